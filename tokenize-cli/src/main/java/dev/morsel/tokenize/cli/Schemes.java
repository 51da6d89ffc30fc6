package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerOptions;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import java.util.List;

/**
 * Trains a tokenizer of a named scheme from piece counts through the learner service interface
 * ({@link Learners}): the tool knows no scheme by name, it lists and builds whatever segmenter
 * modules are on its class path. Learner errors become usage errors naming the option.
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

  /**
   * A learner of {@code scheme} to {@code vocabularySize} ids (reserved tokens included) with the
   * scheme's {@code name=value} options, every setting checked now, before any counting.
   */
  static Learner learner(String scheme, int vocabularySize, List<String> reserved, List<String> options, int threads,
      TrainingListener listener) {
    check(scheme);
    try {
      LearnerSettings settings = LearnerSettings.of(vocabularySize).withReservedTokens(reserved).withThreads(threads)
          .withListener(listener);
      return Learners.learner(scheme, settings, LearnerOptions.parse(options));
    } catch (IllegalArgumentException | NullPointerException e) {
      throw new Morsel.UsageException(e.getMessage());
    }
  }

  /** Trains {@code scheme} to {@code vocabularySize} ids with its default options. */
  static Tokenizer train(String scheme, PieceCounts counts, int vocabularySize, List<String> reserved, int threads,
      TrainingListener listener) {
    return learner(scheme, vocabularySize, reserved, List.of(), threads, listener).train(counts);
  }
}
