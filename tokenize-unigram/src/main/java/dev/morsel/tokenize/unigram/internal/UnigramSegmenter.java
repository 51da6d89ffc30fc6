package dev.morsel.tokenize.unigram.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.format.AlphabetRecord;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.ReviewWriter;
import dev.morsel.tokenize.format.SectionWriter;
import dev.morsel.tokenize.internal.PieceTable;
import dev.morsel.tokenize.spi.ByteSink;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.TokenSink;
import dev.morsel.tokenize.spi.Workspace;
import dev.morsel.tokenize.spi.WorkspacePool;
import it.unimi.dsi.fastutil.ints.IntHeapPriorityQueue;
import it.unimi.dsi.fastutil.objects.Object2IntOpenHashMap;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import java.util.random.RandomGenerator;

/**
 * A unigram language-model segmenter [1]: every token has a log-probability and a piece is split
 * into the tokens whose probabilities multiply to the most (Viterbi), or into the k best such
 * splits, or into a split drawn at random for subword regularization.
 *
 * <p>Id layout: reserved tokens at {@code 0..k-1} (never produced by segmentation); then, with raw
 * bytes on, 256 byte tokens; then the unknown token; then the pieces. A character that no
 * single-character piece covers becomes the unknown token, or with raw bytes its UTF-8 bytes as
 * byte tokens, each spanning that whole character. A lone surrogate counts as U+FFFD for raw bytes.
 * Immutable and thread-safe; encoding works in a {@link Scratch} workspace lent to each call and
 * allocates nothing per token.
 *
 * <p>Design notes. Viterbi [1, section 3.1; 2] runs left to right: from every reachable position
 * the piece trie lists the tokens that start there, O(n · L) for a piece of n chars and longest
 * token L. Where the character at a position is not itself a token an extra edge of one code point
 * carries the unknown token (byte tokens on output with byte fallback), so every piece has a path.
 * Ties keep the first relaxation (the path whose last token starts earliest). Pieces of up to
 * {@value SegmentationCache#MAX_CHARS} chars go through the workspace's {@link SegmentationCache} first. The n-best list is
 * A* search from the start with the exact best-suffix score as heuristic. Sampling filters backward
 * (log-sum-exp of {@code alpha * score} over all suffixes) and then samples forward token by token
 * [1, section 2.2 and 3.1]; this is the mirror image of forward filtering with backward sampling and
 * draws from the same distribution {@code p(path)^alpha / Z}.
 *
 * <p>References: [1] Kudo (2018), "Subword Regularization", ACL 2018. [2] Viterbi (1967), "Error
 * bounds for convolutional codes and an asymptotically optimum decoding algorithm".
 */
public final class UnigramSegmenter implements Segmenter {
  // ------------------------------------------------------------------ configuration

  /** The kind name in model files: {@value}. */
  public static final String SCHEME = "unigram";
  /** Default spelling of the unknown token. */
  public static final String DEFAULT_UNKNOWN = "\u2983?\u2984";
  /** Longest piece accepted, in UTF-16 units (bounds the work per position at Viterbi time). */
  public static final int MAX_PIECE_LENGTH = 256;
  /** Largest {@code k} accepted by {@link #nBest}. */
  public static final int MAX_N_BEST = 10_000;

  /** Model-file section holding settings and reserved tokens. */
  static final String SETTINGS = "UNST";
  /** Model-file section holding pieces and scores. */
  static final String PIECES = "UNVO";
  /** Format version of the two sections. */
  static final int FORMAT_VERSION = 1;
  /** How far below the lowest piece the unknown token scores (common practice: a clear penalty, in nats). */
  static final double UNKNOWN_PENALTY = 10.0;
  /** Pieces longer than this are segmented in a throw-away scratch rather than the workspace's (chars). */
  private static final int KEEP_SCRATCH = 1 << 16;
  /** A* pops allowed per result and position before n-best gives up (bounds time on tied lattices). */
  private static final int POPS_PER_RESULT_AND_POSITION = 8;

  // ------------------------------------------------------------------ state

