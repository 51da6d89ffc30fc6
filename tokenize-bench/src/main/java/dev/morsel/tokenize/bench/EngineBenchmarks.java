package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Decoding;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.split.PieceSink;
import dev.morsel.tokenize.split.Splitting;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
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
 * The encode engine against its limit and under the thread models services use, on the whole
 * Europarl body corpus (one operation = one pass over all bodies):
 * <ul>
 *   <li>{@code ideal_table}: the bodies split as for {@code split}, every piece answered from an
 *       {@link IdealTable} built in setup from the BPE 32k model's own output (ids and spans written
 *       to flat arrays, nothing allocated): the ceiling every per-piece segmenter is compared to;
 *   <li>{@code bpe_utf8_in}: BPE encoding from the bodies' UTF-8 bytes, offsets in bytes;
 *   <li>{@code fresh_threads_<scheme>}: every 20 bodies encoded on a newly started platform thread,
 *       one thread at a time (thread-per-request on one core).
 * </ul>
 *
 * <p>Run with {@code tokenize-bench/summary.sh}, or alone with
 * {@code java -jar tokenize-bench/target/morsel-bench.jar --jmh EngineBenchmarks}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgsAppend = {"-Xms2g", "-Xmx2g"})
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
public class EngineBenchmarks {
  /** Bodies per short-lived thread. */
  static final int BODIES_PER_THREAD = 20;

  List<String> bodies;
  List<byte[]> bodyBytes;
  Splitting rules;
  IdealTable ideal;
  Tokenizer bpe;
  Tokenizer wordpiece;
  Tokenizer unigram;
  int[] outIds = new int[1 << 16];
  int[] outStarts = new int[1 << 16];
  int[] outEnds = new int[1 << 16];
  int count;
  String current;
  final PieceSink idealSink = (a, b) -> {
    int at = ideal.emit(current, a, b, outIds, outStarts, outEnds, count);
    if (at < 0) {
      throw new IllegalStateException("piece [" + a + ", " + b + ") is missing from the ideal table");
    }
    count = at;
  };

  @Setup
  public void setup() {
    bodies = Corpus.bodies();
    bodyBytes = new ArrayList<>(bodies.size());
    for (String s : bodies) {
      bodyBytes.add(s.getBytes(StandardCharsets.UTF_8));
    }
    rules = Models.pipeline().splitting();
    ideal = IdealTable.build(bodies, rules, Models.bpeSegmenter());
    bpe = Models.with(Models.pipeline(), Models.bpeSegmenter());
    wordpiece = Models.with(Models.pipeline(), Models.wordpieceSegmenter());
    unigram = Models.unigram();
  }

  /** {@code ideal_table}: split, then every piece's tokens copied from the precomputed table. */
  @Benchmark
  public int idealTable() {
    int total = 0;
    for (String s : bodies) {
      current = s;
      count = 0;
      rules.split(s, 0, s.length(), idealSink);
      total += count;
    }
    return total;
  }

  /** {@code bpe_utf8_in}: every body from its UTF-8 bytes. */
  @Benchmark
  public void bpeBytes(Blackhole bh) {
    for (byte[] b : bodyBytes) {
      bh.consume(bpe.encodeUtf8(b, 0, b.length, Trust.UNTRUSTED, Decoding.REPLACE));
    }
  }

  /** {@code fresh_threads_bpe}. */
  @Benchmark
  public void freshThreadsBpe(Blackhole bh) throws InterruptedException {
    freshThreads(bpe, bh);
  }

  /** {@code fresh_threads_wordpiece}. */
  @Benchmark
  public void freshThreadsWordpiece(Blackhole bh) throws InterruptedException {
    freshThreads(wordpiece, bh);
  }

  /** {@code fresh_threads_unigram}. */
  @Benchmark
  public void freshThreadsUnigram(Blackhole bh) throws InterruptedException {
    freshThreads(unigram, bh);
  }

  private void freshThreads(Tokenizer t, Blackhole bh) throws InterruptedException {
    final List<String> in = bodies;
    for (int from = 0; from < in.size(); from += BODIES_PER_THREAD) {
      int a = from;
      int b = Math.min(in.size(), from + BODIES_PER_THREAD);
      Thread th = new Thread(() -> {
        for (int i = a; i < b; i++) {
          bh.consume(t.encode(in.get(i)));
        }
      });
      th.start();
      th.join();
    }
  }
}
