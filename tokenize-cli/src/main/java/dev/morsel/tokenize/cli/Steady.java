package dev.morsel.tokenize.cli;

import java.util.Locale;
import java.util.function.LongSupplier;

/**
 * Warm-up until the rate is stable. The JIT compiles the encoder during the first passes, so early
 * passes measure compilation, not the encoder (a default bench once read 3.66 MB/s against 9.65 MB/s
 * after a long warm-up). The criterion: {@value #WINDOW} consecutive passes whose times lie within
 * {@code tolerance} of each other ((slowest − fastest) / fastest), after at least {@code minNanos} of
 * warm-up; the warm-up gives up after {@code maxNanos} and says so.
 */
final class Steady {
  /** Consecutive passes that must agree. */
  static final int WINDOW = 3;
  /** Default tolerance: 5 % between the fastest and the slowest of the window. */
  static final double DEFAULT_TOLERANCE = 0.05;

  /** What a warm-up took. */
  record Warmup(int passes, double seconds, boolean stable, double tolerance) {
    String describe() {
      return String.format(Locale.ROOT, "warm-up %d passes (%.1f s)%s", passes, seconds, stable
          ? String.format(Locale.ROOT, " until %d consecutive passes agreed within %.0f%%", WINDOW, tolerance * 100)
          : String.format(Locale.ROOT, ", NOT stable: %d consecutive passes never agreed within %.0f%%", WINDOW, tolerance * 100));
    }
  }

  private Steady() {}

  /**
   * Runs {@code pass} (which returns its own duration in nanoseconds) until stable.
   *
   * @param minNanos least warm-up time
   * @param maxNanos most warm-up time
   */
  static Warmup warmUp(LongSupplier pass, double tolerance, long minNanos, long maxNanos) {
    long[] window = new long[WINDOW];
    int passes = 0;
    long start = System.nanoTime();
    while (true) {
      long dt = Math.max(1, pass.getAsLong());
      window[passes % WINDOW] = dt;
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

  static boolean agree(long[] window, double tolerance) {
    long min = Long.MAX_VALUE;
    long max = 0;
    for (long w : window) {
      min = Math.min(min, w);
      max = Math.max(max, w);
    }
    return (max - min) <= tolerance * min;
  }
}
