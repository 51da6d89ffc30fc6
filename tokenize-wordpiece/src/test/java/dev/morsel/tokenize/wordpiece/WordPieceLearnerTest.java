package dev.morsel.tokenize.wordpiece;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.wordpiece.internal.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSettings;
import dev.morsel.tokenize.wordpiece.internal.WordPieceTraining;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.TreeMap;
import java.util.stream.LongStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Learner checks: merges computed by hand on a tiny ferry corpus, agreement with an independent
 * textbook learner (full recount every merge) on seeded random corpora, and bad input.
 */
class WordPieceLearnerTest {
  /** Every character in the alphabet: these tests are about merging, and their vocabularies are tiny. */
  static final AlphabetPolicy EVERY = AlphabetPolicy.of(1.0, Integer.MAX_VALUE);

  private static final String M = WordPieceSettings.DEFAULT_MARKER;
  private static final String UNK = WordPieceSettings.DEFAULT_UNKNOWN;

  private static PieceCounts ferryCorpus() {
    Map<String, Long> m = new HashMap<>();
    m.put("ferry", 5L);
    m.put("fare", 3L);
    m.put("pier", 2L);
    return PieceCounts.of(m);
  }

  @Test
  void firstMergesMatchTheGainsComputedByHand() {
    // Gain count(ab) * ln(count(ab) * N / (count(a) * count(b))), N the total unit count: the change
    // of the unigram log-likelihood of the merged positions, probabilities held at their current
    // estimates (derivation in the WordPieceTraining class notes; Schuster & Nakajima 2012 [1]).
    // Worked by hand (natural logs to 3 places).
    // Corpus: ferry x5, fare x3, pier x2. Unit counts: f 8, p 2, ∘e 10, ∘r 15, ∘y 5, ∘a 3, ∘i 2;
    // N = 5*5 + 3*4 + 2*4 = 45.
    //   (f,∘e)  5 ln(5*45/(8*10)) = 5 ln 2.8125 = 5.170    (∘e,∘r) 7 ln(7*45/(10*15)) = 7 ln 2.1 = 5.194
    //   (∘r,∘r) 5 ln(5*45/(15*15)) = 5 ln 1   = 0          (∘r,∘y) 5 ln(5*45/(15*5)) = 5 ln 3   = 5.493
    //   (f,∘a)  3 ln(3*45/(8*3))  = 3 ln 5.625 = 5.182     (∘a,∘r) 3 ln(3*45/(3*15)) = 3 ln 3   = 3.296
    //   (∘r,∘e) 3 ln(3*45/(15*10)) = 3 ln 0.9 = -0.316     (p,∘i)  2 ln(2*45/(2*2))  = 2 ln 22.5 = 6.227
    //   (∘i,∘e) 2 ln(2*45/(2*10)) = 2 ln 4.5 = 3.008
    // 1st merge: (p,∘i) -> "pi" (6.227). Now p 0, ∘i 0, pi 2, N = 43 (every gain is re-evaluated):
    //   (∘r,∘y) 5 ln(5*43/75) = 5.266   (f,∘a) 3 ln(3*43/24) = 5.045   (f,∘e) 5 ln(5*43/80) = 4.943
    //   (∘e,∘r) 7 ln(7*43/150) = 4.875  (pi,∘e) 2 ln(2*43/20) = 2.917  (the rest lower)
    // 2nd: (∘r,∘y) -> "∘ry" (5.266). Now ∘r 10, ∘y 0, ∘ry 5, N = 38; ferry = f ∘e ∘r ∘ry:
    //   (∘e,∘r) 7 ln(7*38/(10*10)) = 7 ln 2.66 = 6.848   (∘r,∘ry) 5 ln(5*38/(10*5)) = 5 ln 3.8 = 6.675
    //   (f,∘a) 3 ln(3*38/24) = 4.674   (f,∘e) 5 ln(5*38/80) = 4.325   (∘a,∘r) 3 ln(3*38/30) = 4.005
    // 3rd: (∘e,∘r) -> "∘er" (6.848).
    // Both forms of each of the 7 characters are units (14); the forms that never occur have count
    // 0, take part in no pair and leave N alone, so the merges are those worked above.
    WordPieceSegmenter s = WordPieceTraining.builder().alphabet(EVERY).vocabularySize(1 + 14 + 3).build().segmenter(ferryCorpus());
    List<String> t = s.tokens();
    assertEquals(18, t.size());
    assertEquals(UNK, t.get(0));
    // alphabet by count: r 15, e 10, f 8, y 5, a 3, then i and p (2 each) by code point; word-initial form first
    assertEquals(List.of("r", M + "r", "e", M + "e", "f", M + "f", "y", M + "y", "a", M + "a", "i", M + "i", "p", M + "p"),
        t.subList(1, 15));
    assertEquals(List.of("pi", M + "ry", M + "er"), t.subList(15, 18));
    // the trained vocabulary encodes its corpus: greedy longest match f | ∘er | ∘ry
    assertArrayEquals(new int[] {s.id("f"), s.id(M + "er"), s.id(M + "ry")},
        TestSupport.segmentOne(s, "ferry", 0, 5).ids.toIntArray());
  }

