package dev.morsel.tokenize;

import dev.morsel.tokenize.testkit.BreakTestFile;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.lang.UProperty;
import com.ibm.icu.text.BreakIterator;
import com.ibm.icu.util.ULocale;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import dev.morsel.tokenize.testkit.Europarl;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.BitSet;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The streaming decoder emits whole extended grapheme clusters: checked against the Unicode Standard
 * Annex #29 conformance file {@code GraphemeBreakTest.txt} of Unicode 15.0.0 (vendored as
 * {@code unicode/GraphemeBreakTest-15.0.0.txt.gz}, see README-GraphemeBreakTest.txt there), against
 * ICU's character break iterator, and against batch decoding on every Europarl body.
 *
 * <p>Ids are fed one UTF-8 byte at a time (the {@link ByteSegmenter} maps byte b to id b), the finest
 * cut any segmenter can make, so every cut inside and between code points is exercised.
 */
class GraphemeStreamConformanceTest {
  private static final String RESOURCE = "/unicode/GraphemeBreakTest-15.0.0.txt.gz";

  private static final Tokenizer BYTES =
      Tokenizers.of(Pipeline.of(Normalization.none(), Splitting.runs()), new ByteSegmenter(0));

  /** One line of the conformance file: its number, text and expected boundaries (UTF-16 indices). */
  record Case(int line, String text, BitSet boundaries) {}

  @Test
  void conformanceFileEveryCut() throws IOException {
    List<Case> cases = cases();
    assertEquals(602, cases.size(), "test lines in the 15.0.0 file (its footer: \"# Lines: 602\")");
    int checked = 0;
    int changedRule = 0;
    for (Case c : cases) {
      BitSet file = c.boundaries();
      BitSet icu = icuBoundaries(c.text());
      BitSet expected = file;
      if (!file.equals(icu)) {
        // Unicode 15.1 added rule GB9c (no break inside an Indic conjunct: consonant, linker,
        // consonant; UAX #29 revision 43). ICU 78 implements Unicode 17, the file is 15.0.0: such a
        // line must involve a character with an Indic_Conjunct_Break value, and then ICU is the
        // reference. Any other difference fails.
        assertTrue(c.text().codePoints().anyMatch(cp -> UCharacter.getIntPropertyValue(cp, UProperty.INDIC_CONJUNCT_BREAK) != 0),
            () -> "line " + c.line() + ": ICU breaks " + icu + ", file expects " + file
                + ", and no character has an Indic_Conjunct_Break value");
        expected = icu;
        changedRule++;
      }
      assertStreamsAtBoundaries(c.text(), expected, "line " + c.line());
      checked++;
    }
    assertEquals(cases.size(), checked);
    assertTrue(changedRule < 40, changedRule + " lines differ from Unicode 15.0.0; only GB9c lines are expected to");
  }

  @Test
  void familiesFlagsAndSkinTonesArriveWhole() {
    // Examples of multi-code-point clusters, each fed byte by byte.
    String[] clusters = {
        "\uD83D\uDC69\u200D\uD83D\uDC69\u200D\uD83D\uDC66", // woman ZWJ woman ZWJ boy (GB11)
        "\uD83C\uDDF3\uD83C\uDDF4", // regional indicators N O (GB12)
        "\uD83D\uDC4D\uD83C\uDFFD", // thumbs up + medium skin tone (GB9, Extend)
        "e\u0301", // e + combining acute (GB9)
        "\u1100\u1161\u11A8", // Hangul L V T (GB6, GB7)
        "\r\n", // CR LF (GB3)
    };
    for (String cluster : clusters) {
      String text = "a" + cluster + cluster + "b";
      List<String> parts = stream(text);
      assertEquals(List.of("a", cluster, cluster, "b"), parts, () -> "cluster " + escape(cluster));
    }
  }