  private final String[] spelling;
  private final byte[][] bytes;
  private final double[] score;
  private final Object2IntOpenHashMap<String> ids;
  private final PieceTrie trie;
  /** Pieces that are their own Viterbi path: one probe instead of a Viterbi pass (see wholePieces). */
  private final PieceTable whole;
  private final int reservedCount;
  private final boolean byteSpelling;
  private final int byteBase;
  private final int unknownId;
  private final int firstPiece;
  private final double unknownScore;
  private final String[] reserved;
  private final String[] pieces;
  private final double[] pieceScores;
  /** Workspaces for calls that bring none (n-best, sampling, direct use); owned by this segmenter. */
  private final WorkspacePool<Scratch> own = WorkspacePool.of(Scratch::new);

  /** What the learner's alphabet policy did, or null (a model made from a token list, or an old file). */
  private volatile AlphabetRecord alphabetRecord;

  // ------------------------------------------------------------------ life-cycle

  /** Validation failures are reported through this, so the factory and the reader can throw their own type. */
  interface Failure {
    RuntimeException at(String what, int index, String message);
  }

  private static final Failure ARGUMENT = (what, index, message) ->
      new IllegalArgumentException(what + " " + index + ": " + message);

  /**
   * A model from its parts. Piece {@code i} gets id {@code firstPieceId() + i}. The unknown token
   * scores {@code min(0, lowest piece score) - 10} (a penalty below every piece).
   *
   * @param reservedTokens reserved tokens (ids 0..k-1), distinct and non-empty
   * @param byteSpelling whether uncovered characters become byte tokens instead of the unknown token
   * @param unknownToken spelling of the unknown token
   * @param pieces the pieces: non-empty, distinct, well-formed UTF-16, at most {@link #MAX_PIECE_LENGTH} units
   * @param scores their log-probabilities, finite
   * @throws IllegalArgumentException naming the entry that is wrong
   */
  public static UnigramSegmenter create(List<String> reservedTokens, boolean byteSpelling, String unknownToken,
      List<String> pieces, double[] scores) {
    Objects.requireNonNull(reservedTokens, "reservedTokens");
    Objects.requireNonNull(unknownToken, "unknownToken");
    Objects.requireNonNull(pieces, "pieces");
    Objects.requireNonNull(scores, "scores");
    if (pieces.size() != scores.length) {
      throw new IllegalArgumentException(pieces.size() + " pieces but " + scores.length + " scores");
    }
    return new UnigramSegmenter(reservedTokens.toArray(new String[0]), byteSpelling, unknownToken,
        pieces.toArray(new String[0]), scores.clone(), ARGUMENT);
  }

  /**
   * The unigram segmenter of {@code tokenizer}.
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}, naming its kind
   */
  public static UnigramSegmenter of(Tokenizer tokenizer) {
    return of(tokenizer, "this operation");
  }

  /**
   * The unigram segmenter of {@code tokenizer}.
   *
   * @param what the operation that needs it, for the message
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}, naming its kind
   */
  public static UnigramSegmenter of(Tokenizer tokenizer, String what) {
    Segmenter s = Tokenizers.segmenterOf(Objects.requireNonNull(tokenizer, "tokenizer"));
    if (!(s instanceof UnigramSegmenter)) {
      throw new IllegalArgumentException(what + " needs a tokenizer of scheme '" + SCHEME + "'; this one is of scheme '"
          + tokenizer.scheme() + "'");
    }
    return (UnigramSegmenter) s;
  }

