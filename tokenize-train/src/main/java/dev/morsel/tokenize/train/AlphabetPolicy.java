package dev.morsel.tokenize.train;

import it.unimi.dsi.fastutil.ints.Int2LongOpenHashMap;
import it.unimi.dsi.fastutil.ints.IntArrays;
import java.util.List;
import java.util.Locale;

/**
 * How a learner chooses its alphabet, the characters it may build tokens from, one policy for every
 * scheme: the smallest set of characters, most frequent first, whose occurrences reach a share
 * ({@link #coverage()}) of all character occurrences in the piece counts, and never more than a cap
 * ({@link #maxSize()}). Immutable and thread-safe.
 *
 * <p>Characters left out of the alphabet never take an id of their own and are never part of a
 * learned token. At encode time a scheme with <em>byte spelling</em> on spells them with byte
 * tokens, one per UTF-8 byte, so the encoding stays lossless; otherwise they become the unknown
 * token. What each scheme does is in its learner's Javadoc and in {@code docs/guide.md} ("Large
 * alphabets"), with the measurement that chose {@link #DEFAULT_COVERAGE}.
 *
 * <pre>{@code
 * AlphabetPolicy policy = AlphabetPolicy.defaults().withCoverage(0.999).withMaxSize(3000);
 * Alphabet alphabet = policy.select(counts, 2000, true);   // 2000: the scheme's derived cap
 * }</pre>
 *
 * <p>Order and ties: characters are ranked by count-weighted occurrences, larger first, ties by the
 * smaller code point, so the choice is deterministic.
 *
 * @since 0.1.0
 */
public final class AlphabetPolicy {
  /**
   * Default {@link #coverage()}: 0.9999, chosen by the held-out measurement in {@code docs/guide.md}
   * ("Large alphabets": English, French and German Europarl text mixed with Chinese, 8,000 ids, each
   * scheme).
   */
  public static final double DEFAULT_COVERAGE = 0.9999;

  /**
   * The {@link #maxSize()} that lets each learner derive the cap from its vocabulary size (the
   * default); see each learner's Javadoc. A cap of its own is any positive number.
   */
  public static final int DERIVED_MAX_SIZE = 0;

  /** The learner option that sets {@link #coverage()}, for every scheme. */
  public static final String COVERAGE_OPTION = "alphabet-coverage";
  /** The learner option that sets {@link #maxSize()}, for every scheme: a number, or {@code auto} (derived). */
  public static final String MAX_SIZE_OPTION = "max-alphabet";
  /** The value of {@link #MAX_SIZE_OPTION} that asks for the derived cap. */
  public static final String AUTO = "auto";

  private static final AlphabetPolicy DEFAULTS = new AlphabetPolicy(DEFAULT_COVERAGE, DERIVED_MAX_SIZE);

  private final double coverage;
  private final int maxSize;

  private AlphabetPolicy(double coverage, int maxSize) {
    this.coverage = coverage;
    this.maxSize = maxSize;
  }

  /** {@link #DEFAULT_COVERAGE} and a derived cap. */
  public static AlphabetPolicy defaults() {
    return DEFAULTS;
  }

  /**
   * A policy with the given coverage and cap.
   *
   * @throws IllegalArgumentException if {@code coverage} is not in {@code (0, 1]} or {@code maxSize}
   *     is negative
   */
  public static AlphabetPolicy of(double coverage, int maxSize) {
    return new AlphabetPolicy(checkCoverage(coverage), checkMaxSize(maxSize));
  }

  /** Share of the character occurrences the alphabet covers at least, in {@code (0, 1]} (1: every character). */
  public double coverage() {
    return coverage;
  }

  /** Most characters in the alphabet, or {@link #DERIVED_MAX_SIZE} when the learner derives the cap. */
  public int maxSize() {
    return maxSize;
  }

  /**
   * This policy with another coverage.
   *
   * @throws IllegalArgumentException if {@code coverage} is not in {@code (0, 1]}, naming it
   */
  public AlphabetPolicy withCoverage(double coverage) {
    return new AlphabetPolicy(checkCoverage(coverage), maxSize);
  }

  /**
   * This policy with another cap ({@link #DERIVED_MAX_SIZE} to let the learner derive it).
   *
   * @throws IllegalArgumentException if {@code maxSize} is negative, naming it
   */
  public AlphabetPolicy withMaxSize(int maxSize) {
    return new AlphabetPolicy(coverage, checkMaxSize(maxSize));
  }

