package dev.morsel.tokenize.normalize;

/**
 * Unicode normalization settings, applied with exact alignment back to the original text.
 * SKELETON: signatures fixed, bodies to be written.
 *
 * @since 0.1.0
 */
public final class Normalization {
  /** The Unicode normalization form applied first. */
  public enum Form { NONE, NFC, NFD, NFKC, NFKD }

  private Normalization() {}

  /** No normalization at all: the text passes unchanged. */
  public static Normalization none() { throw new UnsupportedOperationException(); }

  /** Only the given form, no other step. */
  public static Normalization of(Form form) { throw new UnsupportedOperationException(); }

  /** A builder starting from {@link #none()}. */
  public static Builder builder() { throw new UnsupportedOperationException(); }

  /** Parses a {@link #spec()} string; unknown names are an {@link IllegalArgumentException} naming them. */
  public static Normalization parse(String spec) { throw new UnsupportedOperationException(); }

  /** Canonical text form, for example {@code "nfkc+casefold"}; {@code parse(spec())} equals this. */
  public String spec() { throw new UnsupportedOperationException(); }

  /** Normalizes all of {@code text}. Thread-safe. */
  public NormalizedText apply(CharSequence text) { throw new UnsupportedOperationException(); }

  /** Normalizes {@code text[start, end)}; the alignment reports absolute indices of {@code text}. */
  public NormalizedText apply(CharSequence text, int start, int end) { throw new UnsupportedOperationException(); }

  /** Builder. */
  public static final class Builder {
    private Builder() {}
    public Builder form(Form form) { throw new UnsupportedOperationException(); }
    public Builder caseFold(boolean on) { throw new UnsupportedOperationException(); }
    public Builder stripAccents(boolean on) { throw new UnsupportedOperationException(); }
    public Builder dropControls(boolean on) { throw new UnsupportedOperationException(); }
    public Builder collapseSpaces(boolean on) { throw new UnsupportedOperationException(); }
    public Normalization build() { throw new UnsupportedOperationException(); }
  }
}
