package dev.morsel.tokenize.wordpiece.internal;

import dev.morsel.tokenize.internal.DoubleArray;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import java.util.Arrays;

/**
 * The LinMaxMatch automaton [3] over a WordPiece vocabulary: a trie over UTF-16 units with two
 * roots, failure links and failure pops, all in primitive arrays (no object per node). Immutable and
 * thread-safe once built.
 *
 * <p>Contract: {@link #match} yields exactly the greedy longest-match-first segmentation [2] of one
 * piece, or reports that the piece cannot be covered, in time linear in the piece length.
 *
 * <h2>Design</h2>
 *
 * <p>Word-initial token bodies hang off root {@link #ROOT}; continuation token bodies (without the
 * marker) hang off a second root {@link #CONT_ROOT}, which stands for the paper's marker node "r♯"
 * [3, §3]. A second root instead of a marker path keeps word-initial tokens that begin with the
 * marker's characters apart from continuation tokens.
 *
 * <p>For a node v with string s(v) the failure pops F(v) are the tokens that greedy longest-match
 * emits from the front of s(v) until the unconsumed rest r is (as a continuation) again a trie node;
 * the failure link f(v) is that node, or -1 when greedy matching gets stuck. They are computed in
 * order of depth, following [3, Algorithm 1]: if s(v) is a token, F(v) = [v], f(v) = CONT_ROOT;
 * otherwise, with v = child(u, c), F(v) = F(u) followed by F(z) for each z on the chain z = f(u),
 * f(f(u)), ... until child(z, c) exists, and f(v) = child(z, c). Matching follows [3, Algorithm 2]:
 * follow children; on a missing child emit F(node) and move to f(node); at the end of the piece pop
 * until the continuation root is reached. Every pop emits at least one token that covers at least
 * one unit, so a piece of n units takes O(n) steps.
 *
 * <p>Units are UTF-16 chars. Token bodies are well-formed UTF-16 (checked by the caller), so a
 * token never begins or ends inside a surrogate pair of the text, and a lone surrogate in the text
 * matches nothing.
 *
 * <p>Transitions live in a double array ({@link DoubleArray}: check and base of a node side by side,
 * one array read a step), node ids being slots; the ASCII children of both roots also sit in dense
 * 128-entry tables. A vocabulary that would make the double array too sparse keeps an
 * open-addressing table keyed by {@code node << 16 | char} (load at most 1/2, linear probing), which is
 * also what the automaton is built with. F(v) is stored as a run {@code [popStart[v], popStart[v] +
 * popLength[v])} of one shared {@code int[]}; the runs total at most the sum of node depths.
 *
 * <p>References: [2] Wu et al. (2016), "Google's Neural Machine Translation System", §4.1 (greedy
 * longest-match-first); [3] Song, Salcianu, Song, Dopson, Zhou (2021), "Fast WordPiece
 * Tokenization", EMNLP 2021, §3 (LinMaxMatch).
 */
final class LinMaxMatchTrie {
  /** Root of word-initial tokens. */
  static final int ROOT = 0;
  /** Root of continuation tokens (the marker node). */
  static final int CONT_ROOT = 1;
  /** Dense child tables cover chars below this (ASCII). */
  private static final int DENSE = 128;
  /**
   * Most failure-pop entries kept, in ints (128 MiB): the runs total at most the sum of node depths,
   * which a forged vocabulary of very long tokens could drive quadratic; such a vocabulary is refused.
   */
  static final int MAX_POPS = 1 << 25;
  /** Fibonacci hashing multiplier (2^64 / golden ratio), spreads (node, char) keys over the table. */
  private static final long MIX = 0x9E3779B97F4A7C15L;

  // ------------------------------------------------------------------ state

  // set while building (re-sized once by compactTable); never written after the constructor, and
  // published through the segmenter's final field
  private long[] table; // (key, child) pairs in adjacent slots; key -1 = empty
  private int shift;
  private int mask;
  private final int[] rootAscii;
  private final int[] contAscii;
  // written while building (renumbered to slots at the end), never after the constructor
  private int[] fail;
  private int[] popStart;
  private int[] popLength;
  // the double array (check, base per slot, side by side), or null for the hashed layout; node ids are
  // then slots
  private final int[] da;
  private final char[] code;
  private final int[] pops;
  private final int nodeCount;

  // ------------------------------------------------------------------ life-cycle

