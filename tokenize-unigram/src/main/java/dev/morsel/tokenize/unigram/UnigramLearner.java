package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.Extender;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import dev.morsel.tokenize.unigram.internal.Training;
import dev.morsel.tokenize.unigram.internal.UnigramExtension;
import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import java.util.List;
import java.util.Objects;

/**
 * Learns a unigram language model [1, section 3.2] from piece counts: a seed vocabulary of frequent
 * substrings, then rounds of EM [2] and likelihood-based pruning until the vocabulary size is
 * reached. Immutable and thread-safe; {@link #train} may run concurrently and returns a tokenizer
 * bound to the pipeline of the counts. {@link Unigram} reaches the model's n-best lists and sampling
 * from that tokenizer, or from one loaded from a model file.
 *
 * <p>Deterministic: there are no random choices; rankings break ties by score, then by token
 * string; EM adds partial sums in a fixed order, so the result does not depend on the thread count.
 * Pieces holding an unpaired surrogate, and pieces longer than {@code maxPieceLength} (default
 * {@value #DEFAULT_MAX_PIECE_LENGTH} UTF-16 units), are not learned from. Progress is reported to the
 * listener under the stages {@code "seed"}, {@code "em"} and {@code "prune"}.
 *
 * <pre>{@code
 * Tokenizer unigram = UnigramLearner.builder().vocabularySize(4000).build().train(counts);
 * List<Segmentation> best = Unigram.nBest(unigram, "Harrowmere ferry", 4);
 * }</pre>
 *
 * <p>References: [1] Kudo (2018), "Subword Regularization", ACL 2018. [2] Dempster, Laird, Rubin
 * (1977), "Maximum Likelihood from Incomplete Data via the EM Algorithm".
 *
 * @since 0.1.0
 */
public final class UnigramLearner implements Learner {
  /** Default {@code vocabularySize}, in ids: {@value}, the same for every scheme. */
  public static final int DEFAULT_VOCABULARY_SIZE = Training.DEFAULT_VOCABULARY_SIZE;
  /** Default {@code maxPieceLength}, in UTF-16 units (far above any word of prose). */
  public static final int DEFAULT_MAX_PIECE_LENGTH = Training.DEFAULT_MAX_PIECE_LENGTH;
  /** Default spelling of the unknown token. */
  public static final String DEFAULT_UNKNOWN_TOKEN = UnigramSegmenter.DEFAULT_UNKNOWN;

  // seed and pruning defaults, each chosen by the held-out grid in docs/unigram.md
  // (UnigramSettingsGrid in tokenize-bench; Europarl sample, 8,000 ids)
  /** Default of {@link Builder#candidateMultiple}: a plain multiple of the pieces wanted. */
  public static final int DEFAULT_CANDIDATE_MULTIPLE = Training.DEFAULT_CANDIDATE_MULTIPLE;
  /** Default of {@link Builder#maxTokenCodePoints}, in code points. */
  public static final int DEFAULT_MAX_TOKEN_CODE_POINTS = Training.DEFAULT_MAX_TOKEN_CODE_POINTS;
  /** Default of {@link Builder#keepShare}: the fraction of the vocabulary each pruning round keeps. */
  public static final double DEFAULT_KEEP_SHARE = Training.DEFAULT_KEEP_SHARE;
  /** Default of {@link Builder#emPasses}: EM passes per pruning round. */
  public static final int DEFAULT_EM_PASSES = Training.DEFAULT_EM_PASSES;
  /** Default of {@link Builder#seedTableLimit}, in table entries (about 100 bytes each). */
  public static final int DEFAULT_SEED_TABLE_LIMIT = Training.DEFAULT_SEED_TABLE_LIMIT;

  private final Training training;

  private UnigramLearner(Training training) {
    this.training = training;
  }

  /** A builder with the documented defaults. */
  public static Builder builder() {
    return new Builder();
  }

  /**
   * A builder of an {@link Extender} that extends a unigram model with pieces of a new corpus,
   * appended after the base's ids: candidates are seeded from the new corpus, EM re-estimates the
   * scores of the base's pieces and the candidates together (the base model weighs as a prior, so
   * the old domain keeps its share), and pruning removes only candidates. A text piece the base
   * encoded as one token still is that token. The base's reserved, byte and unknown tokens are kept.
   *
   * <pre>{@code
   * Tokenizer extended = UnigramLearner.extender().addedIds(2_000).build().extend(base, codeCounts);
   * }</pre>
   *
   * @since 0.3.0
   */
  public static ExtenderBuilder extender() {
    return new ExtenderBuilder();
  }

  @Override
  public String scheme() {
    return Unigram.SCHEME;
  }

