package dev.morsel.tokenize.wordpiece;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.Extender;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import dev.morsel.tokenize.wordpiece.internal.WordPieceExtension;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSettings;
import dev.morsel.tokenize.wordpiece.internal.WordPieceTraining;
import java.util.List;
import java.util.Objects;

/**
 * Learns a WordPiece vocabulary [1] from piece counts by likelihood-based pair merging, and returns a
 * tokenizer that encodes with it: greedy longest-match-first segmentation of each piece into a
 * word-initial token and continuation tokens (spelled with the {@code marker} in front), in linear
 * time with LinMaxMatch [2]. Immutable and thread-safe; {@link #train} is deterministic and may run
 * concurrently.
 *
 * <p>In short (the full contract, with the exact score and tie-breaks, is in
 * {@code docs/wordpiece.md}): pieces below {@code minCount} or longer than {@code maxPieceLength}
 * are dropped; the alphabet is chosen by an {@link AlphabetPolicy} (the most frequent code points
 * up to a share of all occurrences, reported to {@link TrainingListener#alphabet}); then the adjacent
 * pair with the highest {@link Score} is merged everywhere, until the vocabulary (reserved tokens,
 * the unknown token and every unit created) reaches {@code vocabularySize} or no pair is left. A
 * piece that cannot be matched, or is longer than {@code maxPieceLength}, becomes the unknown token.
 *
 * <pre>{@code
 * Tokenizer wordpiece = WordPieceLearner.builder().vocabularySize(8000).build().train(counts);
 * }</pre>
 *
 * <p>References: [1] Schuster &amp; Nakajima (2012), "Japanese and Korean Voice Search", ICASSP
 * 2012. [2] Song et al. (2021), "Fast WordPiece Tokenization", EMNLP 2021.
 *
 * @since 0.1.0
 */
public final class WordPieceLearner implements Learner {
  /** Default {@code vocabularySize}, in tokens: {@value}, the same for every scheme. */
  public static final int DEFAULT_VOCABULARY_SIZE = WordPieceTraining.DEFAULT_VOCABULARY_SIZE;
  /** Largest {@code vocabularySize}, in tokens. */
  public static final int MAX_VOCABULARY_SIZE = WordPieceSegmenter.MAX_VOCABULARY_SIZE;
  /** Byte spelling is on by default from this {@code vocabularySize} up (256 byte tokens take at most an eighth). */
  public static final int BYTE_SPELLING_FROM = WordPieceTraining.BYTE_SPELLING_FROM;
  /** Default {@code minCount}: every piece is used. */
  public static final long DEFAULT_MIN_COUNT = WordPieceTraining.DEFAULT_MIN_COUNT;
  /** Default {@code minPairCount}: no floor (docs/wordpiece.md measures floors of 3 and 10). */
  public static final long DEFAULT_MIN_PAIR_COUNT = WordPieceTraining.DEFAULT_MIN_PAIR_COUNT;
  /** Default continuation marker: U+2218 RING OPERATOR, rare in prose and one UTF-16 unit long. */
  public static final String DEFAULT_MARKER = WordPieceSettings.DEFAULT_MARKER;
  /** Default unknown token spelling: U+2370 (a question mark in a box). */
  public static final String DEFAULT_UNKNOWN_TOKEN = WordPieceSettings.DEFAULT_UNKNOWN;
  /**
   * The {@code maxPieceLength} that asks for a limit derived from the vocabulary, and the default:
   * the node count of the vocabulary's LinMaxMatch trie, so per-thread scratch scales with the model
   * and never with the input, and every token can still be matched (docs/wordpiece.md).
   */
  public static final int DERIVED_PIECE_LENGTH = WordPieceSettings.DERIVED_PIECE_LENGTH;
  /** Largest {@code maxPieceLength}, in UTF-16 units (bounds per-thread scratch arrays). */
  public static final int MAX_MAX_PIECE_LENGTH = WordPieceSettings.MAX_MAX_PIECE_LENGTH;

  /**
   * How the learner ranks candidate pairs (a, b); both are likelihood-based after [1].
   *
   * @since 0.1.0
   */
  public enum Score {
    /**
     * The log-likelihood gain of a merge under a unigram model of the units, estimated at the
     * current counts: {@code count(ab) * ln(count(ab) * N / (count(a) * count(b)))}, N the total
     * unit count (natural log). Weighs how often a pair occurs against how strongly its halves
     * attract. The default.
     */
    LIKELIHOOD_GAIN,
    /**
     * The ratio {@code count(ab) / (count(a) * count(b))}: the gain per merged occurrence, without the
     * weight of the occurrences. Favours pairs of rare units; kept for comparison and old models.
     */
    PAIR_RATIO
  }

