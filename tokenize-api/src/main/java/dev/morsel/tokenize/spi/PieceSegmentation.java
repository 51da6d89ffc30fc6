package dev.morsel.tokenize.spi;

/**
 * Segments one piece for one encode call in place of {@link Segmenter#segment}: the hook behind a
 * segmenter's extra ways of encoding (sampled segmentations, n-best lists), so that they go through
 * normalization, splitting, reserved tokens and offset mapping exactly as every encode call does.
 * Used with {@link dev.morsel.tokenize.Tokenizers#encodeWith}.
 *
 * @since 0.1.0
 */
@FunctionalInterface
public interface PieceSegmentation {
  /**
   * Reports tokens for {@code text[start, end)}, one piece of normalized text, to {@code sink}, with
   * spans that are absolute indices into {@code text} as for {@link Segmenter#segment}. The tokenizer
   * maps every span to the original text and keeps the tokens in the order reported; a piece may
   * report several alternative token sequences one after another, if the caller knows how to tell
   * them apart (an n-best list does).
   *
   * @param segmenter the tokenizer's segmenter
   */
  void segment(Segmenter segmenter, CharSequence text, int start, int end, TokenSink sink);
}
