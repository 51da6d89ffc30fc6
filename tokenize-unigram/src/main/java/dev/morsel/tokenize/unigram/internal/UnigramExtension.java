package dev.morsel.tokenize.unigram.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.train.Extender;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import it.unimi.dsi.fastutil.ints.IntArrays;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;
import java.util.concurrent.ExecutorService;

/**
 * Extends a unigram model [1] with pieces of a new corpus, appended after the base's ids. Candidates
 * are seeded from the new corpus as {@link Training} seeds them (substrings the base lacks); EM runs
 * over the base's pieces and the candidates together on the new corpus, and rounds of pruning remove
 * only candidates until {@code addedIds} are left; then EM once more. Immutable and thread-safe.
 *
 * <p>Old domain. The new corpus alone would starve every base piece it does not use; so each M-step
 * adds to the base pieces' expected counts a prior of {@code T · p₀(t)}, where {@code p₀} is the
 * base's distribution and {@code T} the new corpus's expected token count in that step (a Dirichlet
 * prior at the base model weighing the old domain as much as the new [2]). A base piece the new
 * corpus never uses keeps its probability up to the common factor of the mixture.
 *
 * <p>Kept encodings. Afterwards, every base piece that was its own Viterbi path in the base (a text
 * piece the base encoded as that one token) is checked, shortest first, against the best path
 * without it over the extended vocabulary; where that path would now win, the piece's score is
 * raised just above it ({@link #KEEP_MARGIN}). Shortest first suffices: the path of a piece uses only
 * shorter tokens, so a later raise cannot undo an earlier check. So a text piece that was one token
 * of the base still is that token.
 *
 * <p>[1] Kudo (2018), "Subword Regularization", ACL 2018, section 3.2. [2] Gauvain, Lee (1994),
 * "Maximum a Posteriori Estimation for Multivariate Gaussian Mixture Observations of Markov Chains"
 * (// from memory: MAP adaptation of a trained model to new data with the old model as prior).
 */
public final class UnigramExtension implements Extender {
  /** How far above its best rival path a kept base piece is put, in nats (reason: above rounding of sums of ~20 logs). */
  static final double KEEP_MARGIN = 1e-6;

  private final int addedIds;
  private final int candidateMultiple;
  private final int maxTokenCodePoints;
  private final double keepShare;
  private final int emPasses;
  private final int seedTableLimit;
  private final int maxPieceLength;
  private final long minCount;
  private final int threads;
  private final TrainingListener listener;

