/**
 * Byte-level BPE for Morsel: {@link dev.morsel.tokenize.bpe.BpeTrainer} learns merges from piece
 * counts, {@link dev.morsel.tokenize.bpe.BpeSegmenter} applies them. Found by the api's loader under
 * the kind name {@code "bpe"}.
 */
module dev.morsel.tokenize.bpe {
  requires dev.morsel.tokenize;
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize.bpe;

  provides dev.morsel.tokenize.spi.SegmenterProvider with dev.morsel.tokenize.bpe.internal.BpeProvider;
}
