package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.TokenSink;
import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import java.util.List;
import java.util.random.RandomGenerator;

/**
 * A unigram language-model segmenter [1]: every token has a log-probability and a piece is split
 * into the tokens whose probabilities multiply to the most (Viterbi), or into the k best such
 * splits, or into a split drawn at random for subword regularization. Immutable and thread-safe.
 *
 * <p>Id layout: reserved tokens at {@code 0..k-1} (never produced by segmentation); then, if byte
 * fallback is on, 256 byte tokens; then the unknown token; then the pieces. A character that no
 * single-character piece covers becomes the unknown token, or with byte fallback its UTF-8 bytes as
 * byte tokens, each spanning that whole character. A lone surrogate counts as U+FFFD for byte
 * fallback.
 *
 * <p>References: [1] Kudo (2018), "Subword Regularization: Improving Neural Network Translation
 * Models with Multiple Subword Candidates", ACL 2018.
 *
 * @since 0.1.0
 */
public interface UnigramModel extends Segmenter {
  /** The kind name in model files: {@value}. */
  String KIND = "unigram";

  /** Default spelling of the unknown token. */
  String DEFAULT_UNKNOWN = "\u2983?\u2984";

  /** Longest piece accepted, in UTF-16 units (bounds the work per position at Viterbi time). */
  int MAX_PIECE_LENGTH = 256;

  /** Largest {@code k} accepted by {@link #nBest}. */
  int MAX_N_BEST = 10_000;

  /**
   * A model from its parts. Piece {@code i} gets id {@code firstPieceId() + i}. The unknown token
   * scores {@code min(0, lowest piece score) - 10} (a penalty below every piece).
   *
   * @param reservedTokens reserved reserved tokens (ids 0..k-1), distinct and non-empty
   * @param rawBytes whether uncovered characters become byte tokens instead of the unknown token
   * @param unknownToken spelling of the unknown token
   * @param pieces the pieces: non-empty, distinct, well-formed UTF-16, at most {@link #MAX_PIECE_LENGTH} units
   * @param scores their log-probabilities, finite
   * @throws IllegalArgumentException naming the entry that is wrong
   */
  static UnigramModel of(List<String> reservedTokens, boolean rawBytes, String unknownToken, List<String> pieces,
      double[] scores) {
    return UnigramSegmenter.create(reservedTokens, rawBytes, unknownToken, pieces, scores);
  }

  /** Number of reserved tokens (ids {@code 0..reservedCount()-1}). */
  int reservedCount();

  /**
   * The best segmentation (Viterbi) with each token's log-probability and the total, and the
   * runner-up segmentation with its total, so a person can see by how much the best one wins.
   */
  @Override
  default List<String> explain(CharSequence text, int start, int end) {
    List<Segmentation> two = nBest(text, start, end, 2);
    List<String> out = new java.util.ArrayList<>();
    String[] names = {"best", "runner-up"};
    for (int k = 0; k < two.size(); k++) {
      Segmentation s = two.get(k);
      StringBuilder sb = new StringBuilder(names[k]).append(String.format(java.util.Locale.ROOT, " (log-probability %.3f):", s.score()));
      for (int i = 0; i < s.size(); i++) {
        double sc = score(s.id(i));
        sb.append(" '").append(token(s.id(i))).append('\'');
        if (!Double.isNaN(sc)) {
          sb.append(String.format(java.util.Locale.ROOT, "(%.3f)", sc));
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
  default List<String> reservedSpellings() {
    List<String> out = new java.util.ArrayList<>(reservedCount());
    for (int i = 0; i < reservedCount(); i++) {
      out.add(token(i));
    }
    return out;
  }

  /** The reserved tokens: ids {@code 0..reservedCount()-1} bound to their spellings. */
  default dev.morsel.tokenize.ReservedTokens reservedTokens() {
    dev.morsel.tokenize.ReservedTokens.Builder b = dev.morsel.tokenize.ReservedTokens.builder();
    for (int i = 0; i < reservedCount(); i++) {
      b.add(token(i), i);
    }
    return b.build();
  }

  /** Whether uncovered characters become byte tokens. */
  boolean rawBytes();

  /** The id of the first byte token (byte {@code b} is {@code firstByteId() + b}), or -1 without byte fallback. */
  int firstByteId();

  /** The id of the first piece. */
  int firstPieceId();

  /**
   * The log-probability of a piece, the penalty of the unknown token, or {@link Double#NaN} for
   * reserved and byte tokens.
   *
   * @throws IndexOutOfBoundsException if {@code id} is not in the vocabulary
   */
  double score(int id);

  /**
   * The {@code k} best segmentations of {@code text[start, end)}, best first (fewer if the piece has
   * fewer). Ties between equal scores are broken deterministically.
   *
   * @throws IllegalArgumentException if {@code k <= 0} or {@code k > MAX_N_BEST}
   */
  List<Segmentation> nBest(CharSequence text, int start, int end, int k);

  /**
   * Draws one segmentation of {@code text[start, end)} with probability proportional to
   * {@code p(path)^alpha} [1, section 2.2], reporting its tokens to {@code sink}. Deterministic for a
   * given generator state.
   *
   * @param alpha smoothing exponent; small values flatten the distribution, large ones approach Viterbi
   * @throws IllegalArgumentException if {@code alpha} is not a positive finite number
   */
  void sample(CharSequence text, int start, int end, double alpha, RandomGenerator random, TokenSink sink);
}
