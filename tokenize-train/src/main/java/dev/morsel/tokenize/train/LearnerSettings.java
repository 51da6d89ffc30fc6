package dev.morsel.tokenize.train;

import dev.morsel.tokenize.ReservedTokens;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Objects;

/**
 * The settings every learner takes, whatever its scheme: the vocabulary size, the minimum piece
 * count, the reserved tokens, the thread count and a progress listener. Immutable and thread-safe;
 * start from {@link #of(int)} and change one setting at a time with the {@code with…} methods, each
 * of which checks its value and names the setting when it refuses one.
 *
 * <p>Scheme-specific settings are given beside these as {@link LearnerOption options}.
 *
 * @since 0.1.0
 */
public final class LearnerSettings {
  /**
   * Default vocabulary size of every learner and of {@code morsel train}: 16,000 ids. Chosen by
   * measurement (docs/guide.md, "The default vocabulary size"): the largest size in a doubling series
   * at which every scheme still uses at least 80 % of its ids on held-out text.
   */
  public static final int DEFAULT_VOCABULARY_SIZE = 16_000;

  /** Default {@link #minCount()}: 1, every piece is learned from. */
  public static final long DEFAULT_MIN_COUNT = 1;

  private final int vocabularySize;
  private final long minCount;
  private final List<String> reservedTokens;
  private final int threads;
  private final TrainingListener listener;

  private LearnerSettings(int vocabularySize, long minCount, List<String> reservedTokens, int threads,
      TrainingListener listener) {
    this.vocabularySize = vocabularySize;
    this.minCount = minCount;
    this.reservedTokens = reservedTokens;
    this.threads = threads;
    this.listener = listener;
  }

  /**
   * Settings for a vocabulary of {@code vocabularySize} ids (reserved tokens included), with
   * {@link #DEFAULT_MIN_COUNT}, no reserved tokens, every available processor and no listener.
   *
   * @throws IllegalArgumentException if {@code vocabularySize} is below 1
   */
  public static LearnerSettings of(int vocabularySize) {
    return new LearnerSettings(checkSize(vocabularySize), DEFAULT_MIN_COUNT, List.of(),
        Math.max(1, Runtime.getRuntime().availableProcessors()), TrainingListener.NONE);
  }

  /** Number of ids the learned vocabulary should have, reserved tokens included. */
  public int vocabularySize() {
    return vocabularySize;
  }

  /** Pieces counted fewer times are left out of learning. */
  public long minCount() {
    return minCount;
  }

  /** The reserved token spellings, given ids {@code 0..k-1} in this order. */
  public List<String> reservedTokens() {
    return reservedTokens;
  }

  /** Threads a learner may use. */
  public int threads() {
    return threads;
  }

  /** Where progress goes. */
  public TrainingListener listener() {
    return listener;
  }

  /**
   * These settings with another vocabulary size.
   *
   * @throws IllegalArgumentException if {@code vocabularySize} is below 1
   */
  public LearnerSettings withVocabularySize(int vocabularySize) {
    return new LearnerSettings(checkSize(vocabularySize), minCount, reservedTokens, threads, listener);
  }

  /**
   * These settings with another minimum piece count.
   *
   * @throws IllegalArgumentException if {@code minCount} is below 1
   */
  public LearnerSettings withMinCount(long minCount) {
    if (minCount < 1) {
      throw new IllegalArgumentException("minCount=" + minCount + " must be at least 1");
    }
    return new LearnerSettings(vocabularySize, minCount, reservedTokens, threads, listener);
  }

  /**
   * These settings with other reserved tokens: the spellings get ids {@code 0..k-1} in list order.
   * They are checked here by the rules of {@link ReservedTokens.Builder} (non-empty, at most
   * {@link ReservedTokens#MAX_SPELLING_LENGTH} chars, no lone surrogate, distinct, none containing or
   * overlapping another); a learner may refuse more (a spelling its vocabulary already has).
   *
   * @throws IllegalArgumentException naming the spelling, by index, that breaks a rule
   * @throws NullPointerException if the list or one of its spellings is null, naming the index
   */
  public LearnerSettings withReservedTokens(List<String> spellings) {
    return new LearnerSettings(vocabularySize, minCount, checkReserved(spellings), threads, listener);
  }

  /**
   * These settings with another thread count.
   *
   * @throws IllegalArgumentException if {@code threads} is below 1
   */
  public LearnerSettings withThreads(int threads) {
    if (threads < 1) {
      throw new IllegalArgumentException("threads=" + threads + " must be at least 1");
    }
    return new LearnerSettings(vocabularySize, minCount, reservedTokens, threads, listener);
  }

  /** These settings with another progress listener. */
  public LearnerSettings withListener(TrainingListener listener) {
    return new LearnerSettings(vocabularySize, minCount, reservedTokens, threads, Objects.requireNonNull(listener, "listener"));
  }

  /**
   * Checks reserved spellings by the rules of {@link ReservedTokens.Builder}, naming the offending
   * one by index: the check every learner's builder runs on its reserved tokens.
   *
   * @return an unmodifiable copy of {@code spellings}
   * @throws IllegalArgumentException naming the spelling, by index, that breaks a rule
   * @throws NullPointerException if the list or one of its spellings is null, naming the index
   */
  public static List<String> checkReserved(List<String> spellings) {
    Objects.requireNonNull(spellings, "reservedTokens");
    List<String> copy = new ArrayList<>(spellings.size());
    ReservedTokens.Builder b = ReservedTokens.builder();
    for (int i = 0; i < spellings.size(); i++) {
      String s = spellings.get(i);
      if (s == null) {
        throw new NullPointerException("reservedTokens[" + i + "] is null");
      }
      try {
        b.add(s, i);
      } catch (IllegalArgumentException e) {
        throw new IllegalArgumentException("reservedTokens[" + i + "]: " + e.getMessage(), e);
      }
      copy.add(s);
    }
    try {
      b.build();
    } catch (IllegalArgumentException e) {
      throw new IllegalArgumentException("reservedTokens: " + e.getMessage(), e);
    }
    return Collections.unmodifiableList(copy);
  }

  private static int checkSize(int vocabularySize) {
    if (vocabularySize < 1) {
      throw new IllegalArgumentException("vocabularySize=" + vocabularySize + " must be at least 1");
    }
    return vocabularySize;
  }

  @Override
  public boolean equals(Object o) {
    if (!(o instanceof LearnerSettings)) {
      return false;
    }
    LearnerSettings s = (LearnerSettings) o;
    return vocabularySize == s.vocabularySize && minCount == s.minCount && reservedTokens.equals(s.reservedTokens)
        && threads == s.threads && listener == s.listener;
  }

  @Override
  public int hashCode() {
    return Objects.hash(vocabularySize, minCount, reservedTokens, threads);
  }

  @Override
  public String toString() {
    return "LearnerSettings[vocabularySize=" + vocabularySize + ", minCount=" + minCount + ", reservedTokens="
        + reservedTokens + ", threads=" + threads + "]";
  }
}
