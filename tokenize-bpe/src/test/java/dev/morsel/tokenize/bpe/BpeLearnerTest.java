package dev.morsel.tokenize.bpe;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import dev.morsel.tokenize.bpe.internal.BpeTraining;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.TreeMap;
import java.util.stream.IntStream;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/** Learner: the paper's worked example, a textbook oracle on random corpora, settings. */
class BpeLearnerTest {

  /** Our end-of-word marker for the paper's toy dictionary: '~' (one byte, so one symbol). */
  private static final String END = "~";

  private static String spell(BpeSegmenter s, int id) {
    return new String(s.tokenBytes(id), java.nio.charset.StandardCharsets.UTF_8);
  }

  @Test
  void sennrichAlgorithm1ToyDictionary() {
    // Sennrich, Haddow, Birch (2016), section 3.2, Algorithm 1 — from memory: dictionary
    // {low: 5, lower: 2, newest: 6, widest: 3} with an end-of-word symbol; first merges
    // e+s (9), es+t (9), est+</w> (9), l+o (7), lo+w (7). Our end symbol is '~'.
    Map<String, Long> dict = new LinkedHashMap<>();
    dict.put("low" + END, 5L);
    dict.put("lower" + END, 2L);
    dict.put("newest" + END, 6L);
    dict.put("widest" + END, 3L);
    List<String> details = new ArrayList<>();
    List<Long> done = new ArrayList<>();
    BpeSegmenter s = BpeTraining.builder().vocabularySize(256 + 5).minPairCount(1).threads(1)
        .listener((stage, d, total, detail) -> {
          assertEquals("merges", stage);
          assertEquals(5, total);
          done.add(d);
          details.add(detail);
        }).build().segmenter(PieceCounts.of(dict));
    assertEquals(5, s.mergeCount());
    List<String> merged = new ArrayList<>();
    for (int r = 0; r < 5; r++) {
      merged.add(spell(s, s.mergeLeft(r)) + "+" + spell(s, s.mergeRight(r)));
    }
    assertEquals(List.of("e+s", "es+t", "est+~", "l+o", "lo+w"), merged);
    assertEquals(List.of("'es' = 'e' + 's' (9)", "'est' = 'es' + 't' (9)", "'est~' = 'est' + '~' (9)",
        "'lo' = 'l' + 'o' (7)", "'low' = 'lo' + 'w' (7)"), details);
    assertEquals(List.of(1L, 2L, 3L, 4L, 5L), done);
    // The paper's example segments the unseen "lowest" as low + est (section 3.2 discussion) — from memory.
    Fixtures.Collected c = Fixtures.segment(s, "lowest" + END, 0, 7);
    assertEquals(List.of("low", "est~"), IntStream.of(c.ids()).mapToObj(id -> spell(s, id)).toList());
  }

