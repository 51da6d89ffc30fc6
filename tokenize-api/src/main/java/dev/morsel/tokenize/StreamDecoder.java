package dev.morsel.tokenize;

/**
 * Decodes ids fed one at a time, emitting only whole user-perceived characters: extended grapheme
 * clusters of Unicode Standard Annex #29. A partial UTF-8 sequence is held until the ids that
 * complete it arrive, and the last complete cluster is held until the next code point shows it is
 * finished (a combining mark, a zero-width joiner or a second regional indicator may still extend
 * it). So {@code 👩‍👩‍👦}, {@code 🇳🇴}, {@code 👍🏽} and {@code e}+U+0301 each arrive in one piece; a
 * cluster longer than 1,024 UTF-16 units (crafted text only) is emitted in parts at code-point
 * boundaries. The concatenation of every {@link #accept} result and {@link #flush()} equals
 * {@link Tokenizer#decode} of the same ids. Per-caller state: not thread-safe; make one per stream
 * with {@link Tokenizer#streamDecoder}.
 *
 * @since 0.1.0
 */
public interface StreamDecoder {
  /**
   * Feeds one id; returns the clusters that are now complete (often empty, never null): text up to
   * the last cluster boundary before the end of what has been decoded so far.
   */
  String accept(int id);

  /**
   * Ends the stream: returns the held cluster; a held partial UTF-8 sequence follows the decoding
   * policy. The decoder may be fed again afterwards, as a new stream.
   */
  String flush();
}
