package dev.morsel.tokenize.format;

import java.util.Objects;

/**
 * What a model reader accepts, so that a hostile or damaged file is rejected before it costs memory
 * or time, and so that a model whose encodings this runtime cannot reproduce is not used by
 * accident. One object serves the container ({@link ModelFile#read(java.nio.ByteBuffer, ModelLimits)}),
 * the api's own sections and every segmenter's sections
 * ({@link dev.morsel.tokenize.spi.SegmenterProvider#read(ModelSections, ModelLimits)}); pass it to
 * {@link dev.morsel.tokenize.Tokenizers#load(java.nio.file.Path, ModelLimits)}. Immutable and
 * thread-safe; change a setting with its {@code with…} method.
 *
 * <table>
 *   <caption>settings and defaults</caption>
 *   <tr><th>setting</th><th>default</th><th>why</th></tr>
 *   <tr><td>{@code maxModelBytes}</td><td>{@value ModelFile#MAX_MODEL_BYTES} (2 GiB - 1)</td>
 *       <td>a file is read as one {@link java.nio.ByteBuffer}, whose size is an {@code int}</td></tr>
 *   <tr><td>{@code maxSections}</td><td>{@value ModelFile#MAX_SECTIONS}</td>
 *       <td>a model uses about ten sections; the table of 64 is 1,536 bytes</td></tr>
 *   <tr><td>{@code maxVocabulary}</td><td>{@value #DEFAULT_MAX_VOCABULARY} entries</td>
 *       <td>eight times the largest vocabularies in use (about 256 Ki entries); bounds the arrays a
 *       segmenter allocates per entry</td></tr>
 *   <tr><td>{@code maxMerges}</td><td>{@value #DEFAULT_MAX_MERGES} merges</td>
 *       <td>a BPE vocabulary has one token per merge beyond its 256 bytes, so the same bound as
 *       {@code maxVocabulary}</td></tr>
 *   <tr><td>{@code maxReservedTokens}</td><td>{@value #DEFAULT_MAX_RESERVED_TOKENS} tokens</td>
 *       <td>far above any real list (a few dozen); a list of this size loads in well under a second
 *       (benchmark figure {@code load_reserved_64k_ms})</td></tr>
 *   <tr><td>{@code maxTokenBytes}</td><td>{@value #DEFAULT_MAX_TOKEN_BYTES} bytes of UTF-8</td>
 *       <td>the longest token (or reserved spelling, or piece) any entry may hold: 1,024 four-byte
 *       characters, and the cap the BPE builder applies to the tokens its merges make</td></tr>
 *   <tr><td>{@code unicodeMismatchAllowed}</td><td>{@code false}</td>
 *       <td>a model records the Unicode version of the normalization and splitting data it was made
 *       with; on a runtime with another version the same text may normalize or split differently, so
 *       the model's fingerprint would no longer prove equal encodings</td></tr>
 * </table>
 *
 * <p>A file over a limit fails with a {@link ModelFormatException} that names the section, the
 * setting and the method that raises it, for example
 * {@code vocabulary of 3000000 entries exceeds ModelLimits.maxVocabulary=2097152 (raise it with
 * ModelLimits.withMaxVocabulary)}.
 *
 * @since 0.1.0
 */
public final class ModelLimits {
  /** Default {@link #maxVocabulary()}: 2 Mi entries. */
  public static final int DEFAULT_MAX_VOCABULARY = 1 << 21;
  /** Default {@link #maxMerges()}: 2 Mi merges. */
  public static final int DEFAULT_MAX_MERGES = 1 << 21;
  /** Default {@link #maxReservedTokens()}: 64 Ki tokens. */
  public static final int DEFAULT_MAX_RESERVED_TOKENS = 1 << 16;
  /** Default {@link #maxTokenBytes()}: 4 KiB. */
  public static final int DEFAULT_MAX_TOKEN_BYTES = 4096;

  private static final ModelLimits DEFAULTS = new ModelLimits(ModelFile.MAX_MODEL_BYTES, ModelFile.MAX_SECTIONS,
      DEFAULT_MAX_VOCABULARY, DEFAULT_MAX_MERGES, DEFAULT_MAX_RESERVED_TOKENS, DEFAULT_MAX_TOKEN_BYTES, false);

  // ------------------------------------------------------------------ configuration

  private final long maxModelBytes;
  private final int maxSections;
  private final int maxVocabulary;
  private final int maxMerges;
  private final int maxReservedTokens;
  private final int maxTokenBytes;
  private final boolean unicodeMismatchAllowed;

