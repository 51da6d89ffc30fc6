package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Training cost on the whole Europarl body corpus, as single-shot times (seconds for one whole run,
 * all cores): counting its pieces ({@code count_pieces_s}) and learning 32k BPE merges from those
 * counts ({@code bpe_train_32k_s}). One warm-up run, then the measured runs.
 *
 * <p>Run with {@code tokenize-bench/summary.sh}, or alone with
 * {@code java -jar tokenize-bench/target/morsel-bench.jar --jmh TrainingBenchmarks}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgsAppend = {"-Xms4g", "-Xmx4g"})
@Warmup(iterations = 1)
@Measurement(iterations = 2)
public class TrainingBenchmarks {
  List<String> bodies;
  PieceCounts counts;

  @Setup
  public void setup() {
    bodies = Corpus.bodies();
    counts = Models.counts();
  }

  /** {@code count_pieces_s}: count the corpus's pieces on all cores. */
  @Benchmark
  public Object countPieces() {
    return PieceCounter.builder().pipeline(Models.pipeline()).build().count(bodies);
  }

  /** {@code bpe_train_32k_s}: learn a 32k BPE vocabulary from the counts. */
  @Benchmark
  public Object trainBpe32k() {
    return Learners.learner("bpe", LearnerSettings.of(Models.BPE_SIZE)).train(counts);
  }
}
