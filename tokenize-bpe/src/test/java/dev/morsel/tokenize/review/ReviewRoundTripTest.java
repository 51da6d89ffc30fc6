package dev.morsel.tokenize.review;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import dev.morsel.tokenize.bpe.internal.BpeTraining;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSettings;
import dev.morsel.tokenize.wordpiece.internal.WordPieceTraining;
import dev.morsel.tokenize.ReservedTokens;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.bpe.BpeLearner;
import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.BufferedReader;
import java.io.StringReader;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Review text export then import gives a model with the same fingerprint, for BPE and WordPiece,
 * with reserved tokens, byte tokens, characters outside the BMP and tabs, line breaks and
 * backslashes inside tokens; malformed review texts are refused naming the line and the column.
 */
class ReviewRoundTripTest {
  private static final String AGENT = "\u27E8agent\u27E9";
  private static final String PAUSE = "\u27E8pause\u27E9";
  private static final String SHIP = "\uD83D\uDEA2"; // U+1F6A2 SHIP, outside the BMP

  /** Ferry messages with the awkward characters, plus Europarl lines for size. */
  private static List<String> corpus() {
    List<String> texts = new ArrayList<>();
    for (int i = 0; i < 40; i++) {
      texts.add("Oskevik\tquay " + i + "\nHarrowmere ferry " + SHIP + " at C:\\berth\\7\r\nthe " + SHIP + SHIP
          + " sails \u00A0late\u200D");
    }
    texts.addAll(Europarl.bodies().subList(0, 400));
    return texts;
  }

  private static PieceCounts counts(Pipeline p) {
    return PieceCounter.builder().pipeline(p).threads(1).build().count(corpus());
  }

  private static Tokenizer framed(Pipeline p, Segmenter s) {
    return Tokenizers.of(p, s).withTemplate(Template.of(List.of(AGENT), List.of(PAUSE, AGENT), List.of(PAUSE)));
  }

  private static String review(Tokenizer t) {
    StringBuilder sb = new StringBuilder();
    t.writeReview(sb);
    return sb.toString();
  }

  private static byte[] importText(String text) {
    return Tokenizers.modelFromReview(new BufferedReader(new StringReader(text)), "ferry.tsv");
  }

  private static void assertRoundTrip(Tokenizer t) {
    String text = review(t);
    byte[] back = importText(text);
    assertEquals(t.fingerprint(), ModelFile.read(back).fingerprint(), "fingerprint after export and import");
    assertArrayEquals(t.toBytes(), back, "the same model file, byte for byte");
    Tokenizer u = Tokenizers.load(back);
    for (String s : corpus().subList(0, 60)) {
      assertArrayEquals(t.encode(s).ids(), u.encode(s).ids(), s);
    }
    // exporting the imported model gives the same text again
    assertEquals(text, review(u));
    // every line is UTF-8 text in the documented shape: header, notes, headings or TAB-separated rows
    String[] lines = text.split("\n", -1);
    assertEquals("", lines[lines.length - 1], "the text ends with a line feed");
    assertTrue(lines[0].matches("morsel-review\t1\t[a-z]+"), lines[0]);
    for (int i = 1; i < lines.length - 1; i++) {
      assertTrue(!lines[i].contains("\r") && !lines[i].contains(" ") || lines[i].startsWith("\u00B6 ")
          || lines[i].startsWith("\u00A7 "), "line " + (i + 1) + ": " + lines[i]);
    }
  }

  @Test
  void bpeRoundTripsWithReservedTokensBytesAndAwkwardCharacters() {
    Pipeline p = Pipeline.of(Normalization.parse("nfc"), Splitting.whitespace());
    BpeSegmenter s = BpeTraining.builder().vocabularySize(2 + 256 + 600).reservedTokens(List.of(AGENT, PAUSE)).threads(1)
        .build().segmenter(counts(p));
    String text = review(framed(p, s));
    assertTrue(text.contains("\tbyte\t\\t\n") && text.contains("\tbyte\t\\n\n") && text.contains("\tbyte\t\\\\\n"),
        "byte rows for tab, line feed and backslash");
    assertTrue(Pattern.compile("\n[0-9]+\t[^\t\n]*\t[^\t\n]*\t[^\t\n]*" + SHIP + "[^\t\n]*\n").matcher(text).find(),
        "a merge row whose token holds the ship, outside the BMP");
    assertTrue(text.contains("\t\\{F0}\t") || text.contains("\\{F0}\\{9F}"), "a part of the ship's UTF-8 as raw bytes");
    assertRoundTrip(framed(p, s));
    assertRoundTrip(Tokenizers.of(Pipeline.defaults(), s));
  }

