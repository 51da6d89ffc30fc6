package dev.morsel.tokenize;

import java.util.Objects;

/**
 * How {@link Tokens#truncate(int, Truncation)} removes content tokens. Immutable.
 *
 * @since 0.1.0
 */
public final class Truncation {
  /**
   * Which text of a pair loses tokens.
   *
   * @since 0.1.0
   */
  public enum Strategy {
    /** Remove one token at a time from whichever text is currently longer (ties: the second). */
    LONGEST_FIRST,
    /** Remove only from the first text. */
    FIRST_ONLY,
    /** Remove only from the second text. */
    SECOND_ONLY
  }

  private static final Truncation DEFAULT = new Truncation(Strategy.LONGEST_FIRST, Side.END);

  private final Strategy strategy;
  private final Side side;

  private Truncation(Strategy strategy, Side side) {
    this.strategy = Objects.requireNonNull(strategy, "strategy");
    this.side = Objects.requireNonNull(side, "side");
  }

  /** Longest first, removing from the end: the default. */
  public static Truncation longestFirst() {
    return DEFAULT;
  }

  /** A truncation with the given strategy and side. */
  public static Truncation of(Strategy strategy, Side side) {
    return new Truncation(strategy, side);
  }

  /** The same strategy, removing from the given side. */
  public Truncation from(Side side) {
    return new Truncation(strategy, side);
  }

  /** Which text loses tokens. */
  public Strategy strategy() {
    return strategy;
  }

  /** Which end loses tokens. */
  public Side side() {
    return side;
  }

  @Override
  public String toString() {
    return "Truncation[" + strategy + ", from " + side + "]";
  }
}