  UnigramSegmenter(String[] reserved, boolean byteSpelling, String unknown, String[] pieces, double[] scores,
      Failure fail) {
    int k = reserved.length;
    int total = k + (byteSpelling ? 256 : 0) + 1 + pieces.length;
    this.reserved = reserved;
    this.pieces = pieces;
    this.pieceScores = scores;
    this.reservedCount = k;
    this.byteSpelling = byteSpelling;
    this.byteBase = byteSpelling ? k : -1;
    this.unknownId = k + (byteSpelling ? 256 : 0);
    this.firstPiece = unknownId + 1;
    this.spelling = new String[total];
    this.bytes = new byte[total][];
    this.score = new double[total];
    this.ids = new Object2IntOpenHashMap<>(total);
    ids.defaultReturnValue(-1);
    Arrays.fill(score, Double.NaN);
    for (int i = 0; i < k; i++) {
      String c = reserved[i];
      if (c == null || c.isEmpty()) {
        throw fail.at("reserved token", i, "is " + (c == null ? "null" : "empty"));
      }
      put(i, c, c.getBytes(StandardCharsets.UTF_8), "reserved token", i, fail);
    }
    if (byteSpelling) {
      for (int b = 0; b < 256; b++) {
        put(byteBase + b, byteTokenText(b), new byte[] {(byte) b}, "byte token", b, fail);
      }
    }
    if (unknown == null || unknown.isEmpty()) {
      throw fail.at("unknown token", 0, "spelling is " + (unknown == null ? "null" : "empty"));
    }
    put(unknownId, unknown, unknown.getBytes(StandardCharsets.UTF_8), "unknown token", 0, fail);
    double min = 0;
    for (int i = 0; i < pieces.length; i++) {
      String p = pieces[i];
      if (p == null || p.isEmpty()) {
        throw fail.at("piece", i, "is " + (p == null ? "null" : "empty"));
      }
      if (p.length() > MAX_PIECE_LENGTH) {
        throw fail.at("piece", i, "has " + p.length() + " chars, over MAX_PIECE_LENGTH=" + MAX_PIECE_LENGTH);
      }
      int bad = unpairedSurrogate(p);
      if (bad >= 0) {
        throw fail.at("piece", i, "has an unpaired surrogate at char " + bad);
      }
      double s = scores[i];
      if (!Double.isFinite(s)) {
        throw fail.at("piece", i, "'" + p + "' has score " + s + "; scores must be finite");
      }
      min = Math.min(min, s);
      put(firstPiece + i, p, p.getBytes(StandardCharsets.UTF_8), "piece", i, fail);
      score[firstPiece + i] = s;
    }
    this.unknownScore = min - UNKNOWN_PENALTY;
    score[unknownId] = unknownScore;
    int[] values = new int[pieces.length];
    for (int i = 0; i < values.length; i++) {
      values[i] = firstPiece + i;
    }
    this.trie = new PieceTrie(pieces, values);
    this.whole = wholePieces(pieces);
  }

  /**
   * The pieces whose Viterbi path is the piece itself as one token, found by running Viterbi on each
   * vocabulary piece of at most {@link PieceTable#MAX_CHARS} chars once. The path depends on the
   * piece's chars only, so a lookup gives exactly Viterbi's answer.
   */
  private PieceTable wholePieces(String[] pieces) {
    String[] keep = new String[score.length];
    Scratch probe = new Scratch();
    int[] found = new int[2]; // the first token, the token count
    TokenSink count = (tid, a, b) -> {
      if (found[1]++ == 0) {
        found[0] = tid;
      }
    };
    for (int i = 0; i < pieces.length; i++) {
      String p = pieces[i];
      int n = p.length();
      if (n == 0 || n > PieceTable.MAX_CHARS) {
        continue;
      }
      found[1] = 0;
      viterbi(p, 0, n, scratchFor(n, probe), count);
      if (found[1] == 1 && found[0] == firstPiece + i) {
        keep[firstPiece + i] = p;
      }
    }
    return PieceTable.of(keep);
  }

  private void put(int id, String s, byte[] b, String what, int index, Failure fail) {
    int prev = ids.putIfAbsent(s, id);
    if (prev >= 0) {
      throw fail.at(what, index, "'" + s + "' duplicates the spelling of id " + prev);
    }
    spelling[id] = s;
    bytes[id] = b;
  }

  /** Display spelling of byte token {@code b}: white curly brackets around two hex digits. */
  static String byteTokenText(int b) {
    return "\u2983" + Character.toUpperCase(Character.forDigit(b >>> 4, 16))
        + Character.toUpperCase(Character.forDigit(b & 15, 16)) + "\u2984";
  }

  /** Index of the first unpaired surrogate of {@code s}, or -1. */
  static int unpairedSurrogate(CharSequence s) {
    for (int i = 0; i < s.length(); i++) {
      char c = s.charAt(i);
      if (Character.isHighSurrogate(c)) {
        if (i + 1 < s.length() && Character.isLowSurrogate(s.charAt(i + 1))) {
          i++;
        } else {
          return i;
        }
      } else if (Character.isLowSurrogate(c)) {
        return i;
      }
    }
    return -1;
  }

  // ------------------------------------------------------------------ API

  @Override
  public String scheme() {
    return SCHEME;
  }

  @Override
  public int vocabularySize() {
    return spelling.length;
  }

