package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.train.CorpusException;
import dev.morsel.tokenize.train.Utf8Lines;
import dev.morsel.tokenize.train.Utf8Lines.Malformed;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import picocli.CommandLine.Option;

/**
 * Reads corpora and text inputs line by line through {@link Utf8Lines}, so every command names the
 * same exact 1-based line and byte offset for bytes that are not UTF-8, and follows the same
 * {@code --bad-utf8} policy.
 */
final class Corpus {
  private Corpus() {}

  /** The {@code --bad-utf8} option, shared by every command that reads text. */
  static final class BadUtf8 {
    @Option(names = "--bad-utf8", defaultValue = "fail", paramLabel = "fail|replace|skip",
        description = "Lines holding bytes that are not UTF-8: fail (stop, naming the file, line and byte offset), replace (write U+FFFD for each bad sequence) or skip (leave the line out); the count of replaced or skipped lines is printed on standard error (default: ${DEFAULT-VALUE}).")
    String value;

    Malformed policy() {
      switch (value.toLowerCase(Locale.ROOT)) {
        case "fail": return Malformed.FAIL;
        case "replace": return Malformed.REPLACE;
        case "skip": return Malformed.SKIP;
        default: throw new Morsel.UsageException("--bad-utf8 must be fail, replace or skip, got '" + value + "'");
      }
    }
  }

  /** Lines of the named files. */
  static Utf8Lines open(List<Path> files, Malformed policy) {
    return Utf8Lines.open(files, policy);
  }

  /** Lines of standard input. */
  static Utf8Lines stdin(Malformed policy) {
    return Utf8Lines.of(System.in, "standard input", policy);
  }

  /** Total stored size of the files, for progress. */
  static long totalBytes(List<Path> files) {
    long n = 0;
    for (Path p : files) {
      try {
        n += Files.size(p);
      } catch (IOException e) {
        throw new UncheckedIOException("cannot read " + p + ": " + e.getMessage(), e);
      }
    }
    return n;
  }

  /** One summary line on standard error when lines were replaced or skipped. */
  static void summary(PrintWriter err, String command, long malformed, Malformed policy) {
    if (malformed > 0) {
      err.printf(Locale.ROOT, "morsel %s: %s %,d line%s holding bytes that are not UTF-8 (--bad-utf8 %s)%n", command,
          policy == Malformed.SKIP ? "skipped" : "replaced bad bytes in", malformed, malformed == 1 ? "" : "s",
          policy.name().toLowerCase(Locale.ROOT));
      err.flush();
    }
  }

  /** The one-line message for bytes that are not UTF-8, with the option that reads past them. */
  static String describe(CorpusException e) {
    String where = String.format(Locale.ROOT, "%s line %,d (byte offset %,d): %s", e.source(), e.line(), e.byteOffset(),
        e.problem());
    return e.problem().startsWith("invalid UTF-8") ? where + "; --bad-utf8 replace or --bad-utf8 skip reads past it" : where;
  }
}
