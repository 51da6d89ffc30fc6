package dev.morsel.tokenize.unigram.internal;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import org.junit.jupiter.api.Test;

/**
 * The EM engine: its E-step against an independent brute-force enumeration of every segmentation
 * (expected counts and likelihood by definition, Kudo 2018 section 3.2), and the monotonicity of the
 * likelihood across iterations (Dempster, Laird, Rubin 1977, Theorem 1: EM never decreases the
 * likelihood).
 */
class EmTest {
  /** Pieces of invented passenger messages to a ferry operator, with counts. */
  private static final String[] PIECES = {"ferry", " ferry", " delayed", " harbour", " tickets", " ticket", "deck",
      " deck", " sailing", " sailings", " cancelled", " berth", " berths", " cabin", " cabins", "\u26f4", " quay"};
  private static final long[] COUNTS = {40, 120, 35, 60, 25, 44, 9, 30, 70, 22, 18, 12, 5, 16, 7, 3, 11};

  /** Every substring of at most {@code max} code points of the pieces, in first-seen order. */
  private static String[] substrings(int max) {
    Set<String> out = new LinkedHashSet<>();
    for (String p : PIECES) {
      int[] cps = p.codePoints().toArray();
      for (int s = 0; s < cps.length; s++) {
        for (int len = 1; len <= max && s + len <= cps.length; len++) {
          out.add(new String(cps, s, len));
        }
      }
    }
    return out.toArray(new String[0]);
  }

  @Test
  void likelihoodNeverDecreases() {
    String[] vocab = substrings(5);
    double[] logp = new double[vocab.length];
    Arrays.fill(logp, -Math.log(vocab.length));
    Em em = new Em(PIECES, COUNTS);
    double[] expected = new double[vocab.length];
    double prev = Double.NEGATIVE_INFINITY;
    ExecutorService pool = Executors.newFixedThreadPool(2);
    try {
      for (int it = 0; it < 25; it++) {
        double ll = em.iterate(vocab, logp, expected, it % 2 == 0 ? null : pool);
        assertTrue(Double.isFinite(ll), "iteration " + it);
        // Dempster, Laird, Rubin (1977), Theorem 1; tolerance for floating point only
        assertTrue(ll >= prev - 1e-9 * Math.abs(ll), "iteration " + it + ": " + ll + " < " + prev);
        prev = ll;
      }
    } finally {
      pool.shutdownNow();
    }
  }

  @Test
  void expectedCountsEqualBruteForce() {
    String[] vocab = substrings(4);
    double[] logp = new double[vocab.length];
    for (int i = 0; i < logp.length; i++) {
      logp[i] = -1 - (i % 7) * 0.3 - vocab[i].length() * 0.2; // arbitrary, unnormalized is fine for the E-step
    }
    Map<String, Double> score = new HashMap<>();
    for (int i = 0; i < vocab.length; i++) {
      score.put(vocab[i], logp[i]);
    }
    double[] want = new double[vocab.length];
    Map<String, Integer> index = new HashMap<>();
    for (int i = 0; i < vocab.length; i++) {
      index.put(vocab[i], i);
    }
    double wantLl = 0;
    for (int k = 0; k < PIECES.length; k++) {
      List<List<String>> paths = new ArrayList<>();
      enumerate(PIECES[k], 0, score, new ArrayList<>(), paths);
      double z = 0;
      double[] weight = new double[paths.size()];
      for (int q = 0; q < paths.size(); q++) {
        double s = 0;
        for (String t : paths.get(q)) {
          s += score.get(t);
        }
        weight[q] = Math.exp(s);
        z += weight[q];
      }
      for (int q = 0; q < paths.size(); q++) {
        for (String t : paths.get(q)) {
          want[index.get(t)] += COUNTS[k] * weight[q] / z;
        }
      }
      wantLl += COUNTS[k] * Math.log(z);
    }
    double[] got = new double[vocab.length];
    double ll = new Em(PIECES, COUNTS).expect(vocab, logp, got, null);
    assertEquals(wantLl, ll, 1e-9 * Math.abs(wantLl));
    for (int i = 0; i < vocab.length; i++) {
      assertEquals(want[i], got[i], 1e-9 * Math.max(1, want[i]), "token '" + vocab[i] + "'");
    }
  }

  /** Independent enumeration: every split of {@code s} into vocabulary strings. */
  private static void enumerate(String s, int at, Map<String, Double> vocab, List<String> cur, List<List<String>> out) {
    if (at == s.length()) {
      out.add(List.copyOf(cur));
      return;
    }
    for (int end = at + 1; end <= s.length(); end++) {
      String t = s.substring(at, end);
      if (vocab.containsKey(t)) {
        cur.add(t);
        enumerate(s, end, vocab, cur, out);
        cur.remove(cur.size() - 1);
      }
    }
  }

  @Test
  void pruningKeepsSingleCharactersAndTheRequestedSize() {
    String[] vocab = substrings(5);
    double[] logp = new double[vocab.length];
    Arrays.fill(logp, -Math.log(vocab.length));
    double[] expected = new double[vocab.length];
    Em em = new Em(PIECES, COUNTS);
    for (int it = 0; it < 3; it++) {
      em.iterate(vocab, logp, expected, null);
    }
    int singles = (int) Arrays.stream(vocab).filter(SeedCounter::single).count();
    int want = singles + 20;
    int[] keep = Training.prune(vocab, logp, expected, want);
    assertEquals(want, keep.length);
    Set<String> kept = new LinkedHashSet<>();
    for (int k : keep) {
      kept.add(vocab[k]);
    }
    for (String v : vocab) {
      if (SeedCounter.single(v)) {
        assertTrue(kept.contains(v), "single character '" + v + "' was pruned");
      }
    }
    // "ferry" occurs 160 times (in "ferry" and " ferry"); no other 5-character substring comes close
    assertTrue(kept.contains("ferry"), kept.toString());
    // substrings that only ever occur inside a kept longer token lose nothing when removed
    assertTrue(!kept.contains("err"), kept.toString());
  }
}