  /**
   * Learns from {@code counts}, weighted by count; the tokenizer encodes with {@link
   * PieceCounts#pipeline()} and holds the reserved tokens at ids {@code 0..k-1}.
   *
   * @throws IllegalArgumentException if {@code counts} is empty or no piece is left to learn from
   *     (below {@code minCount}, longer than {@code maxPieceLength} or holding an unpaired
   *     surrogate), if {@code vocabularySize} is smaller than the reserved ids plus the alphabet
   *     (every distinct character of the pieces), or if a substring's count summed over the pieces
   *     overflows a long
   */
  @Override
  public Tokenizer train(PieceCounts counts) {
    return training.train(counts);
  }

  /**
   * Settings for a {@link UnigramLearner}; every setting is checked at {@link #build()}. Not
   * thread-safe.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private int vocabularySize = DEFAULT_VOCABULARY_SIZE;
    private long minCount = 1;
    private int candidateMultiple = DEFAULT_CANDIDATE_MULTIPLE;
    private int maxTokenCodePoints = DEFAULT_MAX_TOKEN_CODE_POINTS;
    private double keepShare = DEFAULT_KEEP_SHARE;
    private int emPasses = DEFAULT_EM_PASSES;
    private boolean byteSpelling = Training.DEFAULT_BYTE_SPELLING;
    private AlphabetPolicy alphabet = AlphabetPolicy.defaults();
    private List<String> reservedTokens = List.of();
    private String unknownToken = DEFAULT_UNKNOWN_TOKEN;
    private int threads = Math.max(1, Math.min(Training.MAX_THREADS, Runtime.getRuntime().availableProcessors()));
    private int seedTableLimit = DEFAULT_SEED_TABLE_LIMIT;
    private int maxPieceLength = DEFAULT_MAX_PIECE_LENGTH;
    private TrainingListener listener = TrainingListener.NONE;

    private Builder() {}

    /** Total ids of the learned model (reserved, byte and unknown tokens and pieces). Default {@value #DEFAULT_VOCABULARY_SIZE}. */
    public Builder vocabularySize(int size) {
      this.vocabularySize = size;
      return this;
    }

    /** Pieces counted fewer times are not learned from (at least 1). Default 1. */
    public Builder minCount(long count) {
      this.minCount = count;
      return this;
    }

    /**
     * Seed candidates as a multiple of the number of pieces wanted: the seed keeps this many times as
     * many multi-character substrings, so pruning has room to choose. Default 8, range 1..1000 (chosen by measurement: docs/unigram.md);
     * checked at {@link #build()}.
     */
    public Builder candidateMultiple(int multiple) {
      this.candidateMultiple = multiple;
      return this;
    }

    /**
     * Longest token learned, in code points (a surrogate pair counts once; a token holds at most
     * twice as many UTF-16 units). Default 24, range
     * 1..64 (chosen by measurement: docs/unigram.md); checked at {@link #build()}.
     */
    public Builder maxTokenCodePoints(int codePoints) {
      this.maxTokenCodePoints = codePoints;
      return this;
    }

    /**
     * Share of the current vocabulary that each pruning round keeps (single characters included;
     * the rest go, lowest loss first), never below the target size [1, section 3.2]; every round
     * removes at least one token. Unit: a fraction. Default 0.7
     * (chosen by measurement: docs/unigram.md), range (0, 0.99] (reason
     * for the upper bound: each round runs EM over the whole corpus, and the number of rounds grows
     * as 1 / (1 - share)); checked at {@link #build()}.
     */
    public Builder keepShare(double share) {
      this.keepShare = share;
      return this;
    }

    /**
     * EM passes (one E-step and one M-step each) before every pruning round, and as many again after
     * the last round to set the final scores. Default 3, range
     * 1..100 (chosen by measurement: docs/unigram.md); checked at {@link #build()}.
     */
    public Builder emPasses(int passes) {
      this.emPasses = passes;
      return this;
    }

    /**
     * Byte spelling: whether the model gets 256 byte tokens, so that a character outside the
     * alphabet is spelled with its UTF-8 bytes instead of becoming the unknown token. Default on: no
     * text is lost.
     */
    public Builder byteSpelling(boolean on) {
      this.byteSpelling = on;
      return this;
    }

    /**
     * How the alphabet is chosen (default {@link AlphabetPolicy#defaults()}); with a derived cap the
     * alphabet takes at most half the ids left after the reserved, byte and unknown tokens. Characters
     * left out are never part of a token; they are spelled with byte tokens ({@link #byteSpelling})
     * or become the unknown token. The choice is reported to {@link TrainingListener#alphabet}.
     */
    public Builder alphabet(AlphabetPolicy policy) {
      this.alphabet = Objects.requireNonNull(policy, "alphabet");
      return this;
    }

    /**
     * Reserved token spellings, given ids {@code 0..k-1} in this order; checked at {@link #build()}
     * by the rules of {@link dev.morsel.tokenize.ReservedTokens.Builder}. Default none.
     */
    public Builder reservedTokens(List<String> tokens) {
      this.reservedTokens = Objects.requireNonNull(tokens, "reservedTokens");
      return this;
    }

    /** Spelling of the unknown token. Default {@link #DEFAULT_UNKNOWN_TOKEN}. */
    public Builder unknownToken(String spelling) {
      this.unknownToken = spelling;
      return this;
    }

