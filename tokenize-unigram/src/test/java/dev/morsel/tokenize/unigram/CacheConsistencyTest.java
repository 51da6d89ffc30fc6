package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import static org.junit.jupiter.api.Assertions.assertEquals;

import it.unimi.dsi.fastutil.ints.IntArrayList;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The per-thread piece cache must be invisible: a piece encodes identically whether it hits, misses
 * or was evicted, and its score equals the best path found by the cache-free n-best search.
 */
class CacheConsistencyTest {
  @Test
  void hitsMissesAndEvictionsGiveIdenticalTokens() {
    List<String> vocab = List.of("s", "k", "i", "f", "e", "r", "y", "sk", "ki", "iff", "ferr", "err", "ry", "skiff", "ferry");
    double[] scores = new double[vocab.size()];
    SplittableRandom r = new SplittableRandom(77);
    for (int i = 0; i < scores.length; i++) {
      scores[i] = -1 - r.nextInt(30) / 4.0;
    }
    UnigramSegmenter m = UnigramSegmenter.create(List.of(), true, UnigramSegmenter.DEFAULT_UNKNOWN, vocab, scores);
    // 30,000 pieces of 1..30 chars (some above the cache's 24-char limit), many repeated, many colliding
    String letters = "skifery\u00e9";
    List<String> pieces = new ArrayList<>();
    for (int i = 0; i < 30_000; i++) {
      StringBuilder sb = new StringBuilder();
      int len = 1 + (r.nextInt(4) == 0 ? r.nextInt(30) : r.nextInt(5));
      for (int c = 0; c < len; c++) {
        sb.append(letters.charAt(r.nextInt(letters.length())));
      }
      pieces.add(i % 3 == 0 && i > 0 ? pieces.get(r.nextInt(i)) : sb.toString());
    }
    List<IntArrayList> first = new ArrayList<>();
    for (String p : pieces) {
      first.add(encode(m, p));
    }
    for (int i = pieces.size() - 1; i >= 0; i--) {
      String p = pieces.get(i);
      IntArrayList again = encode(m, p);
      assertEquals(first.get(i), again, "piece " + i + " '" + p + "' (seed 77)");
      if (i % 10 == 0) {
        double viterbi = 0;
        for (int q = 0; q < again.size(); q += 3) {
          int id = again.getInt(q);
          boolean isByte = id >= m.firstByteId() && id < m.firstByteId() + 256;
          if (!isByte) {
            viterbi += m.score(id);
          } else if (q == 0 || again.getInt(q + 1) != again.getInt(q - 2)) {
            viterbi += m.score(m.unknownId()); // first byte token of an uncovered character
          }
        }
        assertEquals(m.nBest(p, 0, p.length(), 1).get(0).score(), viterbi, 1e-9, "piece '" + p + "' (seed 77)");
      }
    }
  }

  /** ids, starts and ends as one flat list. */
  private static IntArrayList encode(UnigramSegmenter m, String p) {
    IntArrayList out = new IntArrayList();
    m.segment(p, 0, p.length(), (id, s, e) -> {
      out.add(id);
      out.add(s);
      out.add(e);
    });
    return out;
  }
}
