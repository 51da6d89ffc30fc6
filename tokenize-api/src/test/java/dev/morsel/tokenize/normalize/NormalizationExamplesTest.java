package dev.morsel.tokenize.normalize;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.normalize.Normalization.Form;
import org.junit.jupiter.api.Test;

/**
 * Worked examples of the steps and the alignment rules, set in a ferry operator's passenger
 * messages. Decompositions are cited from UnicodeData.txt and CaseFolding.txt of Unicode 15.0.0
 * (Debian unicode-data, /usr/share/unicode).
 */
class NormalizationExamplesTest {
  private static final Normalization NFC = Normalization.of(Form.NFC);
  private static final Normalization NFKC = Normalization.of(Form.NFKC);

  /** Spans of every normalized char as {start0, end0, start1, end1, ...}. */
  private static int[] spans(NormalizedText nt) {
    int[] r = new int[nt.length() * 2];
    for (int i = 0; i < nt.length(); i++) {
      r[2 * i] = nt.originalStart(i);
      r[2 * i + 1] = nt.originalEnd(i);
    }
    return r;
  }

  /**
   * Regression: U+0F76 decomposes (UAX #15, canonical decomposition) into marks only, so removing
   * marks brought the Hangul L jamo U+1103 and the V jamo U+1169 together, which NFC composes into
   * U+B3C4; chunking had cut before U+0F76 and left the jamo apart.
   */
  @Test
  void removingMarksThatVanishACharacterStillComposesAcrossIt() {
    String input = "\u1103\u1ab7\u0f76\u0f71\u1169\u3000";
    // independent reference: whole-text NFD, drop Mn, NFC with java.text.Normalizer
    String d = java.text.Normalizer.normalize(input, java.text.Normalizer.Form.NFD).replaceAll("\\p{Mn}", "");
    String expected = java.text.Normalizer.normalize(d, java.text.Normalizer.Form.NFC);
    assertEquals("\ub3c4\u3000", expected);
    for (String spec : new String[] {"nfc+remove-marks", "nfc+casefold+remove-marks+drop-controls", "none+remove-marks"}) {
      NormalizedText t = Normalization.parse(spec).apply(input);
      assertEquals(expected, t.text(), spec);
      assertEquals(0, t.originalStart(0), spec);
      assertEquals(5, t.originalEnd(0), spec);
    }
  }

  @Test
  void ligatureExpandsAndBothCharsMapToIt() {
    // UnicodeData.txt: FB01;LATIN SMALL LIGATURE FI;...;<compat> 0066 0069
    NormalizedText nt = NFKC.apply("\uFB01ne");
    assertEquals("fine", nt.text());
    assertArrayEquals(new int[] {0, 1, 0, 1, 1, 2, 2, 3}, spans(nt));
    // a token "fi" maps to the ligature; a token "in" spans ligature and n
    assertEquals(0, nt.spanStart(0));
    assertEquals(1, nt.spanEnd(2));
    assertEquals(0, nt.spanStart(1));
    assertEquals(2, nt.spanEnd(3));
  }

  @Test
  void nfkcChangesLengthsBothWays() {
    // UnicodeData.txt: 2474 PARENTHESIZED DIGIT ONE <compat> 0028 0031 0029 (1 -> 3 chars);
    // NFC composition 0065 0301 -> 00E9 (2 -> 1 chars), UAX #15 section 1.2
    String msg = "Pier \u2474 cafe\u0301";
    NormalizedText nt = NFKC.apply(msg);
    assertEquals("Pier (1) caf\u00E9", nt.text());
    assertEquals(5, nt.originalStart(5));
    assertEquals(6, nt.originalEnd(5));
    assertEquals(5, nt.originalStart(7)); // ')' still maps to the whole U+2474
    assertEquals(6, nt.originalEnd(7));
    assertEquals(6, nt.originalStart(8)); // ' ' after the expansion
    assertEquals(10, nt.originalStart(12)); // é maps to "e\u0301"
    assertEquals(12, nt.originalEnd(12));
    assertEquals(msg.length(), nt.spanStart(nt.length()));
    // the tokens of docs/normalization.md: "(1)" = [5, 8) -> [5, 6); "café" = [9, 13) -> [7, 12)
    assertEquals(5, nt.spanStart(5));
    assertEquals(6, nt.spanEnd(8));
    assertEquals(7, nt.spanStart(9));
    assertEquals(12, nt.spanEnd(13));
  }

  @Test
  void composesWithAnAsciiBase() {
    // UnicodeData.txt: 226E NOT LESS-THAN = 003C 0338; the ASCII '<' joins the following mark's chunk
    NormalizedText nt = NFC.apply("gate <\u0338 9");
    assertEquals("gate \u226E 9", nt.text());
    assertEquals(5, nt.originalStart(5));
    assertEquals(7, nt.originalEnd(5));
    assertEquals(7, nt.originalStart(6));
  }

