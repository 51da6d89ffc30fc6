package dev.morsel.tokenize.unigram.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.train.Alphabet;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import it.unimi.dsi.fastutil.ints.IntArrays;
import it.unimi.dsi.fastutil.objects.Object2IntOpenHashMap;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;

/**
 * One training run of the unigram model [1, section 3.2]: seed, then rounds of EM and pruning until
 * the vocabulary size is reached, then EM once more. Deterministic: no random choices; every
 * ranking breaks ties by token string; EM sums in a fixed order whatever the thread count.
 *
 * <p>Pruning: for each multi-character token t the loss is {@code c(t) · (log p(t) − log p(alt(t)))},
 * the drop in corpus log-likelihood if every expected occurrence of t were replaced by the best
 * (Viterbi) segmentation alt(t) of t's string without t itself [1, section 3.2]. The tokens with the
 * highest loss are kept, {@code keepShare} of the vocabulary per round; single characters always
 * stay so every piece stays covered.
 *
 * <p>Alphabet: an {@link AlphabetPolicy} chooses the characters tokens are made of (when its cap is
 * derived: half the ids left after the reserved, byte and unknown tokens). Each piece is cut at the
 * characters left out, and the runs between them are learned from in its place, so no seed token
 * and no id holds a left-out character; at encode time those characters are spelled with byte
 * tokens (byte spelling on) or become the unknown token.
 *
 * <p>Every setting is checked when the training is made (so by {@code UnigramLearner.Builder.build()}
 * and by the learner provider alike), each refusal naming the setting.
 *
 * <p>References: [1] Kudo (2018), "Subword Regularization", ACL 2018.
 */
public final class Training implements Learner {
  /** Default vocabulary size, in ids, the same for every scheme. */
  public static final int DEFAULT_VOCABULARY_SIZE = LearnerSettings.DEFAULT_VOCABULARY_SIZE;
  // seed and pruning defaults, each chosen by the held-out grid in docs/unigram.md
  // (UnigramSettingsGrid in tokenize-bench; Europarl sample, 8,000 ids)
  /** Default candidate multiple: a plain multiple of the pieces wanted. */
  public static final int DEFAULT_CANDIDATE_MULTIPLE = 8;
  /** Default longest token, in code points. */
  public static final int DEFAULT_MAX_TOKEN_CODE_POINTS = 24;
  /** Default share of the vocabulary each pruning round keeps. */
  public static final double DEFAULT_KEEP_SHARE = 0.7;
  /** Default EM passes per pruning round. */
  public static final int DEFAULT_EM_PASSES = 3;
  /** Largest keep share: every round removes at least 1 % of the vocabulary. */
  public static final double MAX_KEEP_SHARE = 0.99;
  /** Default: characters outside the vocabulary become their UTF-8 bytes, never the unknown token. */
  public static final boolean DEFAULT_BYTE_SPELLING = true;
  /** Default seed table entries (about 100 bytes each). */
  public static final int DEFAULT_SEED_TABLE_LIMIT = 2_000_000;
  /**
   * Default longest piece learned from, in UTF-16 units (reason: far above any word of prose; a
   * longer piece is a run without breaks, whose every substring the seed stage would count).
   */
  public static final int DEFAULT_MAX_PIECE_LENGTH = 4096;
  /** Most threads of the E-step. */
  public static final int MAX_THREADS = 256;

  private final int vocabularySize;
  private final int candidateMultiple;
  private final int maxTokenCodePoints;
  private final double keepShare;
  private final int emPasses;
  private final boolean byteSpelling;
  private final AlphabetPolicy alphabetPolicy;
  private final List<String> reserved;
  private final String unknown;
  private final int threads;
  private final int seedTableLimit;
  private final int maxPieceLength;
  private final long minCount;
  private final TrainingListener listener;