  @Override
  public String token(int id) {
    return spelling[Objects.checkIndex(id, spelling.length)];
  }

  @Override
  public int id(String token) {
    return ids.getInt(token);
  }

  @Override
  public int unknownId() {
    return unknownId;
  }

  /** Number of reserved tokens (ids {@code 0..reservedCount()-1}). */
  public int reservedCount() {
    return reservedCount;
  }

  /** Whether uncovered characters become byte tokens. */
  public boolean byteSpelling() {
    return byteSpelling;
  }

  /** The id of the first byte token (byte {@code b} is {@code firstByteId() + b}), or -1 without raw bytes. */
  public int firstByteId() {
    return byteBase;
  }

  /** The id of the first piece. */
  public int firstPieceId() {
    return firstPiece;
  }

  /**
   * The log-probability of a piece, the penalty of the unknown token, or {@link Double#NaN} for
   * reserved and byte tokens.
   *
   * @throws IndexOutOfBoundsException if {@code id} is not in the vocabulary
   */
  public double score(int id) {
    return score[Objects.checkIndex(id, score.length)];
  }

  @Override
  public List<String> reservedSpellings() {
    return List.of(reserved);
  }

  /**
   * The best segmentation (Viterbi) with each token's log-probability and the total, and the
   * runner-up segmentation with its total, so a person can see by how much the best one wins.
   */
  @Override
  public List<String> explain(CharSequence text, int start, int end) {
    List<PiecePath> two = nBest(text, start, end, 2);
    List<String> out = new ArrayList<>();
    String[] names = {"best", "runner-up"};
    for (int k = 0; k < two.size(); k++) {
      PiecePath p = two.get(k);
      StringBuilder sb = new StringBuilder(names[k]).append(String.format(Locale.ROOT, " (log-probability %.3f):", p.score()));
      for (int i = 0; i < p.size(); i++) {
        double sc = score(p.id(i));
        sb.append(" '").append(token(p.id(i))).append('\'');
        if (!Double.isNaN(sc)) {
          sb.append(String.format(Locale.ROOT, "(%.3f)", sc));
        }
      }
      out.add(sb.toString());
    }
    if (two.size() < 2) {
      out.add("no other segmentation exists");
    }
    return out;
  }

  @Override
  public void decodeToken(int id, ByteSink out) {
    byte[] b = bytes[Objects.checkIndex(id, bytes.length)];
    out.write(b, 0, b.length);
  }


  /**
   * Records what the alphabet policy did, once, before the segmenter is shared: the model file and
   * the review text then carry it (section {@code ALPH}, outside the fingerprint). A null record is
   * ignored.
   *
   * @throws IllegalStateException if a record was set already
   */
  public void recordAlphabet(AlphabetRecord record) {
    if (record == null) {
      return;
    }
    if (alphabetRecord != null) {
      throw new IllegalStateException("the alphabet record is set once");
    }
    alphabetRecord = record;
  }

  /** What the learner's alphabet policy did, or null when the model does not say. */
  public AlphabetRecord alphabetRecord() {
    return alphabetRecord;
  }

  @Override
  public void write(ModelWriter out) {
    AlphabetRecord r = alphabetRecord;
    if (r != null) {
      r.write(out);
    }
    SectionWriter st = out.section(SETTINGS);
    st.putInt(FORMAT_VERSION).putByte(byteSpelling ? 1 : 0).putString(spelling[unknownId]).putInt(reservedCount);
    for (String c : reserved) {
      st.putString(c);
    }
    SectionWriter vo = out.section(PIECES);
    vo.putInt(pieces.length);
    for (int i = 0; i < pieces.length; i++) {
      vo.putString(pieces[i]).putDouble(pieceScores[i]);
    }
  }

  /** Writes the {@code vocabulary} section of a review text, with each piece's score. */
  @Override
  public void writeReview(ReviewWriter out) {
    UnigramReview.write(out, this);
    AlphabetRecord r = alphabetRecord;
    if (r != null) {
      r.writeReview(out);
    }
  }

  @Override
  public void segment(CharSequence text, int start, int end, TokenSink sink) {
    Scratch s = own.take();
    try {
      segment(text, start, end, sink, s);
    } finally {
      own.give(s);
    }
  }

  /** A workspace of a few hundred bytes; Viterbi arrays grow with the pieces, the cache comes on first use. */
  @Override
  public Workspace newWorkspace() {
    return new Scratch();
  }

