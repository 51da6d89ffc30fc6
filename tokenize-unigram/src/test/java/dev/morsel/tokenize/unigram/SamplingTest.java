package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Sampling for subword regularization (Kudo 2018, sections 2.2 and 3.1): a path is drawn with
 * probability p(path)^alpha / Z. Checked against exact probabilities from the brute-force
 * {@link Oracle} with a chi-square goodness-of-fit test.
 */
class SamplingTest {
  private static final int DRAWS = 20_000;

  private static UnigramSegmenter model(Map<String, Double> vocab, boolean bytes) {
    List<String> pieces = new ArrayList<>(vocab.keySet());
    double[] scores = pieces.stream().mapToDouble(vocab::get).toArray();
    return UnigramSegmenter.create(List.of(), bytes, UnigramSegmenter.DEFAULT_UNKNOWN, pieces, scores);
  }

  /**
   * Survival function of the chi-square distribution for even degrees of freedom 2m, in closed form:
   * Q(x; 2m) = e^(-x/2) · sum_{i<m} (x/2)^i / i!  (Abramowitz and Stegun 1964, 26.4.21, from memory).
   */
  static double chiSquareSurvival(double x, int df) {
    if (df % 2 != 0) {
      throw new IllegalArgumentException("closed form needs even df, got " + df);
    }
    double h = x / 2;
    double term = 1;
    double sum = 1;
    for (int i = 1; i < df / 2; i++) {
      term *= h / i;
      sum += term;
    }
    return Math.exp(-h) * sum;
  }

  @Test
  void closedFormMatchesTabulatedCriticalValue() {
    // from memory: chi-square critical value at significance 0.001 with 6 degrees of freedom is 22.458
    assertEquals(0.001, chiSquareSurvival(22.458, 6), 2e-6);
    // from memory: with 2 degrees of freedom the 0.05 critical value is 5.991
    assertEquals(0.05, chiSquareSurvival(5.991, 2), 2e-5);
  }

  @Test
  void pathFrequenciesMatchExactProbabilities() {
    Map<String, Double> vocab = new LinkedHashMap<>();
    vocab.put("p", -2.0);
    vocab.put("i", -2.5);
    vocab.put("e", -1.5);
    vocab.put("r", -2.25);
    vocab.put("pi", -3.0);
    vocab.put("ie", -3.5);
    vocab.put("er", -3.25);
    vocab.put("pie", -4.0);
    vocab.put("ier", -4.5);
    UnigramSegmenter m = model(vocab, false);
    String text = "pier";
    double alpha = 0.7;
    List<Oracle.Path> paths = Oracle.all(text, vocab);
    // compositions of 4 into parts of length <= 3 that are all pieces: 7 paths, so df = 6
    assertEquals(7, paths.size());
    double z = 0;
    for (Oracle.Path p : paths) {
      z += Math.exp(alpha * p.score());
    }
    Map<List<String>, Integer> index = new HashMap<>();
    for (int i = 0; i < paths.size(); i++) {
      index.put(paths.get(i).edges(), i);
    }
    long[] observed = new long[paths.size()];
    SplittableRandom rng = new SplittableRandom(20180715L);
    for (int d = 0; d < DRAWS; d++) {
      List<String> edges = new ArrayList<>();
      m.sample(text, 0, text.length(), alpha, rng, (id, s, e) -> edges.add(s + "-" + e + ":" + text.substring(s, e)));
      Integer i = index.get(edges);
      assertNotNull(i, "draw " + d + " produced a path that is not a segmentation: " + edges);
      observed[i]++;
    }
    double chi2 = 0;
    for (int i = 0; i < paths.size(); i++) {
      double expected = DRAWS * Math.exp(alpha * paths.get(i).score()) / z;
      assertTrue(expected >= 5, "expected count " + expected + " too small for the chi-square test");
      chi2 += (observed[i] - expected) * (observed[i] - expected) / expected;
    }
    int df = paths.size() - 1;
    double p = chiSquareSurvival(chi2, df);
    assertTrue(p > 0.001, "chi-square " + chi2 + " with df " + df + " has p " + p + " (seed 20180715)");
  }

  @Test
  void largeAlphaConcentratesOnViterbi() {
    Map<String, Double> vocab = new LinkedHashMap<>();
    vocab.put("s", -3.0);
    vocab.put("a", -3.0);
    vocab.put("il", -4.0);
    vocab.put("i", -3.0);
    vocab.put("l", -3.0);
    vocab.put("sail", -2.0);
    UnigramSegmenter m = model(vocab, false);
    SplittableRandom rng = new SplittableRandom(42);
    for (int d = 0; d < 200; d++) {
      int[] count = {0};
      m.sample("sail", 0, 4, 50.0, rng, (id, s, e) -> count[0]++);
      assertEquals(1, count[0], "draw " + d + " (seed 42)");
    }
  }

  @Test
  void byteSpellingSamplesCoverTheText() {
    Map<String, Double> vocab = new LinkedHashMap<>();
    vocab.put("d", -1.0);
    vocab.put("o", -1.0);
    vocab.put("ck", -2.0);
    vocab.put("c", -1.5);
    UnigramSegmenter m = model(vocab, true);
    String text = "dock\u26f4";
    SplittableRandom rng = new SplittableRandom(9);
    for (int d = 0; d < 100; d++) {
      java.io.ByteArrayOutputStream out = new java.io.ByteArrayOutputStream();
      m.sample(text, 0, text.length(), 0.5, rng, (id, s, e) -> m.decodeToken(id, out::write));
      assertEquals(text, out.toString(java.nio.charset.StandardCharsets.UTF_8), "draw " + d + " (seed 9)");
    }
  }

  @Test
  void rejectsNonPositiveAlpha() {
    UnigramSegmenter m = model(Map.of("w", -1.0), false);
    SplittableRandom rng = new SplittableRandom(1);
    for (double a : new double[] {0, -0.5, Double.NaN, Double.POSITIVE_INFINITY}) {
      IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
          () -> m.sample("ww", 0, 2, a, rng, (id, s, x) -> {}));
      assertTrue(e.getMessage().contains("alpha"), e.getMessage());
    }
  }
}
