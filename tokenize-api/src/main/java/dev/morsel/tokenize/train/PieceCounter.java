package dev.morsel.tokenize.train;

import dev.morsel.tokenize.Pipeline;
import java.nio.file.Path;
import java.util.Collection;
import java.util.stream.Stream;

/**
 * Counts pieces for training: normalizes and splits texts exactly as encoding does, in parallel,
 * within a memory budget. SKELETON: signatures fixed, bodies to be written.
 *
 * @since 0.1.0
 */
public final class PieceCounter {
  private PieceCounter() {}

  /** A builder with the default pipeline, all cores, and the default budget. */
  public static Builder builder() { throw new UnsupportedOperationException(); }

  /** Counts the pieces of every text. */
  public PieceCounts count(Iterable<? extends CharSequence> texts) { throw new UnsupportedOperationException(); }

  /** Counts the pieces of every text of the stream. */
  public PieceCounts count(Stream<? extends CharSequence> texts) { throw new UnsupportedOperationException(); }

  /** Counts the pieces of every line of every file (UTF-8, {@code .gz} by name). */
  public PieceCounts countFiles(Collection<Path> files) { throw new UnsupportedOperationException(); }

  /** Builder. */
  public static final class Builder {
    private Builder() {}
    public Builder pipeline(Pipeline pipeline) { throw new UnsupportedOperationException(); }
    public Builder threads(int threads) { throw new UnsupportedOperationException(); }
    public Builder maxDistinctPieces(int max) { throw new UnsupportedOperationException(); }
    public Builder listener(TrainingListener listener) { throw new UnsupportedOperationException(); }
    public PieceCounter build() { throw new UnsupportedOperationException(); }
  }
}