  @Override
  public void segment(CharSequence text, int start, int end, TokenSink sink, Workspace workspace) {
    if (!(workspace instanceof Scratch)) {
      segment(text, start, end, sink);
      return;
    }
    checkRange(text, start, end);
    int n = end - start;
    if (n == 0) {
      return;
    }
    int id = whole.find(text, start, end);
    if (id >= 0) {
      sink.token(id, start, end);
      return;
    }
    Scratch s = scratchFor(n, (Scratch) workspace);
    if (n > SegmentationCache.MAX_CHARS) {
      viterbi(text, start, end, s, sink);
      return;
    }
    SegmentationCache cache = s.cache();
    int slot = cache.slot(text, start, end);
    if (cache.matches(slot, text, start, end)) {
      cache.replay(slot, start, sink);
      return;
    }
    Recorder rec = s.recorder;
    rec.size = 0;
    viterbi(text, start, end, s, rec);
    cache.store(slot, text, start, end, rec.ids, rec.starts, rec.ends, rec.size);
    for (int i = 0; i < rec.size; i++) {
      sink.token(rec.ids[i], rec.starts[i], rec.ends[i]);
    }
  }

  /** Viterbi over {@code text[start, end)} (n >= 1), reporting the best path to {@code sink}. */
  private void viterbi(CharSequence text, int start, int end, Scratch s, TokenSink sink) {
    int n = end - start;
    double[] best = s.best;
    int[] backPos = s.backPos;
    int[] backId = s.backId;
    Arrays.fill(best, 0, n + 1, Double.NEGATIVE_INFINITY);
    best[0] = 0;
    final PieceTrie t = trie;
    final double[] sc = score;
    for (int i = 0; i < n; i++) {
      double base = best[i];
      if (base == Double.NEGATIVE_INFINITY) {
        continue; // inside a surrogate pair: no edge ends here
      }
      int pos = start + i;
      int cpEnd = i + charCount(text, pos, end);
      boolean single = false;
      int node = 0;
      for (int j = pos; j < end; j++) {
        node = t.child(node, text.charAt(j));
        if (node < 0) {
          break;
        }
        int id = t.value(node);
        if (id >= 0) {
          int e = j + 1 - start;
          double v = base + sc[id];
          if (v > best[e]) {
            best[e] = v;
            backPos[e] = i;
            backId[e] = id;
          }
          single |= e == cpEnd;
        }
      }
      if (!single) {
        double v = base + unknownScore;
        if (v > best[cpEnd]) {
          best[cpEnd] = v;
          backPos[cpEnd] = i;
          backId[cpEnd] = unknownId;
        }
      }
    }
    // backtrack into the path arrays (reversed), then report forward
    int[] pathPos = s.pathPos;
    int[] pathId = s.pathId;
    int m = 0;
    for (int e = n; e > 0; e = backPos[e]) {
      pathPos[m] = e;
      pathId[m] = backId[e];
      m++;
    }
    int from = start;
    for (int q = m - 1; q >= 0; q--) {
      int to = start + pathPos[q];
      emit(text, from, to, pathId[q], sink);
      from = to;
    }
  }

