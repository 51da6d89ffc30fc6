package dev.morsel.tokenize.spark;

import static org.apache.spark.sql.functions.col;
import static org.apache.spark.sql.functions.size;
import static org.apache.spark.sql.functions.sum;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.List;
import java.util.Locale;
import java.util.function.LongSupplier;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;

/**
 * A timing harness run by hand (not a test): rows per second of batch encoding on {@code local[2]}
 * against {@link Tokenizer#encodeAll} in one JVM (common pool, 2 cores here), on the 17,597 Europarl
 * bodies, for each scheme of {@link TestModels}; and piece counting, Spark against the single-JVM
 * counter with 2 threads. Each figure is the best of {@value #RUNS} runs after one warm-up run.
 * Every run also checks that both sides produce the same number of tokens.
 *
 * <p>Run from the worktree root (prints one line per figure):
 * <pre>
 * tokenize-spark/src/test/sh/throughput.sh
 * </pre>
 */
public final class EncodeThroughput {
  static final int RUNS = 3;
  /** Vocabulary size of the measured models: a realistic size, not the tiny test size. */
  static final int VOCABULARY = 8_000;

  private EncodeThroughput() {}

  public static void main(String[] args) {
    List<String> bodies = Europarl.bodies();
    int rows = bodies.size();
    double seconds;

    seconds = best(() -> PieceCounter.builder().threads(2).build().count(bodies).total());
    print("count, single JVM (2 threads)", rows, seconds);
    seconds = best(() -> SparkPieceCounter.builder().build().count(LocalSpark.strings(bodies)).total());
    print("count, Spark local[2]", rows, seconds);

    PieceCounts counts = PieceCounter.builder().threads(2).build().count(bodies);
    Dataset<Row> data = LocalSpark.strings(bodies).toDF("message").cache();
    data.count();
    for (String scheme : (Iterable<String>) TestModels.schemes()::iterator) {
      Tokenizer t = TestModels.train(scheme, counts, VOCABULARY, List.of());
      long[] tokens = new long[1];
      seconds = best(() -> {
        long n = 0;
        for (Tokens x : t.encodeAll(bodies)) {
          n += x.size();
        }
        tokens[0] = n;
        return n;
      });
      print(scheme + " encodeAll, single JVM", rows, seconds);
      SparkEncoder ids = SparkEncoder.builder(t).build();
      seconds = best(() -> check(tokens[0], ids.encode(data, "message").agg(sum(size(col("token_ids")))).first().getLong(0)));
      print(scheme + " encode ids, Spark local[2]", rows, seconds);
      SparkEncoder spans = SparkEncoder.builder(t).offsets(true).build();
      seconds = best(() -> check(tokens[0], spans.encode(data, "message")
          .agg(sum(size(col("token_ids"))), sum(size(col("token_ends")))).first().getLong(1)));
      print(scheme + " encode ids+offsets, Spark local[2]", rows, seconds);
    }
    LocalSpark.session().stop();
  }

  private static long check(long expected, long actual) {
    if (expected != actual) {
      throw new IllegalStateException("Spark gave " + actual + " tokens, the single JVM " + expected);
    }
    return actual;
  }

  private static double best(LongSupplier run) {
    run.getAsLong();
    double best = Double.MAX_VALUE;
    for (int i = 0; i < RUNS; i++) {
      long t0 = System.nanoTime();
      run.getAsLong();
      best = Math.min(best, (System.nanoTime() - t0) / 1e9);
    }
    return best;
  }

  private static void print(String what, int rows, double seconds) {
    System.out.println(String.format(Locale.ROOT, "%-40s %8.2f s %10.0f rows/s", what, seconds, rows / seconds));
  }
}