  /**
   * Builds the automaton.
   *
   * @param bodies token bodies (continuation bodies without the marker), indexed by token id; {@code
   *     null} for ids that are not matched (reserved and unknown tokens)
   * @param continuation whether each id is a continuation token
   * @param maxLength bodies longer than this (in UTF-16 units) can never match a piece and are left
   *     out
   * @throws IllegalArgumentException if the vocabulary is too large for the automaton's limits
   */
  LinMaxMatchTrie(String[] bodies, boolean[] continuation, int maxLength) {
    this(bodies, continuation, maxLength, false);
  }

  /** As {@link #LinMaxMatchTrie(String[], boolean[], int)}; {@code hashed} keeps the hashed layout (tests). */
  LinMaxMatchTrie(String[] bodies, boolean[] continuation, int maxLength, boolean hashed) {
    long totalChars = 0;
    for (String b : bodies) {
      if (b != null && b.length() <= maxLength) {
        totalChars += b.length();
      }
    }
    if (totalChars > (1 << 28)) {
      throw new IllegalArgumentException("vocabulary holds " + totalChars + " chars; at most " + (1 << 28)
          + " are supported");
    }
    int maxNodes = (int) totalChars + 2;
    allocateTable(maxNodes);

    int[] tokenAt = new int[maxNodes];
    Arrays.fill(tokenAt, -1);
    int[] parent = new int[maxNodes];
    char[] edge = new char[maxNodes];
    int[] depth = new int[maxNodes];
    int n = 2;
    int maxDepth = 0;
    for (int id = 0; id < bodies.length; id++) {
      String b = bodies[id];
      if (b == null || b.length() > maxLength) {
        continue;
      }
      int node = continuation[id] ? CONT_ROOT : ROOT;
      for (int i = 0; i < b.length(); i++) {
        char c = b.charAt(i);
        int next = lookup(node, c);
        if (next < 0) {
          next = n++;
          insert(node, c, next);
          parent[next] = node;
          edge[next] = c;
          depth[next] = depth[node] + 1;
          maxDepth = Math.max(maxDepth, depth[next]);
        }
        node = next;
      }
      tokenAt[node] = id;
    }
    nodeCount = n;
    compactTable(n);

    // nodes in order of depth (counting sort), so that f(.) of shallower nodes is ready
    int[] byDepthStart = new int[maxDepth + 2];
    for (int v = 2; v < n; v++) {
      byDepthStart[depth[v] + 1]++;
    }
    for (int d = 1; d < byDepthStart.length; d++) {
      byDepthStart[d] += byDepthStart[d - 1];
    }
    int[] order = new int[n - 2];
    for (int v = 2; v < n; v++) {
      order[byDepthStart[depth[v]]++] = v;
    }

    int[] fail = new int[n];
    int[] popStart = new int[n];
    int[] popLength = new int[n];
    this.fail = fail;
    this.popStart = popStart;
    this.popLength = popLength;
    fail[ROOT] = -1;
    fail[CONT_ROOT] = -1;
    IntArrayList pool = new IntArrayList();
    for (int v : order) {
      popStart[v] = pool.size();
      if (tokenAt[v] >= 0) {
        pool.add(tokenAt[v]);
        popLength[v] = 1;
        fail[v] = CONT_ROOT;
        continue;
      }
      int u = parent[v];
      char c = edge[v];
      appendPops(pool, u);
      int z = fail[u];
      while (z >= 0 && lookup(z, c) < 0) {
        appendPops(pool, z);
        z = fail[z];
      }
      if (z < 0) {
        pool.size(popStart[v]); // greedy matching gets stuck: no pops needed
        fail[v] = -1;
      } else {
        fail[v] = lookup(z, c);
      }
      popLength[v] = pool.size() - popStart[v];
      if (pool.size() > MAX_POPS) {
        throw new IllegalArgumentException("the vocabulary's failure pops exceed " + MAX_POPS
            + " entries (very long tokens); shorten the tokens or lower maxPieceLength");
      }
    }
    pops = pool.toIntArray();

    parent[ROOT] = -1;
    parent[CONT_ROOT] = -1;
    DoubleArray placed = hashed ? null : DoubleArray.place(n, parent, edge);
    rootAscii = new int[DENSE];
    contAscii = new int[DENSE];
    if (placed == null) {
      da = null;
      code = null;
      for (char c = 0; c < DENSE; c++) {
        rootAscii[c] = lookup(ROOT, c);
        contAscii[c] = lookup(CONT_ROOT, c);
      }
      return;
    }
    // node ids become slots; the roots keep 0 and 1 (placed first, in node order)
    int slots = placed.slots();
    int[] d = placed.layout(2);
    int[] f = new int[slots];
    int[] ps = new int[slots];
    int[] pl = new int[slots];
    Arrays.fill(f, -1);
    for (int v = 0; v < n; v++) {
      int s = placed.slot(v);
      f[s] = fail[v] < 0 ? -1 : placed.slot(fail[v]);
      ps[s] = popStart[v];
      pl[s] = popLength[v];
    }
    for (char c = 0; c < DENSE; c++) {
      int r = lookup(ROOT, c);
      int q = lookup(CONT_ROOT, c);
      rootAscii[c] = r < 0 ? -1 : placed.slot(r);
      contAscii[c] = q < 0 ? -1 : placed.slot(q);
    }
    this.fail = f;
    this.popStart = ps;
    this.popLength = pl;
    this.da = d;
    this.code = placed.code();
    this.table = null;
  }