  /**
   * A training with every setting checked.
   *
   * @throws IllegalArgumentException naming the setting that is out of range, or the reserved token
   *     (by index) that is invalid or equals the unknown token's spelling
   * @throws NullPointerException if a reserved token, the unknown token or the listener is null
   */
  public Training(int vocabularySize, int candidateMultiple, int maxTokenCodePoints, double keepShare, int emPasses,
      boolean byteSpelling, AlphabetPolicy alphabetPolicy, List<String> reserved, String unknown, int threads, int seedTableLimit,
      int maxPieceLength, long minCount, TrainingListener listener) {
    this.vocabularySize = check("vocabularySize", vocabularySize, 1, Integer.MAX_VALUE - 8);
    this.candidateMultiple = check("candidateMultiple", candidateMultiple, 1, 1000);
    this.maxTokenCodePoints = check("maxTokenCodePoints", maxTokenCodePoints, 1, 64);
    if (!(keepShare > 0 && keepShare <= MAX_KEEP_SHARE)) {
      throw new IllegalArgumentException("keepShare=" + keepShare + " is outside (0, " + MAX_KEEP_SHARE + "]");
    }
    this.keepShare = keepShare;
    this.emPasses = check("emPasses", emPasses, 1, 100);
    this.byteSpelling = byteSpelling;
    this.alphabetPolicy = Objects.requireNonNull(alphabetPolicy, "alphabet");
    this.reserved = LearnerSettings.checkReserved(reserved);
    Objects.requireNonNull(unknown, "unknownToken");
    if (unknown.isEmpty() || unknown.length() > UnigramSegmenter.MAX_PIECE_LENGTH
        || UnigramSegmenter.unpairedSurrogate(unknown) >= 0) {
      throw new IllegalArgumentException("unknownToken '" + unknown + "' must be 1.." + UnigramSegmenter.MAX_PIECE_LENGTH
          + " chars of well-formed UTF-16");
    }
    int clash = this.reserved.indexOf(unknown);
    if (clash >= 0) {
      throw new IllegalArgumentException("reservedTokens[" + clash + "] '" + unknown + "' equals the unknownToken spelling");
    }
    if (byteSpelling) {
      for (int i = 0; i < this.reserved.size(); i++) {
        for (int b = 0; b < 256; b++) {
          if (this.reserved.get(i).equals(UnigramSegmenter.byteTokenText(b))) {
            throw new IllegalArgumentException("reservedTokens[" + i + "] '" + this.reserved.get(i)
                + "' is the spelling of byte token " + b + " (byteSpelling is on)");
          }
        }
      }
    }
    this.unknown = unknown;
    this.threads = check("threads", threads, 1, MAX_THREADS);
    this.seedTableLimit = check("seedTableLimit", seedTableLimit, 1000, 100_000_000);
    this.maxPieceLength = check("maxPieceLength", maxPieceLength, 1, 1 << 26);
    if (minCount < 1) {
      throw new IllegalArgumentException("minCount=" + minCount + " must be at least 1");
    }
    this.minCount = minCount;
    this.listener = Objects.requireNonNull(listener, "listener");
    long floor = (long) this.reserved.size() + (byteSpelling ? 256 : 0) + 2;
    if (vocabularySize < floor) {
      throw new IllegalArgumentException("vocabularySize=" + vocabularySize + " is below " + floor + " ("
          + this.reserved.size() + " reserved tokens" + (byteSpelling ? ", 256 byte tokens" : "")
          + ", the unknown token and at least one piece)");
    }
  }

  private static int check(String name, int v, int min, int max) {
    if (v < min || v > max) {
      throw new IllegalArgumentException(name + "=" + v + " is outside [" + min + ", " + max + "]");
    }
    return v;
  }

  @Override
  public String scheme() {
    return UnigramSegmenter.SCHEME;
  }

  /** Learns from {@code counts}; the tokenizer encodes with their pipeline. */
  @Override
  public Tokenizer train(PieceCounts counts) {
    return Tokenizers.of(Objects.requireNonNull(counts, "counts").pipeline(), segmenter(counts));
  }

