package dev.morsel.tokenize.unigram.internal;

import java.util.Arrays;

/**
 * A read-only prefix trie over UTF-16 strings. Immutable and thread-safe.
 *
 * <p>Layout: a double array (Aoe 1989, "An efficient digital search algorithm by using a double-array
 * structure", IEEE TSE 15(9)). Every node is a slot of three ints in one {@code int[]}: the slot of its
 * parent plus one (0 for a free slot), its base, and its value. The child of node {@code s} labelled
 * {@code c} is slot {@code base(s) + code(c)} if that slot's parent is {@code s}: one array read that
 * brings the child's value along in the same cache line, where a hash probe needed one read for the
 * probe and one for the value. Chars are numbered by how many nodes they label (most frequent first),
 * so the children of busy nodes sit close together. Nodes are placed breadth-first at the first base
 * that fits, trying at most {@link #PLACEMENT_TRIES} free slots before placing a node past the end.
 *
 * <p>If the double array would grow past {@link #SPARSE_LIMIT} slots per node (a model whose nodes have
 * children far apart in the char numbering), the trie falls back to an open-addressing table keyed by
 * (node, char), which is linear in the nodes whatever the keys. Either way the work per step is fixed
 * at build time, whatever text is looked up.
 */
final class PieceTrie {
  /** Free slots tried for a node before it is placed past the end of the array. */
  static final int PLACEMENT_TRIES = 256;

  /** The double array is used while it holds at most this many slots per node (plus one alphabet). */
  static final int SPARSE_LIMIT = 4;

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
    Placed built = hashed ? null : doubleArray(lab, fst, val, next);
    if (built != null) {
      this.da = built.slots();
      this.codeOf = built.code();
      this.rootAscii = new int[128];
      Arrays.fill(rootAscii, -1);
      for (int c = 0; c < 128 && c < codeOf.length; c++) {
        if (codeOf[c] != 0) {
          int s = da[1] + codeOf[c];
          if (s < da.length / 3 && da[3 * s] == 1) {
            rootAscii[c] = s;
          }
        }
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

  /** A placed double array and its char numbering. */
  private record Placed(int[] slots, char[] code) {}

  /** Places the nodes in a double array; null if it would be too sparse. */
  private static Placed doubleArray(char[] lab, int[] fst, int[] val, int count) {
    // number the chars by how many nodes they label, most first (ties by char)
    int maxChar = 0;
    int[] freq = new int[65536];
    for (int k = 1; k < count; k++) {
      freq[lab[k]]++;
      maxChar = Math.max(maxChar, lab[k]);
    }
    int alphabet = 0;
    for (int c = 0; c <= maxChar; c++) {
      if (freq[c] > 0) {
        alphabet++;
      }
    }
    Integer[] order = new Integer[alphabet];
    for (int c = 0, i = 0; c <= maxChar; c++) {
      if (freq[c] > 0) {
        order[i++] = c;
      }
    }
    Arrays.sort(order, (a, b) -> freq[a] != freq[b] ? Integer.compare(freq[b], freq[a]) : Integer.compare(a, b));
    char[] code = new char[maxChar + 1];
    for (int i = 0; i < alphabet; i++) {
      code[order[i]] = (char) (i + 1);
    }
    long limit = Math.min((long) SPARSE_LIMIT * count + alphabet + 64, (Integer.MAX_VALUE - 64) / 3 - alphabet - 1);
    int size = (int) Math.min(limit, Math.max(64L, (long) count + alphabet + 1));
    int[] parent = new int[size]; // parent slot + 1; 0 = free
    int[] base = new int[size];
    int[] value = new int[size];
    int[] free = new int[size + 1]; // free[p] == p: free; else a slot at or before the next free one
    Arrays.fill(value, -1);
    for (int p = 0; p <= size; p++) {
      free[p] = p;
    }
    parent[0] = Integer.MIN_VALUE; // the root: taken, and equal to no parent + 1
    free[0] = 1;
    value[0] = val[0];
    int used = 1; // one past the highest taken slot
    int[] slotOf = new int[count];
    int[] childCodes = new int[Math.max(1, alphabet)];
    for (int k = 0; k < count; k++) {
      int s = slotOf[k];
      int from = fst[k];
      int to = fst[k + 1];
      if (from == to) {
        continue; // base 0: every child test fails on the parent check
      }
      int m = to - from;
      int minCode = Integer.MAX_VALUE;
      for (int c = from; c < to; c++) {
        childCodes[c - from] = code[lab[c]];
        minCode = Math.min(minCode, childCodes[c - from]);
      }
      int b = -1;
      int p = nextFree(free, 1);
      for (int tries = 0; p < size && tries < PLACEMENT_TRIES; tries++, p = nextFree(free, p + 1)) {
        int cand = p - minCode;
        if (cand < 0) {
          continue;
        }
        boolean fits = true;
        for (int q = 0; q < m; q++) {
          int t = cand + childCodes[q];
          if (t < size && parent[t] != 0) {
            fits = false;
            break;
          }
        }
        if (fits) {
          b = cand;
          break;
        }
      }
      if (b < 0) {
        b = Math.max(0, used - minCode); // past every taken slot: always fits
      }
      int maxSlot = 0;
      for (int q = 0; q < m; q++) {
        maxSlot = Math.max(maxSlot, b + childCodes[q]);
      }
      if (maxSlot + 1L > limit) {
        return null;
      }
      if (maxSlot >= size) {
        int grown = (int) Math.min(limit, Math.max(maxSlot + 1L, size * 3L / 2));
        parent = Arrays.copyOf(parent, grown);
        base = Arrays.copyOf(base, grown);
        value = Arrays.copyOf(value, grown);
        free = Arrays.copyOf(free, grown + 1);
        Arrays.fill(value, size, grown, -1);
        for (int t = size + 1; t <= grown; t++) {
          free[t] = t;
        }
        size = grown;
      }
      base[s] = b;
      for (int c = from; c < to; c++) {
        int t = b + code[lab[c]];
        parent[t] = s + 1;
        value[t] = val[c];
        slotOf[c] = t;
        free[t] = t + 1;
        used = Math.max(used, t + 1);
      }
    }
    // padded so that base + any code stays inside the array
    int slots = used + alphabet + 1;
    int[] out = new int[3 * slots];
    for (int s = 0; s < slots; s++) {
      boolean in = s < size;
      out[3 * s] = in && s > 0 ? parent[s] : 0;
      out[3 * s + 1] = in ? base[s] : 0;
      out[3 * s + 2] = in ? value[s] : -1;
    }
    return new Placed(out, code);
  }

  /** The first free slot at or after {@code p} (path halving keeps the walks short). */
  private static int nextFree(int[] free, int p) {
    while (free[p] != p) {
      int q = free[free[p]];
      free[p] = q;
      p = q;
    }
    return p;
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
      final char[] cd = codeOf;
      if (c >= cd.length) {
        return -1;
      }
      int code = cd[c];
      if (code == 0) {
        return -1;
      }
      int s = d[3 * node + 1] + code;
      return d[3 * s] == node + 1 ? s : -1;
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
