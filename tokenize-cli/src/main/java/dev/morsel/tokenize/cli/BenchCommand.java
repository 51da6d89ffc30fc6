package dev.morsel.tokenize.cli;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.atomic.AtomicLong;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code morsel bench}: measures encoding with the user's model on the user's text before deployment.
 * Harness: each thread count is warmed up until the rate is stable ({@link Steady}: three
 * consecutive passes over the whole corpus within {@code --stable-within}, after at least {@code
 * --warmup} seconds, giving up after {@code --max-warmup} seconds and saying so), then {@code
 * --rounds} timed passes; throughput is the median pass, latency percentiles come from every text of
 * every timed pass (System.nanoTime around each encode). The warm-up used is printed with the results.
 */
@Command(name = "bench", mixinStandardHelpOptions = true, separator = " ",
    description = "Benchmark encoding with your model on your text for 1..N threads: MB/s, tokens/s, and per-text"
        + " latency p50/p99/max, measured after a warm-up that lasts until the rate is stable.",
    footer = {"", "Examples:", "  morsel bench --model ferry.morsel --threads 2 messages.txt",
        "  morsel bench --model ferry.morsel --json messages.txt > bench.json"})
final class BenchCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Option(names = {"-m", "--model"}, required = true, paramLabel = "FILE", description = "The model file.")
  Path model;

  @Parameters(paramLabel = "CORPUS", arity = "1..*", description = "Files, folders or globs (one text a line).")
  List<String> corpus = new ArrayList<>();

  @Option(names = "--threads", paramLabel = "N", defaultValue = "2", description = "Measure 1 up to this many threads (default: ${DEFAULT-VALUE}).")
  int threads;

  @Option(names = "--warmup", paramLabel = "SECONDS", defaultValue = "1",
      description = "Least warm-up per thread count; the warm-up goes on until the rate is stable (default: ${DEFAULT-VALUE}).")
  double warmup;

  @Option(names = "--stable-within", paramLabel = "PERCENT", defaultValue = "5",
      description = "Stable: 3 consecutive warm-up passes whose rates differ by at most this (default: ${DEFAULT-VALUE}).")
  double stableWithin;

  @Option(names = "--max-warmup", paramLabel = "SECONDS", defaultValue = "60",
      description = "Most warm-up per thread count; past it the results are marked not stable (default: ${DEFAULT-VALUE}).")
  double maxWarmup;

  @Option(names = "--rounds", paramLabel = "N", defaultValue = "5", description = "Timed passes per thread count (default: ${DEFAULT-VALUE}).")
  int rounds;

  @picocli.CommandLine.Mixin
  Corpus.BadUtf8 badUtf8;

  private final List<Steady.Warmup> warmups = new ArrayList<>();

  @Option(names = "--json", description = "Print the results as one JSON object.")
  boolean json;

  @Override
  public Integer call() throws Exception {
    if (threads < 1 || rounds < 1 || warmup < 0 || maxWarmup < warmup || stableWithin <= 0) {
      throw new Morsel.UsageException("--threads and --rounds must be at least 1, --warmup not negative, --max-warmup at"
          + " least --warmup, and --stable-within positive");
    }
    Tokenizer t = Tokenizers.load(model);
    List<String> texts = new ArrayList<>();
    for (List<String> g : SweepCommand.read(Inputs.expand(corpus), badUtf8.policy(), spec.commandLine().getErr(), "bench")
        .values()) {
      texts.addAll(g);
    }
    if (texts.isEmpty()) {
      throw new IllegalArgumentException("the corpus " + corpus + " holds no text");
    }
    long bytes = 0;
    for (String s : texts) {
      bytes += s.getBytes(StandardCharsets.UTF_8).length;
    }
    List<double[]> results = new ArrayList<>();
    for (int n = 1; n <= threads; n++) {
      results.add(measure(t, texts, n, bytes));
    }
    PrintWriter o = spec.commandLine().getOut();
    if (json) {
      StringWriter w = new StringWriter();
      try (JsonGenerator g = new JsonFactory().createGenerator(w)) {
        g.writeStartObject();
        g.writeStringField("model", model.toString());
        g.writeStringField("fingerprint", t.fingerprint());
        g.writeNumberField("texts", texts.size());
        g.writeNumberField("bytes", bytes);
        g.writeArrayFieldStart("runs");
        for (int i = 0; i < results.size(); i++) {
          double[] r = results.get(i);
          g.writeStartObject();
          g.writeNumberField("threads", i + 1);
          g.writeNumberField("mb_per_s", r[0]);
          g.writeNumberField("tokens_per_s", r[1]);
          g.writeNumberField("latency_p50_us", r[2]);
          g.writeNumberField("latency_p99_us", r[3]);
          g.writeNumberField("latency_max_us", r[4]);
          g.writeNumberField("warmup_passes", warmups.get(i).passes());
          g.writeNumberField("warmup_seconds", warmups.get(i).seconds());
          g.writeBooleanField("stable", warmups.get(i).stable());
          g.writeEndObject();
        }
        g.writeEndArray();
        g.writeEndObject();
      }
      o.println(w);
    } else {
      o.printf(Locale.ROOT, "%s on %,d texts (%,d bytes); after the warm-up, %d timed passes per thread count (median)%n",
          t.scheme(), texts.size(), bytes, rounds);
      o.printf(Locale.ROOT, "%7s %10s %14s %10s %10s %10s  %s%n", "threads", "MB/s", "tokens/s", "p50 µs", "p99 µs", "max µs",
          "warm-up");
      for (int i = 0; i < results.size(); i++) {
        double[] r = results.get(i);
        Steady.Warmup w = warmups.get(i);
        o.printf(Locale.ROOT, "%7d %10.2f %,14.0f %,10.1f %,10.1f %,10.1f  %d passes, %.1f s%s%n", i + 1, r[0], r[1], r[2],
            r[3], r[4], w.passes(), w.seconds(), w.stable() ? "" : " (NOT stable)");
      }
      o.printf(Locale.ROOT, "warm-up: until %d consecutive passes agreed within %s%% (at least %s s, at most %s s)%n",
          Steady.WINDOW, trim(stableWithin), trim(warmup), trim(maxWarmup));
    }
    o.flush();
    return 0;
  }

  /** {MB/s, tokens/s, p50 µs, p99 µs, max µs} for {@code n} threads sharing the texts. */
  private double[] measure(Tokenizer t, List<String> texts, int n, long bytes) throws InterruptedException {
    warmups.add(Steady.warmUp(() -> {
      long t0 = System.nanoTime();
      try {
        pass(t, texts, n, null);
      } catch (InterruptedException e) {
        Thread.currentThread().interrupt();
        throw new IllegalStateException("interrupted", e);
      }
      return bytes / 1e6 / Math.max(1, System.nanoTime() - t0) * 1e9;
    }, stableWithin / 100, (long) (warmup * 1e9), (long) (maxWarmup * 1e9)));
    long[] passNanos = new long[rounds];
    long[] latencies = new long[texts.size() * rounds];
    long tokens = 0;
    for (int r = 0; r < rounds; r++) {
      long[] lat = new long[texts.size()];
      long t0 = System.nanoTime();
      tokens = pass(t, texts, n, lat);
      passNanos[r] = System.nanoTime() - t0;
      System.arraycopy(lat, 0, latencies, r * texts.size(), lat.length);
    }
    Arrays.sort(passNanos);
    Arrays.sort(latencies);
    double median = passNanos[rounds / 2] / 1e9;
    return new double[] {bytes / 1e6 / median, tokens / median, latencies[latencies.length / 2] / 1e3,
        latencies[(int) Math.min(latencies.length - 1, Math.ceil(latencies.length * 0.99) - 1)] / 1e3,
        latencies[latencies.length - 1] / 1e3};
  }

  private static String trim(double v) {
    return v == Math.rint(v) ? Long.toString((long) v) : Double.toString(v);
  }

  private static long pass(Tokenizer t, List<String> texts, int n, long[] lat) throws InterruptedException {
    AtomicLong next = new AtomicLong();
    AtomicLong tokens = new AtomicLong();
    CountDownLatch done = new CountDownLatch(n);
    for (int k = 0; k < n; k++) {
      Thread th = new Thread(() -> {
        long local = 0;
        for (long i; (i = next.getAndIncrement()) < texts.size(); ) {
          long t0 = System.nanoTime();
          local += t.encode(texts.get((int) i)).size();
          if (lat != null) {
            lat[(int) i] = System.nanoTime() - t0;
          }
        }
        tokens.addAndGet(local);
        done.countDown();
      }, "morsel-bench-" + k);
      th.start();
    }
    done.await();
    return tokens.get();
  }

}