  private final WordPieceTraining training;

  private WordPieceLearner(WordPieceTraining training) {
    this.training = training;
  }

  /** A builder with the defaults. */
  public static Builder builder() {
    return new Builder();
  }

  /**
   * A builder of an {@link Extender} that extends a WordPiece model with the units the
   * likelihood-gain criterion picks on a new corpus, appended after the base's ids: the base's units
   * start the merging (the new pieces written in them as encoding writes them), code points the base
   * lacks are added in both forms, and merges that make a unit the base already has cost no id. The
   * base's marker, unknown token, reserved tokens and piece limit setting are kept.
   *
   * <pre>{@code
   * Tokenizer extended = WordPieceLearner.extender().addedIds(2_000).build().extend(base, codeCounts);
   * }</pre>
   *
   * @since 0.3.0
   */
  public static ExtenderBuilder extender() {
    return new ExtenderBuilder();
  }

  @Override
  public String scheme() {
    return WordPiece.SCHEME;
  }

  /**
   * Learns a vocabulary from {@code counts}; the tokenizer encodes with {@link PieceCounts#pipeline()}
   * and holds the reserved tokens at ids {@code 0..k-1}, then the unknown token.
   *
   * @throws IllegalArgumentException if no piece is left to learn from (below {@code minCount},
   *     longer than {@code maxPieceLength}), if {@code vocabularySize} is smaller than the alphabet
   *     plus the reserved tokens, or if the count-weighted length of the pieces overflows a long
   */
  @Override
  public Tokenizer train(PieceCounts counts) {
    return training.train(counts);
  }

  /**
   * Builds {@link WordPieceLearner}s; every setting is checked at {@link #build()}. Not thread-safe.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private int vocabularySize = DEFAULT_VOCABULARY_SIZE;
    private long minCount = DEFAULT_MIN_COUNT;
    private AlphabetPolicy alphabet = AlphabetPolicy.defaults();
    private Boolean byteSpelling; // null: by the vocabulary size
    private List<String> reservedTokens = List.of();
    private String marker = DEFAULT_MARKER;
    private String unknownToken = DEFAULT_UNKNOWN_TOKEN;
    private int maxPieceLength = DERIVED_PIECE_LENGTH;
    private Score score = Score.LIKELIHOOD_GAIN;
    private long minPairCount = DEFAULT_MIN_PAIR_COUNT;
    private TrainingListener listener = TrainingListener.NONE;

    private Builder() {}

    /**
     * Byte spelling: whether the vocabulary gets 256 byte tokens (right after the unknown token), so
     * a character outside the alphabet is spelled with its UTF-8 bytes and its piece keeps its other
     * characters, instead of the whole piece becoming the unknown token. Default: on from {@value
     * WordPieceLearner#BYTE_SPELLING_FROM} ids up, off below (measured in docs/guide.md, "Large alphabets").
     */
    public Builder byteSpelling(boolean on) {
      this.byteSpelling = on;
      return this;
    }

    /** Target vocabulary size in tokens, reserved and unknown tokens included, in {@code [2, MAX_VOCABULARY_SIZE]}. */
    public Builder vocabularySize(int vocabularySize) {
      this.vocabularySize = vocabularySize;
      return this;
    }

    /** Pieces seen fewer times are dropped (at least 1). */
    public Builder minCount(long minCount) {
      this.minCount = minCount;
      return this;
    }

    /**
     * How the alphabet is chosen (default {@link AlphabetPolicy#defaults()}); a derived cap is a
     * quarter of the ids left after the reserved and unknown tokens, since every character takes two
     * ids (word-initial and continuation). A piece holding a character outside the alphabet becomes
     * the unknown token.
     */
    public Builder alphabet(AlphabetPolicy alphabet) {
      this.alphabet = Objects.requireNonNull(alphabet, "alphabet");
      return this;
    }

    /**
     * Reserved token spellings at ids {@code 0..n-1} (default none), checked by the rules of
     * {@link dev.morsel.tokenize.ReservedTokens.Builder} and against the unknown token's spelling.
     */
    public Builder reservedTokens(List<String> reservedTokens) {
      this.reservedTokens = Objects.requireNonNull(reservedTokens, "reservedTokens");
      return this;
    }

    /** The prefix that marks a continuation token: non-empty, no whitespace, no lone surrogate. */
    public Builder marker(String marker) {
      this.marker = marker;
      return this;
    }

