package dev.morsel.tokenize.normalize;

/**
 * Normalized text with its alignment back to the original.
 *
 * <p>Immutable and thread-safe. Every normalized char {@code i} maps to an original span
 * {@code [originalStart(i), originalEnd(i))} in absolute UTF-16 indices of the text given to
 * {@link Normalization#apply(CharSequence, int, int)}. The contract:
 * <ul>
 *   <li>{@code originalStart} and {@code originalEnd} are non-decreasing in {@code i} and lie
 *       inside {@code [rangeStart(), rangeEnd()]};</li>
 *   <li>no span starts or ends inside a surrogate pair of the original;</li>
 *   <li>text is aligned chunk by chunk: in a chunk that normalization left alone (or changed one char
 *       for one char, as case folding of {@code Å} to {@code å} or the U+FFFD replacement of a lone
 *       surrogate), char
 *       {@code i} maps to its own original code point; in a chunk that changed otherwise, every
 *       normalized char maps to the whole original chunk. So an expansion like U+FB01 to
 *       {@code "fi"} maps both chars to the one source char: spans may coincide, never cross;</li>
 *   <li>removed characters (dropped controls, stripped marks that form a chunk of their own,
 *       code points that case folding removes) are covered by no normalized char. A removed
 *       character inside a changed chunk (a mark stripped from its base letter, a control
 *       between two chars that then combine) is folded into that chunk's span.</li>
 * </ul>
 * For a normalized token {@code [a, b)} with {@code a < b} the original span is
 * {@code [spanStart(a), spanEnd(b))}.
 *
 * <p>The alignment is stored as chunk boundaries in parallel {@code int[]}s plus one flag per
 * chunk; a query is a binary search over chunks, or O(1) through a {@link Cursor} when queries come
 * in order. When nothing changed, {@link #isIdentity()} is
 * true, no chunk is stored and {@link #text()} is the input's {@code toString()} of the range.
 *
 * @since 0.1.0
 */
public final class NormalizedText {
  private final String text;
  /** Null when the text is the original range unchanged. */
  private final Chunks chunks;
  private final int rangeStart;
  private final int rangeEnd;

  NormalizedText(String text, Chunks chunks, int rangeStart, int rangeEnd) {
    this.text = text;
    this.chunks = chunks;
    this.rangeStart = rangeStart;
    this.rangeEnd = rangeEnd;
  }

  static NormalizedText identity(CharSequence text, int start, int end) {
    String s = (start == 0 && end == text.length()) ? text.toString() : text.subSequence(start, end).toString();
    return new NormalizedText(s, null, start, end);
  }

  /** The normalized text. */
  public String text() {
    return text;
  }

  /** Length of the normalized text. */
  public int length() {
    return text.length();
  }

  /** Start (inclusive) of the normalized range in the original text (added accessor). */
  public int rangeStart() {
    return rangeStart;
  }

  /** End (exclusive) of the normalized range in the original text (added accessor). */
  public int rangeEnd() {
    return rangeEnd;
  }

  /**
   * Original start (inclusive) of normalized char {@code i}.
   *
   * @throws IndexOutOfBoundsException unless {@code 0 <= i < length()}
   */
  public int originalStart(int i) {
    checkIndex(i);
    return startIn(i, chunks == null ? 0 : chunks.find(i));
  }

  /** {@link #originalStart} with the chunk {@code k} of char {@code i} known. */
  private int startIn(int i, int k) {
    final Chunks c = chunks;
    int o;
    if (c == null) {
      o = rangeStart + i;
    } else {
      if (!c.pos[k]) {
        return c.in[k];
      }
      o = c.in[k] + (i - c.out[k]);
    }
    // a low surrogate in a one-to-one chunk belongs to the pair that starts one char earlier
    if (i > 0 && Character.isLowSurrogate(text.charAt(i)) && Character.isHighSurrogate(text.charAt(i - 1))) {
      o--;
    }
    return o;
  }

