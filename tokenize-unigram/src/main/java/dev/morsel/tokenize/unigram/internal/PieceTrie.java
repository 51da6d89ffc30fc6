package dev.morsel.tokenize.unigram.internal;

import java.util.Arrays;

/**
 * A read-only prefix trie over UTF-16 strings, laid out breadth-first in primitive arrays: the
 * children of node {@code k} are nodes {@code first[k] .. first[k+1]-1}, sorted by their label
 * char, so a step is a binary search (a direct 128-entry table for ASCII at the root). Memory is
 * 10 bytes per node (char label, int value, int first-child index). Immutable and thread-safe.
 */
final class PieceTrie {
  /** Below this many children a linear scan beats binary search (common practice: a cache line of chars). */
  private static final int LINEAR_SCAN = 8;

  private final char[] label;
  private final int[] value;
  private final int[] first;
  private final int[] rootAscii = new int[128];
  private final int maxDepth;

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
    int lo = first[node];
    int hi = first[node + 1] - 1;
    if (hi - lo < LINEAR_SCAN) {
      for (int i = lo; i <= hi; i++) {
        if (label[i] == c) {
          return i;
        }
      }
      return -1;
    }
    while (lo <= hi) {
      int mid = (lo + hi) >>> 1;
      char m = label[mid];
      if (m < c) {
        lo = mid + 1;
      } else if (m > c) {
        hi = mid - 1;
      } else {
        return mid;
      }
    }
    return -1;
  }
}
