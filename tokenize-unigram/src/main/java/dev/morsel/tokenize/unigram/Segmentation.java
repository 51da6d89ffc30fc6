package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.Tokens;
import java.util.Objects;

/**
 * One segmentation of a whole text, as {@link Unigram#nBest} lists them: the tokens, with offsets
 * into the original text like every encode result, and the total score of the segmentation (the sum
 * of its tokens' log-probabilities over all pieces; reserved tokens and framing markers count 0, and
 * an uncovered character counts once with the unknown token's penalty, however many byte tokens it
 * becomes). Immutable.
 *
 * @since 0.1.0
 */
public final class Segmentation {
  private final Tokens tokens;
  private final double score;

  Segmentation(Tokens tokens, double score) {
    this.tokens = tokens;
    this.score = score;
  }

  /** The tokens, offsets into the original text. */
  public Tokens tokens() {
    return tokens;
  }

  /** The total log-probability (natural log); higher is more likely. */
  public double score() {
    return score;
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Segmentation && tokens.equals(((Segmentation) o).tokens)
        && Double.compare(score, ((Segmentation) o).score) == 0;
  }

  @Override
  public int hashCode() {
    return Objects.hash(tokens, score);
  }

  @Override
  public String toString() {
    return "Segmentation[score " + score + ", " + tokens + "]";
  }
}
