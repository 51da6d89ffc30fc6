package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelSections;
import java.io.BufferedWriter;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/**
 * {@code morsel review}: a model as a review text (docs/format.md, section 5), or a review text back
 * into a model file.
 */
@Command(name = "review", mixinStandardHelpOptions = true,
    description = "Write a model as a review text (UTF-8, TAB-separated rows: settings, reserved tokens, vocabulary,"
        + " merge ranks or scores) for reading, diffing and editing, or turn a review text back into a model file."
        + " An unedited review text gives back a model with the same fingerprint.",
    footer = {"", "Examples:", "  morsel review --model ferry.morsel --out ferry-review.tsv",
        "  morsel review --from ferry-review.tsv --out ferry-edited.morsel"})
final class ReviewCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Option(names = {"-m", "--model"}, paramLabel = "MODEL", description = "Export this model file as a review text.")
  Path model;

  @Option(names = "--from", paramLabel = "TEXT", description = "Import this review text into a model file (needs --out).")
  Path from;

  @Option(names = {"-o", "--out"}, paramLabel = "FILE",
      description = "Where to write: the review text (default: standard output) or the model file.")
  Path out;

  @Override
  public Integer call() throws Exception {
    if ((model == null) == (from == null)) {
      throw new Morsel.UsageException("give exactly one of --model (export) and --from (import)");
    }
    if (model != null) {
      ModelSections sections = ModelFile.read(model);
      if (out == null) {
        PrintWriter o = spec.commandLine().getOut();
        Tokenizers.writeReview(sections, o);
        o.flush();
      } else {
        try (BufferedWriter w = Files.newBufferedWriter(out, StandardCharsets.UTF_8)) {
          Tokenizers.writeReview(sections, w);
        }
        spec.commandLine().getErr().println("wrote " + out);
      }
      return 0;
    }
    if (out == null) {
      throw new Morsel.UsageException("--from needs --out for the model file");
    }
    byte[] file = Tokenizers.modelFromReview(from);
    Files.write(out, file);
    spec.commandLine().getErr().println("wrote " + out + ", fingerprint " + ModelFile.read(file).fingerprint());
    return 0;
  }
}
