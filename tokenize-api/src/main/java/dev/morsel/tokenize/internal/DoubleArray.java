package dev.morsel.tokenize.internal;

import java.util.Arrays;

/**
 * Places the nodes of a trie over UTF-16 units in a double array (Aoe 1989, "An efficient digital
 * search algorithm by using a double-array structure", IEEE Trans. Software Eng. 15(9)): every node
 * gets a slot and a base, and the child of the node in slot {@code s} labelled {@code c} is in slot
 * {@code base[s] + code(c)} exactly when that slot's {@code check} is {@code s + 1}. A step is then one
 * array read, and the segmenters lay a node's own fields (value, failure link) beside its check and base
 * so the read brings them along.
 *
 * <p>Chars are numbered by how many nodes they label, most first, so the children of busy nodes sit
 * close together. Nodes are placed breadth-first from the roots (each root in slot {@code 0, 1, ...} in
 * order) at the first base that fits among at most {@link #PLACEMENT_TRIES} free slots, else past the
 * end. The arrays are padded so that {@code base[s] + code} stays inside them for any node and any code
 * of the alphabet: lookups need no bounds test of their own.
 *
 * <p>Size is bounded: a placement that would need more than {@link #SPARSE_LIMIT} slots per node (plus
 * one alphabet) is abandoned and {@link #place} returns null, and the caller keeps a layout that is
 * linear in the nodes whatever the keys (a hashed transition table). Build time is
 * O(nodes × PLACEMENT_TRIES × children) in the worst case.
 *
 * @since 0.1.0
 */
public final class DoubleArray {
  /** Free slots tried for a node before it is placed past the end. */
  public static final int PLACEMENT_TRIES = 256;

  /** Most slots per node (plus one alphabet and a constant) before the placement is abandoned. */
  public static final int SPARSE_LIMIT = 4;

  private final int[] slotOf;
  private final int[] base;
  private final int[] check;
  private final char[] code;

  private DoubleArray(int[] slotOf, int[] base, int[] check, char[] code) {
    this.slotOf = slotOf;
    this.base = base;
    this.check = check;
    this.code = code;
  }

