package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.train.CountReport;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code morsel extend}: add ids for a new corpus to a trained model, keeping every existing id. */
@Command(name = "extend", mixinStandardHelpOptions = true, separator = " ", usageHelpWidth = 110,
    description = {"Extend a trained model with the pieces a new corpus needs; every existing id keeps its meaning.",
        "The corpus is one text per line (files, folders, globs, .gz, or - for standard input), counted with the"
        + " model's own normalization and splitting. The new ids come after the model's own, which keep their tokens,"
        + " reserved tokens and framing; the new model records the fingerprint of the one it extends."},
    footer = {"", "Examples:",
        "  morsel extend --model ferry.morsel --add 500 --out ferry-code.morsel src/**/*.java",
        "  morsel compare --model ferry.morsel --model ferry-code.morsel --out cmp held-out-ferry.txt held-out-code.txt"})
final class ExtendCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Parameters(paramLabel = "CORPUS", description = "Files, folders, globs, or - for standard input (default).")
  List<String> corpus = new ArrayList<>();

  @Option(names = {"-m", "--model"}, required = true, paramLabel = "MODEL", description = "The model file to extend.")
  Path model;

  @Option(names = "--add", required = true, paramLabel = "N", description = "Most ids to add after the model's own.")
  int add;

  @Option(names = "--option", paramLabel = "NAME=VALUE",
      description = "An option of the model's scheme (repeatable; 'morsel schemes' lists them); options that only shape"
          + " a vocabulary from scratch keep the model's values.")
  List<String> options = new ArrayList<>();

  @Option(names = "--threads", paramLabel = "N", description = "Threads for counting and learning (default: all cores).")
  int threads = Runtime.getRuntime().availableProcessors();

  @Option(names = "--max-pieces", paramLabel = "N", defaultValue = "4000000",
      description = "Memory budget: most distinct pieces kept while counting; past it the rarest are dropped (default: ${DEFAULT-VALUE}).")
  int maxPieces;

  @Option(names = {"-o", "--out"}, required = true, paramLabel = "MODEL", description = "Where to write the extended model.")
  Path out;

  @Mixin
  Corpus.BadUtf8 badUtf8;

  @Override
  @SuppressWarnings("try") // progress.close() is called early on purpose, as in TrainCommand: it clears the bar first
  public Integer call() throws Exception {
    if (threads <= 0) {
      throw new Morsel.UsageException("--threads must be positive, got " + threads);
    }
    if (maxPieces <= 0) {
      throw new Morsel.UsageException("--max-pieces must be positive, got " + maxPieces);
    }
    if (Files.isDirectory(out)) {
      throw new Morsel.UsageException("--out " + out + " is a folder; name the model file to write");
    }
    Tokenizer base = Tokenizers.load(model);
    Schemes.ExtensionPlan plan = Schemes.extensionPlan(base.scheme(), add, options, threads); // checked before counting
    PrintWriter o = spec.commandLine().getOut();
    PrintWriter err = spec.commandLine().getErr();
    long t0 = System.nanoTime();
    try (Progress progress = Progress.onTerminal()) {
      PieceCounter counter = PieceCounter.builder().pipeline(base.pipeline()).threads(threads).maxDistinctPieces(maxPieces)
          .listener(progress).build();
      CountReport report = TrainCommand.count(counter, corpus, badUtf8.policy(), progress, err, "extend");
      PieceCounts counts = report.counts();
      long t1 = System.nanoTime();
      Tokenizer t = plan.extend(base, counts, progress);
      progress.close();
      TrainCommand.save(t, out);
      long t2 = System.nanoTime();
      int added = t.vocabularySize() - base.vocabularySize();
      o.printf(Locale.ROOT, "pieces counted   %,d distinct, %,d in all, from %,d lines (%.1f s)%n", counts.size(),
          counts.total(), report.texts(), (t1 - t0) / 1e9);
      o.printf(Locale.ROOT, "vocabulary       %,d ids = %,d of %s + %,d new, scheme %s (%.1f s)%n", t.vocabularySize(),
          base.vocabularySize(), model.getFileName(), added, t.scheme(), (t2 - t1) / 1e9);
      o.printf(Locale.ROOT, "extends          %s%n", base.fingerprint());
      o.printf(Locale.ROOT, "fingerprint      %s%n", t.fingerprint());
      o.printf(Locale.ROOT, "model            %s (%,d bytes)%n", out, Files.size(out));
      if (added < add) {
        err.printf(Locale.ROOT, "morsel extend: note: %s gave %,d new ids, %,d fewer than --add %,d: the corpus holds"
            + " nothing more to learn%n", t.scheme(), added, add - added, add);
        err.flush();
      }
    }
    return 0;
  }
}
