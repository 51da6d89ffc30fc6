package dev.morsel.tokenize;

/**
 * The limits a {@link Tokenizer} enforces on its input. Each violation throws an
 * {@link IllegalArgumentException} whose message names the limit and the setting that changes it.
 * Immutable.
 *
 * @since 0.1.0
 */
public final class Limits {
  /** Default {@link #maxInputLength()}: 64 Mi UTF-16 units (128 MiB of chars), enough for any single document. */
  public static final int DEFAULT_MAX_INPUT_LENGTH = 1 << 26;
  /** Default {@link #maxBatchSize()}: 16 Mi texts per {@code encodeAll} call. */
  public static final int DEFAULT_MAX_BATCH_SIZE = 1 << 24;

  private static final Limits DEFAULTS = new Limits(DEFAULT_MAX_INPUT_LENGTH, DEFAULT_MAX_BATCH_SIZE);

  private final int maxInputLength;
  private final int maxBatchSize;

  private Limits(int maxInputLength, int maxBatchSize) {
    if (maxInputLength < 1) {
      throw new IllegalArgumentException("maxInputLength=" + maxInputLength + " must be at least 1");
    }
    if (maxBatchSize < 1) {
      throw new IllegalArgumentException("maxBatchSize=" + maxBatchSize + " must be at least 1");
    }
    this.maxInputLength = maxInputLength;
    this.maxBatchSize = maxBatchSize;
  }

  /** The defaults. */
  public static Limits defaults() {
    return DEFAULTS;
  }

  /** Longest text one encode call accepts, in UTF-16 units (default {@value #DEFAULT_MAX_INPUT_LENGTH}). */
  public int maxInputLength() {
    return maxInputLength;
  }

  /** Most texts one batch call accepts (default {@value #DEFAULT_MAX_BATCH_SIZE}). */
  public int maxBatchSize() {
    return maxBatchSize;
  }

  /** These limits with another {@code maxInputLength}. */
  public Limits withMaxInputLength(int maxInputLength) {
    return new Limits(maxInputLength, maxBatchSize);
  }

  /** These limits with another {@code maxBatchSize}. */
  public Limits withMaxBatchSize(int maxBatchSize) {
    return new Limits(maxInputLength, maxBatchSize);
  }

  void checkText(CharSequence text, String what) {
    if (text == null) {
      throw new NullPointerException(what + " is null");
    }
    if (text.length() > maxInputLength) {
      throw new IllegalArgumentException(what + " is " + text.length() + " chars long, over the limit maxInputLength="
          + maxInputLength + " (raise it with Limits.withMaxInputLength and Tokenizer.withLimits)");
    }
  }

  void checkBatch(int size) {
    if (size > maxBatchSize) {
      throw new IllegalArgumentException("batch of " + size + " texts is over the limit maxBatchSize=" + maxBatchSize
          + " (raise it with Limits.withMaxBatchSize and Tokenizer.withLimits)");
    }
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Limits && ((Limits) o).maxInputLength == maxInputLength && ((Limits) o).maxBatchSize == maxBatchSize;
  }

  @Override
  public int hashCode() {
    return maxInputLength * 31 + maxBatchSize;
  }

  @Override
  public String toString() {
    return "Limits[maxInputLength=" + maxInputLength + ", maxBatchSize=" + maxBatchSize + "]";
  }
}
