package dev.morsel.tokenize.format;

import java.util.Locale;
import java.util.Objects;

/**
 * What a learner's alphabet policy asked for and what it reached, as a model file records it
 * (section {@value #TAG}, see {@code docs/format.md}): the coverage and cap asked for, whether
 * characters outside the alphabet are spelled with byte tokens, the alphabet size and the coverage
 * reached on the training counts. A record of training, not of encoding: like {@code META} it is
 * left out of the fingerprint, so two models that encode alike have one fingerprint however they
 * were learned. Immutable.
 *
 * <p>Payload, little-endian: {@code u32} version (1), {@code f64} coverage asked for, {@code u32}
 * cap in force, {@code u8} byte spelling (0 or 1), {@code u32} alphabet size, {@code f64} coverage
 * reached. A later minor version may append fields; readers skip what follows.
 *
 * @since 0.1.0
 */
public final class AlphabetRecord {
  /** The section tag. */
  public static final String TAG = "ALPH";
  /** The review-text section name. */
  public static final String REVIEW_SECTION = "alphabet";

  private static final int VERSION = 1;
  private static final String[] COLUMNS = {"setting", "value"};

  private final double coverage;
  private final int maxSize;
  private final boolean byteSpelling;
  private final int size;
  private final double coverageReached;

  private AlphabetRecord(double coverage, int maxSize, boolean byteSpelling, int size, double coverageReached) {
    this.coverage = coverage;
    this.maxSize = maxSize;
    this.byteSpelling = byteSpelling;
    this.size = size;
    this.coverageReached = coverageReached;
  }

  /**
   * A record.
   *
   * @throws IllegalArgumentException if a coverage is outside {@code [0, 1]} (asked for: {@code (0, 1]})
   *     or a size is negative
   */
  public static AlphabetRecord of(double coverage, int maxSize, boolean byteSpelling, int size, double coverageReached) {
    if (!(coverage > 0 && coverage <= 1) || !(coverageReached >= 0 && coverageReached <= 1) || maxSize < 0 || size < 0) {
      throw new IllegalArgumentException("alphabet record out of range: coverage=" + coverage + ", maxSize=" + maxSize
          + ", size=" + size + ", coverageReached=" + coverageReached);
    }
    return new AlphabetRecord(coverage, maxSize, byteSpelling, size, coverageReached);
  }

  /** The share of character occurrences the policy asked the alphabet to cover. */
  public double coverage() {
    return coverage;
  }

  /** The cap in force (the policy's, or the one the learner derived). */
  public int maxSize() {
    return maxSize;
  }

  /** Whether characters outside the alphabet are spelled with byte tokens (else: the unknown token). */
  public boolean byteSpelling() {
    return byteSpelling;
  }

  /** Characters in the alphabet. */
  public int size() {
    return size;
  }

  /** The share of the training counts' character occurrences the alphabet covers. */
  public double coverageReached() {
    return coverageReached;
  }

  /** Writes section {@value #TAG}. */
  public void write(ModelWriter out) {
    out.section(TAG).putInt(VERSION).putDouble(coverage).putInt(maxSize).putByte(byteSpelling ? 1 : 0).putInt(size)
        .putDouble(coverageReached);
  }

  /**
   * The record of {@code sections}, or null if the file has none (a model written before alphabets
   * were recorded, or made from a token list).
   *
   * @throws ModelFormatException naming section {@value #TAG} if its content is malformed
   */
  public static AlphabetRecord read(ModelSections sections) {
    if (!sections.has(TAG)) {
      return null;
    }
    SectionReader r = sections.reader(TAG);
    int version = r.getInt("version");
    if (version < 1) {
      throw r.fail("version " + version + " is not 1 or later");
    }
    double coverage = r.getDouble("coverage");
    int maxSize = r.getInt("maxSize");
    int bytes = r.getByte("byteSpelling");
    int size = r.getInt("size");
    double reached = r.getDouble("coverageReached");
    if (bytes > 1) {
      throw r.fail("byteSpelling " + bytes + " is not 0 or 1");
    }
    try {
      return of(coverage, maxSize, bytes == 1, size, reached);
    } catch (IllegalArgumentException e) {
      throw r.fail(e.getMessage());
    }
  }

  /** Writes the review-text section {@value #REVIEW_SECTION}: one {@code setting, value} row per field. */
  public void writeReview(ReviewWriter out) {
    out.section(REVIEW_SECTION, COLUMNS);
    out.row("coverage", ReviewWriter.decimal(coverage));
    out.row("max-size", Integer.toString(maxSize));
    out.row("byte-spelling", Boolean.toString(byteSpelling));
    out.row("size", Integer.toString(size));
    out.row("coverage-reached", ReviewWriter.decimal(coverageReached));
  }

  /**
   * The record of a review text's {@value #REVIEW_SECTION} section, or null without one.
   *
   * @throws ModelFormatException naming the line of a missing, repeated or malformed setting
   */
  public static AlphabetRecord readReview(ReviewDocument doc) {
    ReviewDocument.Section s = doc.optionalSection(REVIEW_SECTION, COLUMNS);
    if (s == null) {
      return null;
    }
    String[] names = {"coverage", "max-size", "byte-spelling", "size", "coverage-reached"};
    ReviewDocument.Row[] rows = new ReviewDocument.Row[names.length];
    for (ReviewDocument.Row r : s.rows()) {
      String name = r.word(0, names);
      int i = java.util.Arrays.asList(names).indexOf(name);
      if (rows[i] != null) {
        throw r.fail(0, "setting " + name + " appears twice");
      }
      rows[i] = r;
    }
    for (int i = 0; i < names.length; i++) {
      if (rows[i] == null) {
        throw s.fail("has no " + names[i] + " row");
      }
    }
    boolean bytes = rows[2].word(1, "true", "false").equals("true");
    try {
      return of(rows[0].decimal(1), (int) rows[1].integer(1, 0, Integer.MAX_VALUE), bytes,
          (int) rows[3].integer(1, 0, Integer.MAX_VALUE), rows[4].decimal(1));
    } catch (IllegalArgumentException e) {
      throw s.fail(e.getMessage());
    }
  }

  /** One line for people, as {@code inspect} prints it. */
  public String summary() {
    return String.format(Locale.ROOT, "%,d characters, coverage %.6f reached (asked %s, %s), %s", size,
        coverageReached, Double.toString(coverage),
        maxSize == Integer.MAX_VALUE ? "no cap" : String.format(Locale.ROOT, "max %,d", maxSize),
        byteSpelling ? "others spelled with byte tokens" : "others become the unknown token");
  }

  @Override
  public boolean equals(Object o) {
    if (!(o instanceof AlphabetRecord)) {
      return false;
    }
    AlphabetRecord r = (AlphabetRecord) o;
    return Double.compare(coverage, r.coverage) == 0 && maxSize == r.maxSize && byteSpelling == r.byteSpelling
        && size == r.size && Double.compare(coverageReached, r.coverageReached) == 0;
  }

  @Override
  public int hashCode() {
    return Objects.hash(coverage, maxSize, byteSpelling, size, coverageReached);
  }

  @Override
  public String toString() {
    return "AlphabetRecord[" + summary() + "]";
  }
}
