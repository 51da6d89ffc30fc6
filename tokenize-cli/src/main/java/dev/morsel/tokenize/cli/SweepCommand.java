package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Pipeline;
import java.io.BufferedReader;
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
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code morsel sweep}: choose a scheme and a vocabulary size by measuring them. */
@Command(name = "sweep", mixinStandardHelpOptions = true,
    description = "Train each scheme at each vocabulary size on a corpus, encode a held-out part, and report tokens per"
        + " word, tokens per 1,000 characters, bytes per token, unknown rate, vocabulary used and encode speed, per"
        + " input file and overall, as CSV and as an HTML report with charts.",
    footer = {"", "Examples:", "  morsel sweep --sizes 1000,4000,16000 --out sweep messages-*.txt",
        "  morsel sweep --schemes bpe --held-out-every 5 --out sweep corpus/"})
final class SweepCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Parameters(paramLabel = "CORPUS", arity = "1..*", description = "Files, folders or globs; each file is one group in the report.")
  List<String> corpus = new ArrayList<>();

  @Option(names = "--schemes", split = ",", description = "Schemes to compare (default: all).")
  List<String> schemes = new ArrayList<>(Schemes.NAMES);

  @Option(names = "--sizes", split = ",", defaultValue = "1000,2000,4000,8000", description = "Vocabulary sizes (default: ${DEFAULT-VALUE}).")
  List<Integer> sizes;

  @Option(names = "--held-out-every", defaultValue = "10", description = "Hold out every N-th line of each file (default: ${DEFAULT-VALUE}).")
  int every;

  @Option(names = "--normalize", defaultValue = "nfc", description = "Normalization (default: ${DEFAULT-VALUE}).")
  String normalize;

  @Option(names = "--split", defaultValue = "runs:space=next,digits=whole", description = "Splitting (default: ${DEFAULT-VALUE}).")
  String split;

  @Option(names = "--threads", description = "Threads for counting and training (default: all cores).")
  int threads = Runtime.getRuntime().availableProcessors();

  @Option(names = {"-o", "--out"}, required = true, paramLabel = "DIR", description = "Folder for sweep.csv and sweep.html.")
  Path out;

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
    Pipeline pipeline = TrainCommand.pipeline(normalize, split);
    Map<String, List<String>> groups = read(Inputs.expand(corpus));
    List<Sweep.Row> rows;
    try (Progress progress = Progress.onTerminal()) {
      rows = Sweep.run(groups, every, pipeline, schemes, sizes, threads, progress);
    }
    write(rows, out, "Vocabulary sweep", spec.commandLine().getOut());
    return 0;
  }

  static Map<String, List<String>> read(List<Path> files) throws java.io.IOException {
    Map<String, List<String>> groups = new LinkedHashMap<>();
    for (Path p : files) {
      List<String> lines = new ArrayList<>();
      try (BufferedReader r = Lines.open(p)) {
        String line;
        while ((line = r.readLine()) != null) {
          if (!line.isBlank()) {
            lines.add(line);
          }
        }
      } catch (java.nio.charset.CharacterCodingException e) {
        throw new IllegalArgumentException(p + ": not valid UTF-8 (line " + (groupsSize(groups, p) + 1) + ")", e);
      }
      groups.put(p.getFileName().toString(), lines);
    }
    return groups;
  }

  private static int groupsSize(Map<String, List<String>> groups, Path p) {
    return groups.getOrDefault(p.getFileName().toString(), List.of()).size();
  }

  static void write(List<Sweep.Row> rows, Path dir, String title, PrintWriter o) throws java.io.IOException {
    Files.createDirectories(dir);
    Report.csv(rows, dir.resolve("sweep.csv"));
    Report.html(rows, dir.resolve("sweep.html"), title);
    o.printf(Locale.ROOT, "%-10s %9s %11s %12s %11s %9s%n", "scheme", "vocab", "tokens/word", "bytes/token", "unknown", "MB/s");
    for (Sweep.Row r : rows) {
      if (r.group().equals(Sweep.ALL)) {
        o.printf(Locale.ROOT, "%-10s %9d %11.3f %12.2f %11.4f %9.1f%n", r.scheme(), r.vocabularySize(), r.tokensPerWord(),
            r.bytesPerToken(), r.unknownRate(), r.mbPerSecond());
      }
    }
    o.println("wrote " + dir.resolve("sweep.csv") + " and " + dir.resolve("sweep.html"));
  }
}
