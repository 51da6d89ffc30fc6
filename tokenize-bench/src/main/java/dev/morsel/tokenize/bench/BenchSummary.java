package dev.morsel.tokenize.bench;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.Paths;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collection;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.results.RunResult;
import org.openjdk.jmh.runner.Runner;
import org.openjdk.jmh.runner.RunnerException;
import org.openjdk.jmh.runner.options.ChainedOptionsBuilder;
import org.openjdk.jmh.runner.options.OptionsBuilder;
import org.openjdk.jmh.runner.options.TimeValue;

/**
 * Runs the benchmarks and writes {@code bench-summary.json}:
 * {@code {"corpus_bytes": N, "figures": {name: MB/s or seconds}, "ratios": {name: x}}}.
 *
 * <p>Usage: {@code java -jar morsel-bench.jar [--out FILE] [--only REGEX]}, or
 * {@code java -jar morsel-bench.jar --jmh ARGS...} to run JMH's own command line. The documented
 * command is {@code tokenize-bench/summary.sh}, which builds the jar and runs this.
 *
 * <p>Figures: each JMH benchmark's average time per operation is turned into MB/s with the UTF-8
 * size of the input one operation processes ({@link Figure#bytes}); figures whose name ends in
 * {@code _s} are seconds for one operation, and those ending in {@code _ms} milliseconds. Settings are short enough for 2 cores (one fork, 2
 * warm-up and 3 measured iterations of 1 s each, fixed in the benchmark classes).
 */
public final class BenchSummary {

  /**
   * One figure: a JMH benchmark method, the bytes one of its operations processes (0 = seconds), and
   * the values of the benchmark's {@code @Param} fields ({@code name=value,...}; empty for none).
   */
  record Figure(String name, String benchmark, long bytes, String params) {
    Figure(String name, String benchmark, long bytes) {
      this(name, benchmark, bytes, "");
    }

    /** The benchmark and its parameters: figures with the same key share one JMH run. */
    String key() {
      return params.isEmpty() ? benchmark : benchmark + "?" + params;
    }
  }

  private BenchSummary() {}

  /** The figures, in report order. Segmenter modules add theirs here. */
  static List<Figure> figures() {
    long corpus = Corpus.utf8Bytes(Corpus.bodies());
    List<Figure> f = new ArrayList<>();
    f.add(new Figure("utf8", FloorBenchmarks.class.getName() + ".utf8", corpus));
    f.add(new Figure("normalize_nfkc", FloorBenchmarks.class.getName() + ".normalizeNfkc", corpus));
    f.add(new Figure("split", FloorBenchmarks.class.getName() + ".split", corpus));
    f.add(new Figure("count_pieces", FloorBenchmarks.class.getName() + ".countPieces", corpus));
    String bpe = BpeBenchmarks.class.getName();
    f.add(new Figure("bpe_encode", bpe + ".encode", corpus));
    f.add(new Figure("bpe_encode_nocache", bpe + ".encodeNoCache", corpus));
    f.add(new Figure("bpe_textbook", bpe + ".textbook", Corpus.utf8Bytes(Corpus.prefix(BpeBenchmarks.TEXTBOOK_BYTES))));
    f.add(new Figure("bpe_adversarial_1m_s", bpe + ".adversarial1m", 0));
    f.add(new Figure("bpe_adversarial_100k_s", bpe + ".adversarial100k", 0));
    f.add(new Figure("bpe_prose_1m_s", bpe + ".prose1m", 0));
    f.add(new Figure("batch_1thread", bpe + ".batch1", corpus));
    f.add(new Figure("batch_2threads", bpe + ".batch2", corpus));
    String wp = WordPieceBenchmarks.class.getName();
    f.add(new Figure("wordpiece_encode", wp + ".encode", corpus));
    f.add(new Figure("wordpiece_prose_1m_s", wp + ".prose1m", 0));
    f.add(new Figure("wordpiece_adversarial_1m_s", wp + ".adversarial1m", 0));
    f.add(new Figure("wordpiece_nearmiss_1m_s", wp + ".nearMiss1m", 0));
    f.add(new Figure("wordpiece_nearmiss_100k_s", wp + ".nearMiss100k", 0));
    f.add(new Figure("wordpiece_naive", wp + ".naive1m", 1 << 20));
    f.add(new Figure("wordpiece_naive_1m_s", wp + ".naive1m", 0));
    f.add(new Figure("wordpiece_naive_100k_s", wp + ".naive100k", 0));
    String uni = UnigramBenchmarks.class.getName();
    f.add(new Figure("unigram_encode", uni + ".encode", corpus));
    f.add(new Figure("unigram_prose_1m_s", uni + ".prose1m", 0));
    f.add(new Figure("unigram_adversarial_1m_s", uni + ".adversarial1m", 0));
    f.add(new Figure("unigram_adversarial_100k_s", uni + ".adversarial100k", 0));
    f.add(new Figure("lucene_analyze", LuceneBenchmarks.class.getName() + ".analyze", corpus));
    String eng = EngineBenchmarks.class.getName();
    f.add(new Figure("ideal_table", eng + ".idealTable", corpus));
    f.add(new Figure("bpe_utf8_in", eng + ".bpeBytes", corpus));
    f.add(new Figure("fresh_threads_bpe", eng + ".freshThreadsBpe", corpus));
    f.add(new Figure("fresh_threads_wordpiece", eng + ".freshThreadsWordpiece", corpus));
    f.add(new Figure("fresh_threads_unigram", eng + ".freshThreadsUnigram", corpus));
    String vt = VirtualThreadBenchmarks.class.getName();
    for (String scheme : List.of("bpe", "wordpiece", "unigram")) {
      f.add(new Figure("vthreads_" + scheme, vt + "." + scheme, corpus));
      f.add(new Figure("vthreads_base_" + scheme, vt + "." + scheme + "Base", corpus));
    }
    String adv = AdversarialBenchmarks.class.getName();
    for (String scheme : List.of("bpe", "wordpiece", "unigram")) {
      for (String kind : Corpus.ADVERSARIAL_KINDS) {
        String params = "scheme=" + scheme + ",kind=" + kind;
        f.add(new Figure(scheme + "_adversarial_" + kind + "_1m_s", adv + ".mib1", 0, params));
        f.add(new Figure(scheme + "_adversarial_" + kind + "_100k_s", adv + ".kib100", 0, params));
      }
    }
    String train = TrainingBenchmarks.class.getName();
    f.add(new Figure("count_pieces_s", train + ".countPieces", 0));
    f.add(new Figure("bpe_train_32k_s", train + ".trainBpe32k", 0));
    f.add(new Figure("load_reserved_64k_ms", ModelLoadBenchmarks.class.getName() + ".loadReserved64k", 0));
    return f;
  }

