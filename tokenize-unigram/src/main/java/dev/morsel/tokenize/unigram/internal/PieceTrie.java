package dev.morsel.tokenize.unigram.internal;

import dev.morsel.tokenize.internal.DoubleArray;
import java.util.Arrays;

/**
 * A read-only prefix trie over UTF-16 strings. Immutable and thread-safe.
 *
 * <p>Layout: a double array ({@link DoubleArray}); every node is a slot of three ints in one
 * {@code int[]}: check (parent slot + 1), base, value. The child of node {@code s} labelled {@code c} is
 * slot {@code base(s) + code(c)} if its check is {@code s + 1}: one array read that brings the child's
 * value along in the same cache line, where a hash probe needed one read for the probe and one for the
 * value (measured with the 32k Europarl model, a harness encoding the bodies in one process, best of 12
 * passes, runs alternating: 22.7, 26.0, 26.1 MB/s hashed against 37.0, 37.6, 40.4 MB/s).
 *
 * <p>If the double array would be too sparse ({@link DoubleArray#place} returns null), the trie keeps
 * an open-addressing table keyed by (node, char), linear in the nodes whatever the keys. Either way the
 * work per step is fixed at build time, whatever text is looked up.
 */
final class PieceTrie {
  /** Marks an empty table slot of the hashed layout (no real key has all bits set). */
  private static final long EMPTY = -1L;

  private final int maxDepth;
  private final int nodes;

  // double-array layout (null when hashed)
  private final int[] da;
  private final char[] codeOf;
  private final int[] rootAscii;

  // hashed layout (null when double-array)
  private final int[] value;
  private final long[] table;
  private final int mask;

  /**
   * Builds the trie of {@code keys} (distinct, non-empty), node values {@code values[i]} for key
   * {@code i}. Values must be {@code >= 0}.
   */
  PieceTrie(String[] keys, int[] values) {
    this(keys, values, false);
  }

  /** As {@link #PieceTrie(String[], int[])}; {@code hashed} forces the hashed layout (tests). */
  PieceTrie(String[] keys, int[] values, boolean hashed) {
    int n = keys.length;
    Integer[] boxed = new Integer[n];
    long chars = 1;
    int depth = 0;
    for (int i = 0; i < n; i++) {
      boxed[i] = i;
      chars += keys[i].length();
      depth = Math.max(depth, keys[i].length());
    }
    if (chars > Integer.MAX_VALUE - 8) {
      throw new IllegalArgumentException("pieces hold " + chars + " chars; the trie holds at most 2^31");
    }
    Arrays.sort(boxed, (a, b) -> keys[a].compareTo(keys[b]));
    String[] sorted = new String[n];
    int[] sortedValue = new int[n];
    for (int i = 0; i < n; i++) {
      sorted[i] = keys[boxed[i]];
      sortedValue[i] = values[boxed[i]];
    }
    // breadth-first node list: children of node k are first[k] .. first[k+1]-1, sorted by label
    int cap = (int) chars;
    char[] lab = new char[cap];
    int[] val = new int[cap];
    int[] fst = new int[cap + 1];
    int[] lo = new int[cap];
    int[] hi = new int[cap];
    int[] dep = new int[cap];
    Arrays.fill(val, -1);
    int next = 1;
    lo[0] = 0;
    hi[0] = n;
    for (int k = 0; k < next; k++) {
      int a = lo[k];
      int b = hi[k];
      int d = dep[k];
      if (a < b && sorted[a].length() == d) {
        val[k] = sortedValue[a];
        a++;
      }
      fst[k] = next;
      int i = a;
      while (i < b) {
        char c = sorted[i].charAt(d);
        int j = i + 1;
        while (j < b && sorted[j].charAt(d) == c) {
          j++;
        }
        lab[next] = c;
        lo[next] = i;
        hi[next] = j;
        dep[next] = d + 1;
        next++;
        i = j;
      }
    }
    fst[next] = next;
    this.maxDepth = depth;
    this.nodes = next;
    DoubleArray placed = hashed ? null : DoubleArray.place(next, parents(fst, next), lab);
    if (placed != null) {
      int[] d = placed.layout(3);
      for (int s = 0; s < d.length; s += 3) {
        d[s + 2] = -1;
      }
      for (int k = 0; k < next; k++) {
        d[3 * placed.slot(k) + 2] = val[k];
      }
      this.da = d;
      this.codeOf = placed.code();
      this.rootAscii = new int[128];
      for (char c = 0; c < 128; c++) {
        rootAscii[c] = DoubleArray.step(d, 3, codeOf, 0, c);
      }
      this.value = null;
      this.table = null;
      this.mask = 0;
    } else {
      this.da = null;
      this.codeOf = null;
      this.rootAscii = new int[128];
      this.value = Arrays.copyOf(val, next);
      int tcap = Integer.highestOneBit(Math.max(4, next) * 2 - 1) * 2; // load factor at most 1/2
      this.table = new long[2 * tcap];
      this.mask = tcap - 1;
      for (int i = 0; i < table.length; i += 2) {
        table[i] = EMPTY;
      }
      for (int k = 0; k < next; k++) {
        for (int c = fst[k]; c < fst[k + 1]; c++) {
          long key = (long) k << 16 | lab[c];
          int h = hash(key) & mask;
          while (table[2 * h] != EMPTY) {
            h = (h + 1) & mask;
          }
          table[2 * h] = key;
          table[2 * h + 1] = c;
        }
      }
      Arrays.fill(rootAscii, -1);
      for (int c = fst[0]; c < fst[1]; c++) {
        if (lab[c] < 128) {
          rootAscii[lab[c]] = c;
        }
      }
    }
  }

  /** The parent of every breadth-first node (children of k at first[k] .. first[k+1]-1); -1 for the root. */
  private static int[] parents(int[] fst, int count) {
    int[] parent = new int[count];
    parent[0] = -1;
    for (int k = 0; k < count; k++) {
      for (int c = fst[k]; c < fst[k + 1]; c++) {
        parent[c] = k;
      }
    }
    return parent;
  }

  /** The root node. */
  static int root() {
    return 0;
  }

  /** Longest key, in chars. */
  int maxDepth() {
    return maxDepth;
  }

  /** Number of nodes. */
  int nodes() {
    return nodes;
  }

  /** Slots of the double array, or 0 for the hashed layout (tests). */
  int slots() {
    return da == null ? 0 : da.length / 3;
  }

  /** Whether the trie uses the hashed layout (tests). */
  boolean hashed() {
    return da == null;
  }

  /** The value at {@code node}, or -1 if no key ends there. */
  int value(int node) {
    final int[] d = da;
    return d != null ? d[3 * node + 2] : value[node];
  }

  /** The child of {@code node} labelled {@code c}, or -1. */
  int child(int node, char c) {
    if (node == 0 && c < 128) {
      return rootAscii[c];
    }
    final int[] d = da;
    if (d != null) {
      return DoubleArray.step(d, 3, codeOf, node, c);
    }
    long key = (long) node << 16 | c;
    int h = hash(key) & mask;
    final long[] t = table;
    long k;
    while ((k = t[2 * h]) != key) {
      if (k == EMPTY) {
        return -1;
      }
      h = (h + 1) & mask;
    }
    return (int) t[2 * h + 1];
  }

  /** Mixes the key bits (the 64-bit finalizer of MurmurHash3, Appleby 2011). */
  private static int hash(long key) {
    long h = key * 0xFF51AFD7ED558CCDL;
    h ^= h >>> 33;
    return (int) (h ^ (h >>> 29));
  }
}
