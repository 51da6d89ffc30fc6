package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Tokenizer;
import java.util.List;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Future;
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
 * {@code vthreads_<scheme>}: {@value #THREADS} virtual threads, each encoding its slice of the
 * Europarl bodies (one operation = all bodies), against {@code vthreads_base_<scheme>}, the same
 * bodies through {@code encodeAll} on 2 platform threads in the same JVM. Virtual threads exist from Java 21 on, while the
 * library and this jar are compiled for Java 17, so the executor is found by reflection and the
 * summary runs this class in a fork on a JDK 21+ ({@code --vthreads-jvm}, which
 * {@code tokenize-bench/summary.sh} sets to the newest JDK it finds under {@code /usr/lib/jvm}); on
 * an older JDK setup fails with a message saying so.
 *
 * <p>Run alone with {@code java -jar tokenize-bench/target/morsel-bench.jar --jmh
 * VirtualThreadBenchmarks -jvm /usr/lib/jvm/temurin-25-jdk-amd64/bin/java}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgsAppend = {"-Xms2g", "-Xmx2g"})
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
public class VirtualThreadBenchmarks {
  /** Virtual threads per operation. */
  static final int THREADS = 10_000;

  List<String> bodies;
  Tokenizer bpe;
  Tokenizer wordpiece;
  Tokenizer unigram;
  java.lang.reflect.Method perTask;
  ExecutorService two;

  @Setup
  public void setup() {
    try {
      perTask = java.util.concurrent.Executors.class.getMethod("newVirtualThreadPerTaskExecutor");
    } catch (NoSuchMethodException e) {
      throw new IllegalStateException("virtual threads need Java 21 or later; this JVM is "
          + System.getProperty("java.version") + " (run this benchmark with -jvm pointing at a newer JDK)", e);
    }
    bodies = Corpus.bodies();
    two = java.util.concurrent.Executors.newFixedThreadPool(2);
    bpe = Models.with(Models.pipeline(), Models.bpeSegmenter());
    wordpiece = Models.with(Models.pipeline(), Models.wordpieceSegmenter());
    unigram = Models.unigram();
  }

  /** {@code vthreads_bpe}. */
  @Benchmark
  public void bpe(Blackhole bh) throws Exception {
    run(bpe, bh);
  }

  /** {@code vthreads_wordpiece}. */
  @Benchmark
  public void wordpiece(Blackhole bh) throws Exception {
    run(wordpiece, bh);
  }

  /** {@code vthreads_unigram}. */
  @Benchmark
  public void unigram(Blackhole bh) throws Exception {
    run(unigram, bh);
  }

  /** {@code vthreads_base_bpe}: the same work on 2 platform threads in the same JVM. */
  @Benchmark
  public Object bpeBase() {
    return bpe.encodeAll(bodies, dev.morsel.tokenize.Trust.UNTRUSTED, two);
  }

  /** {@code vthreads_base_wordpiece}. */
  @Benchmark
  public Object wordpieceBase() {
    return wordpiece.encodeAll(bodies, dev.morsel.tokenize.Trust.UNTRUSTED, two);
  }

  /** {@code vthreads_base_unigram}. */
  @Benchmark
  public Object unigramBase() {
    return unigram.encodeAll(bodies, dev.morsel.tokenize.Trust.UNTRUSTED, two);
  }

  @org.openjdk.jmh.annotations.TearDown
  public void tearDown() {
    two.shutdown();
  }

  private void run(Tokenizer t, Blackhole bh) throws Exception {
    final List<String> in = bodies;
    int n = in.size();
    Future<?>[] fs = new Future<?>[THREADS];
    ExecutorService ex = (ExecutorService) perTask.invoke(null);
    try {
      for (int w = 0; w < THREADS; w++) {
        int a = (int) ((long) n * w / THREADS);
        int b = (int) ((long) n * (w + 1) / THREADS);
        fs[w] = ex.submit(() -> {
          for (int i = a; i < b; i++) {
            bh.consume(t.encode(in.get(i)));
          }
        });
      }
      for (Future<?> f : fs) {
        f.get();
      }
    } finally {
      ex.shutdown();
    }
  }
}
