package dev.morsel.tokenize.train;

/**
 * The result of a {@link PieceCounter} run with what the memory budget cost: the counts, how many
 * texts were read, and how many pieces and occurrences were dropped by pruning. Immutable.
 *
 * <p>When {@link #droppedPieces()} is 0 the counts are exact. Otherwise every count is a lower
 * bound of the true count, and {@code counts().total() + droppedOccurrences()} equals the number of
 * pieces the texts produced.
 *
 * @since 0.1.0
 */
public final class CountReport {
  private final PieceCounts counts;
  private final long texts;
  private final long droppedPieces;
  private final long droppedOccurrences;

  CountReport(PieceCounts counts, long texts, long droppedPieces, long droppedOccurrences) {
    this.counts = counts;
    this.texts = texts;
    this.droppedPieces = droppedPieces;
    this.droppedOccurrences = droppedOccurrences;
  }

  /** The piece counts (lower bounds if anything was dropped). */
  public PieceCounts counts() {
    return counts;
  }

  /** Number of texts (lines, for files) read. */
  public long texts() {
    return texts;
  }

  /**
   * Map entries removed by pruning, summed over all prunings and all workers; one piece removed
   * twice counts twice.
   */
  public long droppedPieces() {
    return droppedPieces;
  }

  /** Occurrences carried by the removed entries: how much the counts fall short in total. */
  public long droppedOccurrences() {
    return droppedOccurrences;
  }

  /** Whether nothing was dropped, so the counts are exact. */
  public boolean isExact() {
    return droppedPieces == 0;
  }

  @Override
  public String toString() {
    return "CountReport[" + counts + ", texts " + texts + ", dropped " + droppedPieces + " pieces / "
        + droppedOccurrences + " occurrences]";
  }
}
