package dev.morsel.tokenize.modules;

import dev.morsel.tokenize.train.testkit.SegmenterModuleContract;

/** The compiled module descriptor of {@code tokenize-unigram}: the checks every segmenter module passes. */
class ModuleDescriptorTest extends SegmenterModuleContract {
  ModuleDescriptorTest() {
    super("unigram", "dev.morsel.tokenize.unigram", "dev.morsel.tokenize.unigram.internal.UnigramProvider",
        "dev.morsel.tokenize.unigram.internal.UnigramLearnerProvider");
  }
}
