package dev.morsel.tokenize;

import com.ibm.icu.text.BreakIterator;
import com.ibm.icu.util.ULocale;

/**
 * The streaming decoder callers get from {@link Tokenizer#streamDecoder}: it emits only whole
 * extended grapheme clusters (Unicode Standard Annex #29, section 3 [1]), so a flag, a skin-toned
 * emoji or a letter with its accents never reaches the caller in halves.
 *
 * <p>Design. A code-point decoder (which already holds back partial UTF-8 sequences) feeds a held
 * buffer. After each token the buffer's last cluster boundary before its end is found with ICU's
 * character break iterator [2]; everything before that boundary is emitted, the last cluster is
 * held, because the next code point may still extend it (a combining mark, a joiner, the second
 * regional indicator). Boundaries before the last one never move when text is appended: the rules of
 * [1] decide a boundary from the text on its left and the one code point on its right, and restarting
 * the iterator at an emitted boundary loses no context (a regional-indicator pair never spans one).
 *
 * <p>A cluster longer than {@link #MAX_HELD} UTF-16 units (only seen in crafted text: a base with
 * thousands of combining marks) is emitted in parts at code-point boundaries, so the held text and
 * the work per token stay bounded.
 *
 * <p>References: [1] UAX #29, "Unicode Text Segmentation", section 3.1 (Grapheme cluster boundary
 * rules GB1–GB999). [2] ICU4J {@code BreakIterator.getCharacterInstance}.
 */
final class GraphemeStream implements StreamDecoder {
  /**
   * Longest held cluster, in UTF-16 units: 1,024 is 30 times the 31 code points of the longest
   * cluster that stream-safe text (UAX #15, section 13: at most 30 non-starters in a row) can hold.
   */
  static final int MAX_HELD = 1024;

  private final StreamDecoder codePoints;
  private final StringBuilder held = new StringBuilder();
  private final BreakIterator clusters = BreakIterator.getCharacterInstance(ULocale.ROOT);

  GraphemeStream(StreamDecoder codePoints) {
    this.codePoints = codePoints;
  }

  @Override
  public String accept(int id) {
    String s = codePoints.accept(id);
    if (s.isEmpty()) {
      return s;
    }
    held.append(s);
    int cut = lastInnerBoundary();
    if (cut == 0 && held.length() > MAX_HELD) {
      cut = held.length();
      if (Character.isHighSurrogate(held.charAt(cut - 1))) {
        cut--; // code-point decoder output never ends inside a pair; kept for safety
      }
    }
    return take(cut);
  }

  @Override
  public String flush() {
    held.append(codePoints.flush());
    return take(held.length());
  }

  /** The last cluster boundary strictly inside the held text, or 0. */
  private int lastInnerBoundary() {
    int n = held.length();
    if (n < 2) {
      return 0;
    }
    clusters.setText(held);
    int b = clusters.preceding(n);
    return b == BreakIterator.DONE ? 0 : b;
  }

  private String take(int cut) {
    if (cut == 0) {
      return "";
    }
    String out = held.substring(0, cut);
    held.delete(0, cut);
    return out;
  }
}
