/**
 * Morsel's byte-level BPE segmenter ({@link dev.morsel.tokenize.bpe.BpeLearner},
 * {@link dev.morsel.tokenize.bpe.BpeSegmenter}, kind {@code "bpe"}). Found by the api's loader under
 * its kind name.
 */
module dev.morsel.tokenize.bpe {
  requires transitive dev.morsel.tokenize;
  requires transitive dev.morsel.tokenize.train;
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize.bpe;

  provides dev.morsel.tokenize.spi.SegmenterProvider with dev.morsel.tokenize.bpe.internal.BpeProvider;
  provides dev.morsel.tokenize.train.LearnerProvider with dev.morsel.tokenize.bpe.internal.BpeLearnerProvider;
}
