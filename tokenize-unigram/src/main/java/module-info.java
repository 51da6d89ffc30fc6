/**
 * Morsel's unigram language model: {@link dev.morsel.tokenize.unigram.UnigramLearner} learns a
 * vocabulary (EM with likelihood-based pruning) into a tokenizer that encodes with Viterbi, and
 * {@link dev.morsel.tokenize.unigram.Unigram} reaches a unigram tokenizer's n-best lists and sampling
 * for subword regularization. Models of scheme {@code "unigram"} load through the api's loader; the
 * learner is found by scheme name through {@link dev.morsel.tokenize.train.Learners}.
 * Implementations live in a package that is not exported.
 */
module dev.morsel.tokenize.unigram {
  requires transitive dev.morsel.tokenize; // our public types expose Tokenizer and Tokens
  requires transitive dev.morsel.tokenize.train; // and Learner, PieceCounts
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize.unigram;

  provides dev.morsel.tokenize.spi.SegmenterProvider with dev.morsel.tokenize.unigram.internal.UnigramProvider;
  provides dev.morsel.tokenize.train.LearnerProvider with dev.morsel.tokenize.unigram.internal.UnigramLearnerProvider;
}
