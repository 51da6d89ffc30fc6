package dev.morsel.tokenize.spark;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.spark.internal.Columns;
import dev.morsel.tokenize.spark.internal.PartitionCounter;
import dev.morsel.tokenize.spark.internal.PieceOrder;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.List;
import java.util.Objects;
import org.apache.spark.api.java.JavaPairRDD;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Encoders;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.storage.StorageLevel;
import scala.Tuple2;

/**
 * Counts training pieces on Apache Spark, with exactly the counts the single-JVM
 * {@link PieceCounter} gives for the same texts and pipeline, and brings back a memory-bounded
 * table as the {@link PieceCounts} every trainer takes. Immutable and thread-safe; build one with
 * {@link #builder()}.
 *
 * <h2>What runs where</h2>
 * On the executors each partition normalizes and splits its texts with the pipeline (sent as its
 * two spec strings and parsed there) and counts pieces in a local map; the per-partition counts are
 * added up by key across the cluster. The driver then receives only the bounded table. Every count
 * that comes back is exact: unlike the single-JVM counter's memory budget, nothing is pruned before
 * the sums are complete.
 *
 * <h2>The bound on the table</h2>
 * The table holds the pieces whose total count is at least {@code minCount} (default
 * {@value #DEFAULT_MIN_COUNT}); if more than {@code maxPieces} (default
 * {@value #DEFAULT_MAX_PIECES}) qualify, only the {@code maxPieces} with the highest counts are
 * kept, ties going to the piece that comes first in code-point order ({@link String#compareTo}).
 * The driver thus holds at most {@code maxPieces} pieces, whatever the corpus size.
 * {@link SparkCountReport} says how much was left behind.
 *
 * <h2>Null texts</h2>
 * Null values of the text column are skipped (they hold no text); {@link SparkCountReport#texts()}
 * counts only the non-null ones.
 *
 * <h2>Example</h2>
 * <pre>{@code
 * Dataset<String> messages = spark.read().textFile("hdfs:///ferry/messages/*.txt");
 * PieceCounts counts = SparkPieceCounter.builder().minCount(2).build().count(messages);
 * BpeSegmenter bpe = BpeLearner.builder().vocabularySize(32_000).build().train(counts);
 * }</pre>
 *
 * @since 0.1.0
 */
public final class SparkPieceCounter {
  // ---------------------------------------------------------------- configuration

  /** Default minimum total count of a piece that comes back: 1, every piece. */
  public static final long DEFAULT_MIN_COUNT = 1;
  /** Default bound on the pieces that come back to the driver: the single-JVM counter's budget. */
  public static final int DEFAULT_MAX_PIECES = PieceCounter.DEFAULT_MAX_DISTINCT_PIECES;
  /**
   * Distinct pieces an executor's local map holds before it hands its counts downstream and starts
   * afresh: 1,000,000 entries, roughly 100 MB of heap with the strings, a small share of a usual
   * executor; flushing early costs only shuffle volume, never exactness.
   */
  static final int FLUSH_AT = 1_000_000;

  private final Pipeline pipeline;
  private final long minCount;
  private final int maxPieces;

  // ---------------------------------------------------------------- life-cycle

  private SparkPieceCounter(Builder b) {
    this.pipeline = b.pipeline;
    this.minCount = b.minCount;
    this.maxPieces = b.maxPieces;
  }

  /** A builder with {@link Pipeline#defaults()}, every piece, and {@value #DEFAULT_MAX_PIECES} pieces at most. */
  public static Builder builder() {
    return new Builder();
  }

  // ---------------------------------------------------------------- API

  /** Counts the pieces of every non-null text; see the class notes for the bound on the result. */
  public PieceCounts count(Dataset<String> texts) {
    return tally(texts).counts();
  }

  /**
   * Counts the pieces of every non-null value of the string column {@code column}.
   *
   * @throws IllegalArgumentException if {@code column} is not a column of {@code data} or holds no strings
   */
  public PieceCounts count(Dataset<?> data, String column) {
    return tally(data, column).counts();
  }

  /**
   * Counts the pieces of every line of the text files at {@code paths}, read by
   * {@code spark.read().textFile(paths)} (UTF-8, one text a line; compressed files by their
   * extension, as Spark decides).
   */
  public PieceCounts countFiles(SparkSession spark, String... paths) {
    Objects.requireNonNull(spark, "spark");
    return count(spark.read().textFile(paths));
  }