  @Test
  void pairRatioScoreKeepsItsHandWorkedMerges() {
    // Score count(ab) / (count(a) * count(b)), the optional PAIR_RATIO ranking.
    // Corpus: ferry x5, fare x3, pier x2. Unit counts: f 8, p 2, ∘e 10, ∘r 15, ∘y 5, ∘a 3, ∘i 2.
    // Pair counts and scores:
    //   (f,∘e) 5/(8*10)=0.0625  (∘e,∘r) 7/(10*15)=0.047  (∘r,∘r) 5/(15*15)=0.022  (∘r,∘y) 5/(15*5)=0.067
    //   (f,∘a) 3/(8*3)=0.125    (∘a,∘r) 3/(3*15)=0.067   (∘r,∘e) 3/(15*10)=0.02  (p,∘i) 2/(2*2)=0.5
    //   (∘i,∘e) 2/(2*10)=0.1
    // 1st merge: (p,∘i) -> "pi" (0.5).
    // 2nd: (pi,∘e) is now 2/(2*10)=0.1; best is (f,∘a) -> "fa" (0.125).
    // 3rd: f now counts 5: (f,∘e)=5/(5*10)=0.1 ties (pi,∘e)=0.1; higher pair count wins -> "fe".
    WordPieceSegmenter s = WordPieceTraining.builder().alphabet(EVERY).score(WordPieceTraining.Score.PAIR_RATIO)
        .vocabularySize(1 + 14 + 3).build().segmenter(ferryCorpus());
    assertEquals(List.of("pi", "fa", "fe"), s.tokens().subList(15, 18));
    assertArrayEquals(new int[] {s.id("fe"), s.id(M + "r"), s.id(M + "r"), s.id(M + "y")},
        TestSupport.segmentOne(s, "ferry", 0, 5).ids.toIntArray());
  }

  @Test
  void minPairCountFloorsMergesAndStopsEarly() {
    // With a floor of 3 the (p,∘i) pair (count 2) is never merged, although it has the best gain
    // (6.227, see the hand-worked example); merging stops when no pair of count >= 3 is left,
    // well before the asked 100 tokens.
    WordPieceSegmenter s = WordPieceTraining.builder().alphabet(EVERY).minPairCount(3).vocabularySize(100).build().segmenter(ferryCorpus());
    assertEquals(-1, s.tokens().indexOf("pi"));
    assertTrue(s.vocabularySize() < 100, "size " + s.vocabularySize());
    // by hand: counts >= 3 only ever occur inside ferry (x5) and fare (x3), so both become single tokens
    assertEquals(1, TestSupport.segmentOne(s, "ferry", 0, 5).ids.size(), s.tokens().toString());
    assertEquals(1, TestSupport.segmentOne(s, "fare", 0, 4).ids.size(), s.tokens().toString());
    assertEquals(2, WordPieceTraining.builder().alphabet(EVERY).minPairCount(2).build().minPairCount());
    assertEquals(WordPieceTraining.Score.LIKELIHOOD_GAIN, WordPieceTraining.builder().alphabet(EVERY).build().score());
  }

