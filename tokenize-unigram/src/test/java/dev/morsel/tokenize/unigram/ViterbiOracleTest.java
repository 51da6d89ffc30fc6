package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import dev.morsel.tokenize.unigram.internal.PiecePath;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.stream.LongStream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.junit.jupiter.api.Test;

/**
 * Viterbi and n-best against the brute-force {@link Oracle} on seeded random small vocabularies and
 * strings (Kudo 2018, section 3.1: the Viterbi path is the most probable segmentation).
 */
class ViterbiOracleTest {
  /** Code points of the random texts: ASCII, a Latin-1 letter, a BMP symbol and one astral symbol. */
  private static final int[] ALPHABET = {'a', 'b', 'c', 'd', '\u00e9', '\u26f4', 0x1F6A2};

  static LongStream seeds() {
    return LongStream.range(0, 400);
  }

  /** A random case: vocabulary, model and text. */
  record Case(Map<String, Double> vocab, UnigramSegmenter model, String text, boolean bytes) {}

  static Case randomCase(long seed) {
    SplittableRandom r = new SplittableRandom(seed);
    Map<String, Double> vocab = new LinkedHashMap<>();
    for (int cp : ALPHABET) {
      if (r.nextInt(10) < 8) { // some characters stay uncovered, to exercise the unknown edge
        vocab.put(Character.toString(cp), score(r));
      }
    }
    int multi = 3 + r.nextInt(12);
    for (int i = 0; i < multi; i++) {
      vocab.putIfAbsent(word(r, 2 + r.nextInt(3)), score(r));
    }
    boolean bytes = r.nextBoolean();
    List<String> pieces = new ArrayList<>(vocab.keySet());
    double[] scores = new double[pieces.size()];
    for (int i = 0; i < scores.length; i++) {
      scores[i] = vocab.get(pieces.get(i));
    }
    UnigramSegmenter model = UnigramSegmenter.create(List.of("\u00a7quay"), bytes, UnigramSegmenter.DEFAULT_UNKNOWN, pieces, scores);
    return new Case(vocab, model, word(r, 1 + r.nextInt(9)), bytes);
  }

  /** Scores in eighths, so that ties between paths happen. */
  private static double score(SplittableRandom r) {
    return -(1 + r.nextInt(40)) / 8.0;
  }

  private static String word(SplittableRandom r, int cps) {
    StringBuilder sb = new StringBuilder();
    for (int i = 0; i < cps; i++) {
      sb.appendCodePoint(ALPHABET[r.nextInt(ALPHABET.length)]);
    }
    return sb.toString();
  }

  /** Converts segmenter tokens to oracle edges (byte tokens of one character collapse into one unknown edge). */
  static Oracle.Path edges(UnigramSegmenter m, String text, int[] ids, int[] starts, int[] ends, int n) {
    List<String> out = new ArrayList<>();
    double score = 0;
    for (int i = 0; i < n; i++) {
      boolean unknown = ids[i] == m.unknownId() || (m.byteSpelling() && ids[i] >= m.firstByteId()
          && ids[i] < m.firstByteId() + 256);
      if (unknown && i > 0 && starts[i] == starts[i - 1] && ends[i] == ends[i - 1]) {
        continue; // the 2nd..4th byte of one character
      }
      out.add(starts[i] + "-" + ends[i] + ":" + (unknown ? "?" : text.substring(starts[i], ends[i])));
      score += unknown ? m.score(m.unknownId()) : m.score(ids[i]);
    }
    return new Oracle.Path(out, score);
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void viterbiMatchesBruteForce(long seed) {
    Case c = randomCase(seed);
    String why = "seed " + seed + ", text '" + c.text() + "', vocab " + c.vocab();
    assertEquals(Oracle.unknownScore(c.vocab()), c.model().score(c.model().unknownId()), 0, why);
    List<Oracle.Path> all = Oracle.all(c.text(), c.vocab());
    Oracle.Path best = all.stream().max(Comparator.comparingDouble(Oracle.Path::score)).orElseThrow();
    int[] ids = new int[64];
    int[] starts = new int[64];
    int[] ends = new int[64];
    int[] n = {0};
    c.model().segment(c.text(), 0, c.text().length(), (id, s, e) -> {
      ids[n[0]] = id;
      starts[n[0]] = s;
      ends[n[0]++] = e;
    });
    Oracle.Path got = edges(c.model(), c.text(), ids, starts, ends, n[0]);
    assertEquals(best.score(), got.score(), 1e-9, why);
    long ties = all.stream().filter(p -> Math.abs(p.score() - best.score()) < 1e-9).count();
    if (ties == 1) {
      assertEquals(best.edges(), got.edges(), why);
    } else {
      assertTrue(all.stream().anyMatch(p -> p.edges().equals(got.edges())), why + ": path not a segmentation");
    }
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void nBestMatchesBruteForceTopK(long seed) {
    Case c = randomCase(seed);
    String why = "seed " + seed + ", text '" + c.text() + "', vocab " + c.vocab();
    List<Oracle.Path> all = new ArrayList<>(Oracle.all(c.text(), c.vocab()));
    all.sort(Comparator.comparingDouble(Oracle.Path::score).reversed());
    int k = 1 + (int) (seed % 9);
    List<PiecePath> got = c.model().nBest(c.text(), 0, c.text().length(), k);
    assertEquals(Math.min(k, all.size()), got.size(), why);
    Set<List<String>> seen = new HashSet<>();
    for (int i = 0; i < got.size(); i++) {
      PiecePath s = got.get(i);
      int[] starts = new int[s.size()];
      int[] ends = new int[s.size()];
      for (int t = 0; t < s.size(); t++) {
        starts[t] = s.start(t);
        ends[t] = s.end(t);
      }
      Oracle.Path p = edges(c.model(), c.text(), s.ids(), starts, ends, s.size());
      assertEquals(all.get(i).score(), s.score(), 1e-9, why + ", rank " + i);
      assertEquals(p.score(), s.score(), 1e-9, why + ", rank " + i + " score is not its tokens' sum");
      assertTrue(seen.add(p.edges()), why + ": rank " + i + " repeats a path");
      assertTrue(all.stream().anyMatch(q -> q.edges().equals(p.edges())), why + ": not a segmentation");
    }
  }

  @Test
  void nBestRejectsNonPositiveK() {
    Case c = randomCase(7);
    assertThrows(IllegalArgumentException.class, () -> c.model().nBest("ab", 0, 2, 0));
    assertThrows(IllegalArgumentException.class, () -> c.model().nBest("ab", 0, 2, -3));
    assertThrows(IllegalArgumentException.class, () -> c.model().nBest("ab", 0, 2, UnigramSegmenter.MAX_N_BEST + 1));
  }
}