  /**
   * The {@code k} best segmentations of {@code text[start, end)}, best first (fewer if the piece has
   * fewer). Ties between equal scores are broken deterministically.
   *
   * @throws IllegalArgumentException if {@code k <= 0} or {@code k > MAX_N_BEST}
   */
  public List<PiecePath> nBest(CharSequence text, int start, int end, int k) {
    checkRange(text, start, end);
    if (k <= 0 || k > MAX_N_BEST) {
      throw new IllegalArgumentException("k=" + k + " is outside [1, MAX_N_BEST=" + MAX_N_BEST + "]");
    }
    int n = end - start;
    List<PiecePath> out = new ArrayList<>(Math.min(k, 16));
    if (n == 0) {
      out.add(new Segmentation0().build(0));
      return out;
    }
    Scratch s = scratchFor(n, new Scratch()); // n-best allocates its search nodes anyway
    double[] suffix = new double[n + 1];
    int[] edgeEnd = s.edgeEnd;
    int[] edgeId = s.edgeId;
    suffix[n] = 0;
    for (int i = n - 1; i >= 0; i--) {
      int c = edges(text, start + i, end, edgeEnd, edgeId);
      double b = Double.NEGATIVE_INFINITY;
      for (int q = 0; q < c; q++) {
        b = Math.max(b, score[edgeId[q]] + suffix[edgeEnd[q] - start]);
      }
      suffix[i] = b;
    }
    // A* nodes: a prefix path ending at pos with score g, linked to its parent
    Nodes nodes = new Nodes();
    IntHeapPriorityQueue queue = new IntHeapPriorityQueue((a, b) -> {
      int c = Double.compare(nodes.g[b] + suffix[nodes.pos[b]], nodes.g[a] + suffix[nodes.pos[a]]);
      if (c != 0) {
        return c;
      }
      c = Integer.compare(nodes.pos[b], nodes.pos[a]); // deeper first: ties finish quickly
      return c != 0 ? c : Integer.compare(a, b);
    });
    queue.enqueue(nodes.add(0, 0, -1, -1));
    long pops = 0;
    long maxPops = (long) k * (n + 1) * POPS_PER_RESULT_AND_POSITION + 1024;
    while (!queue.isEmpty() && out.size() < k) {
      if (++pops > maxPops) {
        throw new IllegalArgumentException("n-best search over a piece of " + n + " chars exceeded " + maxPops
            + " steps for k=" + k + " (too many tied paths); lower k");
      }
      int a = queue.dequeueInt();
      int pos = nodes.pos[a];
      if (pos == n) {
        out.add(path(text, start, nodes, a));
        continue;
      }
      int c = edges(text, start + pos, end, edgeEnd, edgeId);
      for (int q = 0; q < c; q++) {
        int e = edgeEnd[q] - start;
        if (suffix[e] != Double.NEGATIVE_INFINITY) {
          queue.enqueue(nodes.add(e, nodes.g[a] + score[edgeId[q]], a, edgeId[q]));
        }
      }
    }
    return out;
  }

  /**
   * Draws one segmentation of {@code text[start, end)} with probability proportional to
   * {@code p(path)^alpha} [1, section 2.2], reporting its tokens to {@code sink}. Deterministic for a
   * given generator state.
   *
   * @param alpha smoothing exponent; small values flatten the distribution, large ones approach Viterbi
   * @throws IllegalArgumentException if {@code alpha} is not a positive finite number
   */
  public void sample(CharSequence text, int start, int end, double alpha, RandomGenerator random, TokenSink sink) {
    checkRange(text, start, end);
    if (!(alpha > 0) || Double.isInfinite(alpha)) {
      throw new IllegalArgumentException("alpha=" + alpha + " must be a positive finite number");
    }
    Objects.requireNonNull(random, "random");
    int n = end - start;
    if (n == 0) {
      return;
    }
    Scratch taken = own.take();
    try {
      sample(text, start, end, alpha, random, sink, scratchFor(n, taken));
    } finally {
      own.give(taken);
    }
  }

  /**
   * As {@link #sample(CharSequence, int, int, double, RandomGenerator, TokenSink)}, with working memory
   * from {@code workspace} if it is one of this segmenter's (null: its own).
   */
  public void sample(CharSequence text, int start, int end, double alpha, RandomGenerator random, TokenSink sink,
      Workspace workspace) {
    if (!(workspace instanceof Scratch)) {
      sample(text, start, end, alpha, random, sink);
      return;
    }
    checkRange(text, start, end);
    if (!(alpha > 0) || Double.isInfinite(alpha)) {
      throw new IllegalArgumentException("alpha=" + alpha + " must be a positive finite number");
    }
    Objects.requireNonNull(random, "random");
    int n = end - start;
    if (n > 0) {
      sample(text, start, end, alpha, random, sink, scratchFor(n, (Scratch) workspace));
    }
  }

