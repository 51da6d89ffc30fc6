/**
 * Morsel's WordPiece: {@link dev.morsel.tokenize.wordpiece.WordPieceLearner} learns a vocabulary
 * (likelihood-based merges) into a tokenizer that encodes with LinMaxMatch, and {@link
 * dev.morsel.tokenize.wordpiece.WordPiece} reaches a WordPiece tokenizer's own features. Models of
 * kind {@code "wordpiece"} load through the api's loader; the learner is found by scheme name through
 * {@link dev.morsel.tokenize.train.Learners}. Implementations live in a package that is not exported.
 */
module dev.morsel.tokenize.wordpiece {
  requires transitive dev.morsel.tokenize;
  requires transitive dev.morsel.tokenize.train;
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize.wordpiece;

  provides dev.morsel.tokenize.spi.SegmenterProvider with dev.morsel.tokenize.wordpiece.internal.WordPieceProvider;
  provides dev.morsel.tokenize.train.LearnerProvider with dev.morsel.tokenize.wordpiece.internal.WordPieceLearnerProvider;
}
