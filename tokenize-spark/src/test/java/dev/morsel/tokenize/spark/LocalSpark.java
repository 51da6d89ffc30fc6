package dev.morsel.tokenize.spark;

import java.util.List;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Encoders;
import org.apache.spark.sql.SparkSession;

/**
 * One local Spark session for every test class of the module (Surefire runs them in one JVM), so
 * that the start-up cost is paid once. Two worker threads ({@code local[2]}), no web UI, bound to
 * the loopback address. Never stopped: Spark's own shutdown hook stops it when the JVM exits.
 */
final class LocalSpark {
  /** Partitions the tests spread data over: more than the two threads, so merging across partitions is exercised. */
  static final int PARTITIONS = 6;

  private LocalSpark() {}

  static SparkSession session() {
    return Holder.SESSION;
  }

  /** {@code texts} as a dataset of {@link #PARTITIONS} partitions (nulls allowed). */
  static Dataset<String> strings(List<String> texts) {
    JavaSparkContext jsc = JavaSparkContext.fromSparkContext(session().sparkContext());
    return session().createDataset(jsc.parallelize(texts, PARTITIONS).rdd(), Encoders.STRING());
  }

  private static final class Holder {
    static final SparkSession SESSION = SparkSession.builder()
        .appName("morsel-tokenize-spark-tests")
        .master("local[2]")
        .config("spark.ui.enabled", "false")
        .config("spark.driver.host", "127.0.0.1")
        .config("spark.driver.bindAddress", "127.0.0.1")
        // common practice: few shuffle partitions for small local test data (the default 200 only adds task overhead)
        .config("spark.sql.shuffle.partitions", "4")
        .getOrCreate();
  }
}
