package dev.morsel.tokenize.wordpiece;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSettings;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import java.io.BufferedReader;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.Test;

/** Unit checks of the segmenter: the paper's example, unknown handling, spans, decoding, validation. */
class WordPieceSegmenterTest {
  private static final String M = WordPieceSettings.DEFAULT_MARKER;
  private static final String UNK = WordPieceSettings.DEFAULT_UNKNOWN;

  private static WordPieceSegmenter seg(String... tokens) {
    return WordPieceSegmenter.of(List.of(tokens), 0, WordPieceSettings.defaults());
  }

  @Test
  void paperWorkedExample() {
    // from memory: [3] Song et al. (2021), "Fast WordPiece Tokenization", §3 running example:
    // vocabulary {a, abcdx, +b, +c, +cdy, +dz} ("+" standing for the continuation marker), input
    // "abcdz" -> [a, +b, +c, +dz]; written here with our marker.
    WordPieceSegmenter s = seg(UNK, "a", "abcdx", M + "b", M + "c", M + "cdy", M + "dz");
    TestSupport.Encoded e = TestSupport.segmentOne(s, "abcdz", 0, 5);
    assertArrayEquals(new int[] {1, 3, 4, 6}, e.ids.toIntArray());
    assertArrayEquals(new int[] {0, 1, 2, 3}, e.starts.toIntArray());
    assertArrayEquals(new int[] {1, 2, 3, 5}, e.ends.toIntArray());
    assertEquals("abcdz", new String(TestSupport.decode(s, e.ids.toIntArray()), StandardCharsets.UTF_8));
  }

  @Test
  void uncoverablePieceIsOneUnknownSpanningThePiece() {
    // [2] §4.1 (greedy matching; an unmatched word maps to the unknown token as a whole)
    WordPieceSegmenter s = seg(UNK, "a", "abcdx", M + "b", M + "c", M + "cdy", M + "dz");
    String text = "zz abcq zz";
    TestSupport.Encoded e = TestSupport.segmentOne(s, text, 3, 7);
    assertArrayEquals(new int[] {0}, e.ids.toIntArray());
    assertArrayEquals(new int[] {3}, e.starts.toIntArray());
    assertArrayEquals(new int[] {7}, e.ends.toIntArray());
    // first char not word-initial
    assertArrayEquals(new int[] {0}, TestSupport.segmentOne(s, "b", 0, 1).ids.toIntArray());
    // empty piece yields nothing
    assertEquals(0, TestSupport.segmentOne(s, "abc", 1, 1).ids.size());
  }

  @Test
  void spansAreAbsoluteInTheText() {
    WordPieceSegmenter s = seg(UNK, " ferry", " fer", M + "ry", M + "ries", "s");
    String text = "the ferries";
    TestSupport.Encoded e = TestSupport.segmentOne(s, text, 3, 11);
    assertArrayEquals(new int[] {2, 4}, e.ids.toIntArray());
    assertArrayEquals(new int[] {3, 7}, e.starts.toIntArray());
    assertArrayEquals(new int[] {7, 11}, e.ends.toIntArray());
    OffsetInvariants.check(e.tokens(), text);
  }

  @Test
  void pieceLongerThanTheLimitIsUnknown() {
    WordPieceSettings st = WordPieceSettings.defaults().withMaxPieceLength(4);
    WordPieceSegmenter s = WordPieceSegmenter.of(List.of(UNK, "dock", "do", M + "ck", M + "s"), 0, st);
    assertArrayEquals(new int[] {1}, TestSupport.segmentOne(s, "dock", 0, 4).ids.toIntArray());
    assertArrayEquals(new int[] {0}, TestSupport.segmentOne(s, "docks", 0, 5).ids.toIntArray());
    assertEquals(5, TestSupport.segmentOne(s, "docks", 0, 5).ends.getInt(0));
  }

