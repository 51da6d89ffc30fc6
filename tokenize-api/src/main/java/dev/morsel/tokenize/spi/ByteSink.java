package dev.morsel.tokenize.spi;

/**
 * Receives the bytes of decoded tokens.
 *
 * @since 0.1.0
 */
@FunctionalInterface
public interface ByteSink {
  /** Appends {@code length} bytes of {@code bytes} starting at {@code offset}. */
  void write(byte[] bytes, int offset, int length);
}
