/**
 * Segmenters whose vocabularies are learned by merging pairs: byte-level BPE
 * ({@link dev.morsel.tokenize.bpe.BpeLearner}, {@link dev.morsel.tokenize.bpe.BpeSegmenter}, kind
 * {@code "bpe"}) and WordPiece ({@link dev.morsel.tokenize.wordpiece.WordPieceLearner},
 * {@link dev.morsel.tokenize.wordpiece.WordPieceSegmenter}, kind {@code "wordpiece"}). Found by the
 * api's loader under their kind names.
 */
module dev.morsel.tokenize.bpe {
  requires transitive dev.morsel.tokenize;
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize.bpe;
  exports dev.morsel.tokenize.wordpiece;

  provides dev.morsel.tokenize.spi.SegmenterProvider with
      dev.morsel.tokenize.bpe.internal.BpeProvider,
      dev.morsel.tokenize.wordpiece.internal.WordPieceProvider;
}