  @Test
  void bpeMergesOfTabsLineBreaksAndBackslashesRoundTrip() {
    // explicit merges: TAB LF, backslash backslash, then the four bytes of the ship (F0 9F 9A A2)
    BpeSegmenter s = BpeSegmenter.of(List.of(AGENT), new int[] {1 + '\t', 1 + '\\', 1 + 0xF0, 1 + 0x9A, 259},
        new int[] {1 + '\n', 1 + '\\', 1 + 0x9F, 1 + 0xA2, 260});
    assertEquals(SHIP, s.token(261));
    String text = review(Tokenizers.of(Pipeline.defaults(), s));
    assertTrue(text.contains("\n0\t\\t\t\\n\t\\t\\n\n1\t\\\\\t\\\\\t\\\\\\\\\n2\t\\{F0}\t\\{9F}\t\\{F0}\\{9F}\n"
        + "3\t\\{9A}\t\\{A2}\t\\{9A}\\{A2}\n4\t\\{F0}\\{9F}\t\\{9A}\\{A2}\t" + SHIP + "\n"), text);
    assertRoundTrip(Tokenizers.of(Pipeline.defaults(), s));
  }

  @Test
  void wordPieceRoundTripsWithReservedTokensAndAwkwardCharacters() {
    Pipeline p = Pipeline.of(Normalization.parse("nfkc"), Splitting.whitespace());
    WordPieceSegmenter s = WordPieceTraining.builder().vocabularySize(700).reservedTokens(List.of(AGENT, PAUSE))
        .build().segmenter(counts(p));
    assertRoundTrip(framed(p, s));
    // tokens with tabs, line breaks, backslashes and the ship, and an explicit piece limit
    WordPieceSegmenter odd = WordPieceSegmenter.of(List.of(AGENT, WordPieceSettings.DEFAULT_UNKNOWN, "a\tb", "\r\n",
        "C:\\berth", "\u2218\\", SHIP, "\u2218" + SHIP, "\u00A7quay", "\u00B6"), 1,
        WordPieceSettings.defaults().withMaxPieceLength(40));
    String text = review(Tokenizers.of(Pipeline.defaults(), odd));
    assertTrue(text.contains("\n2\tinitial\ta\\tb\n3\tinitial\t\\r\\n\n4\tinitial\tC:\\\\berth\n5\tcontinuation\t\u2218\\\\\n"
        + "6\tinitial\t" + SHIP + "\n7\tcontinuation\t\u2218" + SHIP + "\n8\tinitial\t\\{U+00A7}quay\n"
        + "9\tinitial\t\\{U+00B6}\n"), text); // a section or note sign is escaped at the start of a field
    assertRoundTrip(Tokenizers.of(Pipeline.defaults(), odd));
  }

  @Test
  void anEditChangesTheFingerprint() {
    BpeSegmenter s = BpeSegmenter.of(List.of(), new int[] {'f', 'e'}, new int[] {'e', 'r'});
    String text = review(Tokenizers.of(Pipeline.defaults(), s));
    String edited = text.replace("\n1\te\tr\ter\n", "\n1\te\tr\ter\n2\tfe\ter\tfeer\n");
    assertNotEquals(text, edited);
    byte[] back = importText(edited);
    assertNotEquals(Tokenizers.of(Pipeline.defaults(), s).fingerprint(), ModelFile.read(back).fingerprint());
    assertEquals(3, ((BpeSegmenter) Tokenizers.segmenterOf(ModelFile.read(back))).mergeCount());
  }

