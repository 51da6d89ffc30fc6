/**
 * Morsel's byte-level BPE: {@link dev.morsel.tokenize.bpe.BpeLearner} learns a vocabulary into a
 * tokenizer, {@link dev.morsel.tokenize.bpe.Bpe} reaches a BPE tokenizer's merges, cache and
 * BPE-dropout. Models of scheme {@code "bpe"} load through the api's loader; the learner is found by
 * scheme name through {@link dev.morsel.tokenize.train.Learners}. Implementations live in a package
 * that is not exported.
 */
module dev.morsel.tokenize.bpe {
  requires transitive dev.morsel.tokenize;
  requires transitive dev.morsel.tokenize.train;
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize.bpe;

  provides dev.morsel.tokenize.spi.SegmenterProvider with dev.morsel.tokenize.bpe.internal.BpeProvider;
  provides dev.morsel.tokenize.train.LearnerProvider with dev.morsel.tokenize.bpe.internal.BpeLearnerProvider;
}
