package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.internal.PieceTable;
import dev.morsel.tokenize.spi.TokenSink;
import dev.morsel.tokenize.spi.Workspace;
import dev.morsel.tokenize.spi.WorkspacePool;
import java.util.SplittableRandom;

/**
 * Applies the merges of a {@link Vocab} to one piece. Thread-safe: all mutable state lives in a
 * {@link Scratch} workspace lent to each call (by the tokenizer's pool, or this encoder's own pool
 * for calls that bring none), and the {@link PieceCache} tolerates races.
 *
 * <p>Semantics (the textbook rule of [1]): repeatedly merge the adjacent pair of lowest rank,
 * leftmost among equal ranks, until no adjacent pair has a rank. Two paths give exactly this result:
 * <ul>
 *   <li>pieces of at most {@link #SHORT_PIECE_BYTES} bytes: an array scan with one cached rank per
 *       adjacent pair, O(k^2) integer compares but only O(k) map lookups;
 *   <li>longer pieces: a doubly linked list over the byte positions plus a binary heap of
 *       {@code (rank << 32 | position)} longs, lazily invalidated: a popped entry is applied only if
 *       its position is alive and the pair now there still has that rank. Each merge pops one entry and pushes at most two,
 *       so the heap holds at most 2k entries and the work is O(k log k).
 * </ul>
 * Since ranks identify pairs, "leftmost among equal ranks" is "smallest position" in the heap order.
 *
 * <p>Pieces longer than {@link #WINDOW_CHARS} are merged one window at a time, in working memory
 * bounded by the window instead of the piece (see {@link #segmentLong}): the rank-bucket path runs on
 * a window and keeps a <em>frontier</em> behind which every symbol is certain to be the same as in a
 * run over the whole piece; the tokens before the frontier are final, and the next window starts at
 * the last of their boundaries that falls on a character. The result is exactly that of one run.
 *
 * <p>BPE-dropout [2]: at every merge step each candidate (each adjacent pair occurrence that has a
 * rank) is removed from consideration independently with probability p; the lowest-ranked surviving
 * candidate (leftmost among equals) is applied; if every candidate was removed, segmentation of the
 * piece stops. The heap path realises this by popping candidates in (rank, position) order and drawing
 * for each until one survives; the dropped ones are pushed back for the next step, where they are
 * drawn afresh. The draws for candidates behind the survivor are never needed, as they are independent.
 *
 * <p>References: [1] Sennrich, Haddow, Birch (2016), "Neural Machine Translation of Rare Words with
 * Subword Units", section 3.2 and Algorithm 1. [2] Provilkov, Emelianenko, Voita (2020),
 * "BPE-Dropout: Simple and Effective Subword Regularization", section 3.
 */
public final class Encoder {
  /** Pieces up to this many UTF-8 bytes take the array scan (k^2/2 = 128 int compares at most). */
  public static final int SHORT_PIECE_BYTES = 16;
  /**
   * Pieces shorter than this many UTF-16 units bypass the piece cache and are merged every time. On
   * the Europarl bodies with the 32k model and the class-run splitter (3.05 million pieces), 74.7% of
   * pieces are one whole token (answered by the read-only whole-token table before any cache), 24.5%
   * are shorter pieces of several tokens, 0.8% are of 17 to 256 units. Replaying the pieces through a
   * direct-mapped table, the short ones hit in 9% of lookups with 4,096 slots and 33% with 65,536 (too
   * few for a probe and a store on every miss to pay off against the array scan); the
   * long ones hit in 33% with 65,536 slots, and each hit saves a heap merge of at least 17 bytes.
   */
  public static final int CACHE_MIN_PIECE_CHARS = 17;
  /**
   * Pieces of at least this many bytes take the rank-bucket path, whose fixed cost (a scan of one bit
   * per merge rank, about 500 words for 32k merges) pays off against the heap's log factor.
   */
  public static final int BUCKET_PIECE_BYTES = 512;
  /**
   * A workspace keeps buffers for pieces up to this many UTF-16 units (about 21 bytes of arrays per
   * unit, so 4,096 units keep about 86 KiB); buffers grown for longer pieces are dropped afterwards, so
   * one huge piece does not pin hundreds of MiB in a pool.
   */
  static final int RETAINED_PIECE_CHARS = 4096;
  /**
   * Pieces longer than this many UTF-16 units are merged window by window, each window starting at
   * this size (about 65 KiB of buffers for 3-byte characters, so a window's merging stays in the L2
   * cache). Only the last few tokens of a window are redone by the next one (see {@link #segmentLong}),
   * so the size trades that repeated work against cache footprint. A sweep over 1 MiB of random
   * letters with the 32k benchmark model (in-process, best of 5, loaded machine) gave 60, 50, 52, 62,
   * 64, 84 ns a byte for windows of 256, 512, 1,024, 2,048, 4,096, 8,192 units, and 237 ns a byte for
   * one run over the piece.
   */
  public static final int WINDOW_CHARS = 1024;