    /** Threads for the E-step. Default: available processors; range 1..256. */
    public Builder threads(int threads) {
      this.threads = threads;
      return this;
    }

    /**
     * Entries of the seed substring table before rare ones are dropped (memory about 100 bytes an
     * entry). Default {@value UnigramLearner#DEFAULT_SEED_TABLE_LIMIT} (chosen by measurement: docs/unigram.md),
     * range 1,000..100,000,000.
     */
    public Builder seedTableLimit(int entries) {
      this.seedTableLimit = entries;
      return this;
    }

    /**
     * Longest piece learned from, in UTF-16 units; longer pieces (runs without a break) are left out
     * of training. Default {@value UnigramLearner#DEFAULT_MAX_PIECE_LENGTH}, range 1..2^26.
     */
    public Builder maxPieceLength(int length) {
      this.maxPieceLength = length;
      return this;
    }

    /** Progress listener. Default {@link TrainingListener#NONE}. */
    public Builder listener(TrainingListener listener) {
      this.listener = Objects.requireNonNull(listener, "listener");
      return this;
    }

    /**
     * The learner.
     *
     * @throws IllegalArgumentException naming the setting that is out of range, or the reserved token
     *     (by index) that breaks a rule or equals the unknown token's spelling
     * @throws NullPointerException naming a reserved token (by index) or the unknown token that is null
     */
    public UnigramLearner build() {
      return new UnigramLearner(new Training(vocabularySize, candidateMultiple, maxTokenCodePoints, keepShare, emPasses,
          byteSpelling, alphabet, reservedTokens, unknownToken, threads, seedTableLimit, maxPieceLength, minCount, listener));
    }
  }

  /**
   * Builder of a unigram {@link Extender}; every setting is checked at {@link #build()}. Not thread-safe.
   *
   * @since 0.3.0
   */
  public static final class ExtenderBuilder {
    private int addedIds;
    private long minCount = 1;
    private int candidateMultiple = DEFAULT_CANDIDATE_MULTIPLE;
    private int maxTokenCodePoints = DEFAULT_MAX_TOKEN_CODE_POINTS;
    private double keepShare = DEFAULT_KEEP_SHARE;
    private int emPasses = DEFAULT_EM_PASSES;
    private int threads = Math.max(1, Math.min(Training.MAX_THREADS, Runtime.getRuntime().availableProcessors()));
    private int seedTableLimit = DEFAULT_SEED_TABLE_LIMIT;
    private int maxPieceLength = DEFAULT_MAX_PIECE_LENGTH;
    private TrainingListener listener = TrainingListener.NONE;

    private ExtenderBuilder() {}

    /** Most pieces (so ids) to add after the base's; required, at least 1. */
    public ExtenderBuilder addedIds(int n) {
      this.addedIds = n;
      return this;
    }

    /** New-corpus pieces counted fewer times are not learned from (at least 1). Default 1. */
    public ExtenderBuilder minCount(long count) {
      this.minCount = count;
      return this;
    }

    /** Seed candidates as a multiple of {@code addedIds} (1..1000). Default 8. */
    public ExtenderBuilder candidateMultiple(int multiple) {
      this.candidateMultiple = multiple;
      return this;
    }

    /** Longest new token, in code points (1..64). Default 24. */
    public ExtenderBuilder maxTokenCodePoints(int codePoints) {
      this.maxTokenCodePoints = codePoints;
      return this;
    }

    /** Share of the candidates each pruning round keeps, in (0, 0.99]. Default 0.7. */
    public ExtenderBuilder keepShare(double share) {
      this.keepShare = share;
      return this;
    }

    /** EM passes before each pruning round (1..100). Default 3. */
    public ExtenderBuilder emPasses(int passes) {
      this.emPasses = passes;
      return this;
    }

    /** Threads of the E-step. Default: available processors. */
    public ExtenderBuilder threads(int n) {
      this.threads = n;
      return this;
    }

    /** Entries of the seed substring table before rare ones are dropped. */
    public ExtenderBuilder seedTableLimit(int entries) {
      this.seedTableLimit = entries;
      return this;
    }

    /** Longest new-corpus piece learned from, in UTF-16 units. */
    public ExtenderBuilder maxPieceLength(int length) {
      this.maxPieceLength = length;
      return this;
    }

    /** Progress listener, stages {@code "seed"}, {@code "em"}, {@code "prune"}. */
    public ExtenderBuilder listener(TrainingListener listener) {
      this.listener = Objects.requireNonNull(listener, "listener");
      return this;
    }

    /**
     * The extender.
     *
     * @throws IllegalArgumentException naming the setting that is out of range ({@code addedIds} unset or
     *     below 1 included)
     */
    public Extender build() {
      return new UnigramExtension(addedIds, candidateMultiple, maxTokenCodePoints, keepShare, emPasses, seedTableLimit,
          maxPieceLength, minCount, threads, listener);
    }
  }
}
