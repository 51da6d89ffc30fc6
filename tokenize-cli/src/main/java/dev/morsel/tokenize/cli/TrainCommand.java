package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.train.Alphabet;
import dev.morsel.tokenize.train.CountReport;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import dev.morsel.tokenize.train.Utf8Lines;
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

/** {@code morsel train}: count pieces in a corpus and train a vocabulary. */
@Command(name = "train", mixinStandardHelpOptions = true, separator = " ", usageHelpWidth = 110,
    description = "Train a subword vocabulary on a corpus (one text per line; files, folders, globs, .gz, or - for standard input).",
    footer = {"", "Examples:",
        "  morsel train --scheme bpe --vocab-size 8000 --out ferry.morsel \\",
        "      morsel-demo/corpus/*.txt",
        "  zcat tickets.gz | morsel train --scheme bpe --vocab-size 16000 --reserved '⟨pause⟩' --out t.morsel -"})
final class TrainCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Parameters(paramLabel = "CORPUS", description = "Files, folders, globs, or - for standard input (default).")
  List<String> corpus = new ArrayList<>();

  @Option(names = "--scheme", paramLabel = "NAME", defaultValue = "bpe",
      description = "A scheme on the class path: ${COMPLETION-CANDIDATES} (default: ${DEFAULT-VALUE}; 'morsel schemes' lists them with their options).",
      completionCandidates = SchemesCommand.Names.class)
  String scheme;

  @Option(names = "--option", paramLabel = "NAME=VALUE",
      description = "A scheme option, for example alphabet-coverage=0.999 or max-alphabet=300 (repeatable; 'morsel schemes' lists them with their defaults).")
  List<String> options = new ArrayList<>();

  @Option(names = "--vocab-size", paramLabel = "N", defaultValue = "16000",
      description = "Vocabulary size, reserved tokens included (default: ${DEFAULT-VALUE}). A corpus too small to fill it gives fewer ids, said on standard error.")
  int vocabularySize;

  @Option(names = "--normalize", paramLabel = "SPEC", defaultValue = "nfc",
      description = "Normalization: none, nfc, nfd, nfkc or nfkd, optionally +casefold (default: ${DEFAULT-VALUE}).")
  String normalize;

  @Option(names = "--split", paramLabel = "SPEC", defaultValue = "runs:space=next,digits=whole",
      description = "Splitting into pieces: runs:space=own|next|previous,digits=whole|1..64 (runs of one character class; where a space goes; digit runs whole or cut into groups of at most N), words (UAX #29 word boundaries), whitespace, or none (default: ${DEFAULT-VALUE}).")
  String split;

  @Option(names = "--reserved", paramLabel = "SPELLING", description = "Add a reserved token, a spelling only trusted input can produce (repeatable); ids 0.. in order.")
  List<String> reserved = new ArrayList<>();

  @Option(names = "--threads", paramLabel = "N", description = "Threads for counting and training (default: all cores).")
  int threads = Runtime.getRuntime().availableProcessors();

  @Option(names = "--max-pieces", paramLabel = "N", defaultValue = "4000000",
      description = "Memory budget: most distinct pieces kept while counting; past it the rarest are dropped (default: ${DEFAULT-VALUE}).")
  int maxPieces;

  @Option(names = {"-o", "--out"}, required = true, paramLabel = "MODEL", description = "Where to write the model file.")
  Path out;

  @Mixin
  Corpus.BadUtf8 badUtf8;

  @Override
  @SuppressWarnings("try") // progress.close() is called early on purpose: it clears the bar before the summary (close is idempotent)
  public Integer call() throws Exception {
    if (threads <= 0) {
      throw new Morsel.UsageException("--threads must be positive, got " + threads);
    }
    if (maxPieces <= 0) {
      throw new Morsel.UsageException("--max-pieces must be positive, got " + maxPieces);
    }
    Pipeline pipeline = pipeline(normalize, split);
    Schemes.Plan plan = Schemes.plan(scheme, vocabularySize, reserved, options, threads); // checked before counting
    Utf8Lines.Malformed policy = badUtf8.policy();
    if (Files.isDirectory(out)) {
      throw new Morsel.UsageException("--out " + out + " is a folder; name the model file to write");
    }
    PrintWriter o = spec.commandLine().getOut();
    PrintWriter err = spec.commandLine().getErr();
    long t0 = System.nanoTime();
    try (Progress progress = Progress.onTerminal()) {
      PieceCounter counter = PieceCounter.builder().pipeline(pipeline).threads(threads).maxDistinctPieces(maxPieces)
          .listener(progress).build();
      CountReport report = count(counter, corpus, policy, progress, err, "train");
      PieceCounts counts = report.counts();
      long t1 = System.nanoTime();
      AlphabetCapture alphabet = new AlphabetCapture(progress);
      Tokenizer t = plan.train(counts, alphabet);
      progress.close();
      save(t, out);
      long t2 = System.nanoTime();
      o.printf(Locale.ROOT, "pieces counted   %,d distinct, %,d in all, from %,d lines (%.1f s)%n", counts.size(), counts.total(),
          report.texts(), (t1 - t0) / 1e9);
      o.printf(Locale.ROOT, "vocabulary       %,d ids, scheme %s (%.1f s)%n", t.vocabularySize(), t.scheme(), (t2 - t1) / 1e9);
      if (alphabet.chosen != null) {
        o.printf(Locale.ROOT, "alphabet         %s%n", alphabet.chosen.summary().substring("alphabet ".length()));
        if (verbose() && alphabet.chosen.leftOutSize() > Alphabet.SUMMARY_LEFT_OUT) {
          o.printf(Locale.ROOT, "left out         %s%n", alphabet.chosen.leftOut(alphabet.chosen.leftOutSize()));
        }
      }
      o.printf(Locale.ROOT, "fingerprint      %s%n", t.fingerprint());
      o.printf(Locale.ROOT, "model            %s (%,d bytes)%n", out, Files.size(out));
      shortfall(err, "train", scheme, vocabularySize, t.vocabularySize());
    }
    return 0;
  }

  /** Writes the model file, making its folder if need be. */
  static void save(Tokenizer t, Path out) throws java.io.IOException {
    Path parent = out.toAbsolutePath().getParent();
    if (parent != null) {
      Files.createDirectories(parent);
    }
    t.save(out);
  }

  private boolean verbose() {
    Object root = spec.root().userObject();
    return root instanceof Morsel && ((Morsel) root).verbose;
  }

  /** Passes progress on and keeps the alphabet the learner reports. */
  static final class AlphabetCapture implements TrainingListener {
    private final TrainingListener next;
    Alphabet chosen;

    AlphabetCapture(TrainingListener next) {
      this.next = next;
    }

    @Override
    public void progress(String stage, long done, long total, String detail) {
      next.progress(stage, done, total, detail);
    }

    @Override
    public void alphabet(String scheme, Alphabet alphabet) {
      chosen = alphabet;
      next.alphabet(scheme, alphabet);
    }
  }

  /** Says on standard error when the corpus gave fewer ids than asked for (the run still succeeds). */
  static void shortfall(PrintWriter err, String command, String scheme, int asked, int got) {
    if (got < asked) {
      err.printf(Locale.ROOT, "morsel %s: note: %s gave %,d ids, %,d fewer than --vocab-size %,d: the corpus holds"
          + " nothing more to learn%n", command, scheme, got, asked - got, asked);
      err.flush();
    }
  }

  static Pipeline pipeline(String normalize, String split) {
    try {
      return Pipeline.of(Normalization.parse(normalize), Splitting.parse(split));
    } catch (IllegalArgumentException e) {
      throw new Morsel.UsageException(e.getMessage() + " (options --normalize and --split)");
    }
  }

  /** Counts the corpus (files or standard input); progress shows bytes read of the total when reading files. */
  static CountReport count(PieceCounter counter, List<String> corpus, Utf8Lines.Malformed policy, Progress progress,
      PrintWriter err, String command) {
    Utf8Lines lines;
    if (Inputs.isStdin(corpus)) {
      lines = Corpus.stdin(policy);
      progress.bytes(lines::bytesRead, -1);
    } else {
      List<Path> files = Inputs.expand(corpus);
      lines = Corpus.open(files, policy);
      progress.bytes(lines::bytesRead, Corpus.totalBytes(files));
    }
    try (Utf8Lines l = lines) {
      Iterable<String> texts = () -> l;
      CountReport r = counter.tally(texts);
      progress.bytes(null, 0);
      Corpus.summary(err, command, l.malformedLines(), policy);
      return r;
    }
  }
}
