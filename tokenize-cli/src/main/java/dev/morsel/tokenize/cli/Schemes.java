package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.ExtensionSettings;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerOptions;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Trains a tokenizer of a named scheme from piece counts through the learner service interface
 * ({@link Learners}): the tool knows no scheme by name, it lists and builds whatever segmenter
 * modules are on its class path. A {@link Plan} is made, and every setting checked, before any
 * counting, so a size that cannot work fails at once; errors speak of command-line options, not
 * Java settings.
 */
final class Schemes {
  /** The scheme names found, in the order reports list them. */
  static final List<String> NAMES = Learners.schemes();

  private Schemes() {}

  static void check(String scheme) {
    if (!NAMES.contains(scheme)) {
      throw new Morsel.UsageException("unknown scheme '" + scheme + "'; choose one of " + String.join(", ", NAMES));
    }
  }

  /** A learner whose settings are checked. */
  interface Plan {
    Tokenizer train(PieceCounts counts, TrainingListener listener);
  }

  /**
   * Checks the settings of {@code scheme} at {@code vocabularySize} before counting: a {@link
   * Morsel.UsageException} names the option to change.
   *
   * @param options {@code NAME=VALUE} for {@code scheme}, or {@code SCHEME:NAME=VALUE} for one scheme
   *     only (those of other schemes are left out)
   */
  static Plan plan(String scheme, int vocabularySize, List<String> reserved, List<String> options, int threads) {
    check(scheme);
    if (vocabularySize <= 0) {
      throw new Morsel.UsageException("--vocab-size must be positive, got " + vocabularySize);
    }
    Map<String, String> own = optionsOf(scheme, options);
    LearnerSettings settings;
    try {
      settings = LearnerSettings.of(vocabularySize).withReservedTokens(reserved).withThreads(threads);
      Learners.learner(scheme, settings, own); // every setting checked now
    } catch (IllegalArgumentException | NullPointerException e) {
      throw new Morsel.UsageException(cliWords(e.getMessage()));
    }
    LearnerSettings checked = settings;
    return (counts, listener) -> {
      Learner learner = Learners.learner(scheme, checked.withListener(listener), own);
      try {
        return learner.train(counts);
      } catch (IllegalArgumentException e) {
        throw new IllegalArgumentException(cliWords(e.getMessage()), e);
      }
    };
  }

  /** An extender whose settings are checked. */
  interface ExtensionPlan {
    Tokenizer extend(Tokenizer base, PieceCounts counts, TrainingListener listener);
  }

  /**
   * Checks the settings of an extension of a {@code scheme} model by {@code added} ids before
   * counting, as {@link #plan} does for learning.
   */
  static ExtensionPlan extensionPlan(String scheme, int added, List<String> options, int threads) {
    check(scheme);
    if (added <= 0) {
      throw new Morsel.UsageException("--add must be positive, got " + added);
    }
    Map<String, String> own = optionsOf(scheme, options);
    ExtensionSettings settings;
    try {
      settings = ExtensionSettings.of(added).withThreads(threads);
      Learners.extender(scheme, settings, own); // every setting checked now
    } catch (IllegalArgumentException | NullPointerException e) {
      throw new Morsel.UsageException(cliWords(e.getMessage()));
    }
    ExtensionSettings checked = settings;
    return (base, counts, listener) -> {
      try {
        return Learners.extender(scheme, checked.withListener(listener), own).extend(base, counts);
      } catch (IllegalArgumentException e) {
        throw new IllegalArgumentException(cliWords(e.getMessage()), e);
      }
    };
  }

  /**
   * The {@code --option} values that apply to {@code scheme}: unscoped ones and those scoped
   * {@code scheme:}, later ones winning.
   *
   * @throws Morsel.UsageException for a value that is not {@code [SCHEME:]NAME=VALUE} or names an unknown scheme
   */
  static Map<String, String> optionsOf(String scheme, List<String> options) {
    List<String> mine = new ArrayList<>();
    for (String o : options) {
      int eq = o.indexOf('=');
      int colon = o.indexOf(':');
      if (colon >= 0 && (eq < 0 || colon < eq)) {
        String s = o.substring(0, colon);
        check(s);
        if (s.equals(scheme)) {
          mine.add(o.substring(colon + 1));
        }
      } else {
        mine.add(o);
      }
    }
    try {
      return new LinkedHashMap<>(LearnerOptions.parse(mine));
    } catch (IllegalArgumentException e) {
      throw new Morsel.UsageException("--option: " + e.getMessage().replaceFirst("^options\\[\\d+\\] ", ""));
    }
  }

  /** Rewrites a learner's message in terms of command-line options. */
  static String cliWords(String message) {
    return message.replace("vocabularySize=", "--vocab-size ").replace("raise vocabularySize", "raise --vocab-size")
        .replace("reservedTokens", "--reserved").replace("threads=", "--threads ").replace("addedIds=", "--add ")
        .replaceAll("(?<!-)\\boption ([a-z][a-z0-9-]*)", "--option $1");
  }
}
