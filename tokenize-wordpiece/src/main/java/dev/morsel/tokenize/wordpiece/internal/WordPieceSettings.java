package dev.morsel.tokenize.wordpiece.internal;

import java.util.Objects;

/**
 * The model settings of a WordPiece vocabulary: the continuation marker, the unknown token's
 * spelling and the longest piece that is segmented. Immutable and thread-safe.
 *
 * <p>Defaults: marker {@value #DEFAULT_MARKER} (U+2218 RING OPERATOR; a token {@code "∘ry"} is the
 * continuation {@code "ry"}), unknown spelling {@value #DEFAULT_UNKNOWN} (U+2370, a boxed question
 * mark), {@code maxPieceLength} {@value #DERIVED_PIECE_LENGTH}: derived from the vocabulary (see
 * {@link #DERIVED_PIECE_LENGTH}).
 *
 * @since 0.1.0
 */
public final class WordPieceSettings {
  /** Default continuation marker: U+2218 RING OPERATOR, rare in prose and one UTF-16 unit long. */
  public static final String DEFAULT_MARKER = "\u2218";
  /** Default unknown token spelling: U+2370 (a question mark in a box). */
  public static final String DEFAULT_UNKNOWN = "\u2370";
  /**
   * The {@link #maxPieceLength()} that asks for a limit derived from the vocabulary, and the default.
   * The derived limit is the number of nodes of the vocabulary's LinMaxMatch trie (one per distinct
   * prefix of a token text, so never below the longest token), at most {@link
   * #MAX_MAX_PIECE_LENGTH}; {@link WordPieceSegmenter#pieceLimit()} gives it.
   *
   * <p>Reason: the limit exists for memory, not for time. LinMaxMatch segments a piece of n units in
   * O(n) steps whatever the vocabulary [Song et al. 2021, "Fast WordPiece Tokenization", §3], so no
   * length needs cutting off to keep encoding fast. What grows with the piece is the per-thread
   * scratch of token ids, one {@code int} per unit, since the whole piece may still turn out unknown.
   * With the limit at the trie's node count that scratch is never larger than one of the trie's own
   * per-node arrays (the trie keeps several), so memory per thread scales with the model and never
   * with the input; and since every token text is a path of the trie, every token can still be
   * matched. Measured on a 3,000-token model trained on the Europarl sample: a limit of 4,444 units
   * against a longest piece of 64 units in the whole sample (see {@code docs/wordpiece.md}), so in
   * practice only long runs without a break become the unknown token.
   */
  public static final int DERIVED_PIECE_LENGTH = 0;
  /** Largest allowed {@link #maxPieceLength()}, in UTF-16 units (bounds per-thread scratch arrays). */
  public static final int MAX_MAX_PIECE_LENGTH = 1 << 20;

  private static final WordPieceSettings DEFAULTS =
      new WordPieceSettings(DEFAULT_MARKER, DEFAULT_UNKNOWN, DERIVED_PIECE_LENGTH, false);

  private final String marker;
  private final String unknownToken;
  private final int maxPieceLength;
  private final boolean byteSpelling;

  private WordPieceSettings(String marker, String unknownToken, int maxPieceLength, boolean byteSpelling) {
    this.marker = marker;
    this.unknownToken = unknownToken;
    this.maxPieceLength = maxPieceLength;
    this.byteSpelling = byteSpelling;
  }

  /** The defaults. */
  public static WordPieceSettings defaults() {
    return DEFAULTS;
  }

  /** The continuation marker written before the text of a continuation token in its spelling. */
  public String marker() {
    return marker;
  }

  /** The unknown token's spelling. */
  public String unknownToken() {
    return unknownToken;
  }

  /**
   * Longest piece, in UTF-16 units, that is segmented; longer pieces become the unknown token. {@value
   * #DERIVED_PIECE_LENGTH} ({@link #DERIVED_PIECE_LENGTH}) means: derived from the vocabulary.
   */
  public int maxPieceLength() {
    return maxPieceLength;
  }

  /**
   * Byte spelling: whether the vocabulary holds 256 byte tokens right after the unknown token, so that
   * a character outside the alphabet is spelled with its UTF-8 bytes instead of turning its piece
   * into the unknown token (off in these defaults, which read models written before the option).
   */
  public boolean byteSpelling() {
    return byteSpelling;
  }