  /** Distinct prefixes of the word-initial and of the continuation texts, plus the two roots: an independent count. */
  private static int trieNodes(List<String> tokens, int from) {
    java.util.Set<String> initial = new java.util.HashSet<>();
    java.util.Set<String> cont = new java.util.HashSet<>();
    for (String t : tokens.subList(from, tokens.size())) {
      boolean c = t.length() > M.length() && t.startsWith(M);
      String body = c ? t.substring(M.length()) : t;
      for (int i = 1; i <= body.length(); i++) {
        (c ? cont : initial).add(body.substring(0, i));
      }
    }
    return 2 + initial.size() + cont.size();
  }

  @Test
  void derivedLimitSegmentsAPieceAtTheLimitAndNotOneOver() {
    List<String> vocab = List.of(UNK, "a", "ab", M + "a", M + "b");
    WordPieceSegmenter s = WordPieceSegmenter.of(vocab, 0, WordPieceSettings.defaults());
    assertEquals(WordPieceSettings.DERIVED_PIECE_LENGTH, s.settings().maxPieceLength());
    // nodes: the roots, a and ab under the word-initial root, a and b under the continuation root
    assertEquals(6, trieNodes(vocab, 1));
    assertEquals(trieNodes(vocab, 1), s.pieceLimit());
    String at = "a".repeat(s.pieceLimit());
    int[] ids = TestSupport.segmentOne(s, at, 0, at.length()).ids.toIntArray();
    assertEquals(s.pieceLimit(), ids.length, "a piece at the limit is segmented, one token a char");
    assertEquals(1, ids[0]);
    String over = at + "a";
    assertArrayEquals(new int[] {0}, TestSupport.segmentOne(s, over, 0, over.length()).ids.toIntArray(),
        "one char over the limit: the unknown token");
    // the same limit survives the model sections and is never below the longest token
    WordPieceSegmenter big = WordPieceSegmenter.of(List.of(UNK, "harbourmaster", M + "s"), 0, WordPieceSettings.defaults());
    assertEquals(2 + 13 + 1, big.pieceLimit());
    assertTrue(big.pieceLimit() >= "harbourmaster".length());
    String many = "harbourmaster" + "s".repeat(big.pieceLimit() - 13);
    assertEquals(1 + big.pieceLimit() - 13, TestSupport.segmentOne(big, many, 0, many.length()).ids.size());
    assertArrayEquals(new int[] {0}, TestSupport.segmentOne(big, many + "s", 0, many.length() + 1).ids.toIntArray());
  }

  /**
   * At and around the derived limit the segmenter agrees with an independent naive greedy
   * longest-match (quadratic, written in TestSupport), on vocabularies whose limit is large; the
   * linear bound itself is exercised by AdversarialInputTest's 1 MiB near-miss input and measured in
   * tokenize-bench.
   */
  @org.junit.jupiter.params.ParameterizedTest
  @org.junit.jupiter.params.provider.ValueSource(longs = {5, 77, 2026})
  void derivedLimitAgreesWithNaiveGreedyAtTheBoundary(long seed) {
    java.util.SplittableRandom rnd = new java.util.SplittableRandom(seed);
    java.util.LinkedHashSet<String> v = new java.util.LinkedHashSet<>(List.of(UNK, "a", "b", M + "a", M + "b"));
    while (v.size() < 60) {
      StringBuilder sb = new StringBuilder(rnd.nextBoolean() ? M : "");
      for (int i = 1 + rnd.nextInt(6); i > 0; i--) {
        sb.append(rnd.nextBoolean() ? 'a' : 'b');
      }
      v.add(sb.toString());
    }
    List<String> vocab = List.copyOf(v);
    WordPieceSegmenter s = WordPieceSegmenter.of(vocab, 0, WordPieceSettings.defaults());
    assertEquals(trieNodes(vocab, 1), s.pieceLimit());
    TestSupport.NaiveGreedy naive = new TestSupport.NaiveGreedy(vocab, 0, M, s.pieceLimit());
    for (int n : new int[] {s.pieceLimit() - 1, s.pieceLimit(), s.pieceLimit() + 1}) {
      StringBuilder sb = new StringBuilder();
      for (int i = 0; i < n; i++) {
        sb.append(rnd.nextBoolean() ? 'a' : 'b');
      }
      String piece = sb.toString();
      assertArrayEquals(naive.segment(piece), TestSupport.segmentOne(s, piece, 0, n).ids.toIntArray(), "n=" + n);
    }
  }

