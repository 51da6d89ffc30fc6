/**
 * Morsel's tokenization API: the {@link dev.morsel.tokenize.Tokenizer} interface, offset-keeping
 * normalization, splitting, reserved tokens, framing, and the model file container.
 * Segmenters plug in through {@link dev.morsel.tokenize.spi.SegmenterProvider}.
 */
module dev.morsel.tokenize {
  requires transitive com.ibm.icu;
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize;
  exports dev.morsel.tokenize.normalize;
  exports dev.morsel.tokenize.split;
  exports dev.morsel.tokenize.format;
  exports dev.morsel.tokenize.spi;

  uses dev.morsel.tokenize.spi.SegmenterProvider;
}
