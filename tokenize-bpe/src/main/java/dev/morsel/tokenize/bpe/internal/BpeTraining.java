package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.format.ReviewText;
import dev.morsel.tokenize.train.Alphabet;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;

/**
 * Learns a byte-level BPE vocabulary [1] from piece counts. Immutable and thread-safe; build one with
 * {@link #builder()}.
 *
 * <p>Each piece becomes a word: its UTF-8 bytes (a lone surrogate as U+FFFD), weighted by its count.
 * Merges are learned until the vocabulary (reserved tokens + 256 bytes + merges) reaches
 * {@code vocabularySize}, or no pair occurs at least {@code minPairCount} times, or no pair is
 * eligible. A pair is eligible unless its token would exceed {@code maxTokenBytes}, its bytes are
 * already a token, or its display spelling equals a reserved spelling.
 *
 * <p>Alphabet: an {@link AlphabetPolicy} chooses the characters whose bytes merges may join (a
 * derived cap is no cap: the coverage alone decides). Each piece is cut at the characters
 * left out, and only the runs between them are learned from, so no merge, and no id, is spent on a
 * rare character: at encode time its bytes stay byte tokens (or join by merges learned from other
 * characters that share them). The choice goes to {@link TrainingListener#alphabet}.
 *
 * <p>Tie-break (deterministic): highest weighted pair count; then the smallest concatenated bytes in
 * unsigned lexicographic order; then the shorter left operand. Pair counts count overlapping
 * occurrences ("aaa" holds (a, a) twice); applying a merge replaces occurrences left to right without
 * overlap ("aaa" becomes "aa" "a").
 *
 * <p>Pieces whose UTF-8 is longer than {@code maxPieceBytes} are left out of training: the work of
 * every merge that touches a piece grows with the piece's length, so one huge piece (a 100 MB line
 * without a break) would keep training busy for hours, and no token of at most {@code maxTokenBytes}
 * needs it. If every piece is left out, {@link #train} fails naming the setting. Counts must also
 * leave room for pair counts: if the count-weighted number of adjacent byte pairs of the kept pieces
 * exceeds {@code Long.MAX_VALUE}, {@link #train} fails rather than let a pair count wrap around.
 *
 * <p>Algorithm and memory: see {@code docs/bpe.md}. Incremental pair counts with an index from pairs
 * to words and a lazily invalidated priority queue; the initial count runs on {@code threads} threads.
 * Memory is about 4 bytes per byte of distinct pieces for the words, plus at most 12 bytes per byte for
 * the pair index, plus the pair count map; {@code minCount} drops rare pieces to bound it.
 *
 * <p>[1] Sennrich, Haddow, Birch (2016), "Neural Machine Translation of Rare Words with Subword
 * Units", ACL 2016, section 3.2, Algorithm 1.
 *
 * @since 0.1.0
 */
public final class BpeTraining implements Learner {
  /** Default {@code vocabularySize}, the same for every scheme. */
  public static final int DEFAULT_VOCABULARY_SIZE = LearnerSettings.DEFAULT_VOCABULARY_SIZE;
  /** Default {@code minPairCount}: 2 (a pair seen once compresses nothing). */
  public static final long DEFAULT_MIN_PAIR_COUNT = 2;
  /** Default {@code maxTokenBytes}: 64 bytes. */
  public static final int DEFAULT_MAX_TOKEN_BYTES = 64;
  /** Default {@code minCount}: 1 (keep every piece). */
  public static final long DEFAULT_MIN_COUNT = 1;
  /**
   * Default {@code maxPieceBytes}: 4,096 bytes of UTF-8, the longest token a model may hold
   * ({@link BpeSegmenter#MAX_TOKEN_BYTES}); far above the words of any language.
   *
   * @since 0.1.0
   */
  public static final int DEFAULT_MAX_PIECE_BYTES = 4096;

  private final int vocabularySize;
  private final long minPairCount;
  private final int maxTokenBytes;
  private final long minCount;
  private final int maxPieceBytes;
  private final List<String> reserved;
  private final int threads;
  private final TrainingListener listener;
  private final AlphabetPolicy alphabet;

  private BpeTraining(Builder b) {
    this.alphabet = b.alphabet;
    this.vocabularySize = b.vocabularySize;
    this.minPairCount = b.minPairCount;
    this.maxTokenBytes = b.maxTokenBytes;
    this.minCount = b.minCount;
    this.maxPieceBytes = b.maxPieceBytes;
    this.reserved = List.copyOf(b.reserved);
    this.threads = b.threads;
    this.listener = b.listener;
  }

  /** A builder with the defaults above, no reserved tokens, all processors, no listener. */
  public static Builder builder() {
    return new Builder();
  }

