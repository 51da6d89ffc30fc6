package dev.morsel.tokenize;

/**
 * The limits a {@link Tokenizer} enforces on its input. Each violation throws an
 * {@link IllegalArgumentException} whose message names the limit and the setting that changes it.
 * Immutable.
 *
 * <table>
 *   <caption>limits and defaults</caption>
 *   <tr><th>setting</th><th>default</th><th>checked</th></tr>
 *   <tr><td>{@code maxInputLength}</td><td>{@value #DEFAULT_MAX_INPUT_LENGTH} UTF-16 units</td>
 *       <td>each text given to an encode call, before any work</td></tr>
 *   <tr><td>{@code maxPieceLength}</td><td>{@value #DEFAULT_MAX_PIECE_LENGTH} UTF-16 units (so, by
 *       default, never hit before {@code maxInputLength})</td>
 *       <td>each piece of normalized text after splitting, before segmentation; a service that
 *       wants to bound the work spent on one unbroken run of characters lowers it, and the call
 *       then fails instead of segmenting the piece</td></tr>
 *   <tr><td>{@code maxBatchSize}</td><td>{@value #DEFAULT_MAX_BATCH_SIZE} texts</td>
 *       <td>each batch call</td></tr>
 * </table>
 *
 * <p>Model files have their own limits (file size, section count), applied while a file is read:
 * see {@link dev.morsel.tokenize.format.ModelLimits}. A segmenter may also have a limit of its own
 * with another policy (WordPiece maps a piece longer than its own piece limit to the unknown
 * token); {@code maxPieceLength} applies to every segmenter and rejects.
 *
 * @since 0.1.0
 */
public final class Limits {
  /** Default {@link #maxInputLength()}: 64 Mi UTF-16 units (128 MiB of chars), enough for any single document. */
  public static final int DEFAULT_MAX_INPUT_LENGTH = 1 << 26;
  /** Default {@link #maxBatchSize()}: 16 Mi texts per {@code encodeAll} call. */
  public static final int DEFAULT_MAX_BATCH_SIZE = 1 << 24;
  /**
   * Default {@link #maxPieceLength()}: equal to {@link #DEFAULT_MAX_INPUT_LENGTH}, so that by default
   * no text that passes the input limit fails on a piece (splitting puts no cap on piece length).
   *
   * @since 0.1.0
   */
  public static final int DEFAULT_MAX_PIECE_LENGTH = DEFAULT_MAX_INPUT_LENGTH;

  private static final Limits DEFAULTS = new Limits(DEFAULT_MAX_INPUT_LENGTH, DEFAULT_MAX_BATCH_SIZE,
      DEFAULT_MAX_PIECE_LENGTH);

  private final int maxInputLength;
  private final int maxBatchSize;
  private final int maxPieceLength;

  private Limits(int maxInputLength, int maxBatchSize, int maxPieceLength) {
    if (maxInputLength < 1) {
      throw new IllegalArgumentException("maxInputLength=" + maxInputLength + " must be at least 1");
    }
    if (maxBatchSize < 1) {
      throw new IllegalArgumentException("maxBatchSize=" + maxBatchSize + " must be at least 1");
    }
    if (maxPieceLength < 1) {
      throw new IllegalArgumentException("maxPieceLength=" + maxPieceLength + " must be at least 1");
    }
    this.maxInputLength = maxInputLength;
    this.maxBatchSize = maxBatchSize;
    this.maxPieceLength = maxPieceLength;
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

  /**
   * Longest piece (normalized text between two split points) that is segmented, in UTF-16 units
   * (default {@value #DEFAULT_MAX_PIECE_LENGTH}).
   *
   * @since 0.1.0
   */
  public int maxPieceLength() {
    return maxPieceLength;
  }

  /** These limits with another {@code maxInputLength}. */
  public Limits withMaxInputLength(int maxInputLength) {
    return new Limits(maxInputLength, maxBatchSize, maxPieceLength);
  }

  /** These limits with another {@code maxBatchSize}. */
  public Limits withMaxBatchSize(int maxBatchSize) {
    return new Limits(maxInputLength, maxBatchSize, maxPieceLength);
  }

  /**
   * These limits with another {@code maxPieceLength}: an encode call that meets a longer piece
   * throws an {@link IllegalArgumentException} naming the limit and the piece's original span.
   *
   * @throws IllegalArgumentException if {@code maxPieceLength < 1}
   * @since 0.1.0
   */
  public Limits withMaxPieceLength(int maxPieceLength) {
    return new Limits(maxInputLength, maxBatchSize, maxPieceLength);
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

  /** Throws for a piece over {@code maxPieceLength}; kept out of the hot path. */
  void throwPieceTooLong(int length, int originalStart, int originalEnd) {
    throw new IllegalArgumentException("piece of " + length + " chars (original text [" + originalStart + ", "
        + originalEnd + ")) is over the limit maxPieceLength=" + maxPieceLength
        + " (raise it with Limits.withMaxPieceLength and Tokenizer.withLimits)");
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Limits && ((Limits) o).maxInputLength == maxInputLength && ((Limits) o).maxBatchSize == maxBatchSize
        && ((Limits) o).maxPieceLength == maxPieceLength;
  }

  @Override
  public int hashCode() {
    return (maxInputLength * 31 + maxBatchSize) * 31 + maxPieceLength;
  }

  @Override
  public String toString() {
    return "Limits[maxInputLength=" + maxInputLength + ", maxPieceLength=" + maxPieceLength + ", maxBatchSize="
        + maxBatchSize + "]";
  }
}
