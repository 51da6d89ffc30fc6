package dev.morsel.tokenize.normalize;

/**
 * Normalized text with its alignment back to the original.
 * SKELETON: signatures fixed, bodies to be written.
 *
 * @since 0.1.0
 */
public final class NormalizedText {
  private NormalizedText() {}

  /** The normalized text. */
  public String text() { throw new UnsupportedOperationException(); }

  /** Length of the normalized text. */
  public int length() { throw new UnsupportedOperationException(); }

  /** Original start (inclusive) of normalized char {@code i}. */
  public int originalStart(int i) { throw new UnsupportedOperationException(); }

  /** Original end (exclusive) of normalized char {@code i}. */
  public int originalEnd(int i) { throw new UnsupportedOperationException(); }

  /** Original span start for a normalized span starting at {@code start} (also valid at {@code length()}). */
  public int spanStart(int start) { throw new UnsupportedOperationException(); }

  /** Original span end for a normalized span ending (exclusive) at {@code end} (also valid at 0). */
  public int spanEnd(int end) { throw new UnsupportedOperationException(); }

  /** Whether the normalized text equals the original range (no copy was made). */
  public boolean isIdentity() { throw new UnsupportedOperationException(); }
}
