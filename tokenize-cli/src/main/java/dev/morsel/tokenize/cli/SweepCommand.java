package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.train.Utf8Lines;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code morsel sweep}: choose a scheme and a vocabulary size by measuring them. */
@Command(name = "sweep", mixinStandardHelpOptions = true, separator = " ",
    description = "Train each scheme at each vocabulary size on a corpus, encode a held-out part, and report tokens per"
        + " word, tokens per 1,000 characters, bytes per token, unknown tokens per 1,000 characters, vocabulary used and"
        + " encode speed, per input file and overall, as CSV and as an HTML report with charts. A size a scheme cannot"
        + " reach on the corpus is recorded as not feasible, with the reason, and the sweep goes on.",
    footer = {"", "Examples:", "  morsel sweep --sizes 1000,4000,16000 --out sweep morsel-demo/corpus/*.txt",
        "  morsel sweep --schemes bpe --held-out-every 5 --out sweep corpus/"})
final class SweepCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Parameters(paramLabel = "CORPUS", arity = "1..*", description = "Files, folders or globs; each file is one group in the report.")
  List<String> corpus = new ArrayList<>();

  @Option(names = "--schemes", paramLabel = "NAME,...", split = ",", description = "Schemes to compare (default: all).")
  List<String> schemes = new ArrayList<>(Schemes.NAMES);

  @Option(names = "--sizes", paramLabel = "N,...", split = ",", defaultValue = "1000,2000,4000,8000",
      description = "Vocabulary sizes (default: ${DEFAULT-VALUE}).")
  List<Integer> sizes;

  @Option(names = "--held-out-every", paramLabel = "N", defaultValue = "10",
      description = "Hold out every N-th line of each file for measuring; train on the rest (default: ${DEFAULT-VALUE}).")
  int every;

  @Option(names = "--option", paramLabel = "[SCHEME:]NAME=VALUE",
      description = "A scheme option, for every swept scheme or, with SCHEME:, for one (repeatable), for example wordpiece:max-alphabet=300; 'morsel schemes' lists them.")
  List<String> options = new ArrayList<>();

  @Option(names = "--normalize", paramLabel = "SPEC", defaultValue = "nfc",
      description = "Normalization: none, nfc, nfd, nfkc or nfkd, optionally +casefold (default: ${DEFAULT-VALUE}).")
  String normalize;

  @Option(names = "--split", paramLabel = "SPEC", defaultValue = "runs:space=next,digits=whole",
      description = "Splitting: runs:space=own|next|previous,digits=whole|1..64, words, whitespace or none (default: ${DEFAULT-VALUE}).")
  String split;

  @Option(names = "--threads", paramLabel = "N", description = "Threads for counting and training (default: all cores).")
  int threads = Runtime.getRuntime().availableProcessors();

  @Option(names = "--max-warmup", paramLabel = "SECONDS", defaultValue = "20",
      description = "Most warm-up per cell before its encode speed is measured; a speed measured after giving up is marked NOT stable (default: ${DEFAULT-VALUE}).")
  double maxWarmup;

  @Option(names = {"-o", "--out"}, required = true, paramLabel = "DIR", description = "Folder for sweep.csv and sweep.html.")
  Path out;

  @Mixin
  Corpus.BadUtf8 badUtf8;

  @Override
  public Integer call() throws Exception {
    for (String s : schemes) {
      Schemes.check(s);
    }
    for (int size : sizes) {
      if (size <= 0) {
        throw new Morsel.UsageException("--sizes must be positive, got " + size);
      }
    }
    if (every < 2) {
      throw new Morsel.UsageException("--held-out-every must be at least 2, got " + every);
    }
    if (threads <= 0) {
      throw new Morsel.UsageException("--threads must be positive, got " + threads);
    }
    if (maxWarmup < 0) {
      throw new Morsel.UsageException("--max-warmup must not be negative, got " + maxWarmup);
    }
    for (String s : schemes) {
      Schemes.optionsOf(s, options); // malformed options fail now, before reading
    }
    Pipeline pipeline = TrainCommand.pipeline(normalize, split);
    List<Path> files = Inputs.expand(corpus);
    Map<String, List<String>> groups = read(files, badUtf8.policy(), spec.commandLine().getErr(), "sweep");
    List<Sweep.Row> rows;
    List<Sweep.ScriptRow> scripts = new java.util.ArrayList<>();
    try (Progress progress = Progress.onTerminal()) {
      rows = Sweep.run(groups, every, pipeline, schemes, sizes, options, threads, progress, spec.commandLine().getErr(),
          (long) (maxWarmup * 1e9), scripts);
    }
    Report.Meta meta = Report.Meta.of(files, every, pipeline, options.isEmpty() ? "defaults" : String.join(" ", options));
    write(rows, scripts, out, "Vocabulary sweep", meta, spec.commandLine().getOut(), "sweep");
    return 0;
  }

  /** Reads every file's non-blank lines; a group per file, named by its file name (made unique). */
  static Map<String, List<String>> read(List<Path> files, Utf8Lines.Malformed policy, PrintWriter err, String command) {
    Map<String, List<String>> groups = new LinkedHashMap<>();
    for (Path p : files) {
      List<String> lines = new ArrayList<>();
      try (Utf8Lines r = Corpus.open(List.of(p), policy)) {
        while (r.hasNext()) {
          String line = r.next();
          if (!line.isBlank()) {
            lines.add(line);
          }
        }
        Corpus.summary(err, command, r.malformedLines(), policy);
      }
      String name = p.getFileName().toString();
      String unique = name;
      for (int k = 2; groups.containsKey(unique); k++) {
        unique = name + " (" + k + ")";
      }
      groups.put(unique, lines);
    }
    return groups;
  }

  /**
   * Writes {@code NAME.csv}, {@code NAME-scripts.csv} and {@code NAME.html} into {@code dir} and a
   * summary of the overall rows on {@code o}.
   */
  static void write(List<Sweep.Row> rows, List<Sweep.ScriptRow> scripts, Path dir, String title, Report.Meta meta,
      PrintWriter o, String name) throws java.io.IOException {
    Files.createDirectories(dir);
    Report.csv(rows, dir.resolve(name + ".csv"));
    Report.scriptsCsv(scripts, dir.resolve(name + "-scripts.csv"));
    Report.html(rows, scripts, dir.resolve(name + ".html"), title, meta);
    int width = 10;
    for (Sweep.Row r : rows) {
      width = Math.max(width, r.scheme().length());
    }
    o.printf(Locale.ROOT, "%-" + width + "s %9s %11s %12s %14s %9s%n", "scheme", "vocab", "tokens/word", "bytes/token",
        "unknown/1k ch", "MB/s");
    for (Sweep.Row r : rows) {
      if (r.group().equals(Sweep.ALL)) {
        if (r.feasible()) {
          o.printf(Locale.ROOT, "%-" + width + "s %,9d %11.3f %12.2f %14.3f %9.1f%n", r.scheme(), r.vocabularySize(), r.tokensPerWord(),
              r.bytesPerToken(), r.unknownPer1000Chars(), r.mbPerSecond());
        } else {
          o.printf(Locale.ROOT, "%-" + width + "s %,9d   not feasible (see the report)%n", r.scheme(), r.requestedSize());
        }
      }
    }
    o.println("encode speed: one thread, median of " + Sweep.TIMED_ROUNDS + " rounds of at least 50 ms after a warm-up"
        + " until " + Steady.WINDOW + " consecutive rounds agree within 5%");
    o.println("wrote " + dir.resolve(name + ".csv") + ", " + dir.resolve(name + "-scripts.csv") + " and "
        + dir.resolve(name + ".html"));
  }
}
