package dev.morsel.tokenize.unigram.internal;

import dev.morsel.tokenize.train.TrainingListener;
import it.unimi.dsi.fastutil.ints.IntArrays;
import it.unimi.dsi.fastutil.objects.Object2LongMap;
import it.unimi.dsi.fastutil.objects.Object2LongOpenHashMap;
import java.util.Set;

/**
 * Seed vocabulary by bounded-length substring counting: every substring of at most
 * {@code maxTokenCodePoints} code points of every distinct piece, weighted by the piece's count, is
 * counted in one hash table. When the table exceeds {@code tableLimit} entries, multi-character
 * entries whose count is at most a threshold are dropped and the threshold doubles (lossy counting;
 * a substring first seen after a drop may be under-counted). Memory: about 100 bytes per entry (a
 * short String plus its table slot), so about 200 MB at the default limit of two million entries.
 *
 * <p>Candidates are ranked by count × length in code points (longer frequent substrings save more
 * tokens), ties by string; the top {@code maxMulti} multi-character substrings are kept, and every
 * single character always is. Initial log-probabilities are the normalized counts.
 */
final class SeedCounter {
  /** How often (pieces) the seed stage reports progress. */
  private static final int REPORT_EVERY = 4096;

  private SeedCounter() {}

  /** Seed vocabulary: parallel arrays of tokens and initial log-probabilities. */
  record Seeds(String[] tokens, double[] logp, int singles) {}

  static Seeds seed(String[] corpus, long[] counts, int maxTokenCodePoints, int maxMulti, int tableLimit,
      Set<String> reserved, TrainingListener listener) {
    Object2LongOpenHashMap<String> table = new Object2LongOpenHashMap<>();
    long threshold = 1;
    int[] offsets = new int[64];
    for (int k = 0; k < corpus.length; k++) {
      String p = corpus[k];
      long c = counts[k];
      int cps = 0;
      if (offsets.length < p.length() + 1) {
        offsets = new int[p.length() + 1];
      }
      for (int i = 0; i < p.length(); i += Character.charCount(p.codePointAt(i))) {
        offsets[cps++] = i;
      }
      offsets[cps] = p.length();
      for (int s = 0; s < cps; s++) {
        int maxLen = Math.min(maxTokenCodePoints, cps - s);
        for (int len = 1; len <= maxLen; len++) {
          String sub = p.substring(offsets[s], offsets[s + len]);
          if (table.addTo(sub, c) > Long.MAX_VALUE - c) {
            throwOverflow(sub, c);
          }
        }
      }
      if (table.size() > tableLimit) {
        while (table.size() > tableLimit - tableLimit / 4) {
          long t = threshold;
          table.object2LongEntrySet().removeIf(e -> e.getLongValue() <= t && !single(e.getKey()));
          threshold *= 2;
        }
      }
      if ((k + 1) % REPORT_EVERY == 0 || k + 1 == corpus.length) {
        listener.progress("seed", k + 1, corpus.length, table.size() + " substrings");
      }
    }
    int n = table.size();
    String[] keys = new String[n];
    long[] freq = new long[n];
    int m = 0;
    for (Object2LongMap.Entry<String> e : table.object2LongEntrySet()) {
      if (!reserved.contains(e.getKey())) {
        keys[m] = e.getKey();
        freq[m++] = e.getLongValue();
      }
    }
    int[] multi = new int[m];
    int[] singles = new int[m];
    int nm = 0;
    int ns = 0;
    for (int i = 0; i < m; i++) {
      if (single(keys[i])) {
        singles[ns++] = i;
      } else {
        multi[nm++] = i;
      }
    }
    final String[] ks = keys;
    final double[] rank = new double[m];
    for (int q = 0; q < nm; q++) {
      int i = multi[q];
      rank[i] = (double) freq[i] * keys[i].codePointCount(0, keys[i].length());
    }
    IntArrays.quickSort(multi, 0, nm, (a, b) -> {
      int c = Double.compare(rank[b], rank[a]);
      return c != 0 ? c : ks[a].compareTo(ks[b]);
    });
    IntArrays.quickSort(singles, 0, ns, (a, b) -> ks[a].compareTo(ks[b]));
    int keep = Math.min(nm, maxMulti);
    String[] tokens = new String[ns + keep];
    double[] logp = new double[ns + keep];
    double sum = 0;
    for (int i = 0; i < ns; i++) {
      tokens[i] = keys[singles[i]];
      logp[i] = freq[singles[i]];
      sum += logp[i];
    }
    for (int i = 0; i < keep; i++) {
      tokens[ns + i] = keys[multi[i]];
      logp[ns + i] = freq[multi[i]];
      sum += logp[ns + i];
    }
    double logSum = Math.log(sum);
    for (int i = 0; i < logp.length; i++) {
      logp[i] = Math.log(logp[i]) - logSum;
    }
    return new Seeds(tokens, logp, ns);
  }

  private static void throwOverflow(String sub, long c) {
    throw new IllegalArgumentException("the count of substring '" + sub + "' summed over the pieces overflows a"
        + " long (adding " + c + "); scale the piece counts down");
  }

  /** Whether {@code s} is one code point. */
  static boolean single(String s) {
    return s.length() == 1 || s.length() == 2 && Character.isHighSurrogate(s.charAt(0))
        && Character.isLowSurrogate(s.charAt(1));
  }
}