  private final Vocab vocab;
  private final int base; // id of byte 0
  private final int mergeBase; // id of merge rank 0
  /** Workspaces for calls that bring none (tests, direct segmenter use); owned by this encoder. */
  private final WorkspacePool<Scratch> own = WorkspacePool.of(Scratch::new);
  private final PieceTable whole;

  /** An encoder over {@code vocab}. */
  public Encoder(Vocab vocab) {
    this.vocab = vocab;
    this.base = vocab.k;
    this.mergeBase = vocab.k + 256;
    this.whole = wholeTokens(this, vocab);
  }

  /** The vocabulary. */
  public Vocab vocab() {
    return vocab;
  }

  // ------------------------------------------------------------------ API

  /**
   * Segments {@code text[start, end)}, reporting absolute spans to {@code sink}. With a non-null
   * {@code cache} the piece is looked up first and stored after a miss.
   */
  public void segment(CharSequence text, int start, int end, TokenSink sink, PieceCache cache) {
    Scratch s = own.take();
    try {
      segment(text, start, end, sink, cache, true, s);
    } finally {
      own.give(s);
    }
  }

  /** As {@link #segment(CharSequence, int, int, TokenSink, PieceCache)} in workspace {@code s}. */
  public void segment(CharSequence text, int start, int end, TokenSink sink, PieceCache cache, Scratch s) {
    segment(text, start, end, sink, cache, true, s);
  }

  /** A new, empty workspace for this encoder (a few hundred bytes until it is used). */
  public Scratch newScratch() {
    return new Scratch();
  }

  /** Merges the {@code n} bytes loaded in {@code s} by the path that suits their number; returns the token count. */
  private int merge(Scratch s, int n) {
    return n <= SHORT_PIECE_BYTES ? mergeShort(s, n) : n < BUCKET_PIECE_BYTES ? mergeHeap(s, n, 0.0, null)
        : mergeBuckets(s, n, -1);
  }

  private void segment(CharSequence text, int start, int end, TokenSink sink, PieceCache cache, boolean useWhole,
      Scratch s) {
    if (start >= end) {
      return;
    }
    int len = end - start;
    if (useWhole && len <= PieceTable.MAX_CHARS) { // first: three quarters of pieces end here
      int id = whole.find(text, start, end);
      if (id >= 0) {
        sink.token(id, start, end);
        return;
      }
    }
    long hash = 0;
    boolean cacheable = cache != null && len >= CACHE_MIN_PIECE_CHARS && len <= PieceCache.MAX_PIECE_CHARS;
    if (cacheable) {
      hash = cache.hash(text, start, end);
      if (cache.emitIfPresent(hash, text, start, end, sink)) {
        return;
      }
    }
    if (len > WINDOW_CHARS) {
      segmentLong(text, start, end, sink, s);
      return;
    }
    int m = merge(s, s.load(text, start, end));
    if (cacheable && cache.admit(hash)) {
      cache.store(hash, text, start, end, s, m);
    }
    s.emit(m, start, sink); // len <= WINDOW_CHARS: the buffers stay within the retained size
  }

