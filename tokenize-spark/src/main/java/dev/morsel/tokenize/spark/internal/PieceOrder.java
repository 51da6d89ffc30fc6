package dev.morsel.tokenize.spark.internal;

import java.io.Serializable;
import java.util.Comparator;
import scala.Tuple2;

/**
 * Orders (piece, count) pairs by count, highest first, then by piece in code-point order
 * ({@link String#compareTo}): the order in which the bounded table keeps pieces, so the cut is
 * deterministic. Serializable for Spark's {@code takeOrdered}.
 *
 * <p>Internal: not part of the public API.
 */
public final class PieceOrder implements Comparator<Tuple2<String, Long>>, Serializable {
  private static final long serialVersionUID = 1L;

  /** The one instance. */
  public static final PieceOrder INSTANCE = new PieceOrder();

  private PieceOrder() {}

  @Override
  public int compare(Tuple2<String, Long> a, Tuple2<String, Long> b) {
    int c = Long.compare(b._2(), a._2());
    return c != 0 ? c : a._1().compareTo(b._1());
  }

  private Object readResolve() {
    return INSTANCE;
  }
}
