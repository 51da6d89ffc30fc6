package dev.morsel.tokenize.bpe;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import dev.morsel.tokenize.bpe.internal.BpeTraining;
import dev.morsel.tokenize.testkit.Sections;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.SegmenterProvider;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.format.ReviewDocument;
import java.io.BufferedReader;
import java.io.StringReader;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.ServiceLoader;
import org.junit.jupiter.api.Test;

/** Model sections (BPST, BPMG), the provider, and the BPE sections of the review text. */
class ModelFormatTest {
  private static final List<String> RESERVED = List.of("«dock»", "«sail»");

  private static BpeSegmenter withReserved() {
    return BpeTraining.builder().vocabularySize(2 + 256 + 300).reservedTokens(RESERVED).threads(1).build().segmenter(Fixtures.countPieces(Fixtures.europarlBodies().subList(0, 300)));
  }

  private static Map<String, byte[]> payloads(BpeSegmenter s) {
    ModelWriter w = new ModelWriter();
    s.write(w);
    return w.payloads();
  }

  private static void assertSameSegmenter(BpeSegmenter a, Segmenter b) {
    assertEquals(a.vocabularySize(), b.vocabularySize());
    for (int id = 0; id < a.vocabularySize(); id++) {
      assertEquals(a.token(id), b.token(id), "token " + id);
    }
    for (String body : Fixtures.europarlBodies().subList(300, 700)) {
      int[] p = Fixtures.pieces(body);
      for (int j = 0; j < p.length; j += 2) {
        Fixtures.Collected x = new Fixtures.Collected();
        Fixtures.Collected y = new Fixtures.Collected();
        a.segment(body, p[j], p[j + 1], x::add);
        b.segment(body, p[j], p[j + 1], y::add);
        assertArrayEquals(x.ids(), y.ids(), body);
        assertArrayEquals(x.starts(), y.starts(), body);
        assertArrayEquals(x.ends(), y.ends(), body);
      }
    }
  }

  @Test
  void sectionsWriteThenReadGiveTheSameSegmenter() {
    BpeSegmenter s = withReserved().withCacheEntries(1024);
    Map<String, byte[]> pl = payloads(s);
    assertEquals(java.util.Set.of("BPST", "BPMG"), pl.keySet());
    BpeSegmenter back = BpeSegmenter.read(Sections.of(pl));
    assertSameSegmenter(s, back);
    // the cache is a runtime setting: not saved, so a loaded model starts with the default, and the
    // sections (hence the fingerprint) do not depend on it
    assertEquals(BpeSegmenter.DEFAULT_CACHE_ENTRIES, back.cacheEntries());
    assertArrayEquals(pl.get("BPST"), payloads(s.withCacheEntries(0)).get("BPST"));
    assertEquals(s.reservedTokens(), back.reservedTokens());
    assertEquals(1, back.reservedTokens().id("«sail»"));
    // writing again is byte-identical
    Map<String, byte[]> again = payloads(back);
    assertArrayEquals(pl.get("BPMG"), again.get("BPMG"));
    assertArrayEquals(pl.get("BPST"), again.get("BPST"));
  }

  @Test
  void providerIsFoundOnTheClassPath() {
    BpeSegmenter s = withReserved();
    SegmenterProvider found = null;
    for (SegmenterProvider p : ServiceLoader.load(SegmenterProvider.class)) {
      if (p.scheme().equals("bpe")) {
        found = p;
      }
    }
    assertTrue(found != null, "no provider of scheme bpe");
    assertSameSegmenter(s, found.read(Sections.of(payloads(s)), dev.morsel.tokenize.format.ModelLimits.defaults()));
  }

  /** A BPMG payload with these (left, right) pairs. */
  private static byte[] merges(int count, int... pairs) {
    ByteBuffer b = ByteBuffer.allocate(4 + 4 * pairs.length).order(ByteOrder.LITTLE_ENDIAN);
    b.putInt(count);
    for (int v : pairs) {
      b.putInt(v);
    }
    return b.array();
  }

  private static ModelFormatException corrupt(byte[] bpem) {
    Map<String, byte[]> pl = new HashMap<>(payloads(BpeSegmenter.of(List.of(), new int[0], new int[0])));
    pl.put("BPMG", bpem);
    return assertThrows(ModelFormatException.class, () -> BpeSegmenter.read(Sections.of(pl)));
  }