  /** Segments with BPE-dropout probability {@code p}, drawing from {@code random}; never cached. */
  public void segmentDropout(CharSequence text, int start, int end, TokenSink sink, double p, SplittableRandom random) {
    Scratch s = own.take();
    try {
      segmentDropout(text, start, end, sink, p, random, s);
    } finally {
      own.give(s);
    }
  }

  /** As {@link #segmentDropout(CharSequence, int, int, TokenSink, double, SplittableRandom)} in workspace {@code s}. */
  public void segmentDropout(CharSequence text, int start, int end, TokenSink sink, double p, SplittableRandom random,
      Scratch s) {
    if (start >= end) {
      return;
    }
    int n = s.load(text, start, end);
    int m = mergeHeap(s, n, p, random);
    s.emit(m, start, sink);
    if (end - start > RETAINED_PIECE_CHARS) {
      s.shrink();
    }
  }

  /** Test hook: the array-scan path on any length; ids into {@code out}, returns the count. */
  public int segmentShortPath(CharSequence text, int[] out) {
    Scratch s = new Scratch();
    int n = s.load(text, 0, text.length());
    int m = mergeShort(s, n);
    System.arraycopy(s.outId, 0, out, 0, m);
    return m;
  }

  /** Test hook: the rank-bucket path on any length; ids into {@code out}, returns the count. */
  public int segmentBucketPath(CharSequence text, int[] out) {
    Scratch s = new Scratch();
    int n = s.load(text, 0, text.length());
    int m = mergeBuckets(s, n, -1);
    System.arraycopy(s.outId, 0, out, 0, m);
    return m;
  }

  /**
   * Test hook: the windowed path on any length, with windows starting at {@code window} UTF-16 units;
   * ids into {@code out}, returns the count.
   */
  public int segmentWindowed(CharSequence text, int window, int[] out) {
    Scratch s = new Scratch();
    int[] count = new int[1];
    TokenSink into = (id, a, b) -> out[count[0]++] = id;
    windows(text, 0, text.length(), into, s, Math.max(2, window));
    return count[0];
  }

  /** Test hook: the heap path on any length; ids into {@code out}, returns the count. */
  public int segmentHeapPath(CharSequence text, int[] out) {
    Scratch s = new Scratch();
    int n = s.load(text, 0, text.length());
    int m = mergeHeap(s, n, 0.0, null);
    System.arraycopy(s.outId, 0, out, 0, m);
    return m;
  }

  // ------------------------------------------------------------------ internals

  /** Array scan; leaves ids in outId and token byte starts in outAt; returns the token count. */
  private int mergeShort(Scratch s, int n) {
    final int[] sym = s.outId;
    final int[] at = s.outAt;
    final int[] rk = s.rank;
    final byte[] buf = s.buf;
    final int b0 = base;
    for (int i = 0; i < n; i++) {
      sym[i] = b0 + (buf[i] & 0xFF);
      at[i] = i;
    }
    int m = n;
    for (int i = 0; i + 1 < m; i++) {
      rk[i] = vocab.rank(sym[i], sym[i + 1]);
    }
    while (m > 1) {
      int best = -1;
      int bestRank = Integer.MAX_VALUE;
      for (int i = 0; i + 1 < m; i++) {
        int r = rk[i];
        if (r >= 0 && r < bestRank) {
          bestRank = r;
          best = i;
        }
      }
      if (best < 0) {
        break;
      }
      sym[best] = mergeBase + bestRank;
      // plain loops: at most 14 elements move, where three System.arraycopy calls per merge cost more
      // than the moves themselves
      for (int i = best + 1; i + 1 < m; i++) {
        sym[i] = sym[i + 1];
        at[i] = at[i + 1];
        rk[i] = rk[i + 1];
      }
      m--;
      if (best > 0) {
        rk[best - 1] = vocab.rank(sym[best - 1], sym[best]);
      }
      if (best + 1 < m) {
        rk[best] = vocab.rank(sym[best], sym[best + 1]);
      }
    }
    return m;
  }

