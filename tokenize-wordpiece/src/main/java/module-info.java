/**
 * Morsel's WordPiece segmenter ({@link dev.morsel.tokenize.wordpiece.WordPieceLearner},
 * {@link dev.morsel.tokenize.wordpiece.WordPieceSegmenter}, kind {@code "wordpiece"}): LinMaxMatch
 * encoding and a likelihood-merge trainer. Found by the api's loader under its kind name.
 */
module dev.morsel.tokenize.wordpiece {
  requires transitive dev.morsel.tokenize;
  requires transitive dev.morsel.tokenize.train;
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize.wordpiece;

  provides dev.morsel.tokenize.spi.SegmenterProvider with dev.morsel.tokenize.wordpiece.internal.WordPieceProvider;
  provides dev.morsel.tokenize.train.LearnerProvider with dev.morsel.tokenize.wordpiece.internal.WordPieceLearnerProvider;
}
