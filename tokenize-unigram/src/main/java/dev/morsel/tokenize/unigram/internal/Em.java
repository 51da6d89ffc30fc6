package dev.morsel.tokenize.unigram.internal;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Future;

/**
 * Expectation-maximization for the unigram language model [1, section 3.2; 2]. The E-step runs the
 * forward-backward algorithm over each distinct piece's lattice in log space and adds the expected
 * count of every token, weighted by the piece's count; the M-step normalizes those counts into new
 * log-probabilities (maximum likelihood, no prior).
 *
 * <p>The pieces are cut into {@link #BLOCKS} fixed blocks whose partial sums are added in block
 * order, so results are bit-identical for any number of threads. Memory: {@code BLOCKS} arrays of
 * one double per token, plus per-block lattice arrays as long as the longest piece.
 *
 * <p>References: [1] Kudo (2018), "Subword Regularization", ACL 2018. [2] Dempster, Laird, Rubin
 * (1977), "Maximum Likelihood from Incomplete Data via the EM Algorithm".
 */
final class Em {
  /** Work blocks per E-step, independent of the thread count (reason: deterministic sums; 8 keeps 2–8 cores busy). */
  static final int BLOCKS = 8;
  /**
   * Expected counts below this become this before normalizing (unit: occurrences). Keeps every
   * token's log-probability finite; changes the likelihood by less than one part in 10^10.
   */
  static final double MIN_EXPECTED = 1e-12;

  private final String[] corpus;
  private final long[] counts;

  Em(String[] corpus, long[] counts) {
    this.corpus = corpus;
    this.counts = counts;
  }

  /** Number of distinct pieces. */
  int size() {
    return corpus.length;
  }

  /**
   * One EM iteration: fills {@code expected} (length {@code vocab.length}) from the current
   * {@code logp}, then overwrites {@code logp} with the re-estimated log-probabilities. Returns the
   * corpus log-likelihood under the model <em>before</em> the update (sum of count × log Z over the
   * pieces whose lattice has a path).
   */
  double iterate(String[] vocab, double[] logp, double[] expected, ExecutorService pool) {
    double ll = expect(vocab, logp, expected, pool);
    maximize(expected, logp);
    return ll;
  }

  /** The M-step: {@code logp[i] = log(expected[i] / sum)}. */
  static void maximize(double[] expected, double[] logp) {
    double sum = 0;
    for (double e : expected) {
      sum += Math.max(e, MIN_EXPECTED);
    }
    double logSum = Math.log(sum);
    for (int i = 0; i < expected.length; i++) {
      logp[i] = Math.log(Math.max(expected[i], MIN_EXPECTED)) - logSum;
    }
  }

  /** The E-step: expected token counts into {@code expected}; returns the log-likelihood. */
  double expect(String[] vocab, double[] logp, double[] expected, ExecutorService pool) {
    int[] values = new int[vocab.length];
    for (int i = 0; i < values.length; i++) {
      values[i] = i;
    }
    PieceTrie trie = new PieceTrie(vocab, values);
    double[][] partial = new double[BLOCKS][];
    double[] ll = new double[BLOCKS];
    if (pool == null) {
      for (int b = 0; b < BLOCKS; b++) {
        partial[b] = new double[vocab.length];
        ll[b] = block(b, trie, logp, partial[b]);
      }
    } else {
      List<Future<Double>> futures = new ArrayList<>(BLOCKS);
      for (int b = 0; b < BLOCKS; b++) {
        int bb = b;
        partial[b] = new double[vocab.length];
        futures.add(pool.submit(() -> block(bb, trie, logp, partial[bb])));
      }
      for (int b = 0; b < BLOCKS; b++) {
        try {
          ll[b] = futures.get(b).get();
        } catch (InterruptedException e) {
          Thread.currentThread().interrupt();
          throw new IllegalStateException("training interrupted", e);
        } catch (ExecutionException e) {
          throw new IllegalStateException("E-step failed: " + e.getCause(), e.getCause());
        }
      }
    }
    Arrays.fill(expected, 0);
    double total = 0;
    for (int b = 0; b < BLOCKS; b++) {
      double[] p = partial[b];
      for (int i = 0; i < expected.length; i++) {
        expected[i] += p[i];
      }
      total += ll[b];
    }
    return total;
  }

  /** Forward-backward over the pieces of block {@code b}. */
  private double block(int b, PieceTrie trie, double[] logp, double[] out) {
    int from = (int) ((long) corpus.length * b / BLOCKS);
    int to = (int) ((long) corpus.length * (b + 1) / BLOCKS);
    double[] alpha = new double[64];
    double[] beta = new double[64];
    double ll = 0;
    for (int k = from; k < to; k++) {
      String p = corpus[k];
      int n = p.length();
      if (alpha.length < n + 1) {
        alpha = new double[Math.max(n + 1, alpha.length * 2)];
        beta = new double[alpha.length];
      }
      Arrays.fill(alpha, 0, n + 1, Double.NEGATIVE_INFINITY);
      alpha[0] = 0;
      for (int i = 0; i < n; i++) {
        double a = alpha[i];
        if (a == Double.NEGATIVE_INFINITY) {
          continue;
        }
        int node = 0;
        for (int j = i; j < n; j++) {
          node = trie.child(node, p.charAt(j));
          if (node < 0) {
            break;
          }
          int id = trie.value(node);
          if (id >= 0) {
            alpha[j + 1] = logAdd(alpha[j + 1], a + logp[id]);
          }
        }
      }
      double z = alpha[n];
      if (z == Double.NEGATIVE_INFINITY) {
        continue; // a character of this piece is not in the vocabulary (reserved spelling): skipped
      }
      beta[n] = 0;
      for (int i = n - 1; i >= 0; i--) {
        double acc = Double.NEGATIVE_INFINITY;
        int node = 0;
        for (int j = i; j < n; j++) {
          node = trie.child(node, p.charAt(j));
          if (node < 0) {
            break;
          }
          int id = trie.value(node);
          if (id >= 0) {
            acc = logAdd(acc, logp[id] + beta[j + 1]);
          }
        }
        beta[i] = acc;
      }
      double c = counts[k];
      for (int i = 0; i < n; i++) {
        double a = alpha[i];
        if (a == Double.NEGATIVE_INFINITY) {
          continue;
        }
        int node = 0;
        for (int j = i; j < n; j++) {
          node = trie.child(node, p.charAt(j));
          if (node < 0) {
            break;
          }
          int id = trie.value(node);
          if (id >= 0) {
            double w = a + logp[id] + beta[j + 1] - z;
            if (w > -745) { // below this exp() underflows to 0 anyway (IEEE 754 double)
              out[id] += c * Math.exp(w);
            }
          }
        }
      }
      ll += c * z;
    }
    return ll;
  }

  /** log(exp(a) + exp(b)) without overflow. */
  static double logAdd(double a, double b) {
    if (a == Double.NEGATIVE_INFINITY) {
      return b;
    }
    if (b == Double.NEGATIVE_INFINITY) {
      return a;
    }
    return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
  }
}
