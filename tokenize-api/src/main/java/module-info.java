/**
 * Morsel's tokenization API: the {@link dev.morsel.tokenize.Tokenizer} interface, offset-keeping
 * normalization, splitting, reserved tokens, framing, and the model file container.
 * Segmenters plug in through {@link dev.morsel.tokenize.spi.SegmenterProvider}.
 */
@SuppressWarnings("module") // the segmenter modules named in the qualified export are compiled after this one
module dev.morsel.tokenize {
  requires transitive com.ibm.icu;
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize;
  exports dev.morsel.tokenize.normalize;
  exports dev.morsel.tokenize.split;
  exports dev.morsel.tokenize.format;
  exports dev.morsel.tokenize.spi;
  // helpers the segmenter modules share; not API, so exported to them alone
  exports dev.morsel.tokenize.internal to dev.morsel.tokenize.bpe, dev.morsel.tokenize.wordpiece, dev.morsel.tokenize.unigram;

  uses dev.morsel.tokenize.spi.SegmenterProvider;
}