  @Test
  void surrogatePairsStayWholeAndLoneSurrogatesAreUnknown() {
    String clef = new String(Character.toChars(0x1D11E));
    WordPieceSegmenter s = seg(UNK, clef, M + "a", M + clef, "a");
    String text = clef + "a" + clef;
    TestSupport.Encoded e = TestSupport.segmentOne(s, text, 0, text.length());
    assertArrayEquals(new int[] {1, 2, 3}, e.ids.toIntArray());
    assertArrayEquals(new int[] {0, 2, 3}, e.starts.toIntArray());
    assertArrayEquals(new int[] {2, 3, 5}, e.ends.toIntArray());
    OffsetInvariants.check(e.tokens(), text);
    String lone = "a" + clef.charAt(0);
    assertArrayEquals(new int[] {0}, TestSupport.segmentOne(s, lone, 0, 2).ids.toIntArray());
    assertThrows(IllegalArgumentException.class, () -> seg(UNK, "a" + clef.charAt(1)));
  }

  @Test
  void decodeDropsTheMarkerAndUnknownWritesItsSpelling() {
    WordPieceSegmenter s = WordPieceSegmenter.of(List.of("harbour-bell", UNK, " pier", M + "s"), 1,
        WordPieceSettings.defaults());
    assertEquals(" piers", new String(TestSupport.decode(s, new int[] {2, 3}), StandardCharsets.UTF_8));
    assertEquals(UNK, new String(TestSupport.decode(s, new int[] {1}), StandardCharsets.UTF_8));
    assertTrue(s.isContinuation(3));
    assertFalse(s.isContinuation(2));
    assertEquals(1, s.unknownId());
    assertEquals(3, s.id(M + "s"));
    assertEquals(M + "s", s.token(3));
    assertEquals(-1, s.id("s"));
    // a reserved spelling in ordinary text is never produced as the reserved token
    TestSupport.Encoded e = TestSupport.segmentOne(s, "harbour-bell", 0, 12);
    assertArrayEquals(new int[] {1}, e.ids.toIntArray());
    assertThrows(IndexOutOfBoundsException.class, () -> s.token(4));
    assertThrows(IndexOutOfBoundsException.class, () -> s.decodeToken(-1, (b, o, l) -> {}));
  }

  @Test
  void multiCharMarkerAndTokensThatSpellTheMarker() {
    WordPieceSettings st = WordPieceSettings.defaults().withMarker("~+").withUnknownToken("?ferry?");
    // "~+" alone is a word-initial token (not longer than the marker)
    WordPieceSegmenter s = WordPieceSegmenter.of(List.of("?ferry?", "~+", "~", "~+~+", "~+x", "deck"), 0, st);
    assertFalse(s.isContinuation(1));
    assertTrue(s.isContinuation(3));
    // "~+~+x": word-initial "~+" then continuation "~+" then continuation "x"
    TestSupport.Encoded e = TestSupport.segmentOne(s, "~+~+x", 0, 5);
    assertArrayEquals(new int[] {1, 3, 4}, e.ids.toIntArray());
  }

  @Test
  void invalidVocabulariesAndSettingsAreRejected() {
    WordPieceSettings d = WordPieceSettings.defaults();
    IllegalArgumentException dup = assertThrows(IllegalArgumentException.class, () -> seg(UNK, "a", "b", "a"));
    assertTrue(dup.getMessage().contains("token 3"), dup.getMessage());
    IllegalArgumentException noUnk = assertThrows(IllegalArgumentException.class, () -> seg("a", UNK));
    assertTrue(noUnk.getMessage().contains("token 0"), noUnk.getMessage());
    assertThrows(IllegalArgumentException.class, () -> WordPieceSegmenter.of(List.of(UNK), 1, d));
    assertThrows(IllegalArgumentException.class, () -> WordPieceSegmenter.of(List.of(UNK), -1, d));
    assertThrows(IllegalArgumentException.class, () -> seg(UNK, ""));
    assertThrows(IllegalArgumentException.class, () -> d.withMarker(""));
    assertThrows(IllegalArgumentException.class, () -> d.withMarker("a b"));
    assertThrows(IllegalArgumentException.class, () -> d.withMarker("\t"));
    assertThrows(IllegalArgumentException.class, () -> d.withUnknownToken(""));
    IllegalArgumentException lim = assertThrows(IllegalArgumentException.class, () -> d.withMaxPieceLength(-1));
    assertTrue(lim.getMessage().contains("maxPieceLength=-1"), lim.getMessage());
  }