  private static void assertNames(ModelFormatException e, String section, String part) {
    assertEquals(section, e.section(), e.getMessage());
    assertTrue(e.getMessage().contains(part), "message '" + e.getMessage() + "' lacks '" + part + "'");
  }

  @Test
  void corruptMergesAreRejectedNamingSectionAndEntry() {
    int a = 'a';
    int b = 'b';
    // unknown id (beyond the vocabulary)
    assertNames(corrupt(merges(2, a, b, 256, 9999)), "BPMG", "entry 1");
    // an id not below the merge's own id (merge 0 is id 256)
    assertNames(corrupt(merges(1, 256, a)), "BPMG", "entry 0");
    // negative id
    assertNames(corrupt(merges(1, -1, a)), "BPMG", "entry 0");
    // repeated pair
    assertNames(corrupt(merges(3, a, b, 256, a, a, b)), "BPMG", "entry 2");
    // the same bytes twice: (a,b)=ab, (ab,a)=aba, (b,a)=ba, (a,ba)=aba again
    assertNames(corrupt(merges(4, a, b, 256, a, b, a, a, 258)), "BPMG", "entry 3");
    // forged count far beyond the payload
    assertNames(corrupt(merges(0x7FFFFFFF, a, b)), "BPMG", "merges");
    // trailing bytes
    assertNames(corrupt(merges(1, a, b, 7)), "BPMG", "trailing");
    // doubling chain past MAX_TOKEN_BYTES (2^13 = 8192 > 4096)
    int[] chain = new int[26];
    chain[0] = a;
    chain[1] = a;
    for (int r = 1; r < 13; r++) {
      chain[2 * r] = 255 + r;
      chain[2 * r + 1] = 255 + r;
    }
    assertNames(corrupt(merges(13, chain)), "BPMG", "MAX_TOKEN_BYTES");
  }

  @Test
  void corruptSettingsAreRejected() {
    Map<String, byte[]> pl = new HashMap<>(payloads(withReserved()));
    byte[] c = pl.get("BPST").clone();
    c[0] = 9; // version
    pl.put("BPST", c);
    assertNames(assertThrows(ModelFormatException.class, () -> BpeSegmenter.read(Sections.of(pl))),
        "BPST", "version");
    Map<String, byte[]> missing = new HashMap<>(payloads(withReserved()));
    missing.remove("BPMG");
    assertNames(assertThrows(ModelFormatException.class, () -> BpeSegmenter.read(Sections.of(missing))),
        "BPMG", "missing");
    // a reserved spelling that contains another (ReservedTokens rule) is rejected
    ModelWriter w = new ModelWriter();
    w.section("BPST").putInt(1).putInt(2).putString("«dock»").putString("dock").putInt(0);
    w.section("BPMG").putInt(0);
    assertNames(assertThrows(ModelFormatException.class, () -> BpeSegmenter.read(Sections.of(w.payloads()))),
        "BPST", "contains");
  }

  /** The review text of a bare segmenter inside a tokenizer with the default pipeline. */
  private static String review(BpeSegmenter s) {
    StringBuilder sb = new StringBuilder();
    Tokenizers.of(Pipeline.defaults(), s).writeReview(sb);
    return sb.toString();
  }

  private static byte[] fromReview(String text, String source) {
    return Tokenizers.modelFromReview(new BufferedReader(new StringReader(text)), source);
  }

  @Test
  void reviewTextRoundTripsIncludingSpacesAndPartialCharacters() {
    BpeSegmenter s = withReserved();
    String text = review(s);
    assertTrue(text.startsWith("morsel-review\t1\tbpe\n"), text.substring(0, 40));
    assertTrue(text.contains("\n0\treserved\t«dock»\n"), "reserved rows");
    assertTrue(text.contains("\tbyte\t\\s\n"), "the space byte is written \\s");
    Tokenizer back = Tokenizers.load(fromReview(text, "ferry.tsv"));
    assertEquals(Tokenizers.of(Pipeline.defaults(), s).fingerprint(), back.fingerprint());
    assertSameSegmenter(s, BpeSegmenter.readReview(ReviewDocument.read(new BufferedReader(new StringReader(text)),
        "ferry.tsv")));
    // a merge of two partial-character bytes: raw bytes in braces, in the review text and the display
    BpeSegmenter partial = BpeSegmenter.of(List.of(), new int[] {0xC3, 0xE2}, new int[] {0xA9, 0x82});
    String p = review(partial);
    assertTrue(p.contains("\n0\t\\{C3}\t\\{A9}\té\n"), p); // C3 A9 is U+00E9 (RFC 3629)
    assertTrue(p.contains("\n1\t\\{E2}\t\\{82}\t\\{E2}\\{82}\n"), p); // a truncated 3-byte sequence
    assertEquals("é", partial.token(256));
    assertEquals("\\{E2}\\{82}", partial.token(257));
    assertEquals(Tokenizers.of(Pipeline.defaults(), partial).fingerprint(), Tokenizers.load(fromReview(p, "partial.tsv")).fingerprint());
  }