  /**
   * Damaging one line of a valid review text (a field replaced by junk, a TAB removed or added, a
   * heading renamed) is either refused with an error naming a line of the file, or, when the damage
   * still describes a valid model, imported; never anything else.
   */
  @ParameterizedTest
  @ValueSource(longs = {7, 11, 2026})
  void damagedLinesAreRefusedNamingTheLine(long seed) {
    WordPieceSegmenter wp = WordPieceSegmenter.of(List.of(AGENT, PAUSE, WordPieceSettings.DEFAULT_UNKNOWN, "quay",
        "\u2218s", "ferry", "\u2218ries", SHIP), 2, WordPieceSettings.defaults());
    String text = review(framed(Pipeline.defaults(), wp));
    String[] lines = text.split("\n");
    SplittableRandom rnd = new SplittableRandom(seed);
    String[] junk = {"", "\\", "\\q", "-1", "99999999999999999999", "\t", " ", "initial", "\u00A7 x\ty", "01"};
    int refused = 0;
    for (int t = 0; t < 300; t++) {
      int at = rnd.nextInt(lines.length);
      String[] f = lines[at].split("\t", -1);
      f[rnd.nextInt(f.length)] = junk[rnd.nextInt(junk.length)];
      String[] copy = lines.clone();
      copy[at] = String.join("\t", f);
      String damaged = String.join("\n", copy) + "\n";
      try {
        Tokenizers.load(importText(damaged));
      } catch (ModelFormatException e) {
        refused++;
        assertTrue(e.section().matches("ferry\\.tsv(:[0-9]+)?"), e.getMessage());
        if (e.section().contains(":")) {
          long line = Long.parseLong(e.section().substring(e.section().indexOf(':') + 1));
          assertTrue(line >= 1 && line <= lines.length, e.getMessage());
        }
      }
    }
    assertTrue(refused > 200, "most damage is refused: " + refused);
  }

  @Test
  void missingAndUnknownSectionsAreNamed() {
    String text = review(Tokenizers.of(Pipeline.defaults(), BpeSegmenter.of(List.of(), new int[0], new int[0])));
    ModelFormatException missing = assertThrows(ModelFormatException.class,
        () -> importText(text.substring(0, text.indexOf("\u00A7 merges"))));
    assertEquals("ferry.tsv", missing.section());
    assertTrue(missing.getMessage().contains("no section merges"), missing.getMessage());
    long lines = text.chars().filter(c -> c == '\n').count();
    ModelFormatException extra = assertThrows(ModelFormatException.class,
        () -> importText(text + "\u00A7 scores\tid\tscore\n"));
    assertEquals("ferry.tsv:" + (lines + 1), extra.section());
    assertTrue(extra.getMessage().contains("no section scores belongs in a review text of scheme bpe"), extra.getMessage());
    ModelFormatException columns = assertThrows(ModelFormatException.class,
        () -> importText(text.replace("\u00A7 merges\trank\tleft\tright\ttoken", "\u00A7 merges\trank\tleft\tright")));
    assertTrue(columns.getMessage().contains("a column is missing"), columns.getMessage());
    ModelFormatException kind = assertThrows(ModelFormatException.class,
        () -> importText(text.replace("morsel-review\t1\tbpe", "morsel-review\t1\tharbour")));
    assertTrue(kind.getMessage().contains("no segmenter of scheme 'harbour'"), kind.getMessage());
    ModelFormatException version = assertThrows(ModelFormatException.class,
        () -> importText(text.replace("morsel-review\t1\tbpe", "morsel-review\t2\tbpe")));
    assertEquals("ferry.tsv:1: column 2 (version): review text version 2 is newer than this reader's version 1",
        version.getMessage());
  }

  /** The example of docs/format.md, section 5.5, imports, and exporting it again gives the same rows. */
  @Test
  void theDocumentedExampleImports() throws java.io.IOException {
    String md = java.nio.file.Files.readString(java.nio.file.Path.of("../docs/format.md"));
    int from = md.indexOf("```\n", md.indexOf("<!-- review-example:begin -->")) + 4;
    String example = md.substring(from, md.indexOf("```", from));
    byte[] file = importText(example);
    Tokenizer t = Tokenizers.load(file);
    assertEquals("wordpiece", t.scheme());
    assertEquals(List.of(7, 8), List.of(t.encode("C:\\berth").ids()[1], t.encode("\uD83D\uDEA2").ids()[1]));
    StringBuilder again = new StringBuilder();
    Tokenizers.writeReview(ModelFile.read(file), again);
    // the same text but for the note line, which the export writes with the fingerprint
    assertEquals(example.substring(example.indexOf("\u00A7")), again.substring(again.indexOf("\u00A7")));
    assertTrue(again.toString().contains("\u00B6 model fingerprint " + t.fingerprint() + "\n"));
  }
}