  private void appendPops(IntArrayList pool, int node) {
    int s = popStart[node];
    int e = s + popLength[node];
    for (int i = s; i < e; i++) {
      pool.add(pool.getInt(i));
    }
  }

  /** An empty transition table for up to {@code edges} transitions, load at most 1/2. */
  private void allocateTable(int edges) {
    int cap = Integer.highestOneBit(Math.max(4, edges) * 2 - 1) << 1;
    table = new long[2 * cap];
    for (int i = 0; i < table.length; i += 2) {
      table[i] = -1L;
    }
    mask = cap - 1;
    shift = 64 - Integer.numberOfTrailingZeros(cap);
  }

  /**
   * Re-hashes the transitions into a table sized by the {@code nodes} actually built (at most
   * {@code nodes - 2} transitions) instead of the vocabulary's char count, which it had to assume
   * while building. Measured with the 30k Europarl model (wordpiece_encode): the table shrinks about
   * 4x, so more of it stays in the core's cache; each probe touches one cache line because key and
   * child sit side by side.
   */
  private void compactTable(int nodes) {
    long[] old = table;
    allocateTable(nodes);
    for (int i = 0; i < old.length; i += 2) {
      long key = old[i];
      if (key != -1L) {
        insert((int) (key >>> 16), (char) key, (int) old[i + 1]);
      }
    }
  }

  private int slot(long key) {
    return (int) ((key * MIX) >>> shift) & mask;
  }

  private void insert(int node, char c, int child) {
    long key = ((long) node << 16) | c;
    final long[] t = table;
    int i = slot(key);
    while (t[2 * i] != -1L) {
      i = (i + 1) & mask;
    }
    t[2 * i] = key;
    t[2 * i + 1] = child;
  }

  private int lookup(int node, char c) {
    long key = ((long) node << 16) | c;
    final long[] t = table;
    int i = slot(key);
    long k;
    while ((k = t[2 * i]) != -1L) {
      if (k == key) {
        return (int) t[2 * i + 1];
      }
      i = (i + 1) & mask;
    }
    return -1;
  }

  // ------------------------------------------------------------------ API

  /** Number of trie nodes, both roots included. */
  int nodeCount() {
    return nodeCount;
  }

  /** Total length of all failure-pop runs (memory diagnostics). */
  int popPoolSize() {
    return pops.length;
  }

  /** The child of {@code node} along {@code c}, or -1. */
  int child(int node, char c) {
    if (c < DENSE) {
      if (node == ROOT) {
        return rootAscii[c];
      }
      if (node == CONT_ROOT) {
        return contAscii[c];
      }
    }
    final int[] d = da;
    if (d != null) {
      return DoubleArray.step(d, 2, code, node, c);
    }
    return lookup(node, c);
  }

  /** Whether the automaton keeps the hashed layout (tests). */
  boolean hashed() {
    return da == null;
  }

  /**
   * Greedy longest-match-first segmentation of {@code text[start, end)} as one piece. Writes token
   * ids to {@code out} (which must hold at least {@code end - start} entries) and returns how many,
   * or -1 if the piece cannot be covered by the vocabulary.
   */
  int match(CharSequence text, int start, int end, int[] out) {
    final int[] fail = this.fail;
    int n = 0;
    int node = ROOT;
    for (int i = start; i < end; i++) {
      char c = text.charAt(i);
      int next;
      while ((next = child(node, c)) < 0) {
        int f = fail[node];
        if (f < 0) {
          return -1;
        }
        n = copyPops(node, out, n);
        node = f;
      }
      node = next;
    }
    while (node != CONT_ROOT && node != ROOT) {
      int f = fail[node];
      if (f < 0) {
        return -1;
      }
      n = copyPops(node, out, n);
      node = f;
    }
    return n;
  }

  private int copyPops(int node, int[] out, int n) {
    int len = popLength[node];
    System.arraycopy(pops, popStart[node], out, n, len);
    return n + len;
  }
}
