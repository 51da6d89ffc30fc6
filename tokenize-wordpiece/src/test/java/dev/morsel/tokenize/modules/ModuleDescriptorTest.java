package dev.morsel.tokenize.modules;

import dev.morsel.tokenize.train.testkit.SegmenterModuleContract;

/** The compiled module descriptor of {@code tokenize-wordpiece}: the checks every segmenter module passes. */
class ModuleDescriptorTest extends SegmenterModuleContract {
  ModuleDescriptorTest() {
    super("wordpiece", "dev.morsel.tokenize.wordpiece", "dev.morsel.tokenize.wordpiece.internal.WordPieceProvider",
        "dev.morsel.tokenize.wordpiece.internal.WordPieceLearnerProvider");
  }
}