  /**
   * Places nodes {@code 0 .. n-1}, where node {@code v} hangs off {@code parent[v]} along {@code edge[v]}
   * ({@code parent[v] < 0} for a root; no two children of one node share a label). Returns null if the
   * array would be too sparse.
   *
   * @throws IllegalArgumentException if a node's parent is out of range
   */
  public static DoubleArray place(int n, int[] parent, char[] edge) {
    // children grouped by parent (counting sort), roots in node order
    int[] childStart = new int[n + 1];
    int roots = 0;
    int maxChar = 0;
    int[] freq = new int[65536];
    for (int v = 0; v < n; v++) {
      int p = parent[v];
      if (p < 0) {
        roots++;
        continue;
      }
      if (p >= n) {
        throw new IllegalArgumentException("node " + v + " has parent " + p + " outside [0, " + n + ")");
      }
      childStart[p + 1]++;
      freq[edge[v]]++;
      maxChar = Math.max(maxChar, edge[v]);
    }
    for (int v = 0; v < n; v++) {
      childStart[v + 1] += childStart[v];
    }
    int[] children = new int[childStart[n]];
    int[] fill = Arrays.copyOf(childStart, n);
    int[] queue = new int[n];
    int tail = 0;
    for (int v = 0; v < n; v++) {
      if (parent[v] < 0) {
        queue[tail++] = v;
      } else {
        children[fill[parent[v]]++] = v;
      }
    }
    // number the chars: most frequent label first, ties by char
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

    long limit = Math.min((long) SPARSE_LIMIT * n + alphabet + 64, (Integer.MAX_VALUE - 64) / 4 - alphabet - 1);
    int size = (int) Math.min(limit, Math.max(64L, (long) n + alphabet + 1));
    if (size < roots) {
      return null;
    }
    int[] check = new int[size]; // parent slot + 1; 0 = free
    int[] base = new int[size];
    int[] free = new int[size + 1]; // free[p] == p: free; else a slot at or before the next free one
    for (int p = 0; p <= size; p++) {
      free[p] = p;
    }
    int[] slotOf = new int[n];
    for (int r = 0; r < roots; r++) {
      slotOf[queue[r]] = r;
      check[r] = Integer.MIN_VALUE; // taken, and equal to no slot + 1
      free[r] = r + 1;
    }
    int used = roots; // one past the highest taken slot
    int[] childCodes = new int[Math.max(1, alphabet)];
    for (int head = 0; head < tail; head++) {
      int v = queue[head];
      int s = slotOf[v];
      int from = childStart[v];
      int to = childStart[v + 1];
      if (from == to) {
        continue; // base 0: every step from here fails on the check
      }
      int m = to - from;
      int minCode = Integer.MAX_VALUE;
      for (int q = 0; q < m; q++) {
        childCodes[q] = code[edge[children[from + q]]];
        minCode = Math.min(minCode, childCodes[q]);
      }
      int b = -1;
      int p = nextFree(free, 0);
      for (int tries = 0; p < size && tries < PLACEMENT_TRIES; tries++, p = nextFree(free, p + 1)) {
        int cand = p - minCode;
        if (cand < 0) {
          continue;
        }
        boolean fits = true;
        for (int q = 0; q < m; q++) {
          int t = cand + childCodes[q];
          if (t < size && check[t] != 0) {
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
        check = Arrays.copyOf(check, grown);
        base = Arrays.copyOf(base, grown);
        free = Arrays.copyOf(free, grown + 1);
        for (int t = size + 1; t <= grown; t++) {
          free[t] = t;
        }
        size = grown;
      }
      base[s] = b;
      for (int q = 0; q < m; q++) {
        int c = children[from + q];
        int t = b + childCodes[q];
        check[t] = s + 1;
        slotOf[c] = t;
        free[t] = t + 1;
        used = Math.max(used, t + 1);
        queue[tail++] = c;
      }
    }
    int slots = used + alphabet + 1; // padding: base + any code stays inside
    int[] outCheck = new int[slots];
    int[] outBase = new int[slots];
    int keep = Math.min(slots, size);
    System.arraycopy(check, 0, outCheck, 0, keep);
    System.arraycopy(base, 0, outBase, 0, keep);
    for (int r = 0; r < roots; r++) {
      outCheck[r] = 0; // no step lands on a root: codes start at 1 and only children are placed
    }
    return new DoubleArray(slotOf, outBase, outCheck, code);
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

  /**
   * One step in a double array laid out by a segmenter as {@code width} ints a slot, check first and
   * base second: the slot of the child of {@code node} labelled {@code c}, or -1.
   */
  public static int step(int[] slots, int width, char[] code, int node, char c) {
    if (c >= code.length) {
      return -1;
    }
    int k = code[c];
    if (k == 0) {
      return -1;
    }
    int s = slots[width * node + 1] + k;
    return slots[width * s] == node + 1 ? s : -1;
  }

  /** Number of slots, padding included. */
  public int slots() {
    return base.length;
  }

  /** The slot of node {@code v}. */
  public int slot(int v) {
    return slotOf[v];
  }

  /**
   * The array a segmenter steps through with {@link #step}: {@code width} ints a slot ({@code width >= 2}),
   * check first and base second; the other ints of each slot are 0, for the caller's own fields.
   */
  public int[] layout(int width) {
    if (width < 2) {
      throw new IllegalArgumentException("width=" + width + " leaves no room for check and base");
    }
    int slots = base.length;
    int[] out = new int[width * slots];
    for (int s = 0; s < slots; s++) {
      out[width * s] = check[s];
      out[width * s + 1] = base[s];
    }
    return out;
  }

  /** The char numbering: {@code code()[c]} is c's code (1 ..), 0 for a char that labels no node. */
  public char[] code() {
    return code.clone();
  }
}