    /** The spelling of the unknown token: non-empty, no lone surrogate. */
    public Builder unknownToken(String unknownToken) {
      this.unknownToken = unknownToken;
      return this;
    }

    /**
     * Longest piece, in UTF-16 units, that is segmented; longer pieces become the unknown token. In
     * {@code [0, MAX_MAX_PIECE_LENGTH]}; {@link #DERIVED_PIECE_LENGTH} (the default) derives it from
     * the vocabulary.
     */
    public Builder maxPieceLength(int maxPieceLength) {
      this.maxPieceLength = maxPieceLength;
      return this;
    }

    /** How candidate pairs are ranked (default {@link Score#LIKELIHOOD_GAIN}). */
    public Builder score(Score score) {
      this.score = Objects.requireNonNull(score, "score");
      return this;
    }

    /**
     * Pairs occurring fewer times (count-weighted, in the current segmentation) are never merged
     * (at least 1; default no floor). Mainly useful with {@link Score#PAIR_RATIO}, whose results
     * depend strongly on it.
     */
    public Builder minPairCount(long minPairCount) {
      this.minPairCount = minPairCount;
      return this;
    }

    /** Progress listener, stage {@code "merges"} (default none). */
    public Builder listener(TrainingListener listener) {
      this.listener = Objects.requireNonNull(listener, "listener");
      return this;
    }

    /**
     * The learner.
     *
     * @throws IllegalArgumentException naming the setting that is out of range, or the reserved token
     *     (by index) that breaks a rule or equals the unknown token's spelling
     * @throws NullPointerException naming a reserved token (by index), the marker or the unknown token that is null
     */
    public WordPieceLearner build() {
      WordPieceSettings settings = WordPieceSettings.defaults().withMarker(marker).withUnknownToken(unknownToken)
          .withMaxPieceLength(maxPieceLength).withByteSpelling(byteSpelling != null ? byteSpelling
              : WordPieceTraining.defaultByteSpelling(vocabularySize));
      return new WordPieceLearner(WordPieceTraining.builder()
          .vocabularySize(vocabularySize)
          .minCount(minCount)
          .alphabet(alphabet)
          .reservedTokens(reservedTokens)
          .settings(settings)
          .score(score == Score.PAIR_RATIO ? WordPieceTraining.Score.PAIR_RATIO : WordPieceTraining.Score.LIKELIHOOD_GAIN)
          .minPairCount(minPairCount)
          .listener(listener)
          .build());
    }
  }

  /**
   * Builder of a WordPiece {@link Extender}; every setting is checked at {@link #build()}. Not thread-safe.
   *
   * @since 0.3.0
   */
  public static final class ExtenderBuilder {
    private int addedIds;
    private long minCount = DEFAULT_MIN_COUNT;
    private int maxAlphabet;
    private boolean maxAlphabetSet; // unset: a quarter of the added ids
    private long minPairCount = DEFAULT_MIN_PAIR_COUNT;
    private Score score = Score.LIKELIHOOD_GAIN;
    private TrainingListener listener = TrainingListener.NONE;

    private ExtenderBuilder() {}

    /** Most ids to add after the base's; required, at least 1. */
    public ExtenderBuilder addedIds(int n) {
      this.addedIds = n;
      return this;
    }

    /** New-corpus pieces counted fewer times are left out (at least 1). Default 1. */
    public ExtenderBuilder minCount(long count) {
      this.minCount = count;
      return this;
    }

    /**
     * Most code points the base lacks that are added (each in both forms; at least 1). Default: a
     * quarter of {@code addedIds}, as a learner's derived alphabet cap is a quarter of its free ids.
     */
    public ExtenderBuilder maxAlphabet(int codePoints) {
      this.maxAlphabet = codePoints;
      this.maxAlphabetSet = true;
      return this;
    }

    /** Pairs occurring fewer times are never merged (at least 1). Default 1. */
    public ExtenderBuilder minPairCount(long count) {
      this.minPairCount = count;
      return this;
    }

    /** How candidate pairs are ranked. Default {@link Score#LIKELIHOOD_GAIN}. */
    public ExtenderBuilder score(Score score) {
      this.score = Objects.requireNonNull(score, "score");
      return this;
    }

    /** Progress listener, stage {@code "merges"}. */
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
      return new WordPieceExtension(addedIds, minCount, maxAlphabetSet ? maxAlphabet : Math.max(1, addedIds / 4),
          minPairCount,
          score == Score.PAIR_RATIO ? WordPieceTraining.Score.PAIR_RATIO : WordPieceTraining.Score.LIKELIHOOD_GAIN,
          listener);
    }
  }
}
