package dev.morsel.tokenize.normalize;

import java.util.Arrays;

/**
 * Compact alignment between an output string and an input range, stored as contiguous chunks.
 *
 * <p>Chunk {@code k} covers output {@code [out[k], out[k+1])} and input {@code [in[k], in[k+1])};
 * {@code out[size]} and {@code in[size]} are sentinels (output length, input range end). A chunk is
 * either <em>one-to-one</em> ({@code pos[k]}: equal lengths, output char {@code j} maps to input char
 * {@code j}) or <em>whole</em> (every output char maps to the whole input chunk). A whole chunk with
 * an empty output range stands for removed input characters, which no output char covers. Chunks are
 * contiguous in both coordinates, so coverage of the input range is built in.
 *
 * <p>Three primitive arrays, no object per char or per chunk. Adjacent one-to-one chunks are merged
 * as they are added. Mutable while built, then handed to an immutable {@link NormalizedText}.
 */
final class Chunks {
  /** Initial capacity in chunks; small because most texts need one or a handful. */
  private static final int INITIAL_CAPACITY = 8;

  int[] out;
  int[] in;
  boolean[] pos;
  int size;

  Chunks(int capacity) {
    int cap = Math.max(INITIAL_CAPACITY, capacity) + 1;
    out = new int[cap];
    in = new int[cap];
    pos = new boolean[cap];
  }

  /**
   * Starts a new chunk at output {@code outStart} and input {@code inStart}; the previous chunk
   * ends there. A one-to-one chunk following a one-to-one chunk is merged into it.
   */
  void add(int outStart, int inStart, boolean oneToOne) {
    int n = size;
    if (oneToOne && n > 0 && pos[n - 1]) {
      return;
    }
    if (n + 1 >= out.length) {
      int cap = out.length * 2;
      out = Arrays.copyOf(out, cap);
      in = Arrays.copyOf(in, cap);
      pos = Arrays.copyOf(pos, cap);
    }
    out[n] = outStart;
    in[n] = inStart;
    pos[n] = oneToOne;
    size = n + 1;
  }

  /** Writes the sentinels: the output length and the input range end. */
  void finish(int outEnd, int inEnd) {
    out[size] = outEnd;
    in[size] = inEnd;
  }

  /** Index of the chunk holding output char {@code i} (0 <= i < out[size]); skips empty chunks. */
  int find(int i) {
    int lo = 0;
    int hi = size - 1;
    // last k with out[k] <= i: chunks removed before i share out[k] with the chunk that holds i
    while (lo < hi) {
      int mid = (lo + hi + 1) >>> 1;
      if (out[mid] <= i) {
        lo = mid;
      } else {
        hi = mid - 1;
      }
    }
    return lo;
  }

  /**
   * As {@link #find(int)}, starting from chunk {@code hint} (the answer for an earlier, smaller
   * index): a forward scan when {@code i} has not moved back, so a run of queries in order costs
   * O(chunks + queries) in all; a binary search otherwise.
   */
  int find(int i, int hint) {
    if (hint < 0 || hint >= size || out[hint] > i) {
      return find(i);
    }
    int k = hint;
    final int[] o = out;
    final int last = size - 1;
    while (k < last && o[k + 1] <= i) {
      k++;
    }
    return k;
  }

  /**
   * Composes two alignments: {@code a} maps a middle string to the original, {@code b} maps the
   * final string to the middle string ({@code b}'s input coordinates are {@code a}'s output
   * coordinates; {@code b} never has an empty input chunk). The result maps final to original.
   *
   * <p>The middle string is cut into pieces at every boundary of either alignment. A piece that is
   * one-to-one in both stays one-to-one. Any other piece starts a group that grows until a point
   * that is a cut of both alignments (a chunk boundary, or a point inside a one-to-one chunk); the
   * group becomes one whole chunk. Removed chunks of {@code a} that fall inside a group are folded
   * into it; others stay removed chunks. Linear in the number of chunks.
   */
  static Chunks compose(Chunks a, Chunks b) {
    Chunks r = new Chunks(Math.max(a.size, b.size));
    int m = a.out[a.size];
    int ka = 0;
    int kb = 0;
    int x = 0;
    boolean group = false;
    while (true) {
      while (ka < a.size && a.out[ka] == x && a.out[ka + 1] == x) {
        if (!group) {
          r.add(finalPos(b, kb, x), a.in[ka], false);
        }
        ka++;
      }
      if (x >= m) {
        break;
      }
      int aEnd = a.out[ka + 1];
      int bEnd = b.in[kb + 1];
      int q = Math.min(aEnd, bEnd);
      boolean same = a.pos[ka] && b.pos[kb];
      if (!group) {
        r.add(finalPos(b, kb, x), origPos(a, ka, x), same);
        group = !same;
      }
      x = q;
      boolean aCut = aEnd == q;
      boolean bCut = bEnd == q;
      if (aCut) {
        ka++;
      }
      if (bCut) {
        kb++;
      }
      if (group && (x >= m || ((aCut || a.pos[ka]) && (bCut || b.pos[kb])))) {
        group = false;
      }
    }
    r.finish(b.out[b.size], a.in[a.size]);
    return r;
  }

  private static int finalPos(Chunks b, int kb, int x) {
    if (kb >= b.size) {
      return b.out[b.size];
    }
    return b.pos[kb] ? b.out[kb] + (x - b.in[kb]) : b.out[kb];
  }

  private static int origPos(Chunks a, int ka, int x) {
    return a.pos[ka] ? a.in[ka] + (x - a.out[ka]) : a.in[ka];
  }
}
