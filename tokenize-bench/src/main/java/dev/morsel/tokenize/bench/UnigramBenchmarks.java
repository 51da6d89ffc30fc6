package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
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
import org.openjdk.jmh.infra.Blackhole;

/**
 * Unigram Viterbi with the 32k vocabulary trained on the whole Europarl body corpus ({@link Models}):
 * every body, 1 MiB of prose, and adversarial input (1 MiB and 100 KiB of letters with no spaces,
 * splitting off).
 *
 * <p>Run with {@code tokenize-bench/summary.sh}, or alone with
 * {@code java -jar tokenize-bench/target/morsel-bench.jar --jmh UnigramBenchmarks}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgsAppend = {"-Xms2g", "-Xmx2g"})
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
public class UnigramBenchmarks {
  List<String> bodies;
  Tokenizer trained;
  Tokenizer unsplit;
  String prose1m;
  String adversarial1m;
  String adversarial100k;

  @Setup
  public void setup() {
    bodies = Corpus.bodies();
    trained = Models.unigram();
    unsplit = Tokenizers.of(Models.unsplit(), Tokenizers.segmenterOf(trained));
    prose1m = Corpus.prose(1 << 20);
    adversarial1m = Corpus.adversarial(1 << 20, 1);
    adversarial100k = Corpus.adversarial(100 << 10, 1);
  }

  /** {@code unigram_encode}: every body. */
  @Benchmark
  public void encode(Blackhole bh) {
    for (String s : bodies) {
      bh.consume(trained.encode(s));
    }
  }

  /** 1 MiB of prose as one text, splitting on. */
  @Benchmark
  public Object prose1m() {
    return trained.encode(prose1m);
  }

  /** 1 MiB of letters, no spaces, splitting off. */
  @Benchmark
  public Object adversarial1m() {
    return unsplit.encode(adversarial1m);
  }

  /** 100 KiB of letters, no spaces, splitting off. */
  @Benchmark
  public Object adversarial100k() {
    return unsplit.encode(adversarial100k);
  }
}