  /** Linked list + heap; with {@code p > 0} applies dropout. Leaves output like {@link #mergeShort}. */
  private int mergeHeap(Scratch s, int n, double p, SplittableRandom random) {
    s.ensureHeap(n, p > 0.0);
    final int[] sym = s.sym;
    final int[] next = s.next;
    final int[] prev = s.prev;
    final byte[] buf = s.buf;
    final int b0 = base;
    for (int i = 0; i < n; i++) {
      sym[i] = b0 + (buf[i] & 0xFF);
      next[i] = i + 1;
      prev[i] = i - 1;
    }
    s.heapSize = 0;
    for (int i = 0; i + 1 < n; i++) {
      int r = vocab.rank(sym[i], sym[i + 1]);
      if (r >= 0) {
        s.push(((long) r << 32) | i);
      }
    }
    boolean dropout = p > 0.0;
    int dropped = 0;
    outer:
    while (s.heapSize > 0) {
      long e = s.pop();
      int r = (int) (e >>> 32);
      int pos = (int) e;
      if (sym[pos] < 0) {
        continue;
      }
      int q = next[pos];
      if (q >= n || vocab.rank(sym[pos], sym[q]) != r) {
        continue;
      }
      if (dropout && random.nextDouble() < p) {
        s.dropped[dropped++] = e;
        if (s.heapSize == 0) {
          break outer; // every candidate of this step was dropped: stop
        }
        continue;
      }
      for (int d = 0; d < dropped; d++) {
        s.push(s.dropped[d]);
      }
      dropped = 0;
      sym[pos] = mergeBase + r;
      sym[q] = -1;
      int nq = next[q];
      next[pos] = nq;
      if (nq < n) {
        prev[nq] = pos;
        int r2 = vocab.rank(sym[pos], sym[nq]);
        if (r2 >= 0) {
          s.push(((long) r2 << 32) | pos);
        }
      }
      int pp = prev[pos];
      if (pp >= 0) {
        int r1 = vocab.rank(sym[pp], sym[pos]);
        if (r1 >= 0) {
          s.push(((long) r1 << 32) | pp);
        }
      }
    }
    int m = 0;
    for (int i = 0; i < n; i = next[i]) {
      s.outId[m] = sym[i];
      s.outAt[m] = i;
      m++;
    }
    return m;
  }

  /**
   * Merges a piece longer than {@link #WINDOW_CHARS} window by window, in buffers bounded by the
   * window: {@code bpe_adversarial_*} measured 48 ns a byte at 100 KiB and 128 ns at 1 MiB when the
   * whole piece was merged at once (about 110 bytes of arrays per byte of piece, far beyond the
   * caches), because every rank's bucket visits positions all over the piece.
   *
   * <p>Why a window's tokens can be final. (a) If no merge of a run over a piece ever joins the symbols on
   * the two sides of a position c, each merge step on either side sees only its own side's symbols,
   * so the run equals a run over {@code [start, c)} followed by a run over {@code [c, end)}. (b) In a
   * run over a window that ends before the piece does, a symbol can differ from the whole run's only
   * if the unknown text after the window could reach it: the last symbol could join the text that
   * follows it at the first rank whose merge has it as the left operand and a right operand starting
   * with the byte that follows it ({@link Vocab#firstRankJoiningRight}); from that rank on it is
   * uncertain, and then so is the symbol before it, by the same test. Merges in which an uncertain
   * symbol takes part give uncertain symbols; every other merge happens in both runs alike (rank order,
   * leftmost first, only depends on the symbols to the left). The merging keeps a frontier: the
   * symbols before it are certain. When the run ends, the frontier passes over every symbol that could
   * still join its right neighbour at any rank, so the symbols before it are final tokens of the whole
   * run and no merge crosses their boundaries. The window's tokens up to the last such boundary that
   * starts a character are emitted, and the rest of the piece is a new piece by (a).
   *
   * <p>When a window yields less than a quarter of itself, the window doubles (up to the piece), so a
   * model whose merges reach far keeps O(n log n) time and falls back to one run over the piece.
   */
  private void segmentLong(CharSequence text, int start, int end, TokenSink sink, Scratch s) {
    windows(text, start, end, sink, s, WINDOW_CHARS);
  }

