package dev.morsel.tokenize.unigram.internal;

import java.util.Arrays;

/**
 * A read-only prefix trie over UTF-16 strings, laid out breadth-first in primitive arrays: the
 * children of node {@code k} are nodes {@code first[k] .. first[k+1]-1}, sorted by their label
 * char. A step is one probe of an open-addressing table keyed by (node, char) (a direct 128-entry
 * table for ASCII at the root). The table is built once from the model, so the longest probe
 * sequence is fixed at build time whatever text is looked up. Memory: about 34 bytes per node
 * (label, value and first-child index, 10 bytes; table at load factor at most 1/2, 24 bytes).
 * Immutable and thread-safe.
 */
final class PieceTrie {
  /** Marks an empty table slot (no real key has all bits set: node ids are below 2^31). */
  private static final long EMPTY = -1L;

  private final char[] label;
  private final int[] value;
  private final int[] first;
  private final int[] rootAscii = new int[128];
  private final int maxDepth;
  /**
   * (key, child) in adjacent slots, so a probe reads one cache line instead of one in each of two
   * arrays. Viterbi's child lookups took 76% of the profile samples of a seg-only harness (split +
   * segment over the Europarl bodies, 32k model); this layout measured within noise there (19.6 /
   * 19.5 MB/s before, 17.4 / 20.5 after, shared 2-core machine).
   */
  private final long[] table;
  private final int mask;

  /**
   * Builds the trie of {@code keys} (distinct, non-empty), node values {@code values[i]} for key
   * {@code i}. Values must be {@code >= 0}.
   */
  PieceTrie(String[] keys, int[] values) {
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
    this.label = Arrays.copyOf(lab, next);
    this.value = Arrays.copyOf(val, next);
    this.first = Arrays.copyOf(fst, next + 1);
    this.maxDepth = depth;
    int tcap = Integer.highestOneBit(Math.max(4, next) * 2 - 1) * 2; // load factor at most 1/2
    this.table = new long[2 * tcap];
    this.mask = tcap - 1;
    for (int i = 0; i < table.length; i += 2) {
      table[i] = EMPTY;
    }
    for (int k = 0; k < next; k++) {
      for (int c = first[k]; c < first[k + 1]; c++) {
        long key = (long) k << 16 | label[c];
        int h = hash(key) & mask;
        while (table[2 * h] != EMPTY) {
          h = (h + 1) & mask;
        }
        table[2 * h] = key;
        table[2 * h + 1] = c;
      }
    }
    Arrays.fill(rootAscii, -1);
    for (int c = first[0]; c < first[1]; c++) {
      if (label[c] < 128) {
        rootAscii[label[c]] = c;
      }
    }
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
    return label.length;
  }

  /** The value at {@code node}, or -1 if no key ends there. */
  int value(int node) {
    return value[node];
  }

  /** The child of {@code node} labelled {@code c}, or -1. */
  int child(int node, char c) {
    if (node == 0 && c < 128) {
      return rootAscii[c];
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