  @Test
  void reservedTokensComeFirstAndListenerReportsMerges() {
    List<String> stages = new ArrayList<>();
    long[] last = {-1, -1};
    WordPieceSegmenter s = WordPieceTraining.builder().alphabet(EVERY).vocabularySize(2 + 1 + 14 + 2)
        .reservedTokens(List.of("\u27e8voyage\u27e9", "\u27e8/voyage\u27e9"))
        .listener((stage, done, total, detail) -> {
          stages.add(stage);
          last[0] = done;
          last[1] = total;
        }).build().segmenter(ferryCorpus());
    assertEquals(List.of("\u27e8voyage\u27e9", "\u27e8/voyage\u27e9", UNK), s.tokens().subList(0, 3));
    assertEquals(2, s.reservedCount());
    assertEquals(List.of("merges", "merges"), stages);
    assertEquals(2, last[0]);
    assertEquals(2, last[1]);
  }

  @Test
  void alphabetCapDropsRareCharactersAndTheirPieces() {
    Map<String, Long> m = new HashMap<>();
    m.put("ferry", 5L);
    m.put("fez", 1L);
    WordPieceSegmenter s = WordPieceTraining.builder().alphabet(EVERY).vocabularySize(100).alphabet(AlphabetPolicy.of(1.0, 4)).build().segmenter(PieceCounts.of(m));
    for (String tok : s.tokens()) {
      assertFalse(tok.contains("z"), tok);
    }
    assertArrayEquals(new int[] {s.unknownId()}, TestSupport.segmentOne(s, "fez", 0, 3).ids.toIntArray());
  }

  @Test
  void badInputIsRejectedClearly() {
    IllegalArgumentException small = assertThrows(IllegalArgumentException.class,
        () -> WordPieceTraining.builder().alphabet(EVERY).vocabularySize(5).build().segmenter(ferryCorpus()));
    assertTrue(small.getMessage().contains("vocabularySize=5"), small.getMessage());
    IllegalArgumentException empty = assertThrows(IllegalArgumentException.class,
        () -> WordPieceTraining.builder().alphabet(EVERY).build().segmenter(PieceCounts.empty()));
    assertTrue(empty.getMessage().contains("minCount"), empty.getMessage());
    assertThrows(IllegalArgumentException.class,
        () -> WordPieceTraining.builder().alphabet(EVERY).minCount(10).build().segmenter(ferryCorpus()));
    assertThrows(IllegalArgumentException.class, () -> WordPieceTraining.builder().alphabet(EVERY).vocabularySize(1));
    assertThrows(IllegalArgumentException.class, () -> WordPieceTraining.builder().alphabet(EVERY).minCount(0));
    assertThrows(IllegalArgumentException.class, () -> WordPieceTraining.builder().alphabet(AlphabetPolicy.of(1.0, -1)));
    IllegalArgumentException floor = assertThrows(IllegalArgumentException.class,
        () -> WordPieceTraining.builder().alphabet(EVERY).minPairCount(0));
    assertTrue(floor.getMessage().contains("minPairCount=0"), floor.getMessage());
    assertThrows(NullPointerException.class, () -> WordPieceTraining.builder().alphabet(EVERY).score(null));
    assertThrows(IllegalArgumentException.class, () -> WordPieceTraining.builder().alphabet(EVERY).reservedTokens(List.of("a", "a")));
    assertThrows(IllegalArgumentException.class, () -> WordPieceTraining.builder().alphabet(EVERY).reservedTokens(List.of(UNK)).build());
  }