  private void windows(CharSequence text, int start, int end, TokenSink sink, Scratch s, int window) {
    int from = start;
    while (from < end) {
      int to = end - from <= window ? end : from + window;
      if (to < end && Character.isHighSurrogate(text.charAt(to - 1)) && Character.isLowSurrogate(text.charAt(to))) {
        to--; // never split a surrogate pair: it would be encoded as two replacement characters
      }
      int n = s.load(text, from, to);
      int following = to < end ? firstByte(text, to, end) : -1;
      mergeBuckets(s, n, following);
      int cut = s.cut;
      if (cut == 0) { // nothing certain: the same start with a larger window
        window = growWindow(window, end - start);
        continue;
      }
      final int[] outId = s.outId;
      final int[] outAt = s.outAt;
      int m = s.cutTokens;
      for (int j = 0; j < m; j++) {
        int be = j + 1 < m ? outAt[j + 1] : cut;
        sink.token(outId[j], from + s.charStartOf(outAt[j]), from + s.charEndOf(be - 1));
      }
      int next = cut == n ? to : from + s.charStartOf(cut);
      if (next - from < window / 4 && to < end) {
        window = growWindow(window, end - start);
      }
      from = next;
    }
    if (window > RETAINED_PIECE_CHARS) {
      s.shrink();
    }
  }

  private static int growWindow(int window, int pieceChars) {
    return (int) Math.min((long) window * 2, Math.max(window, pieceChars));
  }

  /** The first UTF-8 byte of the character at {@code text[at]} (as {@link Utf8#encode} writes it). */
  private static int firstByte(CharSequence text, int at, int end) {
    char c = text.charAt(at);
    if (c < 0x80) {
      return c;
    }
    if (c < 0x800) {
      return 0xC0 | (c >>> 6);
    }
    if (!Character.isSurrogate(c)) {
      return 0xE0 | (c >>> 12);
    }
    if (Character.isHighSurrogate(c) && at + 1 < end && Character.isLowSurrogate(text.charAt(at + 1))) {
      return 0xF0 | (Character.toCodePoint(c, text.charAt(at + 1)) >>> 18);
    }
    return 0xEF; // lone surrogate: U+FFFD
  }

