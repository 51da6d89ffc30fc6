package dev.morsel.tokenize.train;

import dev.morsel.tokenize.format.AlphabetRecord;
import it.unimi.dsi.fastutil.ints.IntOpenHashSet;
import java.util.Locale;

/**
 * The alphabet an {@link AlphabetPolicy} chose from piece counts, and the report of that choice: the
 * characters kept (most frequent first), the coverage reached, and the characters left out with
 * their occurrence counts. Immutable and thread-safe.
 *
 * <p>Learners hand it to {@link TrainingListener#alphabet(String, Alphabet)} once per training, so a
 * caller (the command-line {@code train}, say) can tell which characters a vocabulary has no id
 * for, and how they will be encoded ({@link #byteSpelling()}).
 *
 * @since 0.1.0
 */
public final class Alphabet {
  /** Characters listed by {@link #summary()}: the most frequent of those left out. */
  public static final int SUMMARY_LEFT_OUT = 20;

  private final AlphabetPolicy policy;
  private final int maxSize;
  private final boolean byteSpelling;
  private final int[] kept;
  private final long[] keptCounts;
  private final int[] left;
  private final long[] leftCounts;
  private final long total;
  private final long covered;
  private final IntOpenHashSet members;

  Alphabet(AlphabetPolicy policy, int maxSize, boolean byteSpelling, int[] kept, long[] keptCounts, int[] left,
      long[] leftCounts, long total) {
    this.policy = policy;
    this.maxSize = maxSize;
    this.byteSpelling = byteSpelling;
    this.kept = kept;
    this.keptCounts = keptCounts;
    this.left = left;
    this.leftCounts = leftCounts;
    this.total = total;
    long c = 0;
    for (long k : keptCounts) {
      c += k;
    }
    this.covered = c;
    this.members = new IntOpenHashSet(kept);
  }

  /** The policy that chose this alphabet. */
  public AlphabetPolicy policy() {
    return policy;
  }

  /** The cap in force: the policy's {@link AlphabetPolicy#maxSize()}, or the learner's derived cap. */
  public int maxSize() {
    return maxSize;
  }

  /** Whether the learner spells characters outside the alphabet with byte tokens (else: the unknown token). */
  public boolean byteSpelling() {
    return byteSpelling;
  }

  /** Number of characters kept. */
  public int size() {
    return kept.length;
  }

  /** The kept character of rank {@code r} (0: the most frequent), as a code point. */
  public int codePoint(int r) {
    return kept[r];
  }

  /** Count-weighted occurrences of the kept character of rank {@code r}. */
  public long count(int r) {
    return keptCounts[r];
  }

  /** Whether {@code codePoint} is in the alphabet. */
  public boolean contains(int codePoint) {
    return members.contains(codePoint);
  }

  /** Whether every code point of {@code s} is in the alphabet. */
  public boolean containsAll(CharSequence s) {
    for (int k = 0; k < s.length(); ) {
      int cp = Character.codePointAt(s, k);
      if (!members.contains(cp)) {
        return false;
      }
      k += Character.charCount(cp);
    }
    return true;
  }

  /** Count-weighted character occurrences in the counts the alphabet was chosen from. */
  public long totalOccurrences() {
    return total;
  }

  /** Occurrences of the kept characters. */
  public long coveredOccurrences() {
    return covered;
  }

  /** The share of occurrences the alphabet covers, in {@code [0, 1]} (1 for counts without characters). */
  public double coverageReached() {
    return total == 0 ? 1.0 : (double) covered / (double) total;
  }

  /** Number of distinct characters left out. */
  public int leftOutSize() {
    return left.length;
  }

  /** The left-out character of rank {@code r} (0: the most frequent one left out), as a code point. */
  public int leftOutCodePoint(int r) {
    return left[r];
  }

  /** Occurrences of the left-out character of rank {@code r}. */
  public long leftOutCount(int r) {
    return leftCounts[r];
  }

  /** Occurrences of all characters left out. */
  public long leftOutOccurrences() {
    return total - covered;
  }

  /**
   * One line for people: size, coverage reached, the policy, how left-out characters are encoded,
   * and the {@value #SUMMARY_LEFT_OUT} most frequent of them with their counts.
   */
  public String summary() {
    StringBuilder b = new StringBuilder();
    b.append(String.format(Locale.ROOT, "alphabet %,d characters, coverage %.6f of %,d occurrences (policy coverage %s,"
        + " %s); %,d left out (%,d occurrences)", kept.length, coverageReached(), total,
        Double.toString(policy.coverage()), maxSize == Integer.MAX_VALUE ? "no cap" : String.format(Locale.ROOT,
            "max %,d", maxSize), left.length, leftOutOccurrences()));
    if (left.length > 0) {
      b.append(byteSpelling ? ", spelled with byte tokens" : ", encoded as the unknown token");
      b.append(": ").append(leftOut(SUMMARY_LEFT_OUT));
      if (left.length > SUMMARY_LEFT_OUT) {
        b.append(" …");
      }
    }
    return b.toString();
  }

  /**
   * The {@code limit} most frequent left-out characters as {@code 'c' U+XXXX ×n}, comma-separated
   * (all of them when {@code limit} is at least {@link #leftOutSize()}).
   */
  public String leftOut(int limit) {
    StringBuilder b = new StringBuilder();
    for (int r = 0; r < Math.min(limit, left.length); r++) {
      if (r > 0) {
        b.append(", ");
      }
      int cp = left[r];
      boolean visible = Character.isLetterOrDigit(cp) || (Character.getType(cp) >= Character.DASH_PUNCTUATION
          && Character.getType(cp) <= Character.FINAL_QUOTE_PUNCTUATION);
      if (visible) {
        b.append('\'').appendCodePoint(cp).append("' ");
      }
      b.append(String.format(Locale.ROOT, "U+%04X ×%,d", cp, leftCounts[r]));
    }
    return b.toString();
  }

  /** The record of this choice that a model file keeps (section {@code ALPH}; {@code inspect} shows it). */
  public AlphabetRecord record() {
    return AlphabetRecord.of(policy.coverage(), maxSize, byteSpelling, kept.length, coverageReached());
  }

  @Override
  public String toString() {
    return summary();
  }
}