  private ModelLimits(long maxModelBytes, int maxSections, int maxVocabulary, int maxMerges, int maxReservedTokens,
      int maxTokenBytes, boolean unicodeMismatchAllowed) {
    this.maxModelBytes = maxModelBytes;
    this.maxSections = maxSections;
    this.maxVocabulary = maxVocabulary;
    this.maxMerges = maxMerges;
    this.maxReservedTokens = maxReservedTokens;
    this.maxTokenBytes = maxTokenBytes;
    this.unicodeMismatchAllowed = unicodeMismatchAllowed;
  }

  /** The default limits. */
  public static ModelLimits defaults() {
    return DEFAULTS;
  }

  // ------------------------------------------------------------------ API

  /** Largest accepted file, in bytes (default {@value ModelFile#MAX_MODEL_BYTES}). */
  public long maxModelBytes() {
    return maxModelBytes;
  }

  /** Largest accepted section count (default {@value ModelFile#MAX_SECTIONS}). */
  public int maxSections() {
    return maxSections;
  }

  /** Most vocabulary entries a segmenter section may hold (default {@value #DEFAULT_MAX_VOCABULARY}). */
  public int maxVocabulary() {
    return maxVocabulary;
  }

  /** Most merges a BPE section may hold (default {@value #DEFAULT_MAX_MERGES}). */
  public int maxMerges() {
    return maxMerges;
  }

  /** Most reserved tokens a model may hold (default {@value #DEFAULT_MAX_RESERVED_TOKENS}). */
  public int maxReservedTokens() {
    return maxReservedTokens;
  }

  /** Longest token, piece or reserved spelling, in bytes of UTF-8 (default {@value #DEFAULT_MAX_TOKEN_BYTES}). */
  public int maxTokenBytes() {
    return maxTokenBytes;
  }

  /**
   * Whether a model made with another Unicode version than this runtime's is loaded anyway
   * (default {@code false}: it is refused).
   */
  public boolean unicodeMismatchAllowed() {
    return unicodeMismatchAllowed;
  }

  /**
   * These limits with {@code maxModelBytes} changed.
   *
   * @param bytes in {@code [32, }{@value ModelFile#MAX_MODEL_BYTES}{@code ]} (32 = the header alone)
   * @throws IllegalArgumentException if {@code bytes} is outside that range
   */
  public ModelLimits withMaxModelBytes(long bytes) {
    if (bytes < ModelFileLayout.HEADER_LENGTH || bytes > ModelFile.MAX_MODEL_BYTES) {
      throw new IllegalArgumentException("maxModelBytes=" + bytes + " is outside [" + ModelFileLayout.HEADER_LENGTH
          + ", " + ModelFile.MAX_MODEL_BYTES + "]");
    }
    return new ModelLimits(bytes, maxSections, maxVocabulary, maxMerges, maxReservedTokens, maxTokenBytes,
        unicodeMismatchAllowed);
  }

  /**
   * These limits with {@code maxSections} changed.
   *
   * @param count in {@code [0, }{@value ModelFile#MAX_SECTIONS}{@code ]}
   * @throws IllegalArgumentException if {@code count} is outside that range
   */
  public ModelLimits withMaxSections(int count) {
    if (count < 0 || count > ModelFile.MAX_SECTIONS) {
      throw new IllegalArgumentException("maxSections=" + count + " is outside [0, " + ModelFile.MAX_SECTIONS + "]");
    }
    return new ModelLimits(maxModelBytes, count, maxVocabulary, maxMerges, maxReservedTokens, maxTokenBytes,
        unicodeMismatchAllowed);
  }

  /**
   * These limits with {@code maxVocabulary} changed.
   *
   * @param entries at least 1
   * @throws IllegalArgumentException if {@code entries < 1}
   */
  public ModelLimits withMaxVocabulary(int entries) {
    return new ModelLimits(maxModelBytes, maxSections, positive("maxVocabulary", entries), maxMerges,
        maxReservedTokens, maxTokenBytes, unicodeMismatchAllowed);
  }

  /**
   * These limits with {@code maxMerges} changed.
   *
   * @param merges at least 0
   * @throws IllegalArgumentException if {@code merges < 0}
   */
  public ModelLimits withMaxMerges(int merges) {
    return new ModelLimits(maxModelBytes, maxSections, maxVocabulary, nonNegative("maxMerges", merges),
        maxReservedTokens, maxTokenBytes, unicodeMismatchAllowed);
  }

  /**
   * These limits with {@code maxReservedTokens} changed.
   *
   * @param tokens at least 0
   * @throws IllegalArgumentException if {@code tokens < 0}
   */
  public ModelLimits withMaxReservedTokens(int tokens) {
    return new ModelLimits(maxModelBytes, maxSections, maxVocabulary, maxMerges,
        nonNegative("maxReservedTokens", tokens), maxTokenBytes, unicodeMismatchAllowed);
  }

