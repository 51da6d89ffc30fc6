package dev.morsel.tokenize.internal;

/**
 * A read-only table from whole pieces (strings of at most {@link #MAX_CHARS} UTF-16 units) to the one
 * token id each piece segments to, built once with the segmenter. The segmenter decides which
 * strings qualify; it looks a piece up here before doing its own work and must get the same answer
 * either way. Immutable and thread-safe: it is never written after construction, so threads share it
 * without races and without the cache-line traffic of a written cache.
 *
 * <p>Layout: open addressing with linear probing at load at most 1/2, one long per slot
 * ({@code hash << 32 | recordStart}, -1 for an empty slot), and one char pool of records (length, id
 * low and high half, then the chars). A probe reads eight bytes; a piece that is not a key (a quarter
 * of Europarl pieces, which then go on to the segmenter) almost always stops at the first slot whose
 * hash differs, so the table a miss touches is half the size it was with two longs per slot. The hash
 * is fixed, not seeded: the keys come from the model, so crafted text can cause at most the probes of
 * the model's own clusters.
 *
 * <p>Shared by the segmenters: a piece that is one whole token (about three quarters of Europarl pieces
 * under the class-run splitter) is answered with one probe instead of merging, a trie walk or Viterbi.
 *
 * @since 0.1.0
 */
public final class PieceTable {
  /**
   * Longest key, in UTF-16 units. Pieces of at most 32 units are 99.9% of the Europarl bodies' pieces
   * under the class-run splitter; longer ones skip the table.
   */
  public static final int MAX_CHARS = 32;

  private final long[] slots;
  private final char[] pool;
  private final int size;

  private PieceTable(long[] slots, char[] pool, int size) {
    this.slots = slots;
    this.pool = pool;
    this.size = size;
  }

  /**
   * A table of {@code pieces[id] -> id} for every non-null entry; entries longer than
   * {@link #MAX_CHARS} or equal to an earlier entry are left out.
   */
  public static PieceTable of(String[] pieces) {
    int count = 0;
    long chars = 0;
    for (String p : pieces) {
      if (p != null && !p.isEmpty() && p.length() <= MAX_CHARS) {
        count++;
        chars += p.length();
      }
    }
    int cap = Integer.highestOneBit(Math.max(4, count) * 2 - 1) << 1; // load at most 1/2
    long[] slots = new long[cap];
    java.util.Arrays.fill(slots, -1L);
    if (chars + 3L * count > Integer.MAX_VALUE - 8) {
      throw new IllegalArgumentException("pieces hold " + chars + " chars; the table holds at most 2^31");
    }
    char[] pool = new char[(int) (chars + 3L * count)];
    int at = 0;
    int size = 0;
    PieceTable t = new PieceTable(slots, pool, 0);
    for (int id = 0; id < pieces.length; id++) {
      String p = pieces[id];
      if (p == null || p.isEmpty() || p.length() > MAX_CHARS || t.find(p, 0, p.length()) >= 0) {
        continue;
      }
      pool[at] = (char) p.length();
      pool[at + 1] = (char) id;
      pool[at + 2] = (char) (id >>> 16);
      p.getChars(0, p.length(), pool, at + 3);
      int h = hash(p, 0, p.length());
      int i = h & (cap - 1);
      while (slots[i] != -1L) {
        i = (i + 1) & (cap - 1);
      }
      slots[i] = ((long) h << 32) | at;
      at += 3 + p.length();
      size++;
    }
    return new PieceTable(slots, pool, size);
  }

  /** Number of keys. */
  public int size() {
    return size;
  }

  /** The id of the piece {@code text[start, end)}, or -1 if it is not a key. */
  public int find(CharSequence text, int start, int end) {
    int len = end - start;
    if (len > MAX_CHARS) {
      return -1;
    }
    int h = hash(text, start, end);
    final long[] sl = slots;
    int mask = sl.length - 1;
    for (int i = h & mask; ; i = (i + 1) & mask) {
      long e = sl[i];
      if (e == -1L) {
        return -1;
      }
      if ((int) (e >>> 32) == h) {
        int at = (int) e;
        final char[] p = pool;
        if (p[at] == len && same(text, start, p, at + 3, len)) {
          return p[at + 1] | p[at + 2] << 16;
        }
      }
    }
  }

  private static boolean same(CharSequence text, int start, char[] p, int at, int len) {
    for (int i = 0; i < len; i++) {
      if (p[at + i] != text.charAt(start + i)) {
        return false;
      }
    }
    return true;
  }

  /** Multiplicative hash of the chars (odd multiplier near 2^32 / golden ratio), final bits folded down. */
  private static int hash(CharSequence text, int start, int end) {
    int h = 0x2545F491;
    for (int i = start; i < end; i++) {
      h = (h ^ text.charAt(i)) * 0x9E3779B1;
    }
    return h ^ (h >>> 15);
  }
}