  @Test
  void caseFoldExpandsSharpS() {
    // CaseFolding.txt: 00DF; F; 0073 0073 and 1E9E; F; 0073 0073
    Normalization n = Normalization.builder().form(Form.NFKC).caseFold(true).build();
    NormalizedText nt = n.apply("Hafenstra\u00DFe");
    assertEquals("hafenstrasse", nt.text());
    assertEquals(9, nt.originalStart(9));
    assertEquals(10, nt.originalEnd(9));
    assertEquals(9, nt.originalStart(10));
    assertEquals(10, nt.originalEnd(10));
    assertEquals(10, nt.originalStart(11));
  }

  @Test
  void loneSurrogateBecomesReplacementAtItsOwnOffset() {
    String msg = "Berth 4\uD800 open, \uDC00x";
    NormalizedText nt = Normalization.none().apply(msg);
    assertEquals("Berth 4\uFFFD open, \uFFFDx", nt.text());
    assertFalse(nt.isIdentity());
    assertEquals(7, nt.originalStart(7));
    assertEquals(8, nt.originalEnd(7));
    assertEquals(15, nt.originalStart(15));
    assertEquals(16, nt.originalEnd(15));
    assertNull(AlignmentChecks.violation(nt, msg, 0, msg.length(), cp -> false));
  }

  @Test
  void surrogatePairsAreNeverSplit() {
    // U+1D5A5 MATHEMATICAL SANS-SERIF CAPITAL F, <font> 0046 (UnicodeData.txt); U+1F6A2 SHIP stays
    String msg = "\uD83D\uDEA2 \uD835\uDDA5erry";
    NormalizedText plain = NFC.apply(msg);
    assertTrue(plain.isIdentity());
    assertEquals(0, plain.originalStart(1));
    assertEquals(2, plain.originalEnd(0));
    NormalizedText nt = NFKC.apply(msg);
    assertEquals("\uD83D\uDEA2 Ferry", nt.text());
    assertEquals(0, nt.originalStart(1));
    assertEquals(2, nt.originalEnd(0));
    assertEquals(3, nt.originalStart(3));
    assertEquals(5, nt.originalEnd(3));
  }

  @Test
  void alreadyNormalizedTextIsAnIdentityWithoutCopy() {
    String msg = "Crossing to \u00C5lesund delayed 20 min, caf\u00E9 open";
    NormalizedText nt = NFC.apply(msg);
    assertTrue(nt.isIdentity());
    assertSame(msg, nt.text());
    assertEquals(1, nt.chunkCount());
    assertEquals(12, nt.originalStart(12));
  }

  @Test
  void fewChangesGiveFewChunks() {
    StringBuilder sb = new StringBuilder();
    for (int i = 0; i < 200; i++) {
      sb.append("Deck two is closed. ");
    }
    sb.append("\uFB01nal call");
    NormalizedText nt = NFKC.apply(sb);
    assertEquals(3, nt.chunkCount()); // identity, the ligature, identity
    assertEquals(4000, nt.originalStart(4001));
    assertEquals(4001, nt.originalStart(4002));
  }

  @Test
  void droppedControlsAreCoveredByNothing() {
    Normalization n = Normalization.builder().dropControls(true).build();
    String msg = "Quay\u0007 7\t\u0001\n";
    NormalizedText nt = n.apply(msg);
    assertEquals("Quay 7\t\n", nt.text()); // TAB and LF are kept (documented)
    assertEquals(5, nt.originalStart(4));
    assertEquals(7, nt.originalStart(6));
    assertEquals(9, nt.originalStart(7)); // U+0001 at 8 is covered by nothing
    assertEquals(msg.length(), nt.spanStart(nt.length()));
    assertEquals(msg.length(), nt.spanEnd(nt.length()));
    assertEquals(0, nt.spanEnd(0));
  }

  @Test
  void controlBetweenLetterAndMarkFoldsIntoTheComposedChunk() {
    // dropping runs before the form (documented order), so e + U+0301 compose to U+00E9 across it
    Normalization n = Normalization.builder().form(Form.NFC).dropControls(true).build();
    NormalizedText nt = n.apply("Cafe\u0007\u0301 Nord");
    assertEquals("Caf\u00E9 Nord", nt.text());
    assertEquals(3, nt.originalStart(3));
    assertEquals(6, nt.originalEnd(3));
    assertEquals(6, nt.originalStart(4));
  }

  @Test
  void collapsedSpacesMapToTheWholeRun() {
    // PropList.txt: 00A0 and 3000 are White_Space; 2028 is a line separator and is kept
    Normalization n = Normalization.builder().collapseSpaces(true).build();
    NormalizedText nt = n.apply("Gate\t \u00A0 9\u2028\u3000Exit");
    assertEquals("Gate 9\u2028 Exit", nt.text());
    assertEquals(4, nt.originalStart(4));
    assertEquals(8, nt.originalEnd(4));
    assertEquals(8, nt.originalStart(5));
    assertEquals(10, nt.originalStart(7));
    assertEquals(11, nt.originalEnd(7));
  }

