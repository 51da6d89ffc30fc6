package dev.morsel.tokenize.bpe;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.bpe.internal.BpeExtension;
import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import dev.morsel.tokenize.bpe.internal.BpeTraining;
import dev.morsel.tokenize.train.Extender;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import java.util.List;
import java.util.Objects;

/**
 * Learns a byte-level BPE vocabulary [1] from piece counts and returns a tokenizer that encodes with
 * it. Immutable and thread-safe; build one with {@link #builder()}; {@link #train} may run
 * concurrently. {@link Bpe} reaches the model's merges, its piece cache and BPE-dropout from that
 * tokenizer, or from one loaded from a model file.
 *
 * <p>Each piece becomes a word: its UTF-8 bytes (a lone surrogate as U+FFFD), weighted by its count.
 * Merges are learned until the vocabulary (reserved tokens + 256 bytes + merges) reaches
 * {@code vocabularySize}, or no pair occurs at least {@code minPairCount} times, or no pair is
 * eligible. A pair is eligible unless its token would exceed {@code maxTokenBytes}, its bytes are
 * already a token, or its display spelling equals a reserved spelling.
 *
 * <p>Tie-break (deterministic): highest weighted pair count; then the smallest concatenated bytes in
 * unsigned lexicographic order; then the shorter left operand. Pair counts count overlapping
 * occurrences ("aaa" holds (a, a) twice); applying a merge replaces occurrences left to right without
 * overlap ("aaa" becomes "aa" "a").
 *
 * <p>Pieces counted fewer than {@code minCount} times, and pieces whose UTF-8 is longer than
 * {@code maxPieceBytes}, are left out of learning: the work of every merge that touches a piece grows
 * with the piece's length, so one huge piece (a 100 MB line without a break) would keep learning busy
 * for hours, and no token of at most {@code maxTokenBytes} needs it. If every piece is left out,
 * {@link #train} fails naming the setting. Counts must also leave room for pair counts: if the
 * count-weighted number of adjacent byte pairs of the kept pieces exceeds {@code Long.MAX_VALUE},
 * {@link #train} fails rather than let a pair count wrap around.
 *
 * <p>Algorithm and memory: see {@code docs/bpe.md}.
 *
 * <pre>{@code
 * Tokenizer bpe = BpeLearner.builder().vocabularySize(16_000).build().train(counts);
 * }</pre>
 *
 * <p>[1] Sennrich, Haddow, Birch (2016), "Neural Machine Translation of Rare Words with Subword
 * Units", ACL 2016, section 3.2, Algorithm 1.
 *
 * @since 0.1.0
 */
public final class BpeLearner implements Learner {
  /** Default {@code vocabularySize}: {@value}, the same for every scheme ({@link dev.morsel.tokenize.train.LearnerSettings#DEFAULT_VOCABULARY_SIZE}). */
  public static final int DEFAULT_VOCABULARY_SIZE = BpeTraining.DEFAULT_VOCABULARY_SIZE;
  /** Default {@code minPairCount}: 2 (a pair seen once compresses nothing). */
  public static final long DEFAULT_MIN_PAIR_COUNT = BpeTraining.DEFAULT_MIN_PAIR_COUNT;
  /** Default {@code maxTokenBytes}: 64 bytes. */
  public static final int DEFAULT_MAX_TOKEN_BYTES = BpeTraining.DEFAULT_MAX_TOKEN_BYTES;
  /** Default {@code minCount}: 1 (keep every piece). */
  public static final long DEFAULT_MIN_COUNT = BpeTraining.DEFAULT_MIN_COUNT;
  /** Default {@code maxPieceBytes}: 4,096 bytes of UTF-8, the longest token a model may hold. */
  public static final int DEFAULT_MAX_PIECE_BYTES = BpeTraining.DEFAULT_MAX_PIECE_BYTES;
  /** Longest token a model may hold, in bytes; the upper bound of {@code maxTokenBytes}. */
  public static final int MAX_TOKEN_BYTES = BpeSegmenter.MAX_TOKEN_BYTES;

  private final BpeTraining training;

  private BpeLearner(BpeTraining training) {
    this.training = training;
  }

  /** A builder with the defaults above, no reserved tokens, all processors, no listener. */
  public static Builder builder() {
    return new Builder();
  }

  /**
   * A builder of an {@link Extender} that extends a BPE model by continuing to learn merges on a new
   * corpus: the new pieces are written in the base's own encoding, new merges are learned on them as
   * {@link #train} learns (same counts, tie-break and eligibility) and appended after the base's
   * ranks; every base id, merge and rank is kept.
   *
   * <pre>{@code
   * Tokenizer extended = BpeLearner.extender().addedIds(2_000).build().extend(base, codeCounts);
   * }</pre>
   *
   * @since 0.3.0
   */
  public static ExtenderBuilder extender() {
    return new ExtenderBuilder();
  }

  @Override
  public String scheme() {
    return Bpe.SCHEME;
  }

  /**
   * Learns the merges; the tokenizer encodes with {@link PieceCounts#pipeline()} and holds the
   * reserved tokens at ids {@code 0..k-1}.
   *
   * @throws IllegalArgumentException if {@code pieces} is empty (or empty after {@code minCount} and
   *     {@code maxPieceBytes}), or if the count-weighted number of byte pairs exceeds a long
   */
  @Override
  public Tokenizer train(PieceCounts pieces) {
    return training.train(pieces);
  }