  private void sample(CharSequence text, int start, int end, double alpha, RandomGenerator random, TokenSink sink,
      Scratch s) {
    int n = end - start;
    double[] beta = s.best;
    int[] edgeEnd = s.edgeEnd;
    int[] edgeId = s.edgeId;
    beta[n] = 0;
    for (int i = n - 1; i >= 0; i--) {
      int c = edges(text, start + i, end, edgeEnd, edgeId);
      double m = Double.NEGATIVE_INFINITY;
      for (int q = 0; q < c; q++) {
        m = Math.max(m, alpha * score[edgeId[q]] + beta[edgeEnd[q] - start]);
      }
      double sum = 0;
      if (m != Double.NEGATIVE_INFINITY) {
        for (int q = 0; q < c; q++) {
          sum += Math.exp(alpha * score[edgeId[q]] + beta[edgeEnd[q] - start] - m);
        }
      }
      beta[i] = m == Double.NEGATIVE_INFINITY ? m : m + Math.log(sum);
    }
    int i = 0;
    while (i < n) {
      int pos = start + i;
      int c = edges(text, pos, end, edgeEnd, edgeId);
      double u = random.nextDouble();
      double acc = 0;
      int pick = -1;
      for (int q = 0; q < c; q++) {
        double b = beta[edgeEnd[q] - start];
        if (b == Double.NEGATIVE_INFINITY) {
          continue;
        }
        pick = q;
        acc += Math.exp(alpha * score[edgeId[q]] + b - beta[i]);
        if (u < acc) {
          break;
        }
      }
      emit(text, pos, edgeEnd[pick], edgeId[pick], sink);
      i = edgeEnd[pick] - start;
    }
  }

  // ------------------------------------------------------------------ internals

  /** The pieces, in id order (for the learner and tests). */
  String[] pieces() {
    return pieces.clone();
  }

  /** Piece scores, in id order. */
  double[] pieceScores() {
    return pieceScores.clone();
  }

  /** Reserved tokens. */
  String[] reserved() {
    return reserved.clone();
  }

  /**
   * Lists the edges that start at {@code pos}: their absolute ends and ids, the unknown edge last if
   * the code point at {@code pos} is not a token. Returns the count (at most maxDepth + 1).
   */
  private int edges(CharSequence text, int pos, int end, int[] edgeEnd, int[] edgeId) {
    int cpEnd = pos + charCount(text, pos, end);
    int c = 0;
    boolean single = false;
    int node = 0;
    for (int j = pos; j < end; j++) {
      node = trie.child(node, text.charAt(j));
      if (node < 0) {
        break;
      }
      int id = trie.value(node);
      if (id >= 0) {
        edgeEnd[c] = j + 1;
        edgeId[c++] = id;
        single |= j + 1 == cpEnd;
      }
    }
    if (!single) {
      edgeEnd[c] = cpEnd;
      edgeId[c++] = unknownId;
    }
    return c;
  }

  private static int charCount(CharSequence text, int pos, int end) {
    return Character.isHighSurrogate(text.charAt(pos)) && pos + 1 < end
        && Character.isLowSurrogate(text.charAt(pos + 1)) ? 2 : 1;
  }

  /** Reports one lattice edge: a token, or an uncovered character as unknown or byte tokens. */
  private void emit(CharSequence text, int from, int to, int id, TokenSink sink) {
    if (id != unknownId || !byteSpelling) {
      sink.token(id, from, to);
      return;
    }
    int cp = to - from == 2 ? Character.toCodePoint(text.charAt(from), text.charAt(from + 1)) : text.charAt(from);
    if (Character.isSurrogate((char) cp) && to - from == 1) {
      cp = 0xFFFD; // a lone surrogate has no UTF-8 form
    }
    int base = byteBase;
    if (cp < 0x80) {
      sink.token(base + cp, from, to);
    } else if (cp < 0x800) {
      sink.token(base + (0xC0 | cp >>> 6), from, to);
      sink.token(base + (0x80 | cp & 0x3F), from, to);
    } else if (cp < 0x10000) {
      sink.token(base + (0xE0 | cp >>> 12), from, to);
      sink.token(base + (0x80 | cp >>> 6 & 0x3F), from, to);
      sink.token(base + (0x80 | cp & 0x3F), from, to);
    } else {
      sink.token(base + (0xF0 | cp >>> 18), from, to);
      sink.token(base + (0x80 | cp >>> 12 & 0x3F), from, to);
      sink.token(base + (0x80 | cp >>> 6 & 0x3F), from, to);
      sink.token(base + (0x80 | cp & 0x3F), from, to);
    }
  }