  /** Ratio name → {numerator figure, denominator figure}; MB/s figures divide as throughput. */
  static Map<String, String[]> ratios() {
    Map<String, String[]> r = new LinkedHashMap<>();
    r.put("split_vs_utf8", new String[] {"split", "utf8"});
    r.put("normalize_nfkc_vs_utf8", new String[] {"normalize_nfkc", "utf8"});
    r.put("bpe_vs_split", new String[] {"bpe_encode", "split"});
    r.put("bpe_vs_textbook", new String[] {"bpe_encode", "bpe_textbook"});
    r.put("bpe_cache_gain", new String[] {"bpe_encode", "bpe_encode_nocache"});
    r.put("bpe_adversarial_scale", new String[] {"bpe_adversarial_1m_s", "bpe_adversarial_100k_s"});
    r.put("bpe_adversarial_vs_prose", new String[] {"bpe_adversarial_1m_s", "bpe_prose_1m_s"});
    r.put("batch_2_vs_1", new String[] {"batch_2threads", "batch_1thread"});
    r.put("wordpiece_vs_split", new String[] {"wordpiece_encode", "split"});
    r.put("wordpiece_adversarial_scale", new String[] {"wordpiece_nearmiss_1m_s", "wordpiece_nearmiss_100k_s"});
    r.put("wordpiece_adversarial_vs_prose", new String[] {"wordpiece_adversarial_1m_s", "wordpiece_prose_1m_s"});
    r.put("wordpiece_naive_adversarial_scale", new String[] {"wordpiece_naive_1m_s", "wordpiece_naive_100k_s"});
    r.put("wordpiece_nearmiss_naive_vs_linmaxmatch", new String[] {"wordpiece_naive_1m_s", "wordpiece_nearmiss_1m_s"});
    r.put("unigram_vs_split", new String[] {"unigram_encode", "split"});
    r.put("unigram_adversarial_scale", new String[] {"unigram_adversarial_1m_s", "unigram_adversarial_100k_s"});
    r.put("unigram_adversarial_vs_prose", new String[] {"unigram_adversarial_1m_s", "unigram_prose_1m_s"});
    r.put("lucene_vs_bpe", new String[] {"lucene_analyze", "bpe_encode"});
    r.put("bpe_train_vs_count", new String[] {"bpe_train_32k_s", "count_pieces_s"});
    r.put("bpe_vs_ideal", new String[] {"bpe_encode", "ideal_table"});
    r.put("wordpiece_vs_ideal", new String[] {"wordpiece_encode", "ideal_table"});
    r.put("unigram_vs_ideal", new String[] {"unigram_encode", "ideal_table"});
    r.put("ideal_vs_split", new String[] {"ideal_table", "split"});
    r.put("bytes_vs_string_bpe", new String[] {"bpe_utf8_in", "bpe_encode"});
    r.put("fresh_threads_bpe_vs_1thread", new String[] {"fresh_threads_bpe", "batch_1thread"});
    r.put("fresh_threads_wordpiece_vs_1thread", new String[] {"fresh_threads_wordpiece", "wordpiece_encode"});
    r.put("fresh_threads_unigram_vs_1thread", new String[] {"fresh_threads_unigram", "unigram_encode"});
    for (String scheme : List.of("bpe", "wordpiece", "unigram")) {
      r.put("vthreads_" + scheme + "_vs_2threads", new String[] {"vthreads_" + scheme, "vthreads_base_" + scheme});
    }
    for (String scheme : List.of("bpe", "wordpiece", "unigram")) {
      for (String kind : Corpus.ADVERSARIAL_KINDS) {
        String stem = scheme + "_adversarial_" + kind;
        r.put(stem + "_scale", new String[] {stem + "_1m_s", stem + "_100k_s"});
      }
    }
    return r;
  }

