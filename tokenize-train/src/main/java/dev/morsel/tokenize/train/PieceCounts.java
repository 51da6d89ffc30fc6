package dev.morsel.tokenize.train;

import dev.morsel.tokenize.Pipeline;
import java.util.Arrays;
import java.util.Map;
import java.util.Objects;
import java.util.function.ObjLongConsumer;

/**
 * Training input shared by every learner: each distinct piece (a unit produced by normalization and
 * splitting) with how often it occurred, and the {@link #pipeline() pipeline} that produced the
 * pieces. Immutable and thread-safe; pieces are held in code-point lexicographic order (the order of
 * {@link String#compareTo}), which makes iteration — and so every learner that iterates —
 * deterministic.
 *
 * <p>The pipeline travels with the counts so that a learned tokenizer encodes with the normalization
 * and splitting its vocabulary was learned from: a learner binds its result to {@link #pipeline()},
 * and counts of two pipelines do not {@link #plus add up}. {@link PieceCounter} records the pipeline
 * it counted with; counts made by hand name theirs, or are taken to come from
 * {@link Pipeline#defaults()}.
 *
 * @since 0.1.0
 */
public final class PieceCounts {
  private final Pipeline pipeline;
  private final String[] pieces;
  private final long[] counts;
  private final long total;

  private PieceCounts(Pipeline pipeline, String[] pieces, long[] counts) {
    this.pipeline = pipeline;
    this.pieces = pieces;
    this.counts = counts;
    long t = 0;
    for (long c : counts) {
      t = Math.addExact(t, c);
    }
    this.total = t;
  }

  /** No pieces, from {@link Pipeline#defaults()}. */
  public static PieceCounts empty() {
    return empty(Pipeline.defaults());
  }

  /**
   * No pieces, from {@code pipeline}.
   *
   * @since 0.1.0
   */
  public static PieceCounts empty(Pipeline pipeline) {
    return new PieceCounts(Objects.requireNonNull(pipeline, "pipeline"), new String[0], new long[0]);
  }

  /**
   * Counts from a map, of pieces made by {@link Pipeline#defaults()}. Pieces with count 0 are dropped.
   *
   * @throws IllegalArgumentException for a null or empty piece or a negative count, naming the piece
   * @throws ArithmeticException if the total overflows a long
   */
  public static PieceCounts of(Map<String, ? extends Number> counts) {
    return of(Pipeline.defaults(), counts);
  }

  /**
   * Counts from a map, of pieces made by {@code pipeline}. Pieces with count 0 are dropped.
   *
   * @throws IllegalArgumentException for a null or empty piece or a negative count, naming the piece
   * @throws ArithmeticException if the total overflows a long
   * @since 0.1.0
   */
  public static PieceCounts of(Pipeline pipeline, Map<String, ? extends Number> counts) {
    Objects.requireNonNull(pipeline, "pipeline");
    Objects.requireNonNull(counts, "counts");
    String[] keys = new String[counts.size()];
    int n = 0;
    for (Map.Entry<String, ? extends Number> e : counts.entrySet()) {
      String piece = e.getKey();
      Number v = e.getValue();
      if (piece == null || piece.isEmpty()) {
        throw new IllegalArgumentException("piece counts contain a " + (piece == null ? "null" : "empty") + " piece");
      }
      if (v == null || v.longValue() < 0) {
        throw new IllegalArgumentException("piece '" + piece + "' has count " + v + "; counts must be >= 0");
      }
      if (v.longValue() > 0) {
        keys[n++] = piece;
      }
    }
    keys = Arrays.copyOf(keys, n);
    Arrays.sort(keys);
    long[] values = new long[n];
    for (int i = 0; i < n; i++) {
      values[i] = counts.get(keys[i]).longValue();
    }
    return new PieceCounts(pipeline, keys, values);
  }

  /**
   * Counts from parallel arrays (copied), of pieces made by {@link Pipeline#defaults()}; pieces must
   * be distinct.
   *
   * @throws IllegalArgumentException for lengths that differ, a null/empty/duplicate piece or a negative count
   */
  public static PieceCounts of(String[] pieces, long[] counts) {
    return of(Pipeline.defaults(), pieces, counts);
  }