  @Test
  void mergesNeverSpellReservedOrMarkerLikeTokens() {
    // with marker "q" a word-initial unit "qu" would read as the continuation "u": never created
    WordPieceSettings st = WordPieceSettings.defaults().withMarker("q").withUnknownToken("dock?");
    Map<String, Long> m = new HashMap<>();
    m.put("quay", 9L);
    m.put("dock", 4L);
    m.put("dock?", 7L);
    WordPieceSegmenter s = WordPieceTraining.builder().alphabet(EVERY).settings(st).reservedTokens(List.of("ock")).vocabularySize(200)
        .build().segmenter(PieceCounts.of(m));
    // "qu" is the continuation form of 'u'; the word-initial merge q + u is blocked, so "quay"
    // starts with the word-initial "q" (equal to the marker, hence word-initial)
    assertTrue(s.isContinuation(s.id("qu")));
    TestSupport.Encoded quay = TestSupport.segmentOne(s, "quay", 0, 4);
    assertEquals(s.id("q"), quay.ids.getInt(0));
    assertFalse(s.isContinuation(s.id("q")));
    assertEquals("quay", new String(TestSupport.decode(s, quay.ids.toIntArray()), java.nio.charset.StandardCharsets.UTF_8));
    assertEquals(1, s.tokens().lastIndexOf("dock?"));
    assertEquals(0, s.tokens().lastIndexOf("ock"));
    // spellings stay unique and the model is valid
    assertEquals(s.vocabularySize(), new LinkedHashSet<>(s.tokens()).size());
  }

  // ------------------------------------------------------------------ textbook oracle