  /**
   * Learns the merges.
   *
   * @throws IllegalArgumentException if {@code pieces} is empty (or empty after {@code minCount}
   *     and {@code maxPieceBytes}), or if the count-weighted number of byte pairs exceeds a long
   */
  @Override
  public Tokenizer train(PieceCounts pieces) {
    return Tokenizers.of(Objects.requireNonNull(pieces, "pieces").pipeline(), segmenter(pieces));
  }

  @Override
  public String scheme() {
    return BpeSegmenter.SCHEME;
  }

  /** Learns the segmenter alone. */
  public BpeSegmenter segmenter(PieceCounts pieces) {
    Objects.requireNonNull(pieces, "pieces");
    PieceCounts kept = minCount > 1 ? pieces.withMinCount(minCount) : pieces;
    if (kept.isEmpty()) {
      throw new IllegalArgumentException(pieces.isEmpty() ? "piece counts are empty: nothing to train on"
          : "no piece has a count >= minCount=" + minCount);
    }
    List<byte[]> words = new ArrayList<>(kept.size());
    List<Long> kweights = new ArrayList<>(kept.size());
    List<String> within = new ArrayList<>(kept.size());
    List<Long> withinCounts = new ArrayList<>(kept.size());
    for (int i = 0; i < kept.size(); i++) {
      String piece = kept.piece(i);
      if (piece.length() > maxPieceBytes) { // every UTF-16 unit takes at least one UTF-8 byte: skip unencoded
        continue;
      }
      within.add(piece);
      withinCounts.add(kept.count(i));
    }
    Alphabet chosen = null;
    if (!within.isEmpty()) {
      long[] wc = new long[within.size()];
      for (int i = 0; i < wc.length; i++) {
        wc[i] = withinCounts.get(i);
      }
      // derived cap: none; an alphabet character costs an id only when a merge that assembles it wins
      chosen = alphabet.select(PieceCounts.of(within.toArray(new String[0]), wc), Integer.MAX_VALUE, true);
      listener.alphabet(BpeSegmenter.SCHEME, chosen);
    }
    long pairTotal = 0;
    for (int i = 0; i < within.size(); i++) {
      String piece = within.get(i);
      byte[] b = Utf8.encode(piece);
      if (b.length > maxPieceBytes) {
        continue;
      }
      long count = withinCounts.get(i);
      if (chosen.leftOutSize() == 0 || chosen.containsAll(piece)) {
        pairTotal = addWord(b, count, pairTotal, words, kweights);
        continue;
      }
      int start = 0; // the runs of alphabet characters between left-out ones
      for (int c = 0; c < piece.length(); ) {
        int cp = piece.codePointAt(c);
        int next = c + Character.charCount(cp);
        if (!chosen.contains(cp)) {
          if (c > start) {
            pairTotal = addWord(Utf8.encode(piece.substring(start, c)), count, pairTotal, words, kweights);
          }
          start = next;
        }
        c = next;
      }
      if (start < piece.length()) {
        pairTotal = addWord(Utf8.encode(piece.substring(start)), count, pairTotal, words, kweights);
      }
    }
    if (words.isEmpty()) {
      throw new IllegalArgumentException("every piece is longer than maxPieceBytes=" + maxPieceBytes
          + " bytes of UTF-8: nothing to train on (raise it with BpeTraining.Builder.maxPieceBytes)");
    }
    long[] weights = new long[words.size()];
    for (int i = 0; i < weights.length; i++) {
      weights[i] = kweights.get(i);
    }
    int k = reserved.size();
    int budget = vocabularySize - k - 256;
    MergeLearner learner = new MergeLearner(k, words, weights, budget, minPairCount, maxTokenBytes, reserved, listener);
    int[][] merges = learner.run(threads);
    Vocab v = Vocab.build(reserved, merges[0], merges[1], (i, msg) -> new IllegalStateException(msg));
    BpeSegmenter made = BpeSegmenter.create(v, BpeSegmenter.DEFAULT_CACHE_ENTRIES);
    made.recordAlphabet(chosen == null ? null : chosen.record());
    return made;
  }

  private static long addWord(byte[] b, long count, long pairTotal, List<byte[]> words, List<Long> weights) {
    try {
      pairTotal = Math.addExact(pairTotal, Math.multiplyExact(count, (long) b.length - 1));
    } catch (ArithmeticException e) {
      throw new IllegalArgumentException("piece counts are too large: the count-weighted number of byte pairs"
          + " exceeds Long.MAX_VALUE, so pair counts would overflow; divide the counts by a common factor", e);
    }
    words.add(b);
    weights.add(count);
    return pairTotal;
  }