  /**
   * Linked list + one bucket per merge rank, for long pieces: O(k + V/64) for k bytes and V merges,
   * with no heap. It rests on one property of every valid model (the loader checks that each merge's
   * operands are older ids): a merge of rank r creates a token that only merges of rank greater than r
   * use, so after applying rank r every new candidate pair has a greater rank, and the lowest pending
   * rank never decreases. Buckets are therefore visited once each, in rank order, through a bitset
   * of non-empty ranks; within a bucket (all one pair) positions are sorted so the leftmost goes
   * first, and no entry of rank r is added while rank r is being applied. A popped position applies
   * only if the pair there is still the bucket's pair.
   *
   * <p>With {@code following >= 0} the bytes are a window followed by more of the piece, starting with
   * byte {@code following}: the frontier of {@link #segmentLong} is kept, and {@code s.cut} /
   * {@code s.cutTokens} receive the last final boundary that starts a character and the number of
   * tokens before it. With {@code following < 0} every token is final. Returns the token count.
   */
  private int mergeBuckets(Scratch s, int n, int following) {
    s.ensureBuckets(n, vocab.mergeCount());
    final int[] sym = s.sym;
    final int[] next = s.next;
    final int[] prev = s.prev;
    final int[] head = s.head;
    final int[] entPos = s.entPos;
    final int[] entNext = s.entNext;
    final long[] nonEmpty = s.nonEmpty;
    final int[] tmp = s.tmp;
    final int[] left = vocab.left;
    final int[] right = vocab.right;
    final byte[] buf = s.buf;
    final int b0 = base;
    for (int i = 0; i < n; i++) {
      sym[i] = b0 + (buf[i] & 0xFF);
      next[i] = i + 1;
      prev[i] = i - 1;
    }
    prev[n] = n - 1; // the end sentinel's previous symbol: the last one
    final boolean open = following >= 0;
    int frontier = n; // symbols starting at or after it are uncertain
    int check = Vocab.NO_RANK; // the rank from which the symbol before the frontier is uncertain
    if (open) {
      check = vocab.firstRankJoiningRight(sym[n - 1], following);
    }
    int entries = 0;
    int word = nonEmpty.length;
    for (int i = 0; i + 1 < n; i++) {
      int r = vocab.rank(sym[i], sym[i + 1]);
      if (r >= 0) {
        entPos[entries] = i;
        entNext[entries] = head[r];
        head[r] = entries++;
        nonEmpty[r >>> 6] |= 1L << r;
        word = Math.min(word, r >>> 6);
      }
    }
    while (true) {
      while (word < nonEmpty.length && nonEmpty[word] == 0) {
        word++;
      }
      if (word == nonEmpty.length) {
        break;
      }
      int r = (word << 6) + Long.numberOfTrailingZeros(nonEmpty[word]);
      nonEmpty[word] &= ~(1L << r);
      int cnt = 0;
      for (int e = head[r]; e >= 0; e = entNext[e]) {
        tmp[cnt++] = entPos[e];
      }
      head[r] = -1;
      if (cnt > 1) {
        java.util.Arrays.sort(tmp, 0, cnt);
      }
      final int a = left[r];
      final int b = right[r];
      final int merged = mergeBase + r;
      for (int k = 0; k < cnt; k++) {
        int pos = tmp[k];
        if (sym[pos] != a) {
          continue;
        }
        int q = next[pos];
        if (q >= n || sym[q] != b) {
          continue;
        }
        if (open && r >= check && pos < frontier) {
          frontier = advance(s, frontier, r, n, following);
          check = s.check;
        }
        sym[pos] = merged;
        sym[q] = -1;
        int nq = next[q];
        next[pos] = nq;
        prev[nq] = pos; // nq <= n: the sentinel keeps the last symbol
        if (open && pos < frontier) {
          if (q >= frontier) { // joined an uncertain symbol
            frontier = advance(s, pos, r, n, following);
            check = s.check;
          } else if (nq == frontier) { // the new symbol is the last certain one
            check = vocab.firstRankJoiningRight(merged, nq < n ? buf[nq] & 0xFF : following);
          }
        }
        if (nq < n) {
          int r2 = vocab.rank(merged, sym[nq]);
          if (r2 >= 0) {
            entPos[entries] = pos;
            entNext[entries] = head[r2];
            head[r2] = entries++;
            nonEmpty[r2 >>> 6] |= 1L << r2;
            word = Math.min(word, r2 >>> 6);
          }
        }
        int pp = prev[pos];
        if (pp >= 0) {
          int r1 = vocab.rank(sym[pp], merged);
          if (r1 >= 0) {
            entPos[entries] = pp;
            entNext[entries] = head[r1];
            head[r1] = entries++;
            nonEmpty[r1 >>> 6] |= 1L << r1;
            word = Math.min(word, r1 >>> 6);
          }
        }
      }
    }
    if (open) {
      frontier = advance(s, frontier, Vocab.NO_RANK - 1, n, following); // past every rank: final
    }
    int m = 0;
    int cut = 0;
    int cutTokens = 0;
    for (int i = 0; i < frontier; i = next[i]) {
      s.outId[m] = sym[i];
      s.outAt[m] = i;
      m++;
      int e = next[i];
      if (e == n || (buf[e] & 0xC0) != 0x80) { // a boundary that starts a character (or ends the bytes)
        cut = e;
        cutTokens = m;
      }
    }
    s.cut = cut;
    s.cutTokens = cutTokens;
    return m;
  }