  /**
   * Builder; every setting is checked at {@link #build()}. Not thread-safe.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private final BpeTraining.Builder b = BpeTraining.builder();

    private Builder() {}

    /** Target number of ids: reserved tokens + 256 bytes + merges. Default {@value #DEFAULT_VOCABULARY_SIZE}. */
    public Builder vocabularySize(int size) {
      b.vocabularySize(size);
      return this;
    }

    /** Smallest weighted pair count worth a merge (at least 1). Default 2. */
    public Builder minPairCount(long count) {
      b.minPairCount(count);
      return this;
    }

    /** Longest token, in bytes, in [2, {@link #MAX_TOKEN_BYTES}]. Default 64. */
    public Builder maxTokenBytes(int bytes) {
      b.maxTokenBytes(bytes);
      return this;
    }

    /** Pieces counted fewer times are left out of learning, to bound memory (at least 1). Default 1. */
    public Builder minCount(long count) {
      b.minCount(count);
      return this;
    }

    /**
     * Pieces whose UTF-8 is longer than this many bytes are left out of learning (at least 2).
     * Default {@value BpeLearner#DEFAULT_MAX_PIECE_BYTES}.
     */
    public Builder maxPieceBytes(int bytes) {
      b.maxPieceBytes(bytes);
      return this;
    }

    /**
     * Reserved token spellings, given ids {@code 0..k-1} in this order. They must satisfy
     * {@link dev.morsel.tokenize.ReservedTokens.Builder}'s rules and must not spell a single byte
     * token; checked at {@link #build()}, each refusal naming the spelling by index.
     */
    public Builder reservedTokens(List<String> spellings) {
      b.reservedTokens(Objects.requireNonNull(spellings, "reservedTokens"));
      return this;
    }

    /** Threads for the initial pair count (at least 1). Default: available processors. */
    public Builder threads(int n) {
      b.threads(n);
      return this;
    }

    /** Progress: stage {@code "merges"}, merges done, merge budget, detail {@code "left+right count"}. */
    public Builder listener(TrainingListener l) {
      b.listener(Objects.requireNonNull(l, "listener"));
      return this;
    }

    /**
     * How the alphabet is chosen (default {@link dev.morsel.tokenize.train.AlphabetPolicy#defaults()};
     * a derived cap is no cap, the coverage alone decides): merges never join the bytes
     * of a character left out, so no id is spent on rare characters, which encode as byte tokens.
     * The choice is reported to {@link TrainingListener#alphabet}.
     */
    public Builder alphabet(dev.morsel.tokenize.train.AlphabetPolicy policy) {
      b.alphabet(Objects.requireNonNull(policy, "alphabet"));
      return this;
    }

    /**
     * The learner.
     *
     * @throws IllegalArgumentException naming the setting that is out of range or the reserved token
     *     (by index) that is invalid
     * @throws NullPointerException naming the reserved token (by index) that is null
     */
    public BpeLearner build() {
      return new BpeLearner(b.build());
    }
  }

  /**
   * Builder of a BPE {@link Extender}; every setting is checked at {@link #build()}. Not thread-safe.
   *
   * @since 0.3.0
   */
  public static final class ExtenderBuilder {
    private int addedIds;
    private long minPairCount = DEFAULT_MIN_PAIR_COUNT;
    private int maxTokenBytes = DEFAULT_MAX_TOKEN_BYTES;
    private long minCount = DEFAULT_MIN_COUNT;
    private int maxPieceBytes = DEFAULT_MAX_PIECE_BYTES;
    private int threads = Runtime.getRuntime().availableProcessors();
    private TrainingListener listener = TrainingListener.NONE;

    private ExtenderBuilder() {}

    /** Most merges (so ids) to add after the base's; required, at least 1. */
    public ExtenderBuilder addedIds(int n) {
      this.addedIds = n;
      return this;
    }

    /** Smallest weighted pair count worth a new merge (at least 1). Default 2. */
    public ExtenderBuilder minPairCount(long count) {
      this.minPairCount = count;
      return this;
    }

    /** Longest new token, in bytes, in [2, {@link #MAX_TOKEN_BYTES}]. Default 64. */
    public ExtenderBuilder maxTokenBytes(int bytes) {
      this.maxTokenBytes = bytes;
      return this;
    }

    /** New-corpus pieces counted fewer times are left out of learning (at least 1). Default 1. */
    public ExtenderBuilder minCount(long count) {
      this.minCount = count;
      return this;
    }

    /** New-corpus pieces longer than this many bytes of UTF-8 are left out of learning (at least 2). */
    public ExtenderBuilder maxPieceBytes(int bytes) {
      this.maxPieceBytes = bytes;
      return this;
    }

    /** Threads for the initial pair count (at least 1). Default: available processors. */
    public ExtenderBuilder threads(int n) {
      this.threads = n;
      return this;
    }

    /** Progress: stage {@code "merges"}, new merges done, {@code addedIds}, the merge. */
    public ExtenderBuilder listener(TrainingListener l) {
      this.listener = Objects.requireNonNull(l, "listener");
      return this;
    }

    /**
     * The extender.
     *
     * @throws IllegalArgumentException naming the setting that is out of range ({@code addedIds} unset or
     *     below 1 included)
     */
    public Extender build() {
      return new BpeExtension(addedIds, minPairCount, maxTokenBytes, minCount, maxPieceBytes, threads, listener);
    }
  }
}
