package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import dev.morsel.tokenize.unigram.internal.Training;
import java.util.List;
import java.util.Objects;

/**
 * Trains a {@link UnigramModel} from piece counts [1, section 3.2]: a seed vocabulary of frequent
 * substrings, then rounds of EM [2] and likelihood-based pruning until the vocabulary size is
 * reached. Immutable and thread-safe; {@link #train} may run concurrently.
 *
 * <p>Deterministic: there are no random choices; rankings break ties by score, then by token
 * string; EM adds partial sums in a fixed order, so the result does not depend on the thread count.
 * Pieces holding an unpaired surrogate, and pieces longer than {@code maxPieceLength} (default
 * {@value #DEFAULT_MAX_PIECE_LENGTH} UTF-16 units), are not learned from. Progress is reported to the listener
 * under the stages {@code "seed"}, {@code "em"} and {@code "prune"}.
 *
 * <pre>{@code
 * UnigramModel model = UnigramLearner.builder().vocabularySize(4000).rawBytes(true).build().train(counts);
 * }</pre>
 *
 * <p>References: [1] Kudo (2018), "Subword Regularization", ACL 2018. [2] Dempster, Laird, Rubin
 * (1977), "Maximum Likelihood from Incomplete Data via the EM Algorithm".
 *
 * @since 0.1.0
 */
public final class UnigramLearner {
  /**
   * Default of {@link Builder#maxPieceLength}, in UTF-16 units (reason: far above any word of prose;
   * a longer piece is a run without breaks, whose every substring the seed stage would count).
   */
  public static final int DEFAULT_MAX_PIECE_LENGTH = 4096;

  // seed and pruning defaults, each chosen by the held-out grid in docs/unigram.md
  // (UnigramSettingsGrid in tokenize-bench; Europarl sample, 8,000 ids)
  /** Default of {@link Builder#candidateMultiple}: a plain multiple of the pieces wanted. */
  public static final int DEFAULT_CANDIDATE_MULTIPLE = 8;
  /** Default of {@link Builder#maxTokenCodePoints}, in code points. */
  public static final int DEFAULT_MAX_TOKEN_CODE_POINTS = 24;
  /** Default of {@link Builder#keepShare}: the fraction of the vocabulary each pruning round keeps. */
  public static final double DEFAULT_KEEP_SHARE = 0.7;
  /** Default of {@link Builder#emPasses}: EM passes per pruning round. */
  public static final int DEFAULT_EM_PASSES = 3;
  /** Default of {@link Builder#seedTableLimit}, in table entries (about 100 bytes each). */
  public static final int DEFAULT_SEED_TABLE_LIMIT = 2_000_000;
  /** Largest {@link Builder#keepShare}: every round removes at least 1 % of the vocabulary. */
  static final double MAX_KEEP_SHARE = 0.99;

  private final Builder b;

  private UnigramLearner(Builder b) {
    this.b = b.copy();
  }

  /** A builder with the documented defaults. */
  public static Builder builder() {
    return new Builder();
  }

  /**
   * Trains on {@code counts}, weighted by count.
   *
   * @throws IllegalArgumentException if {@code counts} is empty or no piece is left to learn from
   *     (all longer than {@code maxPieceLength} or holding an unpaired surrogate), if
   *     {@code vocabularySize} is smaller than the reserved ids plus the alphabet (every distinct
   *     character of the pieces), or if a substring's count summed over the pieces overflows a long
   */
  public UnigramModel train(PieceCounts counts) {
    Objects.requireNonNull(counts, "counts");
    return new Training(b.vocabularySize, b.candidateMultiple, b.maxTokenCodePoints, b.keepShare, b.emPasses,
        b.rawBytes, b.reservedTokens, b.unknownToken, b.threads, b.seedTableLimit, b.maxPieceLength, b.listener).train(counts);
  }

  /**
   * Settings for a {@link UnigramLearner}. Not thread-safe.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private int vocabularySize = 8000;
    private int candidateMultiple = DEFAULT_CANDIDATE_MULTIPLE;
    private int maxTokenCodePoints = DEFAULT_MAX_TOKEN_CODE_POINTS;
    private double keepShare = DEFAULT_KEEP_SHARE;
    private int emPasses = DEFAULT_EM_PASSES;
    private boolean rawBytes;
    private List<String> reservedTokens = List.of();
    private String unknownToken = UnigramModel.DEFAULT_UNKNOWN;
    private int threads = Math.max(1, Runtime.getRuntime().availableProcessors());
    private int seedTableLimit = DEFAULT_SEED_TABLE_LIMIT;
    private int maxPieceLength = DEFAULT_MAX_PIECE_LENGTH;
    private TrainingListener listener = TrainingListener.NONE;

    private Builder() {}

    private Builder copy() {
      Builder c = new Builder();
      c.vocabularySize = vocabularySize;
      c.candidateMultiple = candidateMultiple;
      c.maxTokenCodePoints = maxTokenCodePoints;
      c.keepShare = keepShare;
      c.emPasses = emPasses;
      c.rawBytes = rawBytes;
      c.reservedTokens = reservedTokens;
      c.unknownToken = unknownToken;
      c.threads = threads;
      c.seedTableLimit = seedTableLimit;
      c.maxPieceLength = maxPieceLength;
      c.listener = listener;
      return c;
    }

    /** Total ids of the trained model (reserved, byte and unknown tokens and pieces). Default 8000. */
    public Builder vocabularySize(int size) {
      this.vocabularySize = check("vocabularySize", size, 1, Integer.MAX_VALUE - 8);
      return this;
    }

