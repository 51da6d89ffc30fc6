package dev.morsel.tokenize.cli;

import java.io.PrintWriter;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * The {@code morsel} command: train, encode, decode, inspect, sweep, bench, demo.
 *
 * <p>Exit codes: 0 on success, 2 on bad usage (unknown option, missing argument, bad value), 1 when
 * the work itself failed (unreadable corpus, corrupt model, malformed ids). Errors are one line on
 * standard error naming the file, line or option; {@code --verbose} adds the stack trace.
 */
@Command(name = "morsel", mixinStandardHelpOptions = true, versionProvider = Morsel.Version.class,
    description = "Train subword vocabularies, encode and decode text with exact offsets, measure before you deploy.",
    subcommands = {TrainCommand.class, EncodeCommand.class, DecodeCommand.class, InspectCommand.class, ReviewCommand.class,
        SweepCommand.class, BenchCommand.class, DemoCommand.class, CommandLine.HelpCommand.class},
    footer = {"", "Examples:", "  morsel demo", "  morsel train --scheme bpe --vocab-size 8000 --out ferry.morsel corpus/*.txt",
        "  echo 'Is the 07:40 from Oskevik late?' | morsel encode --model ferry.morsel --format json",
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
      if (ex instanceof UsageException) {
        err.println("morsel " + line.getCommandName() + ": " + ex.getMessage());
        err.println("Try 'morsel " + line.getCommandName() + " --help'.");
        return USAGE;
      }
      String msg = ex.getMessage() == null ? ex.getClass().getSimpleName() : ex.getMessage();
      err.println("morsel " + line.getCommandName() + ": " + msg);
      if (verbose) {
        ex.printStackTrace(err);
      }
      err.flush();
      return FAILED;
    });
    cl.setParameterExceptionHandler((ex, a) -> {
      err.println("morsel: " + ex.getMessage());
      err.println("Try '" + ex.getCommandLine().getCommandSpec().qualifiedName() + " --help'.");
      err.flush();
      return USAGE;
    });
    int code = cl.execute(args);
    out.flush();
    err.flush();
    return code;
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
