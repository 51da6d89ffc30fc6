package dev.morsel.tokenize.hardening.kit;

import dev.morsel.tokenize.Template;
import java.util.List;

/**
 * The reserved-token spellings of the hardening tests, our own invention (a ferry's boarding
 * announcements): each starts with {@code "{~"} and ends with {@code "~}"}, so no two overlap or
 * contain each other. Their fullwidth forms (U+FF5B, U+FF5E, U+FF5D and fullwidth letters) become
 * these spellings under NFKC, and {@link #FINAL_CALL} holds "fi", which the ligature U+FB01 becomes.
 */
public final class Spellings {
  private Spellings() {}

  /** Framing marker before a text. */
  public static final String EMBARK = "{~embark~}";
  /** Framing marker after a text. */
  public static final String DISEMBARK = "{~disembark~}";
  /** Framing marker between the texts of a pair. */
  public static final String GANGWAY = "{~gangway~}";
  /** A reserved token that only trusted text may hold. */
  public static final String FINAL_CALL = "{~final-call~}";

  /** All four, in id order (ids 0..3 of a segmenter that reserves them first). */
  public static final List<String> ALL = List.of(EMBARK, DISEMBARK, GANGWAY, FINAL_CALL);

  /** begin EMBARK, separator GANGWAY, end DISEMBARK. */
  public static Template template() {
    return Template.of(List.of(EMBARK), List.of(GANGWAY), List.of(DISEMBARK));
  }

  /** The NFKC-equivalent fullwidth form of an ASCII spelling (U+0021..U+007E to U+FF01..U+FF5E). */
  public static String fullwidth(String ascii) {
    StringBuilder sb = new StringBuilder(ascii.length());
    for (int i = 0; i < ascii.length(); i++) {
      char c = ascii.charAt(i);
      sb.append(c > 0x20 && c < 0x7F ? (char) (c - 0x21 + 0xFF01) : c); // UAX #15 / UnicodeData: <wide> mappings
    }
    return sb.toString();
  }
}