  /**
   * These limits with {@code maxTokenBytes} changed.
   *
   * @param bytes at least 1
   * @throws IllegalArgumentException if {@code bytes < 1}
   */
  public ModelLimits withMaxTokenBytes(int bytes) {
    return new ModelLimits(maxModelBytes, maxSections, maxVocabulary, maxMerges, maxReservedTokens,
        positive("maxTokenBytes", bytes), unicodeMismatchAllowed);
  }

  /**
   * These limits with {@code unicodeMismatchAllowed} changed. Allow a mismatch only after checking
   * that the texts you encode do not depend on what changed between the two Unicode versions; the
   * loaded tokenizer's fingerprint is then computed for this runtime's version, so it differs from
   * the file's.
   */
  public ModelLimits withUnicodeMismatchAllowed(boolean allowed) {
    return new ModelLimits(maxModelBytes, maxSections, maxVocabulary, maxMerges, maxReservedTokens, maxTokenBytes,
        allowed);
  }

  /**
   * Reads a vocabulary entry count (u32) from {@code in}, checks it against {@code maxVocabulary},
   * then checks that {@code count * minBytesEach} bytes remain, before anything is allocated.
   *
   * @throws ModelFormatException naming the section, the limit and its setter
   */
  public int readVocabularyCount(SectionReader in, String what, int minBytesEach) {
    return in.getLimitedCount(what, "vocabulary of %d entries", maxVocabulary, "maxVocabulary", minBytesEach);
  }

  /**
   * Reads a merge count (u32), checked against {@code maxMerges} and the bytes that remain.
   *
   * @throws ModelFormatException naming the section, the limit and its setter
   */
  public int readMergeCount(SectionReader in, String what, int minBytesEach) {
    return in.getLimitedCount(what, "%d merges", maxMerges, "maxMerges", minBytesEach);
  }

  /**
   * Reads a reserved-token count (u32), checked against {@code maxReservedTokens} and the bytes that remain.
   *
   * @throws ModelFormatException naming the section, the limit and its setter
   */
  public int readReservedCount(SectionReader in, String what, int minBytesEach) {
    return in.getLimitedCount(what, "%d reserved tokens", maxReservedTokens, "maxReservedTokens", minBytesEach);
  }

  /**
   * Reads one token, piece or reserved spelling (a length-prefixed UTF-8 string) whose byte length
   * is checked against {@code maxTokenBytes} before it is allocated.
   *
   * @throws ModelFormatException naming the section, the entry, the limit and its setter, or for malformed UTF-8
   */
  public String readToken(SectionReader in, String what) {
    return in.getLimitedString(what, maxTokenBytes);
  }

  @Override
  public boolean equals(Object o) {
    if (!(o instanceof ModelLimits)) {
      return false;
    }
    ModelLimits m = (ModelLimits) o;
    return maxModelBytes == m.maxModelBytes && maxSections == m.maxSections && maxVocabulary == m.maxVocabulary
        && maxMerges == m.maxMerges && maxReservedTokens == m.maxReservedTokens && maxTokenBytes == m.maxTokenBytes
        && unicodeMismatchAllowed == m.unicodeMismatchAllowed;
  }

  @Override
  public int hashCode() {
    return Objects.hash(maxModelBytes, maxSections, maxVocabulary, maxMerges, maxReservedTokens, maxTokenBytes,
        unicodeMismatchAllowed);
  }

  @Override
  public String toString() {
    return "ModelLimits[maxModelBytes=" + maxModelBytes + ", maxSections=" + maxSections + ", maxVocabulary="
        + maxVocabulary + ", maxMerges=" + maxMerges + ", maxReservedTokens=" + maxReservedTokens + ", maxTokenBytes="
        + maxTokenBytes + ", unicodeMismatchAllowed=" + unicodeMismatchAllowed + "]";
  }

  // ------------------------------------------------------------------ internals

  /** {@code ModelLimits.NAME=VALUE (raise it with ModelLimits.withNAME)}, the tail of every limit error. */
  static String setting(String name, long value) {
    return "ModelLimits." + name + "=" + value + " (raise it with ModelLimits.with"
        + Character.toUpperCase(name.charAt(0)) + name.substring(1) + ")";
  }

  private static int positive(String name, int value) {
    if (value < 1) {
      throw new IllegalArgumentException(name + "=" + value + " must be at least 1");
    }
    return value;
  }

  private static int nonNegative(String name, int value) {
    if (value < 0) {
      throw new IllegalArgumentException(name + "=" + value + " must be at least 0");
    }
    return value;
  }
}