  /**
   * Moves the frontier at {@code frontier} left over every symbol that could join its right neighbour
   * at a rank up to {@code r}; leaves in {@code s.check} the rank from which the symbol then before the
   * frontier is uncertain, and returns the frontier.
   */
  private int advance(Scratch s, int frontier, int r, int n, int following) {
    final int[] prev = s.prev;
    final int[] sym = s.sym;
    final byte[] buf = s.buf;
    int f = frontier;
    while (f > 0) {
      int x = prev[f];
      int t = vocab.firstRankJoiningRight(sym[x], f < n ? buf[f] & 0xFF : following);
      if (t > r) {
        s.check = t;
        return f;
      }
      f = x;
    }
    s.check = Vocab.NO_RANK;
    return 0;
  }

  /**
   * The pieces that encode to one whole token, found once here: every token whose bytes are
   * well-formed UTF-8 of at most {@link PieceTable#MAX_CHARS} UTF-16 units is encoded with the merge
   * paths above and kept if the result is that token alone. The result of a piece depends on its
   * bytes only, so a piece equal to a kept string has exactly that one-token result: a lookup gives
   * the same answer as merging. Measured on the Europarl bodies with the 32k model: 31,850 of 32,000
   * tokens are kept and 75% of pieces (392,380 of the 524,226 in the first 3,000 bodies) are found.
   * Decodes without allocating, so building from a forged model costs memory in proportion to it.
   */
  private static PieceTable wholeTokens(Encoder enc, Vocab vocab) {
    int size = vocab.size();
    String[] keep = new String[size];
    char[] chars = new char[PieceTable.MAX_CHARS];
    int[] found = new int[2]; // the one token, the token count
    TokenSink count = (tid, a, b) -> {
      found[0] = tid;
      found[1]++;
    };
    byte[] store = vocab.byteStore();
    Scratch s = new Scratch();
    for (int id = vocab.k; id < size; id++) {
      int n = Utf8.decodeStrict(store, vocab.offset(id), vocab.length(id), chars);
      if (n <= 0) {
        continue; // part of a character, or too long: never a whole piece here
      }
      String t = new String(chars, 0, n);
      found[1] = 0;
      enc.segment(t, 0, n, count, null, false, s);
      if (found[1] == 1 && found[0] == id) {
        keep[id] = t;
      }
    }
    return PieceTable.of(keep);
  }

  /** One encode call's buffers: grow on demand and are kept up to {@link #RETAINED_PIECE_CHARS}. */
  public static final class Scratch extends Workspace {
    /** Dropout generator of this workspace, split from the segmenter's root on first use. */
    public SplittableRandom random;
    byte[] buf = new byte[0];
    int[] charStart = new int[0];
    int[] charEnd = new int[0];
    int[] outId = new int[0];
    int[] outAt = new int[0];
    int[] rank = new int[0];
    int byteCount;
    /** Whether the loaded piece is all ASCII: then {@link #charStart} and {@link #charEnd} are not filled. */
    boolean ascii;
    // heap path
    int[] sym = new int[0];
    int[] next = new int[0];
    int[] prev = new int[0];
    long[] heap = new long[0];
    long[] dropped = new long[0];
    int heapSize;
    // bucket path
    int[] head = new int[0];
    long[] nonEmpty = new long[0];
    int[] entPos = new int[0];
    int[] entNext = new int[0];
    int[] tmp = new int[0];
    // windowed path: the window's last final boundary that starts a character, the tokens before it,
    // the rank from which the symbol before the frontier is uncertain
    int cut;
    int cutTokens;
    int check;

    Scratch() {}

    /** Drops the buffers grown for a long piece (the bucket heads sized by the merge count stay). */
    void shrink() {
      buf = new byte[0];
      charStart = new int[0];
      charEnd = new int[0];
      outId = new int[0];
      outAt = new int[0];
      rank = new int[0];
      sym = new int[0];
      next = new int[0];
      prev = new int[0];
      heap = new long[0];
      dropped = new long[0];
      entPos = new int[0];
      entNext = new int[0];
      tmp = new int[0];
    }

