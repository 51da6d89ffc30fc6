package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.split.Splitting;
import java.util.Arrays;
import java.util.List;

/**
 * The ceiling of per-piece segmentation: every distinct piece of a corpus with its tokens (ids and
 * piece-relative spans), precomputed from a real segmenter's output and held in two flat arrays, so
 * that answering a piece is one hash over its chars, one probe of a slot array (linear probing, at
 * most half full; a slot holds the hash and the record's offset side by side), one compare against
 * the record and a copy of its tokens. A record is contiguous ({@code [chars, tokens, chars packed
 * two per int..., (id, start << 16 | end) per token]}), so a lookup touches the slot's cache line
 * and the record's one or two. No trie, no merge, no object: a segmenter has to do at least this
 * much for a piece it knows by heart, so no per-piece segmenter can beat it.
 */
final class IdealTable {
  private final int[] records;
  private final long[] slots; // hash << 32 | (record offset + 1); 0 = empty
  private final int mask;

  private IdealTable(int[] records, long[] slots) {
    this.records = records;
    this.slots = slots;
    this.mask = slots.length - 1;
  }

  /** The table of every distinct piece of {@code texts} under {@code splitting}, answered by {@code segmenter}. */
  static IdealTable build(List<String> texts, Splitting splitting, Segmenter segmenter) {
    java.util.LinkedHashMap<String, int[]> pieces = new java.util.LinkedHashMap<>();
    long[] total = {0};
    for (String t : texts) {
      splitting.split(t, 0, t.length(), (a, b) -> {
        total[0]++;
        pieces.computeIfAbsent(t.substring(a, b), p -> {
          int[][] acc = {new int[8]};
          int[] n = {0};
          segmenter.segment(p, 0, p.length(), (id, s, e) -> {
            if (n[0] + 2 > acc[0].length) {
              acc[0] = Arrays.copyOf(acc[0], acc[0].length * 2);
            }
            acc[0][n[0]++] = id;
            acc[0][n[0]++] = s << 16 | e;
          });
          return Arrays.copyOf(acc[0], n[0]);
        });
      });
    }
    long size = 0;
    for (java.util.Map.Entry<String, int[]> e : pieces.entrySet()) {
      if (e.getKey().length() > 0xFFFF) {
        throw new IllegalArgumentException("a piece of " + e.getKey().length() + " chars does not fit the 16-bit spans");
      }
      size += 2 + (e.getKey().length() + 1) / 2 + e.getValue().length;
    }
    int[] records = new int[Math.toIntExact(size)];
    int cap = Integer.highestOneBit(Math.max(4, pieces.size() * 2 - 1)) << 1;
    long[] slots = new long[cap];
    int r = 0;
    long tokens = 0;
    for (java.util.Map.Entry<String, int[]> en : pieces.entrySet()) {
      String p = en.getKey();
      int[] v = en.getValue();
      int at = r;
      records[r++] = p.length();
      records[r++] = v.length / 2;
      for (int i = 0; i < p.length(); i += 2) {
        records[r++] = p.charAt(i) | (i + 1 < p.length() ? p.charAt(i + 1) << 16 : 0);
      }
      System.arraycopy(v, 0, records, r, v.length);
      r += v.length;
      tokens += v.length / 2;
      int h = hash(p, 0, p.length());
      int s = h & (cap - 1);
      while (slots[s] != 0) {
        s = (s + 1) & (cap - 1);
      }
      slots[s] = (long) h << 32 | (at + 1);
    }
    System.err.printf(java.util.Locale.ROOT, "ideal table: %d pieces, %d distinct, %d tokens, %.1f MiB of arrays%n",
        total[0], pieces.size(), tokens, (4.0 * records.length + 8.0 * cap) / 1048576.0);
    return new IdealTable(records, slots);
  }

  static int hash(String s, int from, int to) {
    int h = to - from;
    for (int i = from; i < to; i++) {
      h = 31 * h + s.charAt(i);
    }
    h *= 0x9E3779B9; // Fibonacci hashing (Knuth, TAOCP vol. 3, section 6.4) ...
    return h ^ (h >>> 15); // ... whose good bits are the high ones: fold them into the low ones the slots use
  }

  /**
   * Writes the tokens of {@code text[from, to)} at {@code out*[at...]} with absolute spans; returns
   * the new count, or -1 if the piece is not in the table.
   */
  int emit(String text, int from, int to, int[] outIds, int[] outStarts, int[] outEnds, int at) {
    final int h = hash(text, from, to);
    final int len = to - from;
    final long[] sl = slots;
    final int[] rec = records;
    int s = h & mask;
    while (true) {
      long v = sl[s];
      if (v == 0) {
        return -1;
      }
      if ((int) (v >>> 32) == h) {
        int r = (int) v - 1;
        if (rec[r] == len && same(text, from, len, r + 2)) {
          int n = rec[r + 1];
          int t = r + 2 + (len + 1) / 2;
          for (int j = 0; j < n; j++, t += 2) {
            int sp = rec[t + 1];
            outIds[at] = rec[t];
            outStarts[at] = from + (sp >>> 16);
            outEnds[at] = from + (sp & 0xFFFF);
            at++;
          }
          return at;
        }
      }
      s = (s + 1) & mask;
    }
  }

  private boolean same(String text, int from, int len, int k) {
    final int[] rec = records;
    for (int i = 0; i < len; i += 2) {
      int w = rec[k + (i >>> 1)];
      if ((char) w != text.charAt(from + i) || (i + 1 < len && (char) (w >>> 16) != text.charAt(from + i + 1))) {
        return false;
      }
    }
    return true;
  }
}
