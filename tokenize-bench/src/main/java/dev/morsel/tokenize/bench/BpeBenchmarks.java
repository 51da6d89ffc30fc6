package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.bpe.Bpe;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
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
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;
import org.openjdk.jmh.infra.Blackhole;

/**
 * Byte-level BPE with the 32k vocabulary trained on the whole Europarl body corpus ({@link Models}):
 * encoding with and without the piece cache, the textbook encoder as the naive baseline (on the first
 * 1 MB of bodies, since it is quadratic per piece), adversarial input (1 MiB and 100 KiB of letters with
 * no spaces and splitting off) against 1 MiB of prose, and batch encoding on 1 and 2 threads.
 *
 * <p>Run with {@code tokenize-bench/summary.sh}, or alone with
 * {@code java -jar tokenize-bench/target/morsel-bench.jar --jmh BpeBenchmarks}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgsAppend = {"-Xms2g", "-Xmx2g"})
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
public class BpeBenchmarks {
  /** Bytes of prose given to the textbook encoder per operation. */
  static final int TEXTBOOK_BYTES = 1_000_000;

  List<String> bodies;
  Tokenizer cached;
  Tokenizer uncached;
  Tokenizer unsplit;
  TextbookBpe textbook;
  List<String> textbookPieces;
  String adversarial1m;
  String adversarial100k;
  String prose1m;
  ExecutorService one;
  ExecutorService two;

  @Setup
  public void setup() {
    bodies = Corpus.bodies();
    Tokenizer bpe = Models.bpe();
    cached = Models.with(Models.pipeline(), bpe);
    uncached = Bpe.withCacheEntries(cached, 0);
    unsplit = Models.with(Models.unsplit(), bpe);
    textbook = new TextbookBpe(bpe);
    textbookPieces = pieces(Corpus.prefix(TEXTBOOK_BYTES));
    adversarial1m = Corpus.adversarial(1 << 20, 1);
    adversarial100k = Corpus.adversarial(100 << 10, 1);
    prose1m = Corpus.prose(1 << 20);
    one = Executors.newFixedThreadPool(1);
    two = Executors.newFixedThreadPool(2);
  }

  @TearDown
  public void tearDown() {
    one.shutdown();
    two.shutdown();
  }

  static List<String> pieces(List<String> texts) {
    List<String> out = new ArrayList<>();
    for (String t : texts) {
      Models.pipeline().splitting().split(t, 0, t.length(), (a, b) -> out.add(t.substring(a, b)));
    }
    return out;
  }

  /** {@code bpe_encode}: every body, cache on. */
  @Benchmark
  public void encode(Blackhole bh) {
    for (String s : bodies) {
      bh.consume(cached.encode(s));
    }
  }

  /** {@code bpe_encode_nocache}: every body, cache off. */
  @Benchmark
  public void encodeNoCache(Blackhole bh) {
    for (String s : bodies) {
      bh.consume(uncached.encode(s));
    }
  }

  /** {@code bpe_textbook}: the textbook encoder on the pieces of the first 1 MB of bodies. */
  @Benchmark
  public void textbook(Blackhole bh) {
    for (String p : textbookPieces) {
      bh.consume(textbook.encode(p));
    }
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

  /** 1 MiB of prose as one text, splitting on. */
  @Benchmark
  public Object prose1m() {
    return cached.encode(prose1m);
  }

  /** {@code batch_1thread}: every body through encodeAll on one thread. */
  @Benchmark
  public Object batch1() {
    return cached.encodeAll(bodies, Trust.UNTRUSTED, one);
  }

  /** {@code batch_2threads}: every body through encodeAll on two threads. */
  @Benchmark
  public Object batch2() {
    return cached.encodeAll(bodies, Trust.UNTRUSTED, two);
  }
}
