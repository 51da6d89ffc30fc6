/** Segmenters whose vocabularies are learned by merging pairs. */
module dev.morsel.tokenize.bpe {
  requires transitive dev.morsel.tokenize;
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize.wordpiece;

  provides dev.morsel.tokenize.spi.SegmenterProvider with dev.morsel.tokenize.wordpiece.internal.WordPieceProvider;
}
