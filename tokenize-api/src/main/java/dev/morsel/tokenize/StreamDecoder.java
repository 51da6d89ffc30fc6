package dev.morsel.tokenize;

/**
 * Decodes ids fed one at a time, emitting only complete characters: a partial UTF-8 sequence is
 * held until the ids that complete it arrive. Per-caller state: not thread-safe; make one per
 * stream with {@link Tokenizer#streamDecoder}.
 *
 * @since 0.1.0
 */
public interface StreamDecoder {
  /** Feeds one id; returns the text that is now complete (often empty, never null). */
  String accept(int id);

  /** Ends the stream: a held partial sequence follows the decoding policy. Returns the rest. */
  String flush();
}
