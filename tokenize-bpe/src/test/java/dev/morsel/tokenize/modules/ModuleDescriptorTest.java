package dev.morsel.tokenize.modules;

import dev.morsel.tokenize.train.testkit.SegmenterModuleContract;

/** The compiled module descriptor of {@code tokenize-bpe}: the checks every segmenter module passes. */
class ModuleDescriptorTest extends SegmenterModuleContract {
  ModuleDescriptorTest() {
    super("bpe", "dev.morsel.tokenize.bpe", "dev.morsel.tokenize.bpe.internal.BpeProvider",
        "dev.morsel.tokenize.bpe.internal.BpeLearnerProvider");
  }
}
