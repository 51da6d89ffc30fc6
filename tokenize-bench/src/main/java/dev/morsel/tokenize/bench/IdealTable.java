package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.split.Splitting;
import java.util.Arrays;
import java.util.List;

/**
 * The ceiling of per-piece segmentation: every distinct piece of a corpus with its tokens (ids and
 * piece-relative spans), precomputed from a real segmenter's output and held in flat arrays, so that
 * answering a piece is one hash over its chars, one probe (linear probing, at most half full), one
 * char compare and a copy of its tokens: no trie, no merge, no object. A segmenter has to do at least
 * this much for a piece it knows by heart, so no per-piece segmenter can beat it.
 */
final class IdealTable {
  private final char[] keys;
  private final int[] keyStart; // per entry, into keys; keyStart[e + 1] is its end
  private final int[] tokStart; // per entry, into ids/rel; tokStart[e + 1] is its end
  private final int[] ids;
  private final int[] rel; // (start << 16 | end) relative to the piece, per token
  private final int[] slots; // entry + 1, 0 = empty
  private final int[] slotHash;
  private final int mask;

  private IdealTable(char[] keys, int[] keyStart, int[] tokStart, int[] ids, int[] rel, int[] slots, int[] slotHash) {
    this.keys = keys;
    this.keyStart = keyStart;
    this.tokStart = tokStart;
    this.ids = ids;
    this.rel = rel;
    this.slots = slots;
    this.slotHash = slotHash;
    this.mask = slots.length - 1;
  }

  /** The table of every distinct piece of {@code texts} under {@code splitting}, answered by {@code segmenter}. */
  static IdealTable build(List<String> texts, Splitting splitting, Segmenter segmenter) {
    java.util.LinkedHashMap<String, int[]> pieces = new java.util.LinkedHashMap<>();
    long[] total = {0};
    for (String t : texts) {
      splitting.split(t, 0, t.length(), (a, b) -> total[0]++);
      splitting.split(t, 0, t.length(), (a, b) -> pieces.computeIfAbsent(t.substring(a, b), p -> {
        int[][] acc = {new int[8]};
        int[] n = {0};
        segmenter.segment(p, 0, p.length(), (id, s, e) -> {
          if (n[0] + 3 > acc[0].length) {
            acc[0] = Arrays.copyOf(acc[0], acc[0].length * 2);
          }
          acc[0][n[0]++] = id;
          acc[0][n[0]++] = s;
          acc[0][n[0]++] = e;
        });
        return Arrays.copyOf(acc[0], n[0]);
      }));
    }
    int entries = pieces.size();
    long chars = 0;
    long toks = 0;
    for (java.util.Map.Entry<String, int[]> e : pieces.entrySet()) {
      chars += e.getKey().length();
      toks += e.getValue().length / 3;
    }
    char[] keys = new char[Math.toIntExact(chars)];
    int[] keyStart = new int[entries + 1];
    int[] tokStart = new int[entries + 1];
    int[] ids = new int[Math.toIntExact(toks)];
    int[] rel = new int[ids.length];
    int cap = Integer.highestOneBit(Math.max(4, entries * 2 - 1)) << 1;
    int[] slots = new int[cap];
    int[] slotHash = new int[cap];
    int e = 0;
    int k = 0;
    int t = 0;
    for (java.util.Map.Entry<String, int[]> en : pieces.entrySet()) {
      String p = en.getKey();
      if (p.length() > 0xFFFF) {
        throw new IllegalArgumentException("a piece of " + p.length() + " chars does not fit the 16-bit spans");
      }
      p.getChars(0, p.length(), keys, k);
      keyStart[e] = k;
      k += p.length();
      tokStart[e] = t;
      int[] v = en.getValue();
      for (int j = 0; j < v.length; j += 3) {
        ids[t] = v[j];
        rel[t] = v[j + 1] << 16 | v[j + 2];
        t++;
      }
      int h = hash(p, 0, p.length());
      int s = h & (cap - 1);
      while (slots[s] != 0) {
        s = (s + 1) & (cap - 1);
      }
      slots[s] = e + 1;
      slotHash[s] = h;
      e++;
    }
    keyStart[e] = k;
    tokStart[e] = t;
    long tableBytes = 2L * keys.length + 4L * (keyStart.length + tokStart.length + ids.length + rel.length)
        + 8L * cap;
    System.err.printf(java.util.Locale.ROOT, "ideal table: %d pieces, %d distinct, %d tokens, %.1f MiB of arrays%n",
        total[0], entries, ids.length, tableBytes / 1048576.0);
    return new IdealTable(keys, keyStart, tokStart, ids, rel, slots, slotHash);
  }

  /** Number of distinct pieces. */
  int size() {
    return keyStart.length - 1;
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
    int h = hash(text, from, to);
    int s = h & mask;
    final int len = to - from;
    while (true) {
      int e = slots[s] - 1;
      if (e < 0) {
        return -1;
      }
      if (slotHash[s] == h) {
        int k = keyStart[e];
        if (keyStart[e + 1] - k == len && same(text, from, len, k)) {
          for (int j = tokStart[e], end = tokStart[e + 1]; j < end; j++) {
            int r = rel[j];
            outIds[at] = ids[j];
            outStarts[at] = from + (r >>> 16);
            outEnds[at] = from + (r & 0xFFFF);
            at++;
          }
          return at;
        }
      }
      s = (s + 1) & mask;
    }
  }

  private boolean same(String text, int from, int len, int k) {
    final char[] c = keys;
    for (int i = 0; i < len; i++) {
      if (c[k + i] != text.charAt(from + i)) {
        return false;
      }
    }
    return true;
  }
}
