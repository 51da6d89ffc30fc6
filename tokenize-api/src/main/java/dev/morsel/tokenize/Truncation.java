package dev.morsel.tokenize;

import java.util.Objects;

/**
 * How {@link Tokens#truncate(int, Truncation)} removes content tokens. Immutable.
 *
 * @since 0.1.0
 */
public final class Truncation {
  /**
   * Which text of a pair yields (gives up) tokens when the result is too long. For one text
   * every strategy removes from that text.
   *
   * @since 0.1.0
   */
  public enum Strategy {
    /**
     * The longer text yields: one token at a time is removed from whichever text currently holds
     * more content tokens; when both hold the same number, the second text yields that token.
     */
    LONGER_YIELDS,
    /** The first text yields every removed token; the second is kept whole. */
    FIRST_YIELDS,
    /** The second text yields every removed token; the first is kept whole. */
    SECOND_YIELDS
  }

  private static final Truncation DEFAULT = new Truncation(Strategy.LONGER_YIELDS, Side.END);

  private final Strategy strategy;
  private final Side side;

  private Truncation(Strategy strategy, Side side) {
    this.strategy = Objects.requireNonNull(strategy, "strategy");
    this.side = Objects.requireNonNull(side, "side");
  }

  /** The longer text yields, removing from the end: the default. */
  public static Truncation longerYields() {
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

  /** Which text yields tokens. */
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
