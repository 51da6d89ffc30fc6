package dev.morsel.tokenize.spi;

/**
 * Receives the tokens a {@link Segmenter} produces for one piece, in order.
 *
 * @since 0.1.0
 */
@FunctionalInterface
public interface TokenSink {
  /**
   * One token.
   *
   * @param id the token id
   * @param start start of the token in the text given to the segmenter (UTF-16 units, inclusive)
   * @param end end of the token in that text (exclusive); a token that holds part of a character
   *     reports the whole character, so spans of neighbouring tokens may coincide
   */
  void token(int id, int start, int end);
}
