package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.BufferedReader;
import java.io.InputStreamReader;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code morsel train}: count pieces in a corpus and train a vocabulary. */
@Command(name = "train", mixinStandardHelpOptions = true,
    description = "Train a subword vocabulary on a corpus (one text per line; files, folders, globs, .gz, or - for standard input).",
    footer = {"", "Examples:", "  morsel train --scheme bpe --vocab-size 8000 --out ferry.morsel messages/*.txt",
        "  zcat tickets.gz | morsel train --scheme bpe --vocab-size 16000 --reserved '⟨pause⟩' --out t.morsel -"})
final class TrainCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Parameters(paramLabel = "CORPUS", description = "Files, folders, globs, or - for standard input (default).")
  List<String> corpus = new ArrayList<>();

  @Option(names = "--scheme", defaultValue = "bpe", description = "bpe, wordpiece or unigram (default: ${DEFAULT-VALUE}).")
  String scheme;

  @Option(names = "--vocab-size", defaultValue = "8000", description = "Vocabulary size, reserved tokens included (default: ${DEFAULT-VALUE}).")
  int vocabularySize;

  @Option(names = "--normalize", defaultValue = "nfc", description = "Normalization, e.g. none, nfc, nfkc+casefold (default: ${DEFAULT-VALUE}).")
  String normalize;

  @Option(names = "--split", defaultValue = "runs:space=next,digits=whole",
      description = "Splitting: runs:space=own|next|previous,digits=whole|1..64, words, whitespace, none (default: ${DEFAULT-VALUE}).")
  String split;

  @Option(names = "--reserved", paramLabel = "SPELLING", description = "Add a reserved token, a spelling only trusted input can produce (repeatable); ids 0.. in order.")
  List<String> reserved = new ArrayList<>();

  @Option(names = "--threads", description = "Threads for counting and training (default: all cores).")
  int threads = Runtime.getRuntime().availableProcessors();

  @Option(names = "--max-pieces", defaultValue = "4000000", description = "Memory budget: most distinct pieces kept while counting (default: ${DEFAULT-VALUE}).")
  int maxPieces;

  @Option(names = {"-o", "--out"}, required = true, paramLabel = "MODEL", description = "Where to write the model file.")
  Path out;

  @Override
  public Integer call() throws Exception {
    Schemes.check(scheme);
    if (vocabularySize <= 0) {
      throw new Morsel.UsageException("--vocab-size must be positive, got " + vocabularySize);
    }
    if (threads <= 0) {
      throw new Morsel.UsageException("--threads must be positive, got " + threads);
    }
    Pipeline pipeline = pipeline(normalize, split);
    PrintWriter o = spec.commandLine().getOut();
    long t0 = System.nanoTime();
    PieceCounts counts;
    try (Progress progress = Progress.onTerminal()) {
      PieceCounter counter = PieceCounter.builder().pipeline(pipeline).threads(threads).maxDistinctPieces(maxPieces)
          .listener(progress).build();
      counts = count(counter, corpus);
      long t1 = System.nanoTime();
      Tokenizer t = Schemes.train(scheme, counts, pipeline, vocabularySize, reserved, threads, progress);
      progress.close();
      Path parent = out.toAbsolutePath().getParent();
      if (parent != null) {
        Files.createDirectories(parent);
      }
      t.save(out);
      long t2 = System.nanoTime();
      o.printf(Locale.ROOT, "pieces counted   %,d distinct, %,d in all (%.1f s)%n", counts.size(), counts.total(), (t1 - t0) / 1e9);
      o.printf(Locale.ROOT, "vocabulary       %,d ids, scheme %s (%.1f s)%n", t.vocabularySize(), t.kind(), (t2 - t1) / 1e9);
      o.printf(Locale.ROOT, "fingerprint      %s%n", t.fingerprint());
      o.printf(Locale.ROOT, "model            %s (%,d bytes)%n", out, Files.size(out));
    }
    return 0;
  }

  static Pipeline pipeline(String normalize, String split) {
    try {
      return Pipeline.of(Normalization.parse(normalize), Splitting.parse(split));
    } catch (IllegalArgumentException e) {
      throw new Morsel.UsageException(e.getMessage());
    }
  }

  static PieceCounts count(PieceCounter counter, List<String> corpus) throws java.io.IOException {
    if (Inputs.isStdin(corpus)) {
      BufferedReader r = Lines.stdin();
      return counter.count(r.lines());
    }
    return counter.countFiles(Inputs.expand(corpus));
  }
}
