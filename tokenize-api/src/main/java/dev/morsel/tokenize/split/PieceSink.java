package dev.morsel.tokenize.split;

/**
 * Receives pieces from {@link Splitting#split}, in order, covering the range without gaps.
 *
 * @since 0.1.0
 */
@FunctionalInterface
public interface PieceSink {
  /** One piece {@code [start, end)} of the text being split (absolute indices, non-empty). */
  void piece(int start, int end);
}