  /**
   * Builder; every setting is checked at {@link #build()}. Not thread-safe.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private int vocabularySize = DEFAULT_VOCABULARY_SIZE;
    private long minPairCount = DEFAULT_MIN_PAIR_COUNT;
    private int maxTokenBytes = DEFAULT_MAX_TOKEN_BYTES;
    private long minCount = DEFAULT_MIN_COUNT;
    private int maxPieceBytes = DEFAULT_MAX_PIECE_BYTES;
    private List<String> reserved = List.of();
    private int threads = Runtime.getRuntime().availableProcessors();
    private TrainingListener listener = TrainingListener.NONE;
    private AlphabetPolicy alphabet = AlphabetPolicy.defaults();

    private Builder() {}

    /**
     * How the alphabet is chosen (default {@link AlphabetPolicy#defaults()}): merges never join the
     * bytes of a character left out, so no id is spent on rare characters.
     */
    public Builder alphabet(AlphabetPolicy alphabet) {
      this.alphabet = Objects.requireNonNull(alphabet, "alphabet");
      return this;
    }

    /** Target number of ids: reserved tokens + 256 bytes + merges. Default {@value #DEFAULT_VOCABULARY_SIZE}. */
    public Builder vocabularySize(int size) {
      this.vocabularySize = size;
      return this;
    }

    /** Smallest weighted pair count worth a merge (at least 1). Default 2. */
    public Builder minPairCount(long count) {
      this.minPairCount = count;
      return this;
    }

    /** Longest token, in bytes, in [2, {@link BpeSegmenter#MAX_TOKEN_BYTES}]. Default 64. */
    public Builder maxTokenBytes(int bytes) {
      this.maxTokenBytes = bytes;
      return this;
    }

    /** Pieces with a smaller count are dropped before training, to bound memory. Default 1. */
    public Builder minCount(long count) {
      this.minCount = count;
      return this;
    }

    /**
     * Pieces whose UTF-8 is longer than this many bytes are left out of training (at least 2).
     * Default {@value BpeTraining#DEFAULT_MAX_PIECE_BYTES}.
     *
     * @since 0.1.0
     */
    public Builder maxPieceBytes(int bytes) {
      this.maxPieceBytes = bytes;
      return this;
    }

    /**
     * Reserved token spellings, given ids {@code 0..k-1} in this order. They must satisfy
     * {@link ReservedTokens.Builder}'s rules and must not spell a single byte token.
     */
    public Builder reservedTokens(List<String> spellings) {
      this.reserved = Objects.requireNonNull(spellings, "reservedTokens");
      return this;
    }

    /** Threads for the initial pair count (at least 1). Default: available processors. */
    public Builder threads(int n) {
      this.threads = n;
      return this;
    }

    /** Progress: stage {@code "merges"}, merges done, merge budget, detail {@code "left+right count"}. */
    public Builder listener(TrainingListener l) {
      this.listener = Objects.requireNonNull(l, "listener");
      return this;
    }

    /**
     * The learner.
     *
     * @throws IllegalArgumentException naming the setting that is out of range or the reserved token
     *     that is invalid
     */
    public BpeTraining build() {
      reserved = LearnerSettings.checkReserved(reserved);
      java.util.Map<String, Integer> byteSpellings = new java.util.HashMap<>();
      for (int b = 0; b < 256; b++) {
        byteSpellings.put(ReviewText.escape(new byte[] {(byte) b}), b);
      }
      for (int i = 0; i < reserved.size(); i++) {
        Integer b = byteSpellings.get(reserved.get(i));
        if (b != null) {
          throw new IllegalArgumentException("reservedTokens[" + i + "] '" + reserved.get(i)
              + "' is the display spelling of byte token " + b + "; choose a spelling no byte token has");
        }
      }
      int floor = 256 + reserved.size();
      if (vocabularySize < floor) {
        throw new IllegalArgumentException("vocabularySize=" + vocabularySize + " is below " + floor + ", the least BPE can"
            + " use (256 byte tokens" + (reserved.isEmpty() ? "" : " + " + reserved.size() + " reserved tokens") + ")");
      }
      if (minPairCount < 1) {
        throw new IllegalArgumentException("minPairCount=" + minPairCount + " must be at least 1");
      }
      if (maxTokenBytes < 2 || maxTokenBytes > BpeSegmenter.MAX_TOKEN_BYTES) {
        throw new IllegalArgumentException("maxTokenBytes=" + maxTokenBytes + " is outside [2, "
            + BpeSegmenter.MAX_TOKEN_BYTES + "]");
      }
      if (minCount < 1) {
        throw new IllegalArgumentException("minCount=" + minCount + " must be at least 1");
      }
      if (maxPieceBytes < 2) {
        throw new IllegalArgumentException("maxPieceBytes=" + maxPieceBytes + " must be at least 2");
      }
      if (threads < 1) {
        throw new IllegalArgumentException("threads=" + threads + " must be at least 1");
      }
      return new BpeTraining(this);
    }
  }
}
