package dev.morsel.tokenize.spark;

import dev.morsel.tokenize.train.PieceCounts;
import java.util.Objects;

/**
 * What a {@link SparkPieceCounter} run brought back: the bounded table of piece counts and what the
 * bound left on the cluster. Immutable and thread-safe.
 *
 * <p>The counts of the pieces that are kept are always exact; {@link #droppedPieces()} and
 * {@link #droppedOccurrences()} tell how much of the corpus the minimum count and the size bound cut
 * away.
 *
 * @since 0.1.0
 */
public final class SparkCountReport {
  private final PieceCounts counts;
  private final long texts;
  private final long distinctPieces;
  private final long totalOccurrences;

  SparkCountReport(PieceCounts counts, long texts, long distinctPieces, long totalOccurrences) {
    this.counts = Objects.requireNonNull(counts, "counts");
    this.texts = texts;
    this.distinctPieces = distinctPieces;
    this.totalOccurrences = totalOccurrences;
  }

  /** The kept pieces with their exact counts: the input every learner takes. */
  public PieceCounts counts() {
    return counts;
  }

  /** The number of non-null texts counted. */
  public long texts() {
    return texts;
  }

  /** The number of distinct pieces on the cluster, before the minimum count and the size bound. */
  public long distinctPieces() {
    return distinctPieces;
  }

  /** The number of piece occurrences on the cluster, before the minimum count and the size bound. */
  public long totalOccurrences() {
    return totalOccurrences;
  }

  /** Distinct pieces left on the cluster by the minimum count or the size bound. */
  public long droppedPieces() {
    return distinctPieces - counts.size();
  }

  /** Occurrences of the pieces left on the cluster. */
  public long droppedOccurrences() {
    return totalOccurrences - counts.total();
  }

  /** Whether every piece came back (nothing was dropped). */
  public boolean isComplete() {
    return droppedPieces() == 0;
  }

  @Override
  public String toString() {
    return "SparkCountReport[" + texts + " texts, " + counts.size() + " of " + distinctPieces + " pieces kept, "
        + counts.total() + " of " + totalOccurrences + " occurrences]";
  }
}
