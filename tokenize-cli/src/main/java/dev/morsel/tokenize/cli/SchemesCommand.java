package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.train.LearnerOption;
import dev.morsel.tokenize.train.LearnerProvider;
import dev.morsel.tokenize.train.Learners;
import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;

/** {@code morsel schemes}: the schemes on the class path, each with its options and their defaults. */
@Command(name = "schemes", mixinStandardHelpOptions = true,
    description = "List the schemes found on the class path, with the options 'morsel train --option NAME=VALUE' takes.",
    footer = {"", "Example:", "  morsel schemes"})
final class SchemesCommand implements Callable<Integer> {
  @picocli.CommandLine.Spec
  picocli.CommandLine.Model.CommandSpec spec;

  @Override
  public Integer call() {
    PrintWriter o = spec.commandLine().getOut();
    for (LearnerProvider p : Learners.providers()) {
      o.printf("%s  %s%n", p.scheme(), p.description());
      for (LearnerOption opt : p.options()) {
        o.printf("    --option %s=%s%n        %s%n", opt.name(), opt.defaultValue(), opt.description());
      }
    }
    return 0;
  }

  /** The scheme names, for {@code --scheme}'s help. */
  static final class Names implements Iterable<String> {
    @Override
    public Iterator<String> iterator() {
      return new ArrayList<>(Schemes.NAMES).iterator();
    }
  }
}