  static LongStream seeds() {
    return LongStream.range(0, 120).map(i -> 0xFE77L * 31 + i);
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void agreesWithTextbookLearner(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    String alphabet = "abcde".substring(0, 2 + rnd.nextInt(4));
    Map<String, Long> corpus = new TreeMap<>();
    int pieces = 1 + rnd.nextInt(40);
    for (int i = 0; i < pieces; i++) {
      StringBuilder sb = new StringBuilder();
      int len = 1 + rnd.nextInt(8);
      for (int k = 0; k < len; k++) {
        sb.append(alphabet.charAt(rnd.nextInt(alphabet.length())));
      }
      corpus.merge(sb.toString(), 1L + rnd.nextInt(20), Long::sum);
    }
    List<String> reserved = rnd.nextBoolean() ? List.of() : List.of("lifejacket");
    int extra = rnd.nextInt(60);
    boolean gain = rnd.nextInt(4) != 0;
    long floor = rnd.nextInt(3) == 0 ? 1 + rnd.nextInt(6) : 1;
    List<String> expected = textbook(corpus, reserved, extra, gain, floor);
    // an explicit piece limit above every piece: the textbook learner keeps all pieces, while the
    // derived limit would leave out pieces longer than these tiny vocabularies
    WordPieceSegmenter s = WordPieceTraining.builder().alphabet(EVERY).reservedTokens(reserved).minPairCount(floor)
        .settings(WordPieceSettings.defaults().withMaxPieceLength(64))
        .score(gain ? WordPieceTraining.Score.LIKELIHOOD_GAIN : WordPieceTraining.Score.PAIR_RATIO)
        .vocabularySize(Math.max(2, alphabetEnd(corpus, reserved) + extra)).build().segmenter(PieceCounts.of(corpus));
    assertEquals(expected, s.tokens(), "seed " + seed + " corpus " + corpus + " extra " + extra + " gain " + gain
        + " floor " + floor);
  }

  private static int alphabetEnd(Map<String, Long> corpus, List<String> reserved) {
    LinkedHashSet<String> forms = new LinkedHashSet<>();
    corpus.forEach((p, c) -> {
      for (int i = 0; i < p.length(); i++) {
        forms.add(p.substring(i, i + 1));
        forms.add(M + p.charAt(i)); // both forms of every character
      }
    });
    return reserved.size() + 1 + forms.size();
  }

  /**
   * Textbook likelihood-based WordPiece training [1], recounting everything before every merge.
   * Gain rule, written from its definition: the unigram log-likelihood of the merged positions
   * before minus after, k ln(k/N) - k ln(ca/N) - k ln(cb/N), summed as four separate logs (not the
   * implementation's single ratio), scores within 1e-9 relative counting as equal. Ratio rule:
   * count(ab)/(count(a)count(b)). Pairs counted below {@code floor} are skipped. Tie-break as
   * documented: higher score, then higher pair count, then smaller left spelling, then smaller right.
   */
  private static List<String> textbook(Map<String, Long> corpus, List<String> reserved, int extra, boolean gain,
      long floor) {
    // alphabet: characters by total count desc, then code point; both forms of each, word-initial first
    Map<Character, Long> freq = new HashMap<>();
    corpus.forEach((p, c) -> {
      for (char ch : p.toCharArray()) {
        freq.merge(ch, c, Long::sum);
      }
    });
    List<Character> chars = new ArrayList<>(freq.keySet());
    chars.sort((x, y) -> freq.get(x).equals(freq.get(y)) ? Character.compare(x, y) : Long.compare(freq.get(y), freq.get(x)));
    List<String> vocab = new ArrayList<>(reserved);
    vocab.add(UNK);
    for (char ch : chars) {
      boolean init = false;
      boolean cont = false;
      for (String p : corpus.keySet()) {
        for (int i = 0; i < p.length(); i++) {
          if (p.charAt(i) == ch) {
            init |= i == 0;
            cont |= i > 0;
          }
        }
      }
      if (init || cont) {
        vocab.add(String.valueOf(ch));
        vocab.add(M + ch);
      }
    }
    int target = vocab.size() + extra;
    // segmentations as lists of spellings
    Map<String, List<String>> seg = new LinkedHashMap<>();
    for (String p : corpus.keySet()) {
      List<String> units = new ArrayList<>();
      for (int i = 0; i < p.length(); i++) {
        units.add(i == 0 ? String.valueOf(p.charAt(i)) : M + p.charAt(i));
      }
      seg.put(p, units);
    }
    while (vocab.size() < target) {
      Map<String, Long> unitCount = new HashMap<>();
      Map<List<String>, Long> pairCount = new HashMap<>();
      for (Map.Entry<String, List<String>> e : seg.entrySet()) {
        long c = corpus.get(e.getKey());
        List<String> u = e.getValue();
        for (int i = 0; i < u.size(); i++) {
          unitCount.merge(u.get(i), c, Long::sum);
          if (i + 1 < u.size()) {
            pairCount.merge(List.of(u.get(i), u.get(i + 1)), c, Long::sum);
          }
        }
      }
      long total = 0;
      for (long c : unitCount.values()) {
        total += c;
      }
      List<String> best = null;
      double bestScore = -1;
      long bestCount = -1;
      for (Map.Entry<List<String>, Long> e : pairCount.entrySet()) {
        List<String> pr = e.getKey();
        long cab = e.getValue();
        if (cab < floor) {
          continue;
        }
        double ca = unitCount.get(pr.get(0));
        double cb = unitCount.get(pr.get(1));
        double n = total;
        double sc = gain
            ? cab * Math.log(cab / n) - cab * Math.log(ca / n) - cab * Math.log(cb / n)
            : cab / (ca * cb);
        boolean tie = best != null && (gain ? Math.abs(sc - bestScore) <= 1e-9 * Math.max(1, Math.abs(sc))
            : sc == bestScore);
        boolean better = best == null || (!tie && sc > bestScore)
            || (tie && (cab > bestCount
            || (cab == bestCount && (pr.get(0).compareTo(best.get(0)) < 0
            || (pr.get(0).equals(best.get(0)) && pr.get(1).compareTo(best.get(1)) < 0)))));
        if (better) {
          best = pr;
          bestScore = sc;
          bestCount = cab;
        }
      }
      if (best == null) {
        break;
      }
      String left = best.get(0);
      String right = best.get(1);
      String merged = left + right.substring(M.length());
      if (!vocab.contains(merged)) {
        vocab.add(merged);
      }
      for (List<String> u : seg.values()) {
        for (int i = 0; i + 1 < u.size(); i++) {
          if (u.get(i).equals(left) && u.get(i + 1).equals(right)) {
            u.set(i, merged);
            u.remove(i + 1);
          }
        }
      }
    }
    return vocab;
  }
}
