package dev.morsel.tokenize.train;

import java.util.Objects;

/**
 * The settings every {@link Extender} takes, whatever its scheme: how many ids to add, the minimum
 * piece count, the thread count and a progress listener. Immutable and thread-safe; start from
 * {@link #of(int)} and change one setting at a time with the {@code with…} methods, each of which
 * checks its value and names the setting when it refuses one. Scheme-specific settings are given
 * beside these as {@link LearnerOption options} (the same ones the scheme's learner declares).
 *
 * @since 0.3.0
 */
public final class ExtensionSettings {
  private final int addedIds;
  private final long minCount;
  private final int threads;
  private final TrainingListener listener;

  private ExtensionSettings(int addedIds, long minCount, int threads, TrainingListener listener) {
    this.addedIds = addedIds;
    this.minCount = minCount;
    this.threads = threads;
    this.listener = listener;
  }

  /**
   * Settings that add at most {@code addedIds} ids, with {@link LearnerSettings#DEFAULT_MIN_COUNT},
   * every available processor and no listener.
   *
   * @throws IllegalArgumentException if {@code addedIds} is below 1
   */
  public static ExtensionSettings of(int addedIds) {
    return new ExtensionSettings(checkAdded(addedIds), LearnerSettings.DEFAULT_MIN_COUNT,
        Math.max(1, Runtime.getRuntime().availableProcessors()), TrainingListener.NONE);
  }

  /** Most ids added after the base's. */
  public int addedIds() {
    return addedIds;
  }

  /** New-corpus pieces counted fewer times are left out of learning. */
  public long minCount() {
    return minCount;
  }

  /** Threads an extender may use. */
  public int threads() {
    return threads;
  }

  /** Where progress goes. */
  public TrainingListener listener() {
    return listener;
  }

  /**
   * These settings with another number of ids to add.
   *
   * @throws IllegalArgumentException if {@code addedIds} is below 1
   */
  public ExtensionSettings withAddedIds(int addedIds) {
    return new ExtensionSettings(checkAdded(addedIds), minCount, threads, listener);
  }

  /**
   * These settings with another minimum piece count.
   *
   * @throws IllegalArgumentException if {@code minCount} is below 1
   */
  public ExtensionSettings withMinCount(long minCount) {
    if (minCount < 1) {
      throw new IllegalArgumentException("minCount=" + minCount + " must be at least 1");
    }
    return new ExtensionSettings(addedIds, minCount, threads, listener);
  }

  /**
   * These settings with another thread count.
   *
   * @throws IllegalArgumentException if {@code threads} is below 1
   */
  public ExtensionSettings withThreads(int threads) {
    if (threads < 1) {
      throw new IllegalArgumentException("threads=" + threads + " must be at least 1");
    }
    return new ExtensionSettings(addedIds, minCount, threads, listener);
  }

  /** These settings with another progress listener. */
  public ExtensionSettings withListener(TrainingListener listener) {
    return new ExtensionSettings(addedIds, minCount, threads, Objects.requireNonNull(listener, "listener"));
  }

  private static int checkAdded(int addedIds) {
    if (addedIds < 1) {
      throw new IllegalArgumentException("addedIds=" + addedIds + " must be at least 1");
    }
    return addedIds;
  }

  @Override
  public boolean equals(Object o) {
    if (!(o instanceof ExtensionSettings)) {
      return false;
    }
    ExtensionSettings s = (ExtensionSettings) o;
    return addedIds == s.addedIds && minCount == s.minCount && threads == s.threads && listener == s.listener;
  }

  @Override
  public int hashCode() {
    return Objects.hash(addedIds, minCount, threads);
  }

  @Override
  public String toString() {
    return "ExtensionSettings[addedIds=" + addedIds + ", minCount=" + minCount + ", threads=" + threads + "]";
  }
}
