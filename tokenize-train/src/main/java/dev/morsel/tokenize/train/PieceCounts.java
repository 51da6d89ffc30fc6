package dev.morsel.tokenize.train;

import java.util.Arrays;
import java.util.Map;
import java.util.Objects;
import java.util.function.ObjLongConsumer;

/**
 * Training input shared by every trainer: each distinct piece (a unit produced by normalization and
 * splitting) with how often it occurred. Immutable and thread-safe; pieces are held in code-point
 * lexicographic order (the order of {@link String#compareTo}), which makes iteration — and so every
 * trainer that iterates — deterministic.
 *
 * @since 0.1.0
 */
public final class PieceCounts {
  private static final PieceCounts EMPTY = new PieceCounts(new String[0], new long[0]);

  private final String[] pieces;
  private final long[] counts;
  private final long total;

  private PieceCounts(String[] pieces, long[] counts) {
    this.pieces = pieces;
    this.counts = counts;
    long t = 0;
    for (long c : counts) {
      t = Math.addExact(t, c);
    }
    this.total = t;
  }

  /** No pieces. */
  public static PieceCounts empty() {
    return EMPTY;
  }

  /**
   * Counts from a map. Pieces with count 0 are dropped.
   *
   * @throws IllegalArgumentException for a null or empty piece or a negative count, naming the piece
   * @throws ArithmeticException if the total overflows a long
   */
  public static PieceCounts of(Map<String, ? extends Number> counts) {
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
    return new PieceCounts(keys, values);
  }

  /**
   * Counts from parallel arrays (copied); pieces must be distinct.
   *
   * @throws IllegalArgumentException for lengths that differ, a null/empty/duplicate piece or a negative count
   */
  public static PieceCounts of(String[] pieces, long[] counts) {
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
    return new PieceCounts(Arrays.copyOf(p, n), Arrays.copyOf(c, n));
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
    return new PieceCounts(p, c);
  }

  /** The sum of this and {@code other}, piece by piece. */
  public PieceCounts plus(PieceCounts other) {
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
    return new PieceCounts(Arrays.copyOf(p, n), Arrays.copyOf(c, n));
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof PieceCounts && Arrays.equals(pieces, ((PieceCounts) o).pieces)
        && Arrays.equals(counts, ((PieceCounts) o).counts);
  }

  @Override
  public int hashCode() {
    return Arrays.hashCode(pieces) * 31 + Arrays.hashCode(counts);
  }

  @Override
  public String toString() {
    return "PieceCounts[" + pieces.length + " pieces, total " + total + "]";
  }
}
