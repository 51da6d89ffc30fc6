package dev.morsel.tokenize;

import dev.morsel.tokenize.spi.Segmenter;
import java.nio.ByteBuffer;
import java.nio.file.Path;

/**
 * Static factories for {@link Tokenizer}s: from parts, or from a model file.
 * SKELETON: signatures fixed, bodies to be written.
 *
 * @since 0.1.0
 */
public final class Tokenizers {
  private Tokenizers() {}

  /**
   * A tokenizer from its parts.
   *
   * @throws IllegalArgumentException if a control token's id is outside the segmenter's vocabulary,
   *     or the template names a spelling that is not a registered control token
   */
  public static Tokenizer of(Pipeline pipeline, Segmenter segmenter, ControlTokens controlTokens, Template template) {
    throw new UnsupportedOperationException();
  }

  /** A tokenizer with the default pipeline, no control tokens and no framing. */
  public static Tokenizer of(Segmenter segmenter) {
    return of(Pipeline.defaults(), segmenter, ControlTokens.none(), Template.none());
  }

  /** Loads a model file, validating it fully before building anything. */
  public static Tokenizer load(Path path) {
    throw new UnsupportedOperationException();
  }

  /** Loads a model file's bytes, validating them fully before building anything. */
  public static Tokenizer load(byte[] model) {
    throw new UnsupportedOperationException();
  }

  /** Loads a model from a buffer (for example a memory-mapped file), validating it fully first. */
  public static Tokenizer load(ByteBuffer model) {
    throw new UnsupportedOperationException();
  }
}
