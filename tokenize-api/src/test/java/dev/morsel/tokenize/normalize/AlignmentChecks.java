package dev.morsel.tokenize.normalize;

import java.util.function.IntPredicate;

/**
 * Independent checks of the alignment contract (DESIGN.md, "Results and offsets"). Shares no code
 * with the implementation: it only reads the public accessors and the original text.
 */
final class AlignmentChecks {
  private AlignmentChecks() {}

  /**
   * Returns null when {@code nt} satisfies the contract for {@code orig[start, end)}, else a
   * description of the first violation. {@code removable} says which original code points may be
   * covered by no normalized char.
   */
  static String violation(NormalizedText nt, CharSequence orig, int start, int end, IntPredicate removable) {
    int n = nt.length();
    if (nt.text().length() != n) {
      return "length() " + n + " != text().length() " + nt.text().length();
    }
    if (nt.spanStart(n) != end) {
      return "spanStart(length) = " + nt.spanStart(n) + ", expected range end " + end;
    }
    if (nt.spanEnd(0) != start) {
      return "spanEnd(0) = " + nt.spanEnd(0) + ", expected range start " + start;
    }
    boolean[] covered = new boolean[end - start];
    int prevS = start;
    int prevE = start;
    for (int i = 0; i < n; i++) {
      int s = nt.originalStart(i);
      int e = nt.originalEnd(i);
      if (s < start || e > end || s >= e) {
        return "char " + i + " maps to [" + s + ", " + e + ") not a non-empty part of [" + start + ", " + end + ")";
      }
      if (s < prevS || e < prevE) {
        return "not monotone at char " + i + ": [" + s + ", " + e + ") after [" + prevS + ", " + prevE + ")";
      }
      if (splitsPair(orig, s) || splitsPair(orig, e)) {
        return "char " + i + " maps to [" + s + ", " + e + ") which splits a surrogate pair";
      }
      if (nt.spanStart(i) != s || nt.spanEnd(i + 1) != e) {
        return "spanStart/spanEnd disagree with originalStart/End at " + i;
      }
      for (int p = s; p < e; p++) {
        covered[p - start] = true;
      }
      prevS = s;
      prevE = e;
    }
    for (int p = start; p < end; ) {
      int cp = Character.codePointAt(orig, p);
      int len = Math.min(Character.charCount(cp), end - p);
      if (!covered[p - start] && !removable.test(cp)) {
        return String.format("original index %d (U+%04X) is covered by no normalized char and is not removable", p, cp);
      }
      p += len;
    }
    return null;
  }

  private static boolean splitsPair(CharSequence s, int at) {
    return at > 0 && at < s.length() && Character.isHighSurrogate(s.charAt(at - 1))
        && Character.isLowSurrogate(s.charAt(at));
  }

  /** Java-escaped form of a string, for failure messages. */
  static String escape(CharSequence s) {
    StringBuilder sb = new StringBuilder(s.length() * 6 + 2).append('"');
    for (int i = 0; i < s.length(); i++) {
      char c = s.charAt(i);
      if (c >= 0x20 && c < 0x7F && c != '"' && c != '\\') {
        sb.append(c);
      } else {
        sb.append(String.format("\\u%04X", (int) c));
      }
    }
    return sb.append('"').toString();
  }
}
