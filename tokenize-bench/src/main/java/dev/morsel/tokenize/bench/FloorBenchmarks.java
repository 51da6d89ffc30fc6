package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.PieceSink;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.train.PieceCounter;
import java.nio.charset.StandardCharsets;
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
 * The floors every segmenter is measured against, on the whole Europarl body corpus (one operation
 * = one pass over all 17,597 bodies, about 19.3 MB of UTF-8): {@code utf8} ({@code String.getBytes}),
 * {@code normalize_nfkc}, {@code split} (class-run splitting, normalization off) and
 * {@code count_pieces} (the training counter on one thread).
 *
 * <p>Run all figures with {@code tokenize-bench/summary.sh}; this class alone with
 * {@code java -jar tokenize-bench/target/morsel-bench.jar --jmh FloorBenchmarks}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgsAppend = {"-Xms2g", "-Xmx2g"})
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
public class FloorBenchmarks {
  List<String> bodies;
  Normalization nfkc;
  Splitting runs;
  PieceCounter counter;
  final int[] pieces = new int[1];
  final PieceSink sink = (s, e) -> pieces[0] += e - s;

  @Setup
  public void setup() {
    bodies = Corpus.bodies();
    nfkc = Normalization.of(Normalization.Form.NFKC);
    runs = Splitting.runs();
    counter = PieceCounter.builder().pipeline(Pipeline.of(Normalization.none(), runs)).threads(1).build();
  }

  /** {@code utf8}: encode every body to UTF-8 with the JDK. */
  @Benchmark
  public void utf8(Blackhole bh) {
    for (String s : bodies) {
      bh.consume(s.getBytes(StandardCharsets.UTF_8));
    }
  }

  /** {@code normalize_nfkc}: NFKC with alignment. */
  @Benchmark
  public void normalizeNfkc(Blackhole bh) {
    for (String s : bodies) {
      bh.consume(nfkc.apply(s));
    }
  }

  /** {@code split}: the class-run splitter, normalization off. */
  @Benchmark
  public int split() {
    pieces[0] = 0;
    for (String s : bodies) {
      runs.split(s, 0, s.length(), sink);
    }
    return pieces[0];
  }

  /** {@code count_pieces}: piece counting for training, one thread, normalization off. */
  @Benchmark
  public Object countPieces() {
    return counter.count(bodies);
  }
}
