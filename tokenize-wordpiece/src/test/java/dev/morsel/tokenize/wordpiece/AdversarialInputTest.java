package dev.morsel.tokenize.wordpiece;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Near-miss vocabularies that make naive greedy matching quadratic: tokens a, aa, ..., a^k and
 * a^k b (word-initial and continuation), input a^n. LinMaxMatch [3] must agree with the naive
 * encoder [2] where that one finishes, and a 1 MiB input must finish (correctness only; speed is
 * measured by the benchmarks, not here).
 */
class AdversarialInputTest {
  private static final String M = WordPieceSettings.DEFAULT_MARKER;

  private static List<String> nearMissVocabulary(int k) {
    List<String> v = new ArrayList<>();
    v.add(WordPieceSettings.DEFAULT_UNKNOWN);
    for (int len = 1; len <= k; len++) {
      String as = "a".repeat(len);
      v.add(as);
      v.add(M + as);
    }
    v.add("a".repeat(k) + "b");
    v.add(M + "a".repeat(k) + "b");
    return v;
  }

  @Test
  void agreesWithNaiveOnModerateSizes() {
    for (int k : new int[] {1, 2, 7, 31}) {
      List<String> vocab = nearMissVocabulary(k);
      WordPieceSettings st = WordPieceSettings.defaults().withMaxPieceLength(5000);
      WordPieceSegmenter s = WordPieceSegmenter.of(vocab, 0, st);
      TestSupport.NaiveGreedy naive = new TestSupport.NaiveGreedy(vocab, 0, M, 5000);
      for (int n : new int[] {1, 2, k, k + 1, 3 * k + 2, 777, 2000}) {
        String input = "a".repeat(n);
        assertArrayEquals(naive.segment(input), TestSupport.segmentOne(s, input, 0, n).ids.toIntArray(),
            "k=" + k + " n=" + n);
        // ending in b: the last chunk uses the a^k b token when it lines up, else the piece is unknown
        String withB = input + "b";
        assertArrayEquals(naive.segment(withB), TestSupport.segmentOne(s, withB, 0, n + 1).ids.toIntArray(),
            "k=" + k + " n=" + n + " +b");
      }
    }
  }

  @Test
  void forgedVocabularyWithQuadraticFailurePopsIsRefused() {
    // failure pops of the path a, aa, ..., a^L (L = 9000) hold about L^2 / 2 entries [3, §3]
    String longToken = "a".repeat(9000) + "b";
    WordPieceSettings st = WordPieceSettings.defaults().withMaxPieceLength(10_000);
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> WordPieceSegmenter.of(List.of(WordPieceSettings.DEFAULT_UNKNOWN, "a", M + "a", longToken), 0, st));
    assertTrue(e.getMessage().contains("maxPieceLength"), e.getMessage());
    // the derived default keeps every token in the trie, so it refuses the forged vocabulary too
    IllegalArgumentException d = assertThrows(IllegalArgumentException.class,
        () -> WordPieceSegmenter.of(List.of(WordPieceSettings.DEFAULT_UNKNOWN, "a", M + "a", longToken), 0,
            WordPieceSettings.defaults()));
    assertTrue(d.getMessage().contains("maxPieceLength"), d.getMessage());
    // with a lower explicit piece limit the long token can never match and is left out of the trie
    WordPieceSegmenter s = WordPieceSegmenter.of(List.of(WordPieceSettings.DEFAULT_UNKNOWN, "a", M + "a", longToken), 0,
        WordPieceSettings.defaults().withMaxPieceLength(100));
    assertEquals(3, s.id(longToken));
    assertArrayEquals(new int[] {1, 2, 2}, TestSupport.segmentOne(s, "aaa", 0, 3).ids.toIntArray());
  }

  @Test
  void oneMebibyteOfNearMissesFinishesCorrectly() {
    int k = 64;
    List<String> vocab = nearMissVocabulary(k);
    int n = 1 << 20;
    WordPieceSettings st = WordPieceSettings.defaults().withMaxPieceLength(WordPieceSettings.MAX_MAX_PIECE_LENGTH);
    WordPieceSegmenter s = WordPieceSegmenter.of(vocab, 0, st);
    String input = "a".repeat(n);
    TestSupport.Encoded e = TestSupport.segmentOne(s, input, 0, n);
    // greedy: a^k repeated, then the remainder as one token (n divisible by k here)
    assertEquals(n / k, e.ids.size());
    assertEquals(s.id("a".repeat(k)), e.ids.getInt(0));
    assertEquals(s.id(M + "a".repeat(k)), e.ids.getInt(1));
    assertEquals(n, e.ends.getInt(e.ids.size() - 1));
    // a trailing 'c' that no token covers: the whole piece is unknown, after scanning 1 MiB
    String bad = input.substring(1) + "c";
    TestSupport.Encoded u = TestSupport.segmentOne(s, bad, 0, n);
    assertArrayEquals(new int[] {s.unknownId()}, u.ids.toIntArray());
  }
}