  @Test
  void aCraftedClusterLongerThanTheHoldLimitIsEmittedInBoundedParts() {
    StringBuilder sb = new StringBuilder("a");
    sb.append("\u0301".repeat(5000));
    String text = sb.toString();
    List<String> parts = stream(text);
    assertEquals(text, String.join("", parts));
    for (String p : parts) {
      assertTrue(p.length() <= GraphemeStream.MAX_HELD + 4, "part of " + p.length() + " units");
    }
    assertTrue(parts.size() >= 5000 / GraphemeStream.MAX_HELD, parts.size() + " parts");
  }

  @Test
  void everyEuroparlBodyStreamsAsItsBatchDecodeAtClusterBoundaries() {
    int bodies = 0;
    for (String body : Europarl.bodies()) {
      assertStreamsAtBoundaries(body, icuBoundaries(body), "Europarl body " + bodies);
      bodies++;
    }
    assertEquals(Europarl.LINES, bodies);
  }

  // ------------------------------------------------------------------ checks

  /**
   * Feeds the UTF-8 bytes of {@code text} one id at a time. After each byte, the emitted text must be
   * exactly the prefix up to the last boundary strictly before the end of the complete code points
   * fed so far (nothing later can move that boundary, and the cluster after it may still grow); after
   * flush, the whole text, equal to batch decoding.
   */
  private static void assertStreamsAtBoundaries(String text, BitSet boundaries, String where) {
    byte[] utf8 = text.getBytes(StandardCharsets.UTF_8);
    int[] ids = new int[utf8.length];
    for (int i = 0; i < utf8.length; i++) {
      ids[i] = utf8[i] & 0xFF;
    }
    assertEquals(text, BYTES.decode(ids), where);
    StreamDecoder d = BYTES.streamDecoder(false, Decoding.STRICT);
    StringBuilder out = new StringBuilder();
    int decoded = 0; // UTF-16 units of the complete code points fed so far
    int pendingBytes = 0;
    for (int i = 0; i < utf8.length; i++) {
      out.append(d.accept(ids[i]));
      pendingBytes++;
      int lead = utf8[i - pendingBytes + 1] & 0xFF;
      int need = lead < 0x80 ? 1 : lead < 0xE0 ? 2 : lead < 0xF0 ? 3 : 4;
      if (pendingBytes == need) {
        decoded += need == 4 ? 2 : 1;
        pendingBytes = 0;
      }
      int expect = boundaries.previousSetBit(decoded - 1);
      if (expect < 0) {
        expect = 0;
      }
      if (out.length() != expect) {
        fail(where + ": after byte " + i + " of " + escape(text) + " the decoder emitted " + out.length()
            + " UTF-16 units, the last cluster boundary before " + decoded + " is " + expect);
      }
    }
    out.append(d.flush());
    assertEquals(text, out.toString(), where);
  }

  private static List<String> stream(String text) {
    StreamDecoder d = BYTES.streamDecoder(false, Decoding.STRICT);
    List<String> parts = new ArrayList<>();
    for (byte b : text.getBytes(StandardCharsets.UTF_8)) {
      String s = d.accept(b & 0xFF);
      if (!s.isEmpty()) {
        parts.add(s);
      }
    }
    String rest = d.flush();
    if (!rest.isEmpty()) {
      parts.add(rest);
    }
    return parts;
  }

  /** The reference: ICU's extended grapheme cluster boundaries of the whole text, 0 and end included. */
  private static BitSet icuBoundaries(String text) {
    BreakIterator bi = BreakIterator.getCharacterInstance(ULocale.ROOT);
    bi.setText(text);
    BitSet set = new BitSet(text.length() + 1);
    for (int b = bi.first(); b != BreakIterator.DONE; b = bi.next()) {
      set.set(b);
    }
    return set;
  }

  static List<Case> cases() throws IOException {
    List<Case> cases = new ArrayList<>();
    for (BreakTestFile.Line line : BreakTestFile.read(RESOURCE)) {
      BitSet boundaries = new BitSet();
      line.breaks().forEach(boundaries::set);
      cases.add(new Case(line.number(), line.text(), boundaries));
    }
    return cases;
  }

  private static String escape(String s) {
    StringBuilder sb = new StringBuilder();
    s.codePoints().forEach(cp -> sb.append(String.format("U+%04X ", cp)));
    return sb.toString().trim();
  }
}
