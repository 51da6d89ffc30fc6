package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.InputStream;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code morsel demo}: the whole job on a bundled corpus of invented passenger messages to a
 * fictional ferry operator (English, German, French, Norwegian): train every scheme, encode a few
 * new messages showing each token's span in the original text, run a small sweep and write its report.
 */
@Command(name = "demo", mixinStandardHelpOptions = true, separator = " ",
    description = "Train every scheme on the bundled demo corpus (invented ferry passenger messages in four languages),"
        + " show tokens with their offsets, run a small vocabulary sweep and write its report.",
    footer = {"", "Example:", "  morsel demo --out /tmp/morsel-demo"})
final class DemoCommand implements Callable<Integer> {
  static final List<String> FILES = List.of("messages-en.txt", "messages-de.txt", "messages-fr.txt", "messages-no.txt");

  /** New messages (not in the corpus) that the demo encodes. */
  static final List<String> SAMPLES = List.of(
      "Is the 07:40 from Oskevik running late? Booking TW-04417.",
      "Ich habe meine Kamera im Café der MS Tern vergessen.",
      "Le MV Selkie Dawn part-il à l'heure pour Brisholm ?",
      "Kan jeg få refusjon for avgangen som ble innstilt? \uD83D\uDEA2");

  /** The demo's encode-speed warm-up gives up after 2 s per cell, so the demo stays quick on a busy machine. */
  static final long DEMO_MAX_WARMUP_NANOS = 2_000_000_000L;

  @Spec
  CommandSpec spec;

  @Option(names = {"-o", "--out"}, defaultValue = "morsel-demo", paramLabel = "DIR",
      description = "Folder for the corpus copy, the models and the report (default: ${DEFAULT-VALUE}).")
  Path out;

  @Option(names = "--vocab-size", paramLabel = "N", defaultValue = "2000", description = "Vocabulary size of the demo models (default: ${DEFAULT-VALUE}).")
  int vocabularySize;

  @Option(names = "--sizes", paramLabel = "N,...", split = ",", defaultValue = "400,700,1000,2000", description = "Sweep sizes (default: ${DEFAULT-VALUE}).")
  List<Integer> sizes;

  @Override
  public Integer call() throws Exception {
    PrintWriter o = spec.commandLine().getOut();
    long t0 = System.nanoTime();
    Path corpusDir = out.resolve("corpus");
    Files.createDirectories(corpusDir);
    List<Path> files = new ArrayList<>();
    for (String f : FILES) {
      Path p = corpusDir.resolve(f);
      try (InputStream in = DemoCommand.class.getResourceAsStream("demo/" + f)) {
        if (in == null) {
          throw new IllegalStateException("the demo corpus file " + f + " is missing from the jar");
        }
        Files.copy(in, p, StandardCopyOption.REPLACE_EXISTING);
      }
      files.add(p);
    }
    o.printf(Locale.ROOT, "Demo corpus: invented passenger messages to a fictional ferry operator, copied to %s%n", corpusDir);
    Pipeline pipeline = Pipeline.defaults();
    int threads = Runtime.getRuntime().availableProcessors();
    PieceCounts counts = PieceCounter.builder().pipeline(pipeline).threads(threads).build().countFiles(files);
    o.printf(Locale.ROOT, "Counted %,d distinct pieces (%,d in all) with normalization %s, splitting %s%n%n", counts.size(),
        counts.total(), pipeline.normalization().spec(), pipeline.splitting().spec());
    boolean color = System.console() != null && System.getenv("NO_COLOR") == null;
    for (String scheme : Schemes.NAMES) {
      long s0 = System.nanoTime();
      Tokenizer t;
      try (Progress progress = Progress.onTerminal()) {
        t = Schemes.plan(scheme, vocabularySize, List.of(), List.of(), threads).train(counts, progress);
      }
      TrainCommand.shortfall(spec.commandLine().getErr(), "demo", scheme, vocabularySize, t.vocabularySize());
      Path model = out.resolve(scheme + ".morsel");
      t.save(model);
      o.printf(Locale.ROOT, "== %s: %,d ids, trained in %.1f s, fingerprint %s…, saved to %s%n", scheme, t.vocabularySize(),
          (System.nanoTime() - s0) / 1e9, t.fingerprint().substring(0, 16), model);
      for (int k = 0; k < SAMPLES.size(); k++) {
        String text = SAMPLES.get(k);
        Tokens x = t.encode(text);
        o.printf(Locale.ROOT, "   %s%n   %d tokens: %s%n", text, x.size(), show(text, x, color));
        if (!t.decode(x.ids()).equals(pipeline.normalization().apply(text).text())) {
          o.println("   (decode differs from the normalized text: the scheme produced an unknown token)");
        }
      }
      Tokens first = t.encode(SAMPLES.get(0));
      o.println("   offsets of the first message (UTF-16 [start, end) in the original text):");
      StringBuilder line = new StringBuilder("   ");
      for (int i = 0; i < Math.min(first.size(), 12); i++) {
        line.append(String.format(Locale.ROOT, "%d=%s[%d,%d) ", first.id(i),
            InspectCommand.quote(SAMPLES.get(0).substring(first.start(i), first.end(i))), first.start(i), first.end(i)));
      }
      o.println(line.append(first.size() > 12 ? "…" : "").toString().stripTrailing());
      o.println();
    }
    o.println("== sweep: " + Schemes.NAMES + " at sizes " + sizes + " (every 10th line held out)");
    Map<String, List<String>> groups = SweepCommand.read(files, dev.morsel.tokenize.train.Utf8Lines.Malformed.FAIL,
        spec.commandLine().getErr(), "demo");
    List<Sweep.Row> rows;
    List<Sweep.ScriptRow> scripts = new java.util.ArrayList<>();
    try (Progress progress = Progress.onTerminal()) {
      rows = Sweep.run(groups, 10, pipeline, Schemes.NAMES, sizes, List.of(), threads, progress, spec.commandLine().getErr(),
          DEMO_MAX_WARMUP_NANOS, scripts);
    }
    Path report = out.resolve("report");
    SweepCommand.write(rows, scripts, report, "Morsel demo: vocabulary sweep on ferry passenger messages",
        Report.Meta.of(files, 10, pipeline, "defaults"), o, "sweep");
    o.printf(Locale.ROOT, "%nDone in %.1f s. Open %s in a browser.%n", (System.nanoTime() - t0) / 1e9,
        report.resolve("sweep.html").toAbsolutePath());
    return 0;
  }

  /**
   * Shows each token's span of the original text: in a terminal, alternating background colours; otherwise
   * each span in brackets. Tokens that share a span (parts of one character) are shown once with their count.
   */
  static String show(String text, Tokens x, boolean color) {
    StringBuilder sb = new StringBuilder();
    int i = 0;
    int k = 0;
    while (i < x.size()) {
      int j = i + 1;
      while (j < x.size() && x.start(j) == x.start(i) && x.end(j) == x.end(i)) {
        j++;
      }
      String piece = text.substring(x.start(i), x.end(i));
      String count = j - i > 1 ? "×" + (j - i) : "";
      if (color) {
        sb.append(k % 2 == 0 ? "\u001b[30;46m" : "\u001b[30;43m").append(piece).append(count).append("\u001b[0m");
      } else {
        sb.append('[').append(piece).append(count).append(']');
      }
      k++;
      i = j;
    }
    return sb.toString();
  }

}
