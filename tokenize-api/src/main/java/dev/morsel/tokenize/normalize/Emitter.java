package dev.morsel.tokenize.normalize;

/**
 * Collects the output of one normalization step over {@code src[from, to)} chunk by chunk.
 *
 * <p>While every chunk is unchanged nothing is copied: the first changed chunk copies the
 * unchanged prefix once, and from then on chunks are appended with their alignment. If nothing
 * changed, {@link #finish} returns {@code false} and the step costs no copy at all.
 */
final class Emitter {
  private CharSequence src;
  private int from;
  private int to;
  private StringBuilder sb;
  private Chunks chunks;

  /** Re-points this emitter at a new input range; forgets any previous output. */
  Emitter reset(CharSequence src, int from, int to) {
    this.src = src;
    this.from = from;
    this.to = to;
    this.sb = null;
    this.chunks = null;
    return this;
  }

  /** {@code src[a, b)} passes unchanged. */
  void same(int a, int b) {
    StringBuilder s = sb;
    if (s != null && a < b) {
      chunks.add(s.length(), a, true);
      s.append(src, a, b);
    }
  }

  /** {@code src[a, b)} becomes {@code repl}, char for char (same length, BMP only). */
  void oneToOne(CharSequence repl, int a, int b) {
    open(a, b);
    chunks.add(sb.length(), a, true);
    sb.append(repl);
  }

  /** {@code src[a, b)} is ASCII and becomes its lowercase, char for char (case folding of ASCII). */
  void asciiLower(int a, int b) {
    open(a, b);
    StringBuilder s = sb;
    chunks.add(s.length(), a, true);
    CharSequence in = src;
    for (int i = a; i < b; i++) {
      char c = in.charAt(i);
      s.append((c >= 'A' && c <= 'Z') ? (char) (c + ('a' - 'A')) : c);
    }
  }

  /** {@code src[a, b)} becomes {@code repl} (possibly empty); every output char maps to [a, b). */
  void changed(CharSequence repl, int a, int b) {
    open(a, b);
    // one char for one char maps the same either way; flagged one-to-one it merges with neighbours
    chunks.add(sb.length(), a, repl.length() == 1 && b - a == 1);
    sb.append(repl);
  }

  /** The output so far was changed at least once. */
  boolean isChanged() {
    return sb != null;
  }

  /** Ends the step at input {@code to}; returns whether anything changed. */
  boolean finish(int to) {
    if (sb == null) {
      return false;
    }
    chunks.finish(sb.length(), to);
    return true;
  }

  String text() {
    return sb.toString();
  }

  Chunks chunks() {
    return chunks;
  }

  private void open(int a, int b) {
    assert a <= b;
    if (sb == null) {
      // capacity in chars: the input range plus a little room for expansions (ﬁ -> fi)
      int n = to - from;
      int guess = n + (n >>> 3) + 16;
      sb = new StringBuilder(guess);
      chunks = new Chunks(8);
      if (a > from) {
        chunks.add(0, from, true);
        sb.append(src, from, a);
      }
    }
  }
}