  /** Random corpora over tiny alphabets (forcing ties and runs like "aaaa"). */
  static Stream<Long> seeds() {
    return IntStream.range(0, 300).mapToObj(i -> 0x5EED0000L + i);
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void equalsTextbookLearnerOnRandomCorpora(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    String[] alphabets = {"ab", "aab", "abc", "a", "xyé", "ab ", "ø🚢a"};
    String alpha = alphabets[rnd.nextInt(alphabets.length)];
    int[] cps = alpha.codePoints().toArray();
    Map<String, Long> corpus = new TreeMap<>();
    int n = 1 + rnd.nextInt(25);
    for (int i = 0; i < n; i++) {
      StringBuilder sb = new StringBuilder();
      int len = 1 + rnd.nextInt(12);
      for (int j = 0; j < len; j++) {
        sb.appendCodePoint(cps[rnd.nextInt(cps.length)]);
      }
      corpus.merge(sb.toString(), 1L + rnd.nextInt(5), Long::sum);
    }
    int merges = rnd.nextInt(40);
    long minPair = 1 + rnd.nextInt(3);
    int maxBytes = 2 + rnd.nextInt(8);
    int threads = 1 + rnd.nextInt(2);
    String input = "seed=" + seed + " corpus=" + corpus + " merges=" + merges + " minPair=" + minPair + " maxBytes=" + maxBytes;
    BpeSegmenter s = BpeTraining.builder().vocabularySize(256 + merges).minPairCount(minPair).maxTokenBytes(maxBytes)
        .threads(threads).build().segmenter(PieceCounts.of(corpus));
    int[][] expected = TextbookBpe.train(corpus, 0, merges, minPair, maxBytes);
    int[] left = new int[s.mergeCount()];
    int[] right = new int[s.mergeCount()];
    for (int r = 0; r < left.length; r++) {
      left[r] = s.mergeLeft(r);
      right[r] = s.mergeRight(r);
    }
    assertArrayEquals(expected[0], left, input);
    assertArrayEquals(expected[1], right, input);
  }

  @Test
  void overlappingRunsCountExactly() {
    // common practice: pairs are counted over all adjacent positions, so "aaaa" holds (a,a) three times;
    // merging replaces left to right: aaaa -> aa aa, then (aa,aa) once.
    Map<String, Long> corpus = Map.of("aaaa", 3L, "aaa", 1L);
    List<String> details = new ArrayList<>();
    BpeSegmenter s = BpeTraining.builder().vocabularySize(259).minPairCount(1).threads(1)
        .listener((st, d, t, detail) -> details.add(detail)).build().segmenter(PieceCounts.of(corpus));
    // (a,a): 3*3 + 1*2 = 11; then aaaa -> [aa,aa] x3, aaa -> [aa,a] x1: (aa,aa)=3, (aa,a)=1
    assertEquals(List.of("'aa' = 'a' + 'a' (11)", "'aaaa' = 'aa' + 'aa' (3)", "'aaa' = 'aa' + 'a' (1)"), details);
    assertEquals(3, s.mergeCount());
  }

  @Test
  void reservedTokensComeFirstAndAreNeverMergedInto() {
    List<String> reserved = List.of("«dock»", "«sail»");
    BpeSegmenter s = BpeTraining.builder().vocabularySize(2 + 256 + 10).reservedTokens(reserved).threads(1)
        .build().segmenter(Fixtures.countPieces(List.of("the ferry to the island leaves at dawn", "the ferry is late")));
    assertEquals("«dock»", s.token(0));
    assertEquals("«sail»", s.token(1));
    assertEquals(1, s.reservedTokens().id("«sail»"));
    assertEquals("a", s.token(2 + 'a'));
    for (int r = 0; r < s.mergeCount(); r++) {
      assertTrue(s.mergeLeft(r) >= 2 && s.mergeRight(r) >= 2, "merge " + r + " uses a reserved id");
    }
    // decodeToken of a reserved id writes its spelling's UTF-8
    assertArrayEquals("«dock»".getBytes(java.nio.charset.StandardCharsets.UTF_8), Fixtures.decode(s, new int[] {0}));
  }

  @Test
  void threadsDoNotChangeTheResult() {
    PieceCounts pc = Fixtures.countPieces(Fixtures.europarlBodies().subList(0, 3000));
    BpeSegmenter one = BpeTraining.builder().vocabularySize(1500).threads(1).build().segmenter(pc);
    BpeSegmenter two = BpeTraining.builder().vocabularySize(1500).threads(2).build().segmenter(pc);
    assertEquals(1500 - 256, one.mergeCount());
    for (int r = 0; r < one.mergeCount(); r++) {
      assertEquals(one.mergeLeft(r), two.mergeLeft(r), "rank " + r);
      assertEquals(one.mergeRight(r), two.mergeRight(r), "rank " + r);
    }
  }

  @Test
  void stopsWhenNoPairReachesMinPairCountOrFitsMaxTokenBytes() {
    PieceCounts pc = PieceCounts.of(Map.of("ferry", 2L, "fare", 1L));
    BpeSegmenter s = BpeTraining.builder().vocabularySize(1000).minPairCount(2).build().segmenter(pc);
    assertEquals(4, s.mergeCount()); // f+e, fe+r... every pair of "ferry" has count 2, of "fare" 1 — chained 4 merges
    BpeSegmenter t = BpeTraining.builder().vocabularySize(1000).minPairCount(1).maxTokenBytes(2).build().segmenter(pc);
    for (int r = 0; r < t.mergeCount(); r++) {
      assertEquals(2, t.tokenBytes(256 + r).length);
    }
  }

  @Test
  void badSettingsNameTheSetting() {
    PieceCounts pc = PieceCounts.of(Map.of("quay", 3L));
    assertMessage("vocabularySize=257", () -> BpeTraining.builder().vocabularySize(257).reservedTokens(List.of("«a»", "«b»")).build());
    assertMessage("vocabularySize=100", () -> BpeTraining.builder().vocabularySize(100).build());
    assertMessage("piece counts are empty", () -> BpeTraining.builder().build().segmenter(PieceCounts.empty()));
    assertMessage("minCount=5", () -> BpeTraining.builder().minCount(5).build().segmenter(pc));
    assertMessage("reservedTokens", () -> BpeTraining.builder().reservedTokens(List.of("«a»", "«a»")).build());
    assertMessage("reservedTokens", () -> BpeTraining.builder().reservedTokens(List.of("Q")).build());
    assertMessage("reservedTokens", () -> BpeTraining.builder().reservedTokens(List.of("")).build());
    assertMessage("minPairCount=0", () -> BpeTraining.builder().minPairCount(0).build());
    assertMessage("maxTokenBytes=1", () -> BpeTraining.builder().maxTokenBytes(1).build());
    assertMessage("maxTokenBytes=5000", () -> BpeTraining.builder().maxTokenBytes(5000).build());
    assertMessage("threads=0", () -> BpeTraining.builder().threads(0).build());
  }

  static void assertMessage(String part, org.junit.jupiter.api.function.Executable e) {
    IllegalArgumentException x = assertThrows(IllegalArgumentException.class, e);
    assertTrue(x.getMessage().contains(part), "message '" + x.getMessage() + "' lacks '" + part + "'");
  }
}
