package dev.morsel.tokenize.unigram.internal;

import java.util.Arrays;

/**
 * One segmentation of a piece, as returned by {@link UnigramSegmenter#nBest}: token ids with their
 * absolute spans in the normalized text and the path's total score (sum of log-probabilities; an
 * uncovered character counts once with the unknown score, however many byte tokens it becomes).
 * Immutable.
 */
public final class PiecePath {
  private final int[] ids;
  private final int[] starts;
  private final int[] ends;
  private final double score;

  PiecePath(int[] ids, int[] starts, int[] ends, double score) {
    this.ids = ids;
    this.starts = starts;
    this.ends = ends;
    this.score = score;
  }

  /**
   * A segmentation from parallel arrays (copied). Meant for the segmenter implementation.
   *
   * @throws IllegalArgumentException if the arrays differ in length
   */
  public static PiecePath of(int[] ids, int[] starts, int[] ends, double score) {
    if (ids.length != starts.length || ids.length != ends.length) {
      throw new IllegalArgumentException("parallel arrays differ in length: ids=" + ids.length + ", starts="
          + starts.length + ", ends=" + ends.length);
    }
    return new PiecePath(ids.clone(), starts.clone(), ends.clone(), score);
  }

  /** Number of tokens. */
  public int size() {
    return ids.length;
  }

  /** The id of token {@code i}. */
  public int id(int i) {
    return ids[i];
  }

  /** Start of token {@code i} (UTF-16 index into the segmented text). */
  public int start(int i) {
    return starts[i];
  }

  /** End of token {@code i} (exclusive). */
  public int end(int i) {
    return ends[i];
  }

  /** A copy of the ids. */
  public int[] ids() {
    return ids.clone();
  }

  /** The total log-probability of this path. */
  public double score() {
    return score;
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof PiecePath && Arrays.equals(ids, ((PiecePath) o).ids)
        && Arrays.equals(starts, ((PiecePath) o).starts) && Arrays.equals(ends, ((PiecePath) o).ends)
        && Double.compare(score, ((PiecePath) o).score) == 0;
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(ids) * 31 + Double.hashCode(score);
  }

  @Override
  public String toString() {
    return "PiecePath" + Arrays.toString(ids) + " score " + score;
  }
}