  /** Like {@link #count(Dataset)}, with what the bound left behind. */
  public SparkCountReport tally(Dataset<String> texts) {
    Objects.requireNonNull(texts, "texts");
    JavaPairRDD<String, Long> summed = texts.javaRDD()
        .mapPartitionsToPair(new PartitionCounter(pipeline.normalization().spec(), pipeline.splitting().spec(), FLUSH_AT))
        .reduceByKey(Long::sum)
        .persist(StorageLevel.MEMORY_AND_DISK());
    try {
      return collect(summed);
    } finally {
      summed.unpersist(false);
    }
  }

  /**
   * Like {@link #count(Dataset, String)}, with what the bound left behind.
   *
   * @throws IllegalArgumentException if {@code column} is not a column of {@code data} or holds no strings
   */
  public SparkCountReport tally(Dataset<?> data, String column) {
    Objects.requireNonNull(data, "data");
    Columns.requireStringColumn(data, column, "text column");
    return tally(data.select(data.col(column)).as(Encoders.STRING()));
  }

  /** The pipeline used. */
  public Pipeline pipeline() {
    return pipeline;
  }

  /** The minimum total count of a piece that comes back. */
  public long minCount() {
    return minCount;
  }

  /** The most pieces that come back. */
  public int maxPieces() {
    return maxPieces;
  }

  // ---------------------------------------------------------------- internals

  private SparkCountReport collect(JavaPairRDD<String, Long> summed) {
    final long min = minCount;
    // [texts, distinct pieces, occurrences, pieces at or above minCount], in one pass
    long[] stats = summed.aggregate(new long[4], (acc, e) -> {
      if (e._1().isEmpty()) { // PartitionCounter.TEXTS_KEY
        acc[0] += e._2();
      } else {
        acc[1]++;
        acc[2] += e._2();
        if (e._2() >= min) {
          acc[3]++;
        }
      }
      return acc;
    }, (a, b) -> {
      for (int i = 0; i < a.length; i++) {
        a[i] += b[i];
      }
      return a;
    });
    JavaPairRDD<String, Long> eligible = summed.filter(e -> !e._1().isEmpty() && e._2() >= min);
    List<Tuple2<String, Long>> kept = stats[3] <= maxPieces
        ? eligible.collect()
        : eligible.takeOrdered(maxPieces, PieceOrder.INSTANCE);
    String[] pieces = new String[kept.size()];
    long[] counts = new long[pieces.length];
    for (int i = 0; i < pieces.length; i++) {
      Tuple2<String, Long> e = kept.get(i);
      pieces[i] = e._1();
      counts[i] = e._2();
    }
    return new SparkCountReport(PieceCounts.of(pipeline, pieces, counts), stats[0], stats[1], stats[2]);
  }

  // ---------------------------------------------------------------- builder

  /**
   * Builder; not thread-safe. Defaults: {@link Pipeline#defaults()}, minimum count
   * {@value #DEFAULT_MIN_COUNT}, at most {@value #DEFAULT_MAX_PIECES} pieces.
   */
  public static final class Builder {
    private Pipeline pipeline = Pipeline.defaults();
    private long minCount = DEFAULT_MIN_COUNT;
    private int maxPieces = DEFAULT_MAX_PIECES;

    private Builder() {}

    /** The normalization and splitting to count with: use the pipeline the tokenizer will encode with. */
    public Builder pipeline(Pipeline pipeline) {
      this.pipeline = Objects.requireNonNull(pipeline, "pipeline");
      return this;
    }

    /**
     * Minimum total count of a piece that comes back, at least 1; default {@value #DEFAULT_MIN_COUNT}.
     *
     * @throws IllegalArgumentException if below 1, naming {@code minCount}
     */
    public Builder minCount(long minCount) {
      if (minCount < 1) {
        throw new IllegalArgumentException("minCount=" + minCount + " must be at least 1");
      }
      this.minCount = minCount;
      return this;
    }

    /**
     * Most pieces that come back to the driver, at least 1; default {@value #DEFAULT_MAX_PIECES}.
     * Past it the pieces with the highest counts are kept (ties by code-point order).
     *
     * @throws IllegalArgumentException if below 1, naming {@code maxPieces}
     */
    public Builder maxPieces(int maxPieces) {
      if (maxPieces < 1) {
        throw new IllegalArgumentException("maxPieces=" + maxPieces + " must be at least 1");
      }
      this.maxPieces = maxPieces;
      return this;
    }

    /** A counter with these settings. */
    public SparkPieceCounter build() {
      return new SparkPieceCounter(this);
    }
  }
}
