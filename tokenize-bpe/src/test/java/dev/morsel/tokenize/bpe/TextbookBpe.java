package dev.morsel.tokenize.bpe;

import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Independent textbook BPE (Sennrich et al. 2016, section 3.2, Algorithm 1): recount every pair after
 * every merge; encode by rescanning for the lowest-ranked pair. Shares no code with the implementation;
 * it follows the documented rules (tie-break, eligibility, overlap handling) written out again here.
 */
final class TextbookBpe {
  private TextbookBpe() {}

  /** Merges as {left ids, right ids}. Ids: reserved 0..k-1, byte b = k+b, merge r = k+256+r. */
  static int[][] train(Map<String, Long> pieces, int k, int maxMerges, long minPairCount, int maxTokenBytes) {
    List<String> keys = new ArrayList<>(pieces.keySet());
    keys.sort(null);
    List<List<Integer>> words = new ArrayList<>();
    List<Long> weights = new ArrayList<>();
    for (String p : keys) {
      byte[] b = p.getBytes(StandardCharsets.UTF_8); // test inputs hold no lone surrogates
      List<Integer> w = new ArrayList<>();
      for (byte x : b) {
        w.add(k + (x & 0xFF));
      }
      words.add(w);
      weights.add(pieces.get(p));
    }
    Map<Integer, byte[]> spelled = new HashMap<>();
    Set<String> existing = new HashSet<>();
    for (int v = 0; v < 256; v++) {
      spelled.put(k + v, new byte[] {(byte) v});
      existing.add(Arrays.toString(new byte[] {(byte) v}));
    }
    return learn(words, weights, spelled, existing, k + 256, maxMerges, minPairCount, maxTokenBytes);
  }

  /**
   * Continues after {@code base}'s merges: each piece written by the textbook encoder with the
   * base's ranks, then the same greedy loop, new merge {@code r} getting id {@code base size + r}.
   */
  static int[][] extend(BpeSegmenter base, Map<String, Long> pieces, int maxMerges, long minPairCount,
      int maxTokenBytes) {
    int k = base.reservedSpellings().size();
    Map<List<Integer>, Integer> ranks = ranks(base);
    List<String> keys = new ArrayList<>(pieces.keySet());
    keys.sort(null);
    List<List<Integer>> words = new ArrayList<>();
    List<Long> weights = new ArrayList<>();
    for (String p : keys) {
      List<Integer> w = new ArrayList<>();
      for (int id : encode(p.getBytes(StandardCharsets.UTF_8), k, ranks)) {
        w.add(id);
      }
      words.add(w);
      weights.add(pieces.get(p));
    }
    Map<Integer, byte[]> spelled = new HashMap<>();
    Set<String> existing = new HashSet<>();
    for (int id = k; id < base.vocabularySize(); id++) {
      spelled.put(id, base.tokenBytes(id));
      existing.add(Arrays.toString(base.tokenBytes(id)));
    }
    return learn(words, weights, spelled, existing, base.vocabularySize(), maxMerges, minPairCount, maxTokenBytes);
  }

  private static int[][] learn(List<List<Integer>> words, List<Long> weights, Map<Integer, byte[]> spelled,
      Set<String> existing, int firstId, int maxMerges, long minPairCount, int maxTokenBytes) {
    List<Integer> lefts = new ArrayList<>();
    List<Integer> rights = new ArrayList<>();
    while (lefts.size() < maxMerges) {
      Map<List<Integer>, Long> stats = new HashMap<>();
      for (int wi = 0; wi < words.size(); wi++) {
        List<Integer> w = words.get(wi);
        for (int i = 0; i + 1 < w.size(); i++) {
          stats.merge(List.of(w.get(i), w.get(i + 1)), weights.get(wi), Long::sum);
        }
      }
      List<Integer> best = null;
      long bestCount = 0;
      byte[] bestBytes = null;
      for (Map.Entry<List<Integer>, Long> e : stats.entrySet()) {
        long c = e.getValue();
        if (c < minPairCount) {
          continue;
        }
        byte[] l = spelled.get(e.getKey().get(0));
        byte[] r = spelled.get(e.getKey().get(1));
        byte[] cat = new byte[l.length + r.length];
        System.arraycopy(l, 0, cat, 0, l.length);
        System.arraycopy(r, 0, cat, l.length, r.length);
        if (cat.length > maxTokenBytes || existing.contains(Arrays.toString(cat))) {
          continue;
        }
        boolean better;
        if (best == null || c > bestCount) {
          better = true;
        } else if (c < bestCount) {
          better = false;
        } else {
          int cmp = Arrays.compareUnsigned(cat, bestBytes);
          better = cmp < 0 || (cmp == 0 && l.length < spelled.get(best.get(0)).length);
        }
        if (better) {
          best = e.getKey();
          bestCount = c;
          bestBytes = cat;
        }
      }
      if (best == null) {
        break;
      }
      int id = firstId + lefts.size();
      lefts.add(best.get(0));
      rights.add(best.get(1));
      spelled.put(id, bestBytes);
      existing.add(Arrays.toString(bestBytes));
      for (List<Integer> w : words) {
        List<Integer> out = new ArrayList<>();
        int i = 0;
        while (i < w.size()) {
          if (i + 1 < w.size() && w.get(i).equals(best.get(0)) && w.get(i + 1).equals(best.get(1))) {
            out.add(id);
            i += 2;
          } else {
            out.add(w.get(i));
            i++;
          }
        }
        w.clear();
        w.addAll(out);
      }
    }
    return new int[][] {lefts.stream().mapToInt(Integer::intValue).toArray(),
        rights.stream().mapToInt(Integer::intValue).toArray()};
  }

  /** Rank table from a segmenter's merge list (data only). */
  static Map<List<Integer>, Integer> ranks(BpeSegmenter seg) {
    Map<List<Integer>, Integer> m = new HashMap<>();
    for (int r = 0; r < seg.mergeCount(); r++) {
      m.put(List.of(seg.mergeLeft(r), seg.mergeRight(r)), r);
    }
    return m;
  }

  /** Textbook encoder: lowest-ranked adjacent pair, leftmost first, until none. */
  static int[] encode(byte[] utf8, int k, Map<List<Integer>, Integer> ranks) {
    List<Integer> syms = new ArrayList<>();
    for (byte b : utf8) {
      syms.add(k + (b & 0xFF));
    }
    while (true) {
      int bestAt = -1;
      int bestRank = Integer.MAX_VALUE;
      for (int i = 0; i + 1 < syms.size(); i++) {
        Integer r = ranks.get(List.of(syms.get(i), syms.get(i + 1)));
        if (r != null && r < bestRank) {
          bestRank = r;
          bestAt = i;
        }
      }
      if (bestAt < 0) {
        break;
      }
      syms.set(bestAt, k + 256 + bestRank);
      syms.remove(bestAt + 1);
    }
    return syms.stream().mapToInt(Integer::intValue).toArray();
  }
}