  @Test
  void reviewTextRoundTripWithEscapes() {
    WordPieceSegmenter s = WordPieceSegmenter.of(List.of("harbour-bell", UNK, "\n", " pier", M + "s", "a\\b", "\t",
        "\uD83D\uDEA2"), 1, WordPieceSettings.defaults().withMaxPieceLength(12));
    StringBuilder sb = new StringBuilder();
    Tokenizers.of(Pipeline.defaults(), s).writeReview(sb);
    String text = sb.toString();
    assertTrue(text.contains("\n§ settings\tsetting\tvalue\nmarker\t" + M + "\nunknown\t" + UNK
        + "\nmax-piece-length\t12\n§ vocabulary\tid\tkind\ttoken\n0\treserved\tharbour-bell\n1\tunknown\t" + UNK
        + "\n2\tinitial\t\\n\n3\tinitial\t\\spier\n4\tcontinuation\t" + M + "s\n5\tinitial\ta\\\\b\n"
        + "6\tinitial\t\\t\n7\tinitial\t\uD83D\uDEA2\n"), text);
    byte[] file = Tokenizers.modelFromReview(new BufferedReader(new StringReader(text)), "wp.tsv");
    assertEquals(Tokenizers.of(Pipeline.defaults(), s).fingerprint(), Tokenizers.load(file).fingerprint());
    WordPieceSegmenter back = (WordPieceSegmenter) Tokenizers.segmenterOf(ModelFile.read(file));
    assertEquals(s.tokens(), back.tokens());
    assertEquals(s.settings(), back.settings());
    // a kind that contradicts the spelling is refused at its line and column
    String wrong = text.replace("4\tcontinuation\t", "4\tinitial\t");
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> Tokenizers.modelFromReview(new BufferedReader(new StringReader(wrong)), "wp.tsv"));
    assertTrue(e.getMessage().contains("column 2 (kind): id 4 is continuation here, not initial"), e.getMessage());
  }

  @Test
  void tokenListErrorsNameTheLine() {
    WordPieceSettings d = WordPieceSettings.defaults();
    ModelFormatException dup = assertThrows(ModelFormatException.class,
        () -> WordPieceSegmenter.readTokenList(new StringReader(UNK + "\nquay\nquay\n"), "quay.txt", 0, d));
    assertEquals("quay.txt:3", dup.section());
    ModelFormatException empty = assertThrows(ModelFormatException.class,
        () -> WordPieceSegmenter.readTokenList(new StringReader(UNK + "\n\nquay\n"), "quay.txt", 0, d));
    assertEquals("quay.txt:2", empty.section());
    ModelFormatException esc = assertThrows(ModelFormatException.class,
        () -> WordPieceSegmenter.readTokenList(new StringReader(UNK + "\nq\\x\n"), "quay.txt", 0, d));
    assertEquals("quay.txt:2", esc.section());
    ModelFormatException shortU = assertThrows(ModelFormatException.class,
        () -> WordPieceSegmenter.readTokenList(new StringReader(UNK + "\nq\\{U+12}\n"), "quay.txt", 0, d));
    assertEquals("quay.txt:2", shortU.section());
    ModelFormatException noUnk = assertThrows(ModelFormatException.class,
        () -> WordPieceSegmenter.readTokenList(new StringReader("quay\n" + UNK + "\n"), "quay.txt", 0, d));
    assertEquals("quay.txt:1", noUnk.section());
    WordPieceSegmenter ok = WordPieceSegmenter.readTokenList(new StringReader(UNK + "\r\nq\\{U+0041}\\spier\r\n"),
        "quay.txt", 0, d);
    assertEquals(List.of(UNK, "qA pier"), ok.tokens());
  }
}