  /** Entry point. */
  public static void main(String[] args) throws RunnerException {
    if (args.length > 0 && args[0].equals("--jmh")) {
      try {
        org.openjdk.jmh.Main.main(Arrays.copyOfRange(args, 1, args.length));
      } catch (IOException e) {
        throw new UncheckedIOException(e);
      }
      return;
    }
    Path out = Paths.get("tokenize-bench/target/bench-summary.json");
    String only = ".*";
    String vthreadsJvm = null;
    for (int i = 0; i < args.length; i++) {
      switch (args[i]) {
        case "--out":
          out = Paths.get(args[++i]);
          break;
        case "--only":
          only = args[++i];
          break;
        case "--vthreads-jvm":
          vthreadsJvm = args[++i];
          break;
        default:
          System.err.println("unknown option " + args[i] + "; usage: [--out FILE] [--only REGEX] [--vthreads-jvm JAVA] | --jmh ARGS...");
          System.exit(2);
      }
    }
    long corpusBytes = Corpus.utf8Bytes(Corpus.bodies());
    Map<String, Double> values = new LinkedHashMap<>();
    Map<String, Double> secondsByBenchmark = new LinkedHashMap<>();
    boolean needsModels = false;
    for (Figure f : figures()) {
      needsModels |= f.name().matches(only) && !f.benchmark().startsWith(ModelLoadBenchmarks.class.getName());
    }
    if (needsModels) { // the load benchmark builds its own model
      Models.bpeFile(); // train the benchmark models once, before any fork needs them
      Models.wordpieceFile();
      Models.unigramFile();
    }
    Map<String, String> notes = new LinkedHashMap<>();
    for (Figure f : figures()) {
      if (!f.name().matches(only)) {
        continue;
      }
      boolean virtual = f.benchmark().startsWith(VirtualThreadBenchmarks.class.getName() + ".");
      if (virtual && vthreadsJvm == null) {
        notes.put(f.name(), "skipped: no JDK 21+ found for virtual threads (pass --vthreads-jvm JAVA)");
        System.out.printf(Locale.ROOT, "%-32s %12s%n", f.name(), "skipped (no JDK 21+)");
        continue;
      }
      Double known = secondsByBenchmark.get(f.key());
      if (known != null) {
        double value = value(f, known);
        values.put(f.name(), value);
        System.out.printf(Locale.ROOT, "%-32s %12.3f %s%n", f.name(), value, unit(f));
        continue;
      }
      ChainedOptionsBuilder o = new OptionsBuilder().include("^" + f.benchmark().replace(".", "\\.") + "$")
          .shouldFailOnError(true);
      if (!f.params().isEmpty()) {
        for (String kv : f.params().split(",")) {
          int eq = kv.indexOf('=');
          o = o.param(kv.substring(0, eq), kv.substring(eq + 1));
        }
      }
      if (virtual) {
        o = o.jvm(vthreadsJvm);
        notes.putIfAbsent("vthreads", "virtual-thread figures ran on " + vthreadsJvm);
      }
      Collection<RunResult> results = new Runner(o.build()).run();
      for (RunResult rr : results) {
        double score = rr.getPrimaryResult().getScore();
        TimeUnit unit = rr.getParams().getTimeUnit();
        double seconds = score * unit.toNanos(1) / 1e9; // seconds per operation
        secondsByBenchmark.put(f.key(), seconds);
        double value = value(f, seconds);
        values.put(f.name(), value);
        System.out.printf(Locale.ROOT, "%-32s %12.3f %s%n", f.name(), value, unit(f));
      }
    }
    for (Map.Entry<String, java.util.function.Supplier<Double>> p : probes().entrySet()) {
      if (p.getKey().matches(only)) {
        double value = p.getValue().get();
        values.put(p.getKey(), value);
        System.out.printf(Locale.ROOT, "%-32s %12.3f %s%n", p.getKey(), value, unit(p.getKey()));
      }
    }
    Map<String, Double> ratioValues = new LinkedHashMap<>();
    for (Map.Entry<String, String[]> e : ratios().entrySet()) {
      Double a = values.get(e.getValue()[0]);
      Double b = values.get(e.getValue()[1]);
      if (a != null && b != null) {
        ratioValues.put(e.getKey(), a / b);
      }
    }
    write(out, corpusBytes, values, ratioValues, notes);
    System.out.println("wrote " + out.toAbsolutePath());
  }