    /** Bucket bounds: n-1 initial entries plus at most two per merge (at most n-1 merges): 3n. */
    void ensureBuckets(int n, int ranks) {
      if (sym.length < n + 1) { // one more for the end sentinel of prev
        sym = new int[n + 1];
        next = new int[n + 1];
        prev = new int[n + 1];
        heap = new long[0];
      }
      if (entPos.length < 3 * n) {
        entPos = new int[3 * n];
        entNext = new int[3 * n];
        tmp = new int[3 * n];
      }
      if (head.length != ranks) {
        head = new int[ranks];
        java.util.Arrays.fill(head, -1);
        nonEmpty = new long[(ranks + 63) >>> 6];
      }
    }

    /** Encodes the piece; returns its byte count. */
    int load(CharSequence text, int start, int end) {
      int cap = 3 * (end - start);
      if (buf.length < cap) {
        int c = Math.max(cap, 64);
        buf = new byte[c];
        charStart = new int[c];
        charEnd = new int[c];
        outId = new int[c];
        outAt = new int[c];
        rank = new int[c];
      }
      // ASCII first (most pieces of European text): one byte a char, so the spans are the byte
      // indices themselves and the two span arrays are not written (13.7% of the samples of a JFR
      // profile of bpe_encode sat in this method when every piece wrote them)
      final byte[] b = buf;
      int len = end - start;
      int i = 0;
      while (i < len) {
        char c = text.charAt(start + i);
        if (c >= 0x80) {
          break;
        }
        b[i++] = (byte) c;
      }
      if (i == len) {
        ascii = true;
        byteCount = len;
        return len;
      }
      ascii = false;
      byteCount = Utf8.encode(text, start, end, buf, charStart, charEnd);
      return byteCount;
    }

    /** The start, relative to the piece, of the character that holds byte {@code b}. */
    int charStartOf(int b) {
      return ascii ? b : charStart[b];
    }

    /** The end, relative to the piece, of the character that holds byte {@code b}. */
    int charEndOf(int b) {
      return ascii ? b + 1 : charEnd[b];
    }

    /** Heap bound: n-1 initial entries, and each merge pops one and pushes at most two: 2n. */
    void ensureHeap(int n, boolean dropout) {
      if (sym.length < n) {
        sym = new int[n];
        next = new int[n];
        prev = new int[n];
      }
      if (heap.length < 2 * n) {
        heap = new long[2 * n];
      }
      if (dropout && dropped.length < 2 * n) {
        dropped = new long[2 * n];
      }
    }

    void push(long v) {
      long[] h = heap;
      int i = heapSize++;
      while (i > 0) {
        int parent = (i - 1) >>> 1;
        long pv = h[parent];
        if (pv <= v) {
          break;
        }
        h[i] = pv;
        i = parent;
      }
      h[i] = v;
    }

    long pop() {
      long[] h = heap;
      long top = h[0];
      int size = --heapSize;
      if (size > 0) {
        long v = h[size];
        int i = 0;
        while (true) {
          int c = 2 * i + 1;
          if (c >= size) {
            break;
          }
          if (c + 1 < size && h[c + 1] < h[c]) {
            c++;
          }
          if (h[c] >= v) {
            break;
          }
          h[i] = h[c];
          i = c;
        }
        h[i] = v;
      }
      return top;
    }

    /** Reports the m tokens left in outId/outAt to {@code sink}, spans offset by {@code start}. */
    void emit(int m, int start, TokenSink sink) {
      int n = byteCount;
      for (int j = 0; j < m; j++) {
        int bs = outAt[j];
        int be = j + 1 < m ? outAt[j + 1] : n;
        sink.token(outId[j], start + charStartOf(bs), start + charEndOf(be - 1));
      }
    }
  }
}
