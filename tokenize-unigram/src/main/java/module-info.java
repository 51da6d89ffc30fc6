/**
 * Morsel's unigram language-model segmenter: Viterbi segmentation, n-best lists, sampling for
 * subword regularization, and an EM trainer with likelihood-based pruning. Implementations live in
 * a package that is not exported.
 */
module dev.morsel.tokenize.unigram {
  requires transitive dev.morsel.tokenize; // our public types expose Segmenter, TokenSink
  requires transitive dev.morsel.tokenize.train; // and PieceCounts
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize.unigram;

  provides dev.morsel.tokenize.spi.SegmenterProvider with dev.morsel.tokenize.unigram.internal.UnigramProvider;
  provides dev.morsel.tokenize.train.LearnerProvider with dev.morsel.tokenize.unigram.internal.UnigramLearnerProvider;
}
