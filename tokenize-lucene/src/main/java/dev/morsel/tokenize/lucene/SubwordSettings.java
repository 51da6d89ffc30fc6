package dev.morsel.tokenize.lucene;

import java.util.Objects;

/**
 * How {@link SubwordTokenizer} turns Morsel tokens into Lucene tokens. Immutable and thread-safe.
 *
 * <table>
 *   <caption>Settings and defaults</caption>
 *   <tr><th>setting</th><th>default</th><th>factory parameter</th></tr>
 *   <tr><td>{@link #termText()}</td><td>{@link TermText#VOCABULARY}</td><td>{@code termText=vocabulary|original}</td></tr>
 *   <tr><td>{@link #positions()}</td><td>{@link Positions#PER_TOKEN}</td><td>{@code positions=token|piece}</td></tr>
 *   <tr><td>{@link #idPayload()}</td><td>false</td><td>{@code idPayload=true|false}</td></tr>
 *   <tr><td>{@link #chunkLength()}</td><td>{@value #DEFAULT_CHUNK_LENGTH} chars</td><td>{@code chunkLength=N}</td></tr>
 * </table>
 *
 * @since 0.1.0
 */
public final class SubwordSettings {
  /**
   * What a Lucene token's term holds.
   *
   * @since 0.1.0
   */
  public enum TermText {
    /**
     * The token's display spelling in the vocabulary ({@code Tokenizer.token(id)}), the default:
     * spellings are unique per id, so terms and ids correspond one to one, text that normalization
     * changed ({@code "ﬁ"}, full-width letters) finds the same terms as its normalized form, and two
     * tokens cut from one changed character (whose spans coincide) keep distinct terms.
     */
    VOCABULARY,
    /**
     * The token's span of the original text: readable in term listings, but tokens whose spans
     * coincide get equal terms and normalized spellings no longer meet in the index.
     */
    ORIGINAL
  }

  /**
   * How position increments are given.
   *
   * @since 0.1.0
   */
  public enum Positions {
    /** Every token advances the position by one, the default. */
    PER_TOKEN,
    /**
     * The first token of each piece advances the position by one and the others of that piece
     * stand at the same position (increment 0), so a phrase query spans whole words. Pieces that
     * normalization derived from one original character share a position too.
     */
    PER_PIECE
  }

  /**
   * Default {@link #chunkLength()}, in UTF-16 units: 8 Ki chars (16 KiB) bounds the memory of one
   * tokenizer and is long against the per-chunk costs (one {@code String} and one encode call) yet
   * small enough to stay in the cache of one core.
   */
  public static final int DEFAULT_CHUNK_LENGTH = 8192;
  /** Smallest {@link #chunkLength()}, in UTF-16 units (reason: a chunk needs room for a cut point). */
  public static final int MIN_CHUNK_LENGTH = 4;

  private static final SubwordSettings DEFAULTS =
      new SubwordSettings(TermText.VOCABULARY, Positions.PER_TOKEN, false, DEFAULT_CHUNK_LENGTH);

  private final TermText termText;
  private final Positions positions;
  private final boolean idPayload;
  private final int chunkLength;

  private SubwordSettings(TermText termText, Positions positions, boolean idPayload, int chunkLength) {
    this.termText = termText;
    this.positions = positions;
    this.idPayload = idPayload;
    this.chunkLength = chunkLength;
  }

  /** The defaults (see the class comment). */
  public static SubwordSettings defaults() {
    return DEFAULTS;
  }

  /** A builder starting from the defaults. */
  public static Builder builder() {
    return new Builder(DEFAULTS);
  }

  /** A builder starting from these settings. */
  public Builder toBuilder() {
    return new Builder(this);
  }

  /** What a term holds. */
  public TermText termText() {
    return termText;
  }

  /** How positions advance. */
  public Positions positions() {
    return positions;
  }

  /**
   * Whether each token also carries its id as a payload: 4 bytes, big-endian. Off by default, as
   * payloads cost index space and the {@link TokenIdAttribute} already carries the id in the chain.
   */
  public boolean idPayload() {
    return idPayload;
  }

  /**
   * The length, in UTF-16 units, of the buffer the input is read into and encoded from; chunks are
   * cut only where cutting changes no token, so the buffer grows for a longer stretch without
   * such a place (up to the tokenizer's {@code maxInputLength}).
   */
  public int chunkLength() {
    return chunkLength;
  }

  @Override
  public boolean equals(Object o) {
    if (!(o instanceof SubwordSettings)) {
      return false;
    }
    SubwordSettings s = (SubwordSettings) o;
    return s.termText == termText && s.positions == positions && s.idPayload == idPayload && s.chunkLength == chunkLength;
  }

  @Override
  public int hashCode() {
    return Objects.hash(termText, positions, idPayload, chunkLength);
  }

  @Override
  public String toString() {
    return "SubwordSettings[termText=" + termText + ", positions=" + positions + ", idPayload=" + idPayload
        + ", chunkLength=" + chunkLength + "]";
  }

  /**
   * Builds {@link SubwordSettings}. Not thread-safe.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private TermText termText;
    private Positions positions;
    private boolean idPayload;
    private int chunkLength;

    private Builder(SubwordSettings from) {
      termText = from.termText;
      positions = from.positions;
      idPayload = from.idPayload;
      chunkLength = from.chunkLength;
    }

    /** What a term holds. */
    public Builder termText(TermText termText) {
      this.termText = Objects.requireNonNull(termText, "termText");
      return this;
    }

    /** How positions advance. */
    public Builder positions(Positions positions) {
      this.positions = Objects.requireNonNull(positions, "positions");
      return this;
    }

    /** Whether each token carries its id as a payload. */
    public Builder idPayload(boolean idPayload) {
      this.idPayload = idPayload;
      return this;
    }

    /**
     * The read buffer's length in UTF-16 units.
     *
     * @throws IllegalArgumentException if below {@link #MIN_CHUNK_LENGTH}
     */
    public Builder chunkLength(int chunkLength) {
      if (chunkLength < MIN_CHUNK_LENGTH) {
        throw new IllegalArgumentException("chunkLength=" + chunkLength + " is below the minimum " + MIN_CHUNK_LENGTH);
      }
      this.chunkLength = chunkLength;
      return this;
    }

    /** The settings. */
    public SubwordSettings build() {
      return new SubwordSettings(termText, positions, idPayload, chunkLength);
    }
  }
}