  private PiecePath path(CharSequence text, int start, Nodes nodes, int last) {
    int[] chain = new int[16];
    int m = 0;
    for (int a = last; nodes.parent[a] >= 0; a = nodes.parent[a]) {
      if (m == chain.length) {
        chain = Arrays.copyOf(chain, m * 2);
      }
      chain[m++] = a;
    }
    Segmentation0 b = new Segmentation0();
    int from = start;
    for (int q = m - 1; q >= 0; q--) {
      int a = chain[q];
      int to = start + nodes.pos[a];
      emit(text, from, to, nodes.id[a], b);
      from = to;
    }
    return b.build(nodes.g[last]);
  }

  /** {@code s} ready for a piece of {@code n} chars, or a throw-away scratch for a huge piece. */
  private Scratch scratchFor(int n, Scratch s) {
    if (n > KEEP_SCRATCH) {
      s = new Scratch();
    }
    s.ensure(n, trie.maxDepth());
    return s;
  }

  private static void checkRange(CharSequence text, int start, int end) {
    Objects.requireNonNull(text, "text");
    if (start < 0 || end < start || end > text.length()) {
      throwRange(text, start, end);
    }
  }

  // ------------------------------------------------------------------ errors

  private static void throwRange(CharSequence text, int start, int end) {
    throw new IndexOutOfBoundsException("range [" + start + ", " + end + ") is outside the text of length "
        + text.length());
  }

  // ------------------------------------------------------------------ helper types

  /** One encode call's work arrays, grown on demand; the piece cache is made on first use. */
  private static final class Scratch extends Workspace {
    double[] best = new double[0];
    int[] backPos = new int[0];
    int[] backId = new int[0];
    int[] pathPos = new int[0];
    int[] pathId = new int[0];
    int[] edgeEnd = new int[0];
    int[] edgeId = new int[0];
    private SegmentationCache cache;
    final Recorder recorder = new Recorder();

    SegmentationCache cache() {
      SegmentationCache c = cache;
      if (c == null) {
        c = new SegmentationCache();
        cache = c;
      }
      return c;
    }

    void ensure(int n, int depth) {
      if (best.length < n + 1) {
        int cap = Math.max(n + 1, Math.min(2 * best.length, KEEP_SCRATCH + 1));
        best = new double[cap];
        backPos = new int[cap];
        backId = new int[cap];
        pathPos = new int[cap];
        pathId = new int[cap];
      }
      if (edgeEnd.length < depth + 2) {
        edgeEnd = new int[depth + 2];
        edgeId = new int[depth + 2];
      }
    }
  }

  /** Collects the tokens of one short piece before they go to the cache and the caller. */
  private static final class Recorder implements TokenSink {
    final int[] ids = new int[SegmentationCache.MAX_TOKENS];
    final int[] starts = new int[SegmentationCache.MAX_TOKENS];
    final int[] ends = new int[SegmentationCache.MAX_TOKENS];
    int size;

    @Override
    public void token(int id, int start, int end) {
      ids[size] = id;
      starts[size] = start;
      ends[size] = end;
      size++;
    }
  }

  /** Growable A* node arrays. */
  private static final class Nodes {
    int[] pos = new int[64];
    double[] g = new double[64];
    int[] parent = new int[64];
    int[] id = new int[64];
    int size;

    int add(int p, double score, int par, int tok) {
      if (size == pos.length) {
        int cap = size * 2;
        pos = Arrays.copyOf(pos, cap);
        g = Arrays.copyOf(g, cap);
        parent = Arrays.copyOf(parent, cap);
        id = Arrays.copyOf(id, cap);
      }
      pos[size] = p;
      g[size] = score;
      parent[size] = par;
      id[size] = tok;
      return size++;
    }
  }

  /** Collects tokens into a {@link PiecePath}. */
  private static final class Segmentation0 implements TokenSink {
    int[] ids = new int[8];
    int[] starts = new int[8];
    int[] ends = new int[8];
    int size;

    @Override
    public void token(int id, int start, int end) {
      if (size == ids.length) {
        ids = Arrays.copyOf(ids, size * 2);
        starts = Arrays.copyOf(starts, size * 2);
        ends = Arrays.copyOf(ends, size * 2);
      }
      ids[size] = id;
      starts[size] = start;
      ends[size] = end;
      size++;
    }

    PiecePath build(double score) {
      return PiecePath.of(Arrays.copyOf(ids, size), Arrays.copyOf(starts, size), Arrays.copyOf(ends, size), score);
    }
  }
}