    /**
     * Seed size as a multiple of the pieces wanted: the seed keeps {@code candidateMultiple × (vocabularySize
     * − reserved ids)} multi-character substrings as candidates (plus every single character), so that
     * pruning has that many to choose from. Unit: a plain multiple. Default
     * {@value UnigramLearner#DEFAULT_CANDIDATE_MULTIPLE}, range 1..1000 (chosen by measurement:
     * docs/unigram.md).
     */
    public Builder candidateMultiple(int multiple) {
      this.candidateMultiple = check("candidateMultiple", multiple, 1, 1000);
      return this;
    }

    /**
     * Longest token learned, in code points (a surrogate pair counts once; a token holds at most
     * twice as many UTF-16 units). Default {@value UnigramLearner#DEFAULT_MAX_TOKEN_CODE_POINTS},
     * range 1..64 (chosen by measurement: docs/unigram.md).
     */
    public Builder maxTokenCodePoints(int codePoints) {
      this.maxTokenCodePoints = check("maxTokenCodePoints", codePoints, 1, 64);
      return this;
    }

    /**
     * Share of the current vocabulary that each pruning round keeps (single characters included;
     * the rest go, lowest loss first), never below the target size [1, section 3.2]. Unit: a
     * fraction. Default {@value UnigramLearner#DEFAULT_KEEP_SHARE} (chosen by measurement:
     * docs/unigram.md), range (0, 0.99] (reason for the upper bound: each round runs EM over the
     * whole corpus, and the number of rounds grows as 1 / (1 − share)).
     */
    public Builder keepShare(double share) {
      if (!(share > 0 && share <= MAX_KEEP_SHARE)) {
        throw new IllegalArgumentException("keepShare=" + share + " is outside (0, " + MAX_KEEP_SHARE + "]");
      }
      this.keepShare = share;
      return this;
    }

    /**
     * EM passes (one E-step and one M-step each) before every pruning round, and as many again after
     * the last round to set the final scores. Default {@value UnigramLearner#DEFAULT_EM_PASSES}, range
     * 1..100 (chosen by measurement: docs/unigram.md).
     */
    public Builder emPasses(int passes) {
      this.emPasses = check("emPasses", passes, 1, 100);
      return this;
    }

    /**
     * Whether the model gets 256 byte tokens so a character outside the vocabulary encodes as its
     * UTF-8 bytes instead of the unknown token. Default off.
     */
    public Builder rawBytes(boolean on) {
      this.rawBytes = on;
      return this;
    }

    /** Reserved tokens, given ids {@code 0..k-1}, distinct and non-empty. Default none. */
    public Builder reservedTokens(List<String> tokens) {
      List<String> copy = List.copyOf(tokens);
      for (int i = 0; i < copy.size(); i++) {
        if (copy.get(i).isEmpty() || copy.indexOf(copy.get(i)) != i) {
          throw new IllegalArgumentException("reserved token " + i + " '" + copy.get(i) + "' is empty or repeated");
        }
      }
      this.reservedTokens = copy;
      return this;
    }

    /** Spelling of the unknown token. Default {@link UnigramModel#DEFAULT_UNKNOWN}. */
    public Builder unknownToken(String spelling) {
      if (spelling == null || spelling.isEmpty()) {
        throw new IllegalArgumentException("unknownToken must be a non-empty string");
      }
      this.unknownToken = spelling;
      return this;
    }

    /** Threads for the E-step. Default: available processors; range 1..256. */
    public Builder threads(int threads) {
      this.threads = check("threads", threads, 1, 256);
      return this;
    }

    /**
     * Entries of the seed substring table before rare ones are dropped (memory about 100 bytes an
     * entry). Default {@value UnigramLearner#DEFAULT_SEED_TABLE_LIMIT}, range 1,000..100,000,000.
     * Too small a table for the corpus costs much quality (on the whole Europarl sample, 750,000
     * entries give 1.7 % more tokens per word and 500,000 give 16 % more; docs/unigram.md): raise it
     * with the corpus.
     */
    public Builder seedTableLimit(int entries) {
      this.seedTableLimit = check("seedTableLimit", entries, 1000, 100_000_000);
      return this;
    }

    /**
     * Longest piece learned from, in UTF-16 units; longer pieces (runs without a break) are left out
     * of training. Default {@value UnigramLearner#DEFAULT_MAX_PIECE_LENGTH}, range 1..2^26.
     */
    public Builder maxPieceLength(int length) {
      this.maxPieceLength = check("maxPieceLength", length, 1, 1 << 26);
      return this;
    }

    /** Progress listener. Default {@link TrainingListener#NONE}. */
    public Builder listener(TrainingListener listener) {
      this.listener = Objects.requireNonNull(listener, "listener");
      return this;
    }

    /** The trainer. */
    public UnigramLearner build() {
      return new UnigramLearner(this);
    }

    private static int check(String name, int v, int min, int max) {
      if (v < min || v > max) {
        throw new IllegalArgumentException(name + "=" + v + " is outside [" + min + ", " + max + "]");
      }
      return v;
    }
  }
}
