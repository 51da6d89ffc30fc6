package dev.morsel.tokenize.wordpiece;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSettings;
import java.util.List;
import java.util.Objects;

/**
 * What a WordPiece tokenizer offers beyond {@link Tokenizer}: which tokens continue a word, its
 * marker, a tokenizer from a vocabulary list, another piece limit. Works on any tokenizer of scheme
 * {@value #SCHEME}, learned or loaded, without casts. Stateless and thread-safe.
 *
 * @since 0.1.0
 */
public final class WordPiece {
  /** The kind of WordPiece tokenizers: {@value}. */
  public static final String SCHEME = WordPieceSegmenter.SCHEME;

  private WordPiece() {}

  /**
   * Whether token {@code id} is a continuation token (spelled with the marker in front; it never
   * starts a piece).
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}
   * @throws IndexOutOfBoundsException if {@code id} is not in the vocabulary
   */
  public static boolean isContinuation(Tokenizer tokenizer, int id) {
    return segmenter(tokenizer, "isContinuation").isContinuation(id);
  }

  /**
   * The continuation marker of {@code tokenizer}.
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}
   */
  public static String marker(Tokenizer tokenizer) {
    return segmenter(tokenizer, "marker").settings().marker();
  }

  /**
   * The longest piece, in UTF-16 units, that {@code tokenizer} segments (the limit derived from the
   * vocabulary unless one was set); longer pieces become the unknown token.
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}
   */
  public static int maxPieceLength(Tokenizer tokenizer) {
    return segmenter(tokenizer, "maxPieceLength").pieceLimit();
  }

  /**
   * {@code tokenizer} with another piece limit: same vocabulary, pipeline, reserved tokens, framing
   * and limits; a model of its own, so its fingerprint differs.
   *
   * @param maxPieceLength in UTF-16 units, or {@link WordPieceLearner#DERIVED_PIECE_LENGTH} for the
   *     limit derived from the vocabulary
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}, or
   *     {@code maxPieceLength} is outside {@code [0, }{@value WordPieceLearner#MAX_MAX_PIECE_LENGTH}{@code ]}
   */
  public static Tokenizer withMaxPieceLength(Tokenizer tokenizer, int maxPieceLength) {
    WordPieceSegmenter s = segmenter(tokenizer, "withMaxPieceLength");
    WordPieceSegmenter wide = WordPieceSegmenter.of(s.tokens(), s.reservedCount(), s.settings().withMaxPieceLength(maxPieceLength));
    return Tokenizers.of(tokenizer.pipeline(), wide, tokenizer.reservedTokens(), tokenizer.template())
        .withLimits(tokenizer.limits());
  }

  /**
   * A tokenizer over a given vocabulary, encoding with {@code pipeline}: {@code tokens} in id order,
   * {@code reservedCount} reserved tokens first, then the unknown token (spelled {@code
   * unknownToken}), then word-initial tokens and continuation tokens (spelled with {@code marker} in
   * front), in any order.
   *
   * @throws IllegalArgumentException naming the token by index if one is empty, repeated or holds a
   *     lone surrogate, if the unknown token is not at index {@code reservedCount}, or naming the
   *     marker or the unknown spelling if it is not allowed
   */
  public static Tokenizer fromTokens(Pipeline pipeline, List<String> tokens, int reservedCount, String marker,
      String unknownToken) {
    Objects.requireNonNull(pipeline, "pipeline");
    WordPieceSettings settings = WordPieceSettings.defaults().withMarker(marker).withUnknownToken(unknownToken);
    return Tokenizers.of(pipeline, WordPieceSegmenter.of(tokens, reservedCount, settings));
  }

  private static WordPieceSegmenter segmenter(Tokenizer tokenizer, String what) {
    Objects.requireNonNull(tokenizer, "tokenizer");
    Segmenter s = Tokenizers.segmenterOf(tokenizer);
    if (!(s instanceof WordPieceSegmenter)) {
      throw new IllegalArgumentException("WordPiece." + what + " needs a tokenizer of scheme '" + SCHEME
          + "'; this one is of scheme '" + tokenizer.scheme() + "'");
    }
    return (WordPieceSegmenter) s;
  }
}
