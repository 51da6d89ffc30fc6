package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.spi.Workspace;
import dev.morsel.tokenize.unigram.internal.PiecePath;
import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.PriorityQueue;
import java.util.Set;
import java.util.SplittableRandom;

/**
 * What a unigram tokenizer can do beyond {@link Tokenizer#encode}: list the best segmentations of a
 * text, draw one at random for subword regularization [1], read a token's log-probability. Works on
 * any tokenizer of scheme {@value #SCHEME}, learned or loaded, without casts; every call goes through the
 * tokenizer's reserved-token scan, normalization, splitting and framing like an encode call, and
 * every result has offsets into the original text. Stateless and thread-safe.
 *
 * <pre>{@code
 * Tokenizer t = Tokenizers.load(Path.of("ferry-unigram.morsel"));
 * List<Segmentation> best = Unigram.nBest(t, "Harrowmere ferry", 4);
 * Tokens drawn = Unigram.sample(t, "Harrowmere ferry", 0.2, 7L);
 * }</pre>
 *
 * <p>Design note: the n-best list of a text combines the n-best lists of its pieces (each the A*
 * search of the segmenter, exact): the pieces are independent, so the k best segmentations of the
 * text are the k best combinations of piece segmentations, found piece by piece with a heap over the
 * sorted lists in O(k log k) per piece. Ties between equal totals go to the combination that takes
 * better-ranked segmentations of earlier pieces.
 *
 * <p>References: [1] Kudo (2018), "Subword Regularization: Improving Neural Network Translation
 * Models with Multiple Subword Candidates", ACL 2018, sections 2.2 and 3.
 *
 * @since 0.1.0
 */
public final class Unigram {
  /** The kind of unigram tokenizers: {@value}. */
  public static final String SCHEME = UnigramSegmenter.SCHEME;
  /** Largest {@code k} accepted by {@link #nBest}. */
  public static final int MAX_N_BEST = UnigramSegmenter.MAX_N_BEST;

  private Unigram() {}

  /** The {@code k} best segmentations of untrusted {@code text}, best first; see {@link #nBest(Tokenizer, CharSequence, int, Trust)}. */
  public static List<Segmentation> nBest(Tokenizer tokenizer, CharSequence text, int k) {
    return nBest(tokenizer, text, k, Trust.UNTRUSTED);
  }

  /**
   * The {@code k} best segmentations of {@code text} (fewer if it has fewer), best first; the first is
   * the tokenizer's own encoding up to ties of equal score. Reserved tokens of trusted text and
   * framing markers are the same in every one.
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME} (naming its
   *     kind), or {@code k} is outside {@code [1, MAX_N_BEST]}
   */
  public static List<Segmentation> nBest(Tokenizer tokenizer, CharSequence text, int k, Trust trust) {
    UnigramSegmenter seg = segmenter(tokenizer, "nBest");
    if (k < 1 || k > MAX_N_BEST) {
      throw new IllegalArgumentException("k=" + k + " is outside [1, MAX_N_BEST=" + MAX_N_BEST + "]");
    }
    List<List<PiecePath>> pieces = new ArrayList<>();
    Tokens all = Tokenizers.encodeWith(tokenizer, text, trust, (s, t, start, end, sink, ws) -> {
      List<PiecePath> paths = viterbiFirst(seg, t, start, end, ws, seg.nBest(t, start, end, k));
      pieces.add(paths);
      for (PiecePath p : paths) {
        for (int i = 0; i < p.size(); i++) {
          sink.token(p.id(i), p.start(i), p.end(i));
        }
      }
    });
    // where each piece's block of alternatives starts among the tokens
    int[] blockStart = new int[pieces.size()];
    int piece = 0;
    for (int j = 0; j < all.size(); ) {
      if (all.isReserved(j)) {
        j++;
        continue;
      }
      blockStart[piece] = j;
      for (PiecePath p : pieces.get(piece)) {
        j += p.size();
      }
      piece++;
    }
    int[][] choices = combine(pieces, k);
    List<Segmentation> out = new ArrayList<>(choices.length);
    for (int[] choice : choices) {
      out.add(assemble(all, pieces, blockStart, choice));
    }
    return out;
  }

  /** One segmentation of untrusted {@code text} drawn at random; see {@link #sample(Tokenizer, CharSequence, double, long, Trust)}. */
  public static Tokens sample(Tokenizer tokenizer, CharSequence text, double alpha, long seed) {
    return sample(tokenizer, text, alpha, seed, Trust.UNTRUSTED);
  }

  /**
   * One segmentation of {@code text} drawn with probability proportional to {@code p(s)^alpha} [1,
   * section 2.2], each piece drawn in turn from one generator seeded with {@code seed}: equal
   * arguments give equal results. Small {@code alpha} flattens the distribution; large values
   * approach the tokenizer's own encoding.
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME} (naming its
   *     kind), or {@code alpha} is not a positive finite number
   */
  public static Tokens sample(Tokenizer tokenizer, CharSequence text, double alpha, long seed, Trust trust) {
    UnigramSegmenter seg = segmenter(tokenizer, "sample");
    if (!(alpha > 0) || Double.isInfinite(alpha)) {
      throw new IllegalArgumentException("alpha=" + alpha + " must be a positive finite number");
    }
    SplittableRandom random = new SplittableRandom(seed);
    return Tokenizers.encodeWith(tokenizer, text, trust, (s, t, start, end, sink, ws) -> seg.sample(t, start, end, alpha, random, sink, ws));
  }