  /**
   * An extender with every setting checked.
   *
   * @throws IllegalArgumentException naming the setting that is out of range
   */
  public UnigramExtension(int addedIds, int candidateMultiple, int maxTokenCodePoints, double keepShare, int emPasses,
      int seedTableLimit, int maxPieceLength, long minCount, int threads, TrainingListener listener) {
    this.addedIds = check("addedIds", addedIds, 1, Integer.MAX_VALUE - 1024);
    this.candidateMultiple = check("candidateMultiple", candidateMultiple, 1, 1000);
    this.maxTokenCodePoints = check("maxTokenCodePoints", maxTokenCodePoints, 1, 64);
    if (!(keepShare > 0 && keepShare <= Training.MAX_KEEP_SHARE)) {
      throw new IllegalArgumentException("keepShare=" + keepShare + " is outside (0, " + Training.MAX_KEEP_SHARE + "]");
    }
    this.keepShare = keepShare;
    this.emPasses = check("emPasses", emPasses, 1, 100);
    this.seedTableLimit = check("seedTableLimit", seedTableLimit, 1000, 100_000_000);
    this.maxPieceLength = check("maxPieceLength", maxPieceLength, 1, 1 << 26);
    if (minCount < 1) {
      throw new IllegalArgumentException("minCount=" + minCount + " must be at least 1");
    }
    this.minCount = minCount;
    this.threads = check("threads", threads, 1, Training.MAX_THREADS);
    this.listener = Objects.requireNonNull(listener, "listener");
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

  @Override
  public Tokenizer extend(Tokenizer base, PieceCounts counts) {
    Extender.checkInputs(UnigramSegmenter.SCHEME, base, counts);
    UnigramSegmenter s = UnigramSegmenter.of(base, "a unigram extension");
    long total = (long) s.vocabularySize() + addedIds;
    if (total > dev.morsel.tokenize.format.ModelLimits.DEFAULT_MAX_VOCABULARY) {
      throw new IllegalArgumentException("addedIds=" + addedIds + " would give " + total
          + " ids, over the model limit ModelLimits.maxVocabulary " + dev.morsel.tokenize.format.ModelLimits.DEFAULT_MAX_VOCABULARY);
    }
    PieceCounts kept = minCount > 1 ? counts.withMinCount(minCount) : counts;
    List<String> corpusList = new ArrayList<>(kept.size());
    long[] weights = new long[kept.size()];
    for (int i = 0; i < kept.size(); i++) {
      String p = kept.piece(i);
      if (p.length() > maxPieceLength || UnigramSegmenter.unpairedSurrogate(p) >= 0) {
        continue;
      }
      weights[corpusList.size()] = kept.count(i);
      corpusList.add(p);
    }
    if (corpusList.isEmpty()) {
      throw new IllegalArgumentException("no new piece to learn from (minCount=" + minCount + ", maxPieceLength="
          + maxPieceLength + ", pieces with an unpaired surrogate are left out)");
    }
    String[] corpus = corpusList.toArray(new String[0]);
    weights = Arrays.copyOf(weights, corpus.length);

    int first = s.firstPieceId();
    int nOld = s.vocabularySize() - first;
    String[] oldPieces = new String[nOld];
    double[] prior = new double[nOld]; // p0, normalized
    double maxScore = Double.NEGATIVE_INFINITY;
    for (int i = 0; i < nOld; i++) {
      oldPieces[i] = s.token(first + i);
      maxScore = Math.max(maxScore, s.score(first + i));
    }
    double z = 0;
    for (int i = 0; i < nOld; i++) {
      prior[i] = Math.exp(s.score(first + i) - maxScore);
      z += prior[i];
    }
    for (int i = 0; i < nOld; i++) {
      prior[i] /= z;
    }
    Set<String> taken = new HashSet<>(Arrays.asList(oldPieces));
    for (int id = 0; id < first; id++) {
      taken.add(s.token(id));
    }
    taken.addAll(base.reservedTokens().spellings());
    int maxMulti = (int) Math.min(Integer.MAX_VALUE - 8, (long) candidateMultiple * addedIds);
    SeedCounter.Seeds seeds = SeedCounter.seed(corpus, weights, maxTokenCodePoints, maxMulti, seedTableLimit, taken,
        listener);
    if (seeds.tokens().length == 0) {
      throw new IllegalArgumentException("the new pieces hold no substring the base lacks: nothing to add");
    }
    // vocabulary during EM: the base's pieces (fixed, never pruned), then the candidates
    String[] vocab = concat(oldPieces, seeds.tokens());
    double[] logp = new double[vocab.length];
    for (int i = 0; i < nOld; i++) {
      logp[i] = Math.log(prior[i]) + Math.log(0.5);
    }
    for (int i = 0; i < seeds.tokens().length; i++) {
      logp[nOld + i] = seeds.logp()[i] + Math.log(0.5);
    }
    Em em = new Em(corpus, weights);
    ExecutorService pool = Training.emPool(threads);
    try {
      int round = 0;
      long step = 0;
      while (true) {
        double[] expected = new double[vocab.length];
        for (int it = 0; it < emPasses; it++) {
          double ll = em.expect(vocab, logp, expected, pool);
          double tokens = 0;
          for (double e : expected) {
            tokens += e;
          }
          for (int i = 0; i < nOld; i++) {
            expected[i] += tokens * prior[i];
          }
          Em.maximize(expected, logp);
          listener.progress("em", ++step, -1, "round " + round + ", iteration " + (it + 1) + ", " + (vocab.length - nOld)
              + " new tokens, log-likelihood " + ll);
        }
        int candidates = vocab.length - nOld;
        if (candidates <= addedIds) {
          break;
        }
        int newSize = Math.max(addedIds, Math.min(candidates - 1, (int) (candidates * keepShare)));
        int[] keep = pruneNew(vocab, logp, expected, nOld, newSize);
        String[] v = new String[nOld + keep.length];
        double[] lp = new double[v.length];
        System.arraycopy(vocab, 0, v, 0, nOld);
        System.arraycopy(logp, 0, lp, 0, nOld);
        for (int i = 0; i < keep.length; i++) {
          v[nOld + i] = vocab[keep[i]];
          lp[nOld + i] = logp[keep[i]];
        }
        Training.renormalize(lp);
        listener.progress("prune", ++round, -1, candidates + " -> " + keep.length + " new tokens (target " + addedIds + ")");
        vocab = v;
        logp = lp;
      }
    } finally {
      if (pool != null) {
        pool.shutdownNow();
      }
    }
    keepWholePieces(s, vocab, logp, nOld);
    // new ids: by score, then by token string
    int nNew = vocab.length - nOld;
    Integer[] order = new Integer[nNew];
    for (int i = 0; i < nNew; i++) {
      order[i] = nOld + i;
    }
    final String[] fv = vocab;
    final double[] fl = logp;
    Arrays.sort(order, (a, b) -> {
      int c = Double.compare(fl[b], fl[a]);
      return c != 0 ? c : fv[a].compareTo(fv[b]);
    });
    List<String> pieces = new ArrayList<>(vocab.length);
    double[] scores = new double[vocab.length];
    for (int i = 0; i < nOld; i++) {
      pieces.add(vocab[i]);
      scores[i] = logp[i];
    }
    for (int i = 0; i < nNew; i++) {
      pieces.add(fv[order[i]]);
      scores[nOld + i] = fl[order[i]];
    }
    UnigramSegmenter extended = UnigramSegmenter.create(s.reservedSpellings(), s.byteSpelling(), s.token(s.unknownId()),
        pieces, scores);
    return Tokenizers.extension(base, extended);
  }

  /**
   * Indices (into {@code vocab}) of the candidates kept: new single characters first (most expected
   * first), then the multi-character candidates with the highest loss [1, section 3.2].
   */
  static int[] pruneNew(String[] vocab, double[] logp, double[] expected, int nOld, int newSize) {
    int[] values = new int[vocab.length];
    for (int i = 0; i < values.length; i++) {
      values[i] = i;
    }
    PieceTrie trie = new PieceTrie(vocab, values);
    int n = vocab.length - nOld;
    int[] order = new int[n];
    double[] loss = new double[vocab.length];
    boolean[] single = new boolean[vocab.length];
    double[] best = new double[64];
    for (int q = 0; q < n; q++) {
      int t = nOld + q;
      order[q] = t;
      if (SeedCounter.single(vocab[t])) {
        single[t] = true;
        loss[t] = expected[t];
      } else {
        loss[t] = expected[t] * (logp[t] - Training.bestWithout(vocab[t], t, trie, logp, best));
      }
    }
    IntArrays.quickSort(order, 0, n, (a, b) -> {
      if (single[a] != single[b]) {
        return single[a] ? -1 : 1;
      }
      int c = Double.compare(loss[b], loss[a]);
      return c != 0 ? c : vocab[a].compareTo(vocab[b]);
    });
    int[] keep = Arrays.copyOf(order, Math.min(n, newSize));
    Arrays.sort(keep); // in their current order
    return keep;
  }

  /** Raises base pieces that were their own Viterbi path so they still are (class note). */
  private static void keepWholePieces(UnigramSegmenter s, String[] vocab, double[] logp, int nOld) {
    int first = s.firstPieceId();
    int[] values = new int[vocab.length];
    for (int i = 0; i < values.length; i++) {
      values[i] = i;
    }
    PieceTrie trie = new PieceTrie(vocab, values);
    Integer[] byLength = new Integer[nOld];
    for (int i = 0; i < nOld; i++) {
      byLength[i] = i;
    }
    Arrays.sort(byLength, (a, b) -> Integer.compare(vocab[a].length(), vocab[b].length()));
    int[] found = new int[2];
    double[] best = new double[64];
    for (int i : byLength) {
      String p = vocab[i];
      if (SeedCounter.single(p)) {
        continue; // no other path of one character but bytes, which score below every piece
      }
      found[0] = -1;
      found[1] = 0;
      s.segment(p, 0, p.length(), (id, a, b) -> {
        if (found[1]++ == 0) {
          found[0] = id;
        }
      });
      if (found[1] != 1 || found[0] != first + i) {
        continue; // not one token in the base: nothing to keep
      }
      double rival = Training.bestWithout(p, i, trie, logp, best);
      if (rival + KEEP_MARGIN > logp[i]) {
        logp[i] = rival + KEEP_MARGIN;
      }
    }
  }

  private static String[] concat(String[] a, String[] b) {
    String[] out = Arrays.copyOf(a, a.length + b.length);
    System.arraycopy(b, 0, out, a.length, b.length);
    return out;
  }
}