  /**
   * Counts from parallel arrays (copied), of pieces made by {@code pipeline}; pieces must be distinct.
   *
   * @throws IllegalArgumentException for lengths that differ, a null/empty/duplicate piece or a negative count
   * @since 0.1.0
   */
  public static PieceCounts of(Pipeline pipeline, String[] pieces, long[] counts) {
    Objects.requireNonNull(pipeline, "pipeline");
    Objects.requireNonNull(pieces, "pieces");
    Objects.requireNonNull(counts, "counts");
    if (pieces.length != counts.length) {
      throw new IllegalArgumentException("pieces (" + pieces.length + ") and counts (" + counts.length + ") differ in length");
    }
    Integer[] order = new Integer[pieces.length];
    for (int i = 0; i < order.length; i++) {
      if (pieces[i] == null || pieces[i].isEmpty()) {
        throw new IllegalArgumentException("piece " + i + " is " + (pieces[i] == null ? "null" : "empty"));
      }
      if (counts[i] < 0) {
        throw new IllegalArgumentException("piece '" + pieces[i] + "' has count " + counts[i] + "; counts must be >= 0");
      }
      order[i] = i;
    }
    Arrays.sort(order, (a, b) -> pieces[a].compareTo(pieces[b]));
    String[] p = new String[pieces.length];
    long[] c = new long[pieces.length];
    int n = 0;
    for (int k = 0; k < order.length; k++) {
      int i = order[k];
      if (n > 0 && p[n - 1].equals(pieces[i])) {
        throw new IllegalArgumentException("piece '" + pieces[i] + "' appears twice");
      }
      if (counts[i] > 0) {
        p[n] = pieces[i];
        c[n] = counts[i];
        n++;
      }
    }
    return new PieceCounts(pipeline, Arrays.copyOf(p, n), Arrays.copyOf(c, n));
  }

  /**
   * The normalization and splitting that produced these pieces; a tokenizer learned from them
   * encodes with it.
   *
   * @since 0.1.0
   */
  public Pipeline pipeline() {
    return pipeline;
  }

  /** Number of distinct pieces. */
  public int size() {
    return pieces.length;
  }

  /** Whether there are no pieces. */
  public boolean isEmpty() {
    return pieces.length == 0;
  }

  /** The {@code i}-th piece in code-point order. */
  public String piece(int i) {
    return pieces[i];
  }

  /** The count of the {@code i}-th piece. */
  public long count(int i) {
    return counts[i];
  }

  /** The count of {@code piece}, 0 if absent. */
  public long count(String piece) {
    int i = Arrays.binarySearch(pieces, piece);
    return i < 0 ? 0 : counts[i];
  }

  /** Sum of all counts. */
  public long total() {
    return total;
  }

  /** Calls {@code action} for each piece in code-point order. */
  public void forEach(ObjLongConsumer<String> action) {
    for (int i = 0; i < pieces.length; i++) {
      action.accept(pieces[i], counts[i]);
    }
  }

  /** The pieces whose count is at least {@code minCount}. */
  public PieceCounts withMinCount(long minCount) {
    int n = 0;
    for (long c : counts) {
      if (c >= minCount) {
        n++;
      }
    }
    if (n == pieces.length) {
      return this;
    }
    String[] p = new String[n];
    long[] c = new long[n];
    int k = 0;
    for (int i = 0; i < pieces.length; i++) {
      if (counts[i] >= minCount) {
        p[k] = pieces[i];
        c[k++] = counts[i];
      }
    }
    return new PieceCounts(pipeline, p, c);
  }

  /**
   * The sum of this and {@code other}, piece by piece.
   *
   * @throws IllegalArgumentException if {@code other} was counted with another pipeline, naming both
   */
  public PieceCounts plus(PieceCounts other) {
    Objects.requireNonNull(other, "other");
    if (!pipeline.equals(other.pipeline)) {
      throw new IllegalArgumentException("cannot add piece counts of two pipelines: " + describe(pipeline)
          + " and " + describe(other.pipeline));
    }
    String[] p = new String[pieces.length + other.pieces.length];
    long[] c = new long[p.length];
    int i = 0;
    int j = 0;
    int n = 0;
    while (i < pieces.length || j < other.pieces.length) {
      int cmp = i == pieces.length ? 1 : j == other.pieces.length ? -1 : pieces[i].compareTo(other.pieces[j]);
      if (cmp < 0) {
        p[n] = pieces[i];
        c[n++] = counts[i++];
      } else if (cmp > 0) {
        p[n] = other.pieces[j];
        c[n++] = other.counts[j++];
      } else {
        p[n] = pieces[i];
        c[n++] = Math.addExact(counts[i++], other.counts[j++]);
      }
    }
    return new PieceCounts(pipeline, Arrays.copyOf(p, n), Arrays.copyOf(c, n));
  }

  /**
   * A pipeline as its two spec strings, {@code normalization 'nfc', splitting 'runs:…'}, for messages
   * that must name a pipeline.
   *
   * @since 0.1.0
   */
  public static String describe(Pipeline pipeline) {
    return "normalization '" + pipeline.normalization().spec() + "', splitting '" + pipeline.splitting().spec() + "'";
  }

  /** Equal when the pipelines, the pieces and their counts are equal. */
  @Override
  public boolean equals(Object o) {
    return o instanceof PieceCounts && pipeline.equals(((PieceCounts) o).pipeline)
        && Arrays.equals(pieces, ((PieceCounts) o).pieces) && Arrays.equals(counts, ((PieceCounts) o).counts);
  }

  @Override
  public int hashCode() {
    return (pipeline.hashCode() * 31 + Arrays.hashCode(pieces)) * 31 + Arrays.hashCode(counts);
  }

  @Override
  public String toString() {
    return "PieceCounts[" + pieces.length + " pieces, total " + total + ", " + describe(pipeline) + "]";
  }
}