  /** These settings with byte spelling on or off. */
  public WordPieceSettings withByteSpelling(boolean on) {
    return new WordPieceSettings(marker, unknownToken, maxPieceLength, on);
  }

  /** The spelling of byte token {@code b}: its two hex digits between U+2983 and U+2984 (white curly brackets). */
  public static String byteTokenText(int b) {
    return "\u2983" + Character.toUpperCase(Character.forDigit((b >>> 4) & 15, 16))
        + Character.toUpperCase(Character.forDigit(b & 15, 16)) + "\u2984";
  }

  /**
   * These settings with another marker.
   *
   * @throws IllegalArgumentException if {@code marker} is empty, holds whitespace or a lone surrogate
   */
  public WordPieceSettings withMarker(String marker) {
    return new WordPieceSettings(checkMarker(marker), unknownToken, maxPieceLength, byteSpelling);
  }

  /**
   * These settings with another unknown token spelling.
   *
   * @throws IllegalArgumentException if {@code unknownToken} is empty or holds a lone surrogate
   */
  public WordPieceSettings withUnknownToken(String unknownToken) {
    return new WordPieceSettings(marker, checkUnknown(unknownToken), maxPieceLength, byteSpelling);
  }

  /**
   * These settings with another piece limit: a length in UTF-16 units, or {@link
   * #DERIVED_PIECE_LENGTH} for the limit derived from the vocabulary.
   *
   * @throws IllegalArgumentException if {@code maxPieceLength} is outside {@code [0, }{@value #MAX_MAX_PIECE_LENGTH}{@code ]}
   */
  public WordPieceSettings withMaxPieceLength(int maxPieceLength) {
    return new WordPieceSettings(marker, unknownToken, checkMaxPieceLength(maxPieceLength), byteSpelling);
  }

  static String checkMarker(String marker) {
    Objects.requireNonNull(marker, "marker");
    if (marker.isEmpty()) {
      throw new IllegalArgumentException("marker must not be empty");
    }
    for (int i = 0; i < marker.length(); i++) {
      if (Character.isWhitespace(marker.charAt(i)) || Character.isSpaceChar(marker.charAt(i))) {
        throw new IllegalArgumentException("marker '" + marker + "' holds whitespace at index " + i);
      }
    }
    if (!wellFormed(marker)) {
      throw new IllegalArgumentException("marker holds a lone surrogate");
    }
    return marker;
  }

  static String checkUnknown(String unknown) {
    Objects.requireNonNull(unknown, "unknownToken");
    if (unknown.isEmpty()) {
      throw new IllegalArgumentException("unknownToken must not be empty");
    }
    if (!wellFormed(unknown)) {
      throw new IllegalArgumentException("unknownToken holds a lone surrogate");
    }
    return unknown;
  }

  static int checkMaxPieceLength(int maxPieceLength) {
    if (maxPieceLength < 0 || maxPieceLength > MAX_MAX_PIECE_LENGTH) {
      throw new IllegalArgumentException("maxPieceLength=" + maxPieceLength + " is outside [0, "
          + MAX_MAX_PIECE_LENGTH + "] (0: derived from the vocabulary)");
    }
    return maxPieceLength;
  }

  /** Whether {@code s} has no lone surrogate. */
  static boolean wellFormed(CharSequence s) {
    int n = s.length();
    for (int i = 0; i < n; i++) {
      char c = s.charAt(i);
      if (Character.isHighSurrogate(c)) {
        if (i + 1 == n || !Character.isLowSurrogate(s.charAt(i + 1))) {
          return false;
        }
        i++;
      } else if (Character.isLowSurrogate(c)) {
        return false;
      }
    }
    return true;
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof WordPieceSettings && ((WordPieceSettings) o).marker.equals(marker)
        && ((WordPieceSettings) o).unknownToken.equals(unknownToken)
        && ((WordPieceSettings) o).maxPieceLength == maxPieceLength && ((WordPieceSettings) o).byteSpelling == byteSpelling;
  }

  @Override
  public int hashCode() {
    return Objects.hash(marker, unknownToken, maxPieceLength, byteSpelling);
  }

  @Override
  public String toString() {
    return "WordPieceSettings[marker=" + marker + ", unknownToken=" + unknownToken + ", maxPieceLength="
        + (maxPieceLength == DERIVED_PIECE_LENGTH ? "derived" : Integer.toString(maxPieceLength))
        + (byteSpelling ? ", byteSpelling" : "") + "]";
  }
}