  /** Learns the segmenter alone from {@code counts}. */
  public UnigramSegmenter segmenter(PieceCounts counts) {
    Objects.requireNonNull(counts, "counts");
    if (minCount > 1 && !counts.isEmpty()) {
      PieceCounts kept = counts.withMinCount(minCount);
      if (kept.isEmpty()) {
        throw new IllegalArgumentException("no piece has a count >= minCount=" + minCount);
      }
      counts = kept;
    }
    if (counts.isEmpty()) {
      throw new IllegalArgumentException("piece counts are empty; training needs at least one piece");
    }
    int n = counts.size();
    List<String> usable = new ArrayList<>(n);
    long[] usableCounts = new long[n];
    int tooLong = 0;
    for (int i = 0; i < n; i++) {
      String p = counts.piece(i);
      if (p.length() > maxPieceLength) {
        tooLong++;
        continue; // a run without breaks: its substrings would swamp the seed; not learned from
      }
      if (UnigramSegmenter.unpairedSurrogate(p) >= 0) {
        continue; // an unpaired surrogate cannot be a token; such pieces are not learned from
      }
      usableCounts[usable.size()] = counts.count(i);
      usable.add(p);
    }
    if (usable.isEmpty()) {
      throw new IllegalArgumentException(tooLong == 0 ? "every piece holds an unpaired surrogate; nothing to train on"
          : tooLong + " of " + n + " pieces are longer than maxPieceLength="
          + maxPieceLength + " (UnigramLearner.Builder.maxPieceLength) and the rest hold an unpaired surrogate;"
          + " nothing to train on");
    }
    int reservedIds = reserved.size() + (byteSpelling ? 256 : 0) + 1;
    Alphabet alphabet = alphabetPolicy.select(PieceCounts.of(usable.toArray(new String[0]),
        Arrays.copyOf(usableCounts, usable.size())), Math.max(1, (vocabularySize - reservedIds) / 2), byteSpelling);
    long required = (long) reservedIds + alphabet.size();
    if (vocabularySize < required) {
      throw new IllegalArgumentException("vocabularySize=" + vocabularySize + " is smaller than the " + required
          + " ids required: " + reserved.size() + " reserved tokens" + (byteSpelling ? ", 256 byte tokens" : "")
          + ", 1 unknown token and an alphabet of " + alphabet.size() + " characters (lower the alphabet's maxSize"
          + " or coverage)");
    }
    listener.alphabet(UnigramSegmenter.SCHEME, alphabet);
    // the runs of alphabet characters between the left-out ones, merged where equal (first-seen order)
    Object2IntOpenHashMap<String> runIndex = new Object2IntOpenHashMap<>();
    runIndex.defaultReturnValue(-1);
    List<String> corpusList = new ArrayList<>(usable.size());
    long[] weights = new long[usable.size()];
    for (int i = 0; i < usable.size(); i++) {
      String p = usable.get(i);
      long w = usableCounts[i];
      if (alphabet.leftOutSize() == 0 || alphabet.containsAll(p)) {
        weights = addRun(p, w, runIndex, corpusList, weights);
        continue;
      }
      int start = 0;
      for (int k = 0; k < p.length(); ) {
        int cp = p.codePointAt(k);
        int next = k + Character.charCount(cp);
        if (!alphabet.contains(cp)) {
          if (k > start) {
            weights = addRun(p.substring(start, k), w, runIndex, corpusList, weights);
          }
          start = next;
        }
        k = next;
      }
      if (start < p.length()) {
        weights = addRun(p.substring(start), w, runIndex, corpusList, weights);
      }
    }
    if (corpusList.isEmpty()) {
      throw new IllegalArgumentException("no piece holds a character of the alphabet (" + alphabet.summary() + ")");
    }
    String[] corpus = corpusList.toArray(new String[0]);
    weights = Arrays.copyOf(weights, corpus.length);
    int target = vocabularySize - reservedIds;
    Set<String> taken = new HashSet<>(reserved);
    taken.add(unknown);
    if (byteSpelling) {
      for (int b = 0; b < 256; b++) {
        taken.add(UnigramSegmenter.byteTokenText(b));
      }
    }
    int maxMulti = (int) Math.min(Integer.MAX_VALUE - 8, (long) candidateMultiple * target);
    SeedCounter.Seeds seeds = SeedCounter.seed(corpus, weights, maxTokenCodePoints, maxMulti, seedTableLimit, taken,
        listener);
    String[] vocab = seeds.tokens();
    double[] logp = seeds.logp();
    Em em = new Em(corpus, weights);
    ExecutorService pool = emPool(threads);
    try {
      int round = 0;
      long step = 0;
      while (true) {
        double[] expected = new double[vocab.length];
        for (int it = 0; it < emPasses; it++) {
          double ll = em.iterate(vocab, logp, expected, pool);
          listener.progress("em", ++step, -1, "round " + round + ", iteration " + (it + 1) + ", " + vocab.length
              + " tokens, log-likelihood " + ll);
        }
        if (vocab.length <= target) {
          break;
        }
        int newSize = Math.max(target, Math.min(vocab.length - 1, (int) (vocab.length * keepShare)));
        int[] keep = prune(vocab, logp, expected, newSize);
        String[] v = new String[keep.length];
        double[] lp = new double[keep.length];
        for (int i = 0; i < keep.length; i++) {
          v[i] = vocab[keep[i]];
          lp[i] = logp[keep[i]];
        }
        renormalize(lp);
        listener.progress("prune", ++round, -1, vocab.length + " -> " + v.length + " tokens (target " + target + ")");
        vocab = v;
        logp = lp;
      }
    } finally {
      if (pool != null) {
        pool.shutdownNow();
      }
    }
    // id order: by score, then by token string
    Integer[] order = new Integer[vocab.length];
    for (int i = 0; i < order.length; i++) {
      order[i] = i;
    }
    final String[] fv = vocab;
    final double[] fl = logp;
    Arrays.sort(order, (a, b) -> {
      int c = Double.compare(fl[b], fl[a]);
      return c != 0 ? c : fv[a].compareTo(fv[b]);
    });
    List<String> pieces = new ArrayList<>(order.length);
    double[] scores = new double[order.length];
    for (int i = 0; i < order.length; i++) {
      pieces.add(fv[order[i]]);
      scores[i] = fl[order[i]];
    }
    UnigramSegmenter made = UnigramSegmenter.create(reserved, byteSpelling, unknown, pieces, scores);
    made.recordAlphabet(alphabet.record());
    return made;
  }