  @Test
  void strippedAccentsFoldIntoTheirBaseOrVanish() {
    // UnicodeData.txt: 00C5 = 0041 030A; 030A COMBINING RING ABOVE is Mn
    Normalization n = Normalization.builder().form(Form.NFC).removeMarks(true).build();
    NormalizedText pre = n.apply("\u00C5lesund");
    assertEquals("Alesund", pre.text());
    assertEquals(1, pre.originalEnd(0));
    NormalizedText dec = n.apply("A\u030Alesund");
    assertEquals("Alesund", dec.text());
    assertEquals(0, dec.originalStart(0));
    assertEquals(2, dec.originalEnd(0)); // the mark folds into its base's chunk
    NormalizedText spaced = n.apply("x \u0301y");
    assertEquals("x y", spaced.text()); // the mark shares the space's chunk and folds into it
    assertEquals(1, spaced.originalStart(1));
    assertEquals(3, spaced.originalEnd(1));
    NormalizedText lone = n.apply("\u0301Ny");
    assertEquals("Ny", lone.text()); // a mark with nothing before it is its own chunk: covered by nothing
    assertEquals(1, lone.originalStart(0));
    assertEquals(1, lone.spanStart(0));
    assertEquals(0, lone.spanEnd(0));
  }

  @Test
  void rangeOffsetsAreAbsolute() {
    String msg = ">> Cafe\u0301 Nord <<";
    NormalizedText nt = NFC.apply(msg, 3, 13);
    assertEquals("Caf\u00E9 Nord", nt.text());
    assertEquals(3, nt.rangeStart());
    assertEquals(13, nt.rangeEnd());
    assertEquals(3, nt.spanEnd(0));
    assertEquals(13, nt.spanStart(nt.length()));
    assertEquals(6, nt.originalStart(3));
    assertEquals(8, nt.originalEnd(3));
    assertEquals(12, nt.originalStart(8));
  }

  @Test
  void everyStepTogetherKeepsTheContract() {
    Normalization all = Normalization.parse("nfkc+casefold+remove-marks+drop-controls+collapse-spaces");
    String msg = "\u0001\uFF26\uFF25\uFF32\uFF32\uFF39\u3000 \u00C5LESUND\u0007\u00A0\u2460\uFB01\u0301x";
    NormalizedText nt = all.apply(msg);
    assertEquals("ferry alesund 1fix", nt.text());
    assertNull(AlignmentChecks.violation(nt, msg, 0, msg.length(), AlignmentPropertyTest.removable(all)));
    assertEquals(1, nt.originalStart(0)); // the leading control is covered by nothing
  }

  /**
   * UAX #15 section 13 (Stream-Safe Text Format): after 30 non-starters in a row a U+034F COMBINING
   * GRAPHEME JOINER is inserted. The expected text is built independently: insert CGJ into the
   * input by that rule, then normalize the whole string with ICU.
   */
  @Test
  void longRunsOfMarksAreCutTheStreamSafeWay() {
    StringBuilder sb = new StringBuilder("Ro");
    for (int i = 0; i < 100; i++) {
      sb.append(i % 2 == 0 ? '\u0301' : '\u0316'); // ccc 230 and 220 (UnicodeData.txt), so every pair reorders
    }
    sb.append("ute 9");
    String msg = sb.toString();
    StringBuilder safe = new StringBuilder();
    int run = 0;
    for (int i = 0; i < msg.length(); i++) {
      char c = msg.charAt(i);
      if (com.ibm.icu.lang.UCharacter.getCombiningClass(c) != 0) {
        if (run == 30) {
          safe.append('\u034F');
          run = 0;
        }
        run++;
      } else {
        run = 0;
      }
      safe.append(c);
    }
    String expectedSafe = safe.toString();
    for (Form f : new Form[] {Form.NFC, Form.NFD, Form.NFKC, Form.NFKD}) {
      NormalizedText nt = Normalization.of(f).apply(msg);
      com.ibm.icu.text.Normalizer2 icu = f == Form.NFC ? com.ibm.icu.text.Normalizer2.getNFCInstance()
          : f == Form.NFD ? com.ibm.icu.text.Normalizer2.getNFDInstance()
          : f == Form.NFKC ? com.ibm.icu.text.Normalizer2.getNFKCInstance()
          : com.ibm.icu.text.Normalizer2.getNFKDInstance();
      assertEquals(icu.normalize(expectedSafe), nt.text(), f.toString());
      assertTrue(icu.isNormalized(nt.text()), f + " output is normalized");
      assertNull(AlignmentChecks.violation(nt, msg, 0, msg.length(), cp -> false), f.toString());
    }
    Normalization strip = Normalization.builder().form(Form.NFC).removeMarks(true).build();
    NormalizedText stripped = strip.apply(msg);
    assertEquals("Route 9", stripped.text()); // every mark is Mn, so no joiner is left either
    assertNull(AlignmentChecks.violation(stripped, msg, 0, msg.length(), AlignmentPropertyTest.removable(strip)));
  }
}
