package dev.morsel.tokenize.cli;

import java.io.PrintWriter;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * The {@code morsel} command: train, encode, decode, inspect, sweep, bench, demo, schemes.
 *
 * <p>Exit codes: 0 on success, 2 on bad usage (unknown option, missing argument, bad value), 1 when
 * the work itself failed (unreadable corpus, corrupt model, malformed ids). Errors are one line on
 * standard error naming the file, line or option; {@code --verbose} adds the stack trace.
 */
@Command(name = "morsel", mixinStandardHelpOptions = true, separator = " ", versionProvider = Morsel.Version.class,
    description = "Train subword vocabularies, encode and decode text with exact offsets, measure before you deploy.",
    subcommands = {TrainCommand.class, EncodeCommand.class, DecodeCommand.class, InspectCommand.class, ReviewCommand.class,
        SweepCommand.class, ExtendCommand.class, CompareCommand.class, BenchCommand.class, DemoCommand.class, SchemesCommand.class, CommandLine.HelpCommand.class},
    footer = {"", "Examples:", "  morsel demo",
        "  morsel train --scheme bpe --vocab-size 2000 --out ferry.morsel \\",
        "      morsel-demo/corpus/*.txt",
        "  echo 'Is the 07:40 from Oskevik late?' \\",
        "      | morsel encode --model ferry.morsel --format json",
        "  morsel inspect --model ferry.morsel --explain 'Harrowmere'"})
public final class Morsel implements Runnable {
  /** Exit code for failed work. */
  public static final int FAILED = 1;
  /** Exit code for bad usage. */
  public static final int USAGE = 2;

  @Option(names = "--verbose", description = "Print stack traces with errors.", scope = CommandLine.ScopeType.INHERIT)
  boolean verbose;

  @Override
  public void run() {
    new CommandLine(this).usage(System.out);
  }

  /** Entry point. */
  public static void main(String[] args) {
    System.exit(run(args, new PrintWriter(System.out, true), new PrintWriter(System.err, true)));
  }

  /** Runs the command line with the given output streams (used by tests); returns the exit code. */
  public static int run(String[] args, PrintWriter out, PrintWriter err) {
    Morsel root = new Morsel();
    CommandLine cl = new CommandLine(root);
    cl.setOut(out);
    cl.setErr(err);
    cl.setExecutionExceptionHandler((ex, line, parsed) -> {
      boolean verbose = root.verbose || java.util.Arrays.asList(args).contains("--verbose");
      String name = line.getCommandName();
      if (ex instanceof UsageException) {
        err.println("morsel " + name + ": " + ex.getMessage());
        err.println("Try 'morsel " + name + " --help'.");
        err.flush();
        return USAGE;
      }
      err.println("morsel " + name + ": " + message(ex));
      if (verbose) {
        ex.printStackTrace(err);
      }
      err.flush();
      return FAILED;
    });
    cl.setParameterExceptionHandler((ex, a) -> {
      CommandLine at = ex.getCommandLine();
      String qualified = at.getCommandSpec().qualifiedName();
      if (ex instanceof CommandLine.UnmatchedArgumentException && at == cl && !a[0].startsWith("-")) {
        err.println("morsel: unknown command '" + a[0] + "'; the commands are "
            + String.join(", ", at.getSubcommands().keySet()));
      } else {
        err.println(qualified + ": " + ex.getMessage());
      }
      err.println("Try '" + qualified + " --help'.");
      err.flush();
      return USAGE;
    });
    int code;
    try {
      code = cl.execute(args);
    } catch (OutOfMemoryError e) {
      err.println("morsel: " + message(e));
      code = FAILED;
    }
    out.flush();
    err.flush();
    return code;
  }

  /**
   * One line for a failure: the reason and the place, with 1-based line numbers; never a bare
   * exception class name or a message that only repeats a path.
   */
  static String message(Throwable ex) {
    if (ex instanceof dev.morsel.tokenize.train.CorpusException) {
      return Corpus.describe((dev.morsel.tokenize.train.CorpusException) ex);
    }
    if (ex instanceof java.io.UncheckedIOException && ex.getCause() != null) {
      String m = ex.getMessage();
      return m != null && !m.equals(ex.getCause().toString()) ? m : reason(ex.getCause());
    }
    if (ex instanceof java.io.IOException) {
      return reason(ex);
    }
    if (ex instanceof OutOfMemoryError) {
      return "out of memory (raise the heap with java -Xmx…, or use smaller inputs)";
    }
    String m = ex.getMessage();
    return m == null ? ex.getClass().getSimpleName() : m.lines().findFirst().orElse(m);
  }

  /** The reason of an I/O failure in words (the JDK's message is often the bare path). */
  static String reason(Throwable e) {
    if (e instanceof java.nio.file.NoSuchFileException) {
      return e.getMessage() + ": no such file";
    }
    if (e instanceof java.nio.file.AccessDeniedException) {
      return e.getMessage() + ": permission denied";
    }
    if (e instanceof java.nio.file.FileSystemException) {
      java.nio.file.FileSystemException f = (java.nio.file.FileSystemException) e;
      return f.getFile() + ": " + (f.getReason() == null ? e.getClass().getSimpleName() : f.getReason());
    }
    String m = e.getMessage();
    return m == null ? e.getClass().getSimpleName() : m.lines().findFirst().orElse(m);
  }

  /** Bad usage discovered after parsing (a value that parses but makes no sense): exit code 2. */
  static final class UsageException extends RuntimeException {
    private static final long serialVersionUID = 1L;

    UsageException(String message) {
      super(message);
    }
  }

  /** Prints the version from the jar manifest, or the development version. */
  static final class Version implements CommandLine.IVersionProvider {
    @Override
    public String[] getVersion() {
      String v = Morsel.class.getPackage().getImplementationVersion();
      return new String[] {"morsel " + (v == null ? "0.1.0-SNAPSHOT" : v), "Java " + System.getProperty("java.version")};
    }
  }
}