  /** The review text of the empty model with these merge rows (rank, left, right, token). */
  private static String withMerges(String rows) {
    String head = review(BpeSegmenter.of(List.of(), new int[0], new int[0]));
    return head + rows;
  }

  private static void assertAt(String text, String section, String part) {
    ModelFormatException e = assertThrows(ModelFormatException.class, () -> fromReview(text, "ferry.tsv"));
    assertEquals(section, e.section(), e.getMessage());
    assertTrue(e.getMessage().contains(part), "message '" + e.getMessage() + "' lacks '" + part + "'");
  }

  @Test
  void reviewErrorsNameTheLineAndColumn() {
    String head = review(BpeSegmenter.of(List.of(), new int[0], new int[0]));
    long lines = head.chars().filter(c -> c == '\n').count();
    String l1 = "ferry.tsv:" + (lines + 1);
    String l3 = "ferry.tsv:" + (lines + 3);
    assertAt(withMerges("0\tf\te\tfe\n1\tfe\tr\tfer\n2\tfer\tzz\tferzz\n"), l3, "column 3 (right): no byte token");
    assertAt(withMerges("0\tf\te\tfe\n1\tq\tu\tqu\n0\tf\te\tfe\n"), l3, "column 1 (rank): rank 0 repeats line");
    assertAt(withMerges("0\tf\te\tfe\n1\tq u\tqu\n"), "ferry.tsv:" + (lines + 2), "the row has 3 columns");
    assertAt(withMerges("0\t\\q\te\tqe\n"), l1, "column 2 (left): character 1: unknown escape \\q");
    assertAt(withMerges("0\ta\tb\tab\n1\tab\tc\tabc\n2\tb\tc\tbc\n3\ta\tbc\tabc\n"), "ferry.tsv:" + (lines + 4),
        "column 4 (token): token abc is already made by rank 1");
    assertAt(withMerges("0\tf\te\tef\n"), l1, "column 4 (token): the token must be left and right joined, fe");
    assertAt(withMerges("1\tf\te\tfe\n"), l1, "column 1 (rank): 1 is outside [0, 0]");
    assertAt(withMerges("0\tf\te\tfe \n"), l1, "column 4 (token): character 3: character U+0020 must be written");
    // the old layout (one pair a line, one space) is no review text
    assertAt("f e\nfe r\n", "ferry.tsv:1", "column 1: not a Morsel review text");
    // escapes, out-of-order ranks and notes are fine
    byte[] ok = fromReview(withMerges("¶ merges of the Oskevik quay model\n1\t\\n\t\\s\t\\n\\s\n"
        + "0\t\\\\\tn\t\\\\n\n"), "ok.tsv");
    BpeSegmenter two = (BpeSegmenter) Tokenizers.segmenterOf(dev.morsel.tokenize.format.ModelFile.read(ok));
    assertEquals(2, two.mergeCount());
    assertEquals("\\\\n", two.token(256));
    assertEquals("\\n\\s", two.token(257));
  }

  @Test
  void explicitMergesAreValidated() {
    BpeLearnerTest.assertMessage("refers to an id", () -> BpeSegmenter.of(List.of(), new int[] {300}, new int[] {'a'}));
    BpeLearnerTest.assertMessage("refers to an id", () -> BpeSegmenter.of(List.of("«dock»"), new int[] {0}, new int[] {'a'}));
    BpeLearnerTest.assertMessage("differ in length", () -> BpeSegmenter.of(List.of(), new int[] {97}, new int[0]));
    assertEquals("ab", new String(BpeSegmenter.of(List.of(), new int[] {'a'}, new int[] {'b'}).tokenBytes(256),
        StandardCharsets.UTF_8));
  }
}