  /**
   * Chooses the alphabet of {@code counts}: the code points of every piece, weighted by its count.
   *
   * @param derivedMaxSize the cap to use when {@link #maxSize()} is {@link #DERIVED_MAX_SIZE}, at least 1
   * @param byteSpelling whether the learner spells the characters left out with byte tokens (recorded
   *     in the result for its report)
   * @throws IllegalArgumentException if {@code derivedMaxSize} is below 1 (occurrence counts beyond
   *     {@code Long.MAX_VALUE} saturate there)
   */
  public Alphabet select(PieceCounts counts, int derivedMaxSize, boolean byteSpelling) {
    if (derivedMaxSize < 1) {
      throw new IllegalArgumentException("derivedMaxSize=" + derivedMaxSize + " must be at least 1");
    }
    Int2LongOpenHashMap freq = new Int2LongOpenHashMap();
    long total = 0;
    for (int i = 0, n = counts.size(); i < n; i++) {
      String p = counts.piece(i);
      long w = counts.count(i);
      for (int k = 0; k < p.length(); ) {
        int cp = p.codePointAt(k);
        freq.put(cp, saturatedSum(freq.get(cp), w));
        total = saturatedSum(total, w);
        k += Character.charCount(cp);
      }
    }
    int[] cps = freq.keySet().toIntArray();
    long[] occ = new long[cps.length];
    for (int i = 0; i < cps.length; i++) {
      occ[i] = freq.get(cps[i]);
    }
    int[] order = new int[cps.length];
    for (int i = 0; i < order.length; i++) {
      order[i] = i;
    }
    IntArrays.quickSort(order, (x, y) -> {
      int c = Long.compare(occ[y], occ[x]);
      return c != 0 ? c : Integer.compare(cps[x], cps[y]);
    });
    int cap = maxSize == DERIVED_MAX_SIZE ? derivedMaxSize : maxSize;
    int keep = 0;
    long covered = 0;
    // the target in exact arithmetic where it matters: coverage 1 keeps every character
    while (keep < order.length && keep < cap && (coverage >= 1.0 || (double) covered < coverage * (double) total)) {
      covered += occ[order[keep++]];
    }
    int[] kept = new int[keep];
    long[] keptCounts = new long[keep];
    for (int r = 0; r < keep; r++) {
      kept[r] = cps[order[r]];
      keptCounts[r] = occ[order[r]];
    }
    int[] left = new int[order.length - keep];
    long[] leftCounts = new long[left.length];
    for (int r = keep; r < order.length; r++) {
      left[r - keep] = cps[order[r]];
      leftCounts[r - keep] = occ[order[r]];
    }
    return new Alphabet(this, cap, byteSpelling, kept, keptCounts, left, leftCounts, total);
  }

  /**
   * The declarations of {@link #COVERAGE_OPTION} and {@link #MAX_SIZE_OPTION}, for a learner
   * provider's {@link LearnerProvider#options()}; {@code derived} describes the scheme's derived cap.
   */
  public static List<LearnerOption> options(String derived) {
    return List.of(
        LearnerOption.of(COVERAGE_OPTION, Double.toString(DEFAULT_COVERAGE),
            "share of character occurrences the alphabet covers, in (0, 1]; the rarest characters are left out"),
        LearnerOption.of(MAX_SIZE_OPTION, AUTO, "most characters in the alphabet; auto: " + derived));
  }

  /**
   * The policy that {@link #COVERAGE_OPTION} and {@link #MAX_SIZE_OPTION} of {@code options} ask for.
   *
   * @throws IllegalArgumentException naming the option whose value is wrong
   */
  public static AlphabetPolicy fromOptions(LearnerOptions options) {
    double coverage = options.doubleValue(COVERAGE_OPTION, 0, 1, true);
    if (coverage == 0) {
      throw options.wrong(COVERAGE_OPTION, options.string(COVERAGE_OPTION), "is outside (0, 1]", null);
    }
    String max = options.string(MAX_SIZE_OPTION);
    int maxSize = max.equals(AUTO) ? DERIVED_MAX_SIZE : options.intValue(MAX_SIZE_OPTION, 1, Integer.MAX_VALUE);
    return of(coverage, maxSize);
  }

  /**
   * {@code a + b} for non-negative counts, or {@link Long#MAX_VALUE} where it would overflow: counts
   * that large are refused by each learner's own overflow check, which knows what it must fit.
   */
  private static long saturatedSum(long a, long b) {
    long r = a + b;
    return r < 0 ? Long.MAX_VALUE : r;
  }

    private static double checkCoverage(double coverage) {
    if (!(coverage > 0 && coverage <= 1)) {
      throw new IllegalArgumentException("coverage=" + coverage + " is outside (0, 1]");
    }
    return coverage;
  }

  private static int checkMaxSize(int maxSize) {
    if (maxSize < 0) {
      throw new IllegalArgumentException("maxSize=" + maxSize + " must be at least 0 (0: derived by the learner)");
    }
    return maxSize;
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof AlphabetPolicy && Double.compare(coverage, ((AlphabetPolicy) o).coverage) == 0
        && maxSize == ((AlphabetPolicy) o).maxSize;
  }

  @Override
  public int hashCode() {
    return Double.hashCode(coverage) * 31 + maxSize;
  }

  @Override
  public String toString() {
    return "AlphabetPolicy[coverage=" + coverage + ", maxSize="
        + (maxSize == DERIVED_MAX_SIZE ? "derived" : String.format(Locale.ROOT, "%d", maxSize)) + "]";
  }
}