  /**
   * The log-probability of token {@code id}: a piece's score, the unknown token's penalty, or
   * {@link Double#NaN} for reserved and byte tokens.
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}
   * @throws IndexOutOfBoundsException if {@code id} is not in the vocabulary
   */
  public static double score(Tokenizer tokenizer, int id) {
    return segmenter(tokenizer, "score").score(id);
  }

  // ------------------------------------------------------------------ internals

  private static UnigramSegmenter segmenter(Tokenizer tokenizer, String what) {
    return UnigramSegmenter.of(tokenizer, "Unigram." + what);
  }

  /**
   * The k best combinations of one path per piece (each list sorted best first), as the chosen path
   * index of every piece, best total first. Each level keeps back pointers (the entry of the previous
   * level and the path taken), so memory is O(pieces × k).
   */
  static int[][] combine(List<List<PiecePath>> pieces, int k) {
    int levels = pieces.size();
    int[][] back = new int[levels][];
    int[][] pick = new int[levels][];
    double[] score = {0};
    for (int level = 0; level < levels; level++) {
      List<PiecePath> paths = pieces.get(level);
      int n = paths.size();
      double[] prev = score;
      PriorityQueue<long[]> heap = new PriorityQueue<>((x, y) -> {
        int c = Double.compare(prev[(int) y[0]] + paths.get((int) y[1]).score(), prev[(int) x[0]] + paths.get((int) x[1]).score());
        if (c != 0) {
          return c;
        }
        c = Long.compare(x[0], y[0]);
        return c != 0 ? c : Long.compare(x[1], y[1]);
      });
      Set<Long> seen = new HashSet<>();
      heap.add(new long[] {0, 0});
      seen.add(0L);
      int limit = (int) Math.min(k, (long) prev.length * n);
      double[] next = new double[limit];
      int[] b0 = new int[limit];
      int[] p0 = new int[limit];
      for (int m = 0; m < limit; m++) {
        long[] top = heap.poll();
        int a = (int) top[0];
        int b = (int) top[1];
        next[m] = prev[a] + paths.get(b).score();
        b0[m] = a;
        p0[m] = b;
        if (a + 1 < prev.length && seen.add(((long) (a + 1) << 32) | b)) {
          heap.add(new long[] {a + 1, b});
        }
        if (b + 1 < n && seen.add(((long) a << 32) | (b + 1))) {
          heap.add(new long[] {a, b + 1});
        }
      }
      score = next;
      back[level] = b0;
      pick[level] = p0;
    }
    int[][] out = new int[score.length][levels];
    for (int m = 0; m < score.length; m++) {
      int e = m;
      for (int level = levels - 1; level >= 0; level--) {
        out[m][level] = pick[level][e];
        e = back[level][e];
      }
    }
    return out;
  }

  private static Segmentation assemble(Tokens all, List<List<PiecePath>> pieces, int[] blockStart, int[] choice) {
    int size = 0;
    int reservedCount = 0;
    for (int j = 0; j < all.size(); j++) {
      if (all.isReserved(j)) {
        reservedCount++;
      }
    }
    size = reservedCount;
    double total = 0;
    for (int p = 0; p < pieces.size(); p++) {
      PiecePath path = pieces.get(p).get(choice[p]);
      size += path.size();
      total += path.score();
    }
    int[] ids = new int[size];
    int[] starts = new int[size];
    int[] ends = new int[size];
    byte[] segments = new byte[size];
    byte[] flags = new byte[size];
    int out = 0;
    int piece = 0;
    for (int j = 0; j < all.size(); ) {
      if (all.isReserved(j)) {
        ids[out] = all.id(j);
        starts[out] = all.start(j);
        ends[out] = all.end(j);
        segments[out] = (byte) all.segment(j);
        flags[out++] = (byte) all.flags(j);
        j++;
        continue;
      }
      List<PiecePath> paths = pieces.get(piece);
      int from = blockStart[piece];
      for (int b = 0; b < choice[piece]; b++) {
        from += paths.get(b).size();
      }
      int len = paths.get(choice[piece]).size();
      for (int i = from; i < from + len; i++) {
        ids[out] = all.id(i);
        starts[out] = all.start(i);
        ends[out] = all.end(i);
        segments[out] = (byte) all.segment(i);
        flags[out++] = (byte) all.flags(i);
      }
      for (PiecePath pp : paths) {
        j += pp.size();
      }
      piece++;
    }
    return new Segmentation(Tokens.of(ids, starts, ends, segments, flags), total);
  }

  /**
   * {@code paths} with the segmenter's own (Viterbi) path first when it ties with the best one, so the
   * first candidate is exactly what {@code encode} gives: A* and Viterbi may break exact ties of
   * equal score differently.
   */
  private static List<PiecePath> viterbiFirst(UnigramSegmenter seg, CharSequence t, int start, int end, Workspace ws,
      List<PiecePath> paths) {
    if (paths.size() < 2) {
      return paths;
    }
    it.unimi.dsi.fastutil.ints.IntArrayList viterbi = new it.unimi.dsi.fastutil.ints.IntArrayList();
    seg.segment(t, start, end, (id, s, e) -> viterbi.add(id), ws);
    int[] ids = viterbi.toIntArray();
    if (java.util.Arrays.equals(ids, paths.get(0).ids())) {
      return paths;
    }
    double best = paths.get(0).score();
    double tie = 1e-9 * Math.max(1, Math.abs(best)); // sums in another order differ in the last bits
    for (int i = 1; i < paths.size() && best - paths.get(i).score() <= tie; i++) {
      if (java.util.Arrays.equals(ids, paths.get(i).ids())) {
        List<PiecePath> out = new ArrayList<>(paths);
        out.add(0, out.remove(i));
        return out;
      }
    }
    return paths;
  }
}