  /** Adds {@code w} to the weight of {@code run}, appending it when new; returns the (grown) weights. */
  private static long[] addRun(String run, long w, Object2IntOpenHashMap<String> index, List<String> runs,
      long[] weights) {
    int at = index.getInt(run);
    if (at >= 0) {
      weights[at] += w;
      return weights;
    }
    index.put(run, runs.size());
    if (runs.size() == weights.length) {
      weights = Arrays.copyOf(weights, Math.max(16, weights.length * 2));
    }
    weights[runs.size()] = w;
    runs.add(run);
    return weights;
  }

  /** The E-step's threads: null for one (the caller's thread runs it), else daemon threads. */
  static ExecutorService emPool(int threads) {
    return threads > 1 ? Executors.newFixedThreadPool(threads, r -> {
      Thread t = new Thread(r, "morsel-unigram-em");
      t.setDaemon(true);
      return t;
    }) : null;
  }

  /** Indices of the tokens kept (in their current order): all single characters, then the highest losses. */
  static int[] prune(String[] vocab, double[] logp, double[] expected, int newSize) {
    int[] values = new int[vocab.length];
    for (int i = 0; i < values.length; i++) {
      values[i] = i;
    }
    PieceTrie trie = new PieceTrie(vocab, values);
    double[] loss = new double[vocab.length];
    int[] multi = new int[vocab.length];
    boolean[] kept = new boolean[vocab.length];
    int nm = 0;
    int singles = 0;
    double[] best = new double[64];
    for (int t = 0; t < vocab.length; t++) {
      String s = vocab[t];
      if (SeedCounter.single(s)) {
        kept[t] = true;
        singles++;
        continue;
      }
      multi[nm++] = t;
      double alt = bestWithout(s, t, trie, logp, best);
      loss[t] = expected[t] * (logp[t] - alt);
    }
    IntArrays.quickSort(multi, 0, nm, (a, b) -> {
      int c = Double.compare(loss[b], loss[a]);
      return c != 0 ? c : vocab[a].compareTo(vocab[b]);
    });
    int keepMulti = Math.max(0, Math.min(nm, newSize - singles));
    for (int i = 0; i < keepMulti; i++) {
      kept[multi[i]] = true;
    }
    int[] out = new int[singles + keepMulti];
    int m = 0;
    for (int t = 0; t < vocab.length; t++) {
      if (kept[t]) {
        out[m++] = t;
      }
    }
    return out;
  }

  /** Viterbi score of {@code s} over the vocabulary without token {@code self}. */
  static double bestWithout(String s, int self, PieceTrie trie, double[] logp, double[] best) {
    int n = s.length();
    if (best.length < n + 1) {
      best = new double[n + 1];
    }
    Arrays.fill(best, 0, n + 1, Double.NEGATIVE_INFINITY);
    best[0] = 0;
    for (int i = 0; i < n; i++) {
      if (best[i] == Double.NEGATIVE_INFINITY) {
        continue;
      }
      int node = 0;
      for (int j = i; j < n; j++) {
        node = trie.child(node, s.charAt(j));
        if (node < 0) {
          break;
        }
        int id = trie.value(node);
        if (id >= 0 && id != self) {
          best[j + 1] = Math.max(best[j + 1], best[i] + logp[id]);
        }
      }
    }
    return best[n];
  }

  static void renormalize(double[] logp) {
    double m = Double.NEGATIVE_INFINITY;
    for (double v : logp) {
      m = Math.max(m, v);
    }
    double sum = 0;
    for (double v : logp) {
      sum += Math.exp(v - m);
    }
    double z = m + Math.log(sum);
    for (int i = 0; i < logp.length; i++) {
      logp[i] -= z;
    }
  }
}
