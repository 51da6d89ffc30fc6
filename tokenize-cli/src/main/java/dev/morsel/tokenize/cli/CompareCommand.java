package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
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

/** {@code morsel compare}: measure trained models side by side on held-out text, for example before and after an extension. */
@Command(name = "compare", mixinStandardHelpOptions = true, separator = " ",
    description = {"Measure models side by side on held-out text, for example before and after 'morsel extend'.",
        "Encodes every file with each model and reports tokens per word, tokens per 1,000 characters, bytes per token,"
        + " unknown tokens per 1,000 characters, vocabulary used and encode speed, per input file and overall, as CSV"
        + " and as an HTML report like the sweep report's. Give one file per domain (the old one and the new one) to"
        + " see what an extension buys on one and costs on the other."},
    footer = {"", "Example:",
        "  morsel compare --model ferry.morsel --model ferry-code.morsel --out cmp held-out-ferry.txt held-out-code.txt"})
final class CompareCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Parameters(paramLabel = "TEXT", arity = "1..*",
      description = "Held-out files, folders or globs (text the models were not trained on); each file is one group.")
  List<String> text = new ArrayList<>();

  @Option(names = {"-m", "--model"}, required = true, paramLabel = "MODEL",
      description = "A model file (repeatable, at least one; each is measured on every file).")
  List<Path> models = new ArrayList<>();

  @Option(names = "--max-warmup", paramLabel = "SECONDS", defaultValue = "5",
      description = "Most warm-up per model before its encode speed is measured (default: ${DEFAULT-VALUE}).")
  double maxWarmup;

  @Option(names = {"-o", "--out"}, required = true, paramLabel = "DIR", description = "Folder for compare.csv and compare.html.")
  Path out;

  @Mixin
  Corpus.BadUtf8 badUtf8;

  @Override
  public Integer call() throws Exception {
    if (maxWarmup < 0) {
      throw new Morsel.UsageException("--max-warmup must not be negative, got " + maxWarmup);
    }
    List<Tokenizer> loaded = new ArrayList<>();
    List<String> labels = new ArrayList<>();
    List<String> described = new ArrayList<>();
    for (Path p : models) {
      Tokenizer t = Tokenizers.load(p);
      loaded.add(t);
      String label = p.getFileName() + " (" + t.scheme() + ")";
      for (int k = 2; labels.contains(label); k++) {
        label = p.getFileName() + " (" + t.scheme() + ", " + k + ")";
      }
      labels.add(label);
    }
    for (int i = 0; i < loaded.size(); i++) {
      Tokenizer t = loaded.get(i);
      String lineage = "";
      if (t.lineage().isPresent()) {
        lineage = ", extends " + t.lineage().get().baseFingerprint().substring(0, 12);
        for (int j = 0; j < loaded.size(); j++) {
          if (t.lineage().get().isBase(loaded.get(j))) {
            lineage = ", extends " + labels.get(j);
          }
        }
      }
      described.add(String.format(Locale.ROOT, "%s: %,d ids, fingerprint %s%s%s", labels.get(i), t.vocabularySize(),
          t.fingerprint().substring(0, 12), lineage, t.pipeline().equals(loaded.get(0).pipeline()) ? ""
              : ", pipeline " + t.pipeline().normalization().spec() + " / " + t.pipeline().splitting().spec()));
    }
    List<Path> files = Inputs.expand(text);
    Map<String, List<String>> groups = SweepCommand.read(files, badUtf8.policy(), spec.commandLine().getErr(), "compare");
    List<String> all = new ArrayList<>();
    groups.values().forEach(all::addAll);
    List<Sweep.Row> rows = new ArrayList<>();
    List<Sweep.ScriptRow> scripts = new ArrayList<>();
    try (Progress progress = Progress.onTerminal()) {
      for (int i = 0; i < loaded.size(); i++) {
        progress.progress("compare", i, loaded.size(), labels.get(i));
        Tokenizer t = loaded.get(i);
        rows.addAll(Sweep.measureAll(t, labels.get(i), t.vocabularySize(), new LinkedHashMap<>(groups), all, Double.NaN,
            (long) (maxWarmup * 1e9)));
        scripts.addAll(Sweep.byScript(t, labels.get(i), t.vocabularySize(), all));
      }
      progress.progress("compare", loaded.size(), loaded.size(), "done");
    }
    Report.Meta meta = Report.Meta.of(files, "every non-blank line of each file (text the models were not trained on)",
        loaded.get(0).pipeline(), "").withModels(described);
    SweepCommand.write(rows, scripts, out, "Model comparison", meta, spec.commandLine().getOut(), "compare");
    return 0;
  }
}
