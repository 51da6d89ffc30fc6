package dev.morsel.tokenize.testkit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.fail;

import dev.morsel.tokenize.Tokens;

/**
 * The offset rules of a {@link Tokens} result, checked after encoding in every module's tests:
 * parallel arrays agree; spans are inside the text; starts and ends never decrease within a segment;
 * no span starts or ends inside a surrogate pair. (Spans of tokens that share a normalization chunk
 * or a character may coincide or overlap; that is allowed.)
 */
public final class OffsetInvariants {
  private OffsetInvariants() {}

  /** Checks a single-text result against the text that was encoded. */
  public static void check(Tokens t, CharSequence text) {
    check(t, text, text);
  }

  /** Checks a pair result against the two texts that were encoded. */
  public static void check(Tokens t, CharSequence first, CharSequence second) {
    assertEquals(t.size(), t.ids().length);
    int prevStart = -1;
    int prevEnd = -1;
    int prevSegment = -1;
    for (int i = 0; i < t.size(); i++) {
      CharSequence text = t.segment(i) == 0 ? first : second;
      int s = t.start(i);
      int e = t.end(i);
      if (t.segment(i) != prevSegment) {
        if (t.segment(i) < prevSegment) {
          fail("segment goes back at token " + i + ": " + t);
        }
        prevStart = -1;
        prevEnd = -1;
        prevSegment = t.segment(i);
      }
      if (s < 0 || e < s || e > text.length()) {
        fail("token " + i + " span [" + s + ", " + e + ") outside the text of length " + text.length() + ": " + t);
      }
      if (s < prevStart || e < prevEnd) {
        fail("token " + i + " span [" + s + ", " + e + ") goes back from [" + prevStart + ", " + prevEnd + ")");
      }
      if (insidePair(text, s) || insidePair(text, e)) {
        fail("token " + i + " span [" + s + ", " + e + ") splits a surrogate pair");
      }
      prevStart = s;
      prevEnd = e;
    }
  }

  private static boolean insidePair(CharSequence text, int at) {
    return at > 0 && at < text.length() && Character.isHighSurrogate(text.charAt(at - 1))
        && Character.isLowSurrogate(text.charAt(at));
  }
}
