package dev.morsel.tokenize.cli;

import java.util.Locale;
import java.util.function.DoubleSupplier;

/**
 * Warm-up until the rate is stable. The JIT compiles the encoder during the first passes, so early
 * passes measure compilation, not the encoder (a default bench once read 3.66 MB/s against 9.65 MB/s
 * after a long warm-up). The criterion: {@value #WINDOW} consecutive rounds whose rates lie within
 * {@code tolerance} of each other ((fastest − slowest) / slowest), after at least {@code minNanos} of
 * warm-up; the warm-up gives up after {@code maxNanos} and says so.
 */
final class Steady {
  /** Consecutive passes that must agree. */
  static final int WINDOW = 3;
  /** Default tolerance: 5 % between the fastest and the slowest of the window. */
  static final double DEFAULT_TOLERANCE = 0.05;

  /** What a warm-up took. */
  record Warmup(int passes, double seconds, boolean stable, double tolerance) {
    /** Short form for tables: "43 rounds, 2.8 s", with ", NOT stable" when it gave up. */
    String brief() {
      return String.format(Locale.ROOT, "%d rounds, %.1f s%s", passes, seconds, stable ? "" : ", NOT stable");
    }

    String describe() {
      return String.format(Locale.ROOT, "warm-up %d rounds (%.1f s)%s", passes, seconds, stable
          ? String.format(Locale.ROOT, " until %d consecutive rounds agreed within %.0f%%", WINDOW, tolerance * 100)
          : String.format(Locale.ROOT, ", NOT stable: %d consecutive rounds never agreed within %.0f%%", WINDOW, tolerance * 100));
    }
  }

  private Steady() {}

  /**
   * Runs {@code round} (which returns the rate it measured, any unit, higher is faster) until stable.
   *
   * @param minNanos least warm-up time
   * @param maxNanos most warm-up time
   */
  static Warmup warmUp(DoubleSupplier round, double tolerance, long minNanos, long maxNanos) {
    double[] window = new double[WINDOW];
    int passes = 0;
    long start = System.nanoTime();
    while (true) {
      window[passes % WINDOW] = round.getAsDouble();
      passes++;
      long elapsed = System.nanoTime() - start;
      if (passes >= WINDOW && elapsed >= minNanos && agree(window, tolerance)) {
        return new Warmup(passes, elapsed / 1e9, true, tolerance);
      }
      if (elapsed >= maxNanos) {
        return new Warmup(passes, elapsed / 1e9, false, tolerance);
      }
    }
  }

  static boolean agree(double[] window, double tolerance) {
    double min = Double.MAX_VALUE;
    double max = 0;
    for (double w : window) {
      min = Math.min(min, w);
      max = Math.max(max, w);
    }
    return min > 0 && (max - min) <= tolerance * min;
  }
}