  /** A figure's value from the seconds one operation takes: MB/s, seconds, or milliseconds for {@code _ms} names. */
  static double value(Figure f, double seconds) {
    if (f.bytes() != 0) {
      return f.bytes() / 1e6 / seconds;
    }
    return f.name().endsWith("_ms") ? seconds * 1e3 : seconds;
  }

  private static String unit(Figure f) {
    return f.bytes() != 0 ? "MB/s" : unit(f.name());
  }

  /**
   * Figures measured in this JVM, not by JMH (they count bytes): first encode on a fresh thread, heap
   * retained per model reload (see {@link MemoryProbes}).
   */
  static Map<String, java.util.function.Supplier<Double>> probes() {
    Map<String, java.util.function.Supplier<Double>> p = new LinkedHashMap<>();
    p.put("first_encode_bytes_bpe", () -> MemoryProbes.firstEncodeBytes(Models.with(Models.pipeline(), Models.bpe())));
    p.put("first_encode_bytes_wordpiece", () -> MemoryProbes.firstEncodeBytes(Models.with(Models.pipeline(), Models.wordpiece())));
    p.put("first_encode_bytes_unigram", () -> MemoryProbes.firstEncodeBytes(Models.with(Models.pipeline(), Models.unigram())));
    p.put("reload_retained_kib", () -> MemoryProbes.reloadRetainedKib(Models.bpeFile()));
    return p;
  }

  /** The unit of a figure, from its name's suffix. */
  static String unit(String name) {
    return name.endsWith("_s") ? "s" : name.endsWith("_ms") ? "ms" : name.startsWith("first_encode_bytes_") ? "bytes"
        : name.endsWith("_kib") ? "KiB" : "MB/s";
  }

  static void write(Path out, long corpusBytes, Map<String, Double> figures, Map<String, Double> ratios,
      Map<String, String> notes) {
    StringBuilder sb = new StringBuilder();
    sb.append("{\n  \"corpus_bytes\": ").append(corpusBytes).append(",\n  \"figures\": {");
    appendMap(sb, figures);
    sb.append("},\n  \"ratios\": {");
    appendMap(sb, ratios);
    sb.append("},\n  \"notes\": {");
    boolean first = true;
    for (Map.Entry<String, String> e : notes.entrySet()) {
      sb.append(first ? "\n" : ",\n").append("    \"").append(e.getKey()).append("\": \"")
          .append(e.getValue().replace("\\", "\\\\").replace("\"", "\\\"")).append('"');
      first = false;
    }
    sb.append(first ? "" : "\n  ").append("}\n}\n");
    try {
      Path parent = out.toAbsolutePath().getParent();
      if (parent != null) {
        Files.createDirectories(parent);
      }
      Files.write(out, sb.toString().getBytes(StandardCharsets.UTF_8));
    } catch (IOException e) {
      throw new UncheckedIOException("cannot write " + out, e);
    }
  }

  private static void appendMap(StringBuilder sb, Map<String, Double> m) {
    boolean first = true;
    for (Map.Entry<String, Double> e : m.entrySet()) {
      sb.append(first ? "\n" : ",\n").append("    \"").append(e.getKey()).append("\": ")
          .append(String.format(Locale.ROOT, "%.4f", e.getValue()));
      first = false;
    }
    sb.append(first ? "" : "\n  ");
  }
}
