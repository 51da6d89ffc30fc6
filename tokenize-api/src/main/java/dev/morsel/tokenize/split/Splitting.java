package dev.morsel.tokenize.split;

/**
 * How normalized text is split into pieces before segmentation. Lossless: the pieces concatenate
 * to the text exactly. SKELETON: signatures fixed, bodies to be written.
 *
 * @since 0.1.0
 */
public final class Splitting {
  /** The splitting rule set. */
  public enum Mode { RULES, WORDS, WHITESPACE, NONE }

  private Splitting() {}

  /** Morsel's rule set with digit groups of at most 3. */
  public static Splitting rules() { throw new UnsupportedOperationException(); }

  /** Morsel's rule set with digit groups of at most {@code maxDigits} (1..64). */
  public static Splitting rules(int maxDigits) { throw new UnsupportedOperationException(); }

  /** UAX #29 word boundaries. */
  public static Splitting words() { throw new UnsupportedOperationException(); }

  /** Runs of whitespace and runs of non-whitespace. */
  public static Splitting whitespace() { throw new UnsupportedOperationException(); }

  /** The whole text is one piece. */
  public static Splitting none() { throw new UnsupportedOperationException(); }

  /** Parses a {@link #spec()} string. */
  public static Splitting parse(String spec) { throw new UnsupportedOperationException(); }

  /** Canonical text form, for example {@code "rules:3"}, {@code "words"}. */
  public String spec() { throw new UnsupportedOperationException(); }

  /** The mode. */
  public Mode mode() { throw new UnsupportedOperationException(); }

  /** Splits {@code text[start, end)}. Thread-safe; allocates nothing per piece. */
  public void split(CharSequence text, int start, int end, PieceSink sink) { throw new UnsupportedOperationException(); }
}