  /**
   * Original end (exclusive) of normalized char {@code i}.
   *
   * @throws IndexOutOfBoundsException unless {@code 0 <= i < length()}
   */
  public int originalEnd(int i) {
    checkIndex(i);
    return endIn(i, chunks == null ? 0 : chunks.find(i));
  }

  /** {@link #originalEnd} with the chunk {@code k} of char {@code i} known. */
  private int endIn(int i, int k) {
    final Chunks c = chunks;
    int o;
    if (c == null) {
      o = rangeStart + i + 1;
    } else {
      if (!c.pos[k]) {
        return c.in[k + 1];
      }
      o = c.in[k] + (i - c.out[k]) + 1;
    }
    if (i + 1 < text.length() && Character.isHighSurrogate(text.charAt(i))
        && Character.isLowSurrogate(text.charAt(i + 1))) {
      o++;
    }
    return o;
  }

  /**
   * Original span start for a normalized span starting at {@code start}; at {@code length()} it is
   * {@link #rangeEnd()}.
   *
   * @throws IndexOutOfBoundsException unless {@code 0 <= start <= length()}
   */
  public int spanStart(int start) {
    if (start == text.length() && start >= 0) {
      return rangeEnd;
    }
    return originalStart(start);
  }

  /**
   * Original span end for a normalized span ending (exclusive) at {@code end}; at 0 it is
   * {@link #rangeStart()}.
   *
   * @throws IndexOutOfBoundsException unless {@code 0 <= end <= length()}
   */
  public int spanEnd(int end) {
    if (end == 0) {
      return rangeStart;
    }
    if (end < 0 || end > text.length()) {
      throwBadIndex(end, text.length() + 1);
    }
    return originalEnd(end - 1);
  }

  /**
   * Maps normalized spans to original spans like {@link #spanStart(int)} and {@link #spanEnd(int)},
   * remembering the alignment chunk of the last query: spans asked for in order (as a segmenter
   * reports tokens) cost O(1) each instead of a binary search over chunks; any order still gives
   * the same answers. Mutable and reusable ({@link #reset}); one per thread, never shared.
   *
   * @since 0.2.0
   */
  public static final class Cursor {
    private NormalizedText text;
    private int chunk;

    /** A cursor over nothing; {@link #reset} it before use. */
    public Cursor() {}

    /** Points this cursor at {@code t} (null lets the last text go); returns this cursor. */
    public Cursor reset(NormalizedText t) {
      text = t;
      chunk = 0;
      return this;
    }

    /** {@link NormalizedText#spanStart(int)} of the current text. */
    public int spanStart(int start) {
      final NormalizedText t = text;
      if (start == t.text.length() && start >= 0) {
        return t.rangeEnd;
      }
      t.checkIndex(start);
      final Chunks c = t.chunks;
      if (c == null) {
        return t.startIn(start, 0);
      }
      int k = c.find(start, chunk);
      chunk = k;
      return t.startIn(start, k);
    }

    /** {@link NormalizedText#spanEnd(int)} of the current text. */
    public int spanEnd(int end) {
      final NormalizedText t = text;
      if (end == 0) {
        return t.rangeStart;
      }
      if (end < 0 || end > t.text.length()) {
        throwBadIndex(end, t.text.length() + 1);
      }
      final Chunks c = t.chunks;
      if (c == null) {
        return t.endIn(end - 1, 0);
      }
      int k = c.find(end - 1, chunk);
      chunk = k;
      return t.endIn(end - 1, k);
    }
  }

  /** Whether the normalized text equals the original range (no copy was made). */
  public boolean isIdentity() {
    return chunks == null;
  }

  /** Number of alignment chunks; 1 for an identity (added, for diagnostics and tests). */
  public int chunkCount() {
    return chunks == null ? 1 : chunks.size;
  }

  @Override
  public String toString() {
    return text;
  }

  private void checkIndex(int i) {
    if (i < 0 || i >= text.length()) {
      throwBadIndex(i, text.length());
    }
  }

  private static void throwBadIndex(int i, int bound) {
    throw new IndexOutOfBoundsException("normalized index " + i + " outside [0, " + bound + ")");
  }
}
