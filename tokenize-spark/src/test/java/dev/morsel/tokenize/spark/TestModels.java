package dev.morsel.tokenize.spark;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.List;
import java.util.stream.Stream;

/**
 * The tokenizers the Spark tests run with: every scheme whose module is a test dependency, found
 * through the learner service interface ({@link Learners}). A new scheme needs only its module as a
 * test dependency.
 */
final class TestModels {
  /** A reserved token spelling of our own, for the trust tests. */
  static final String DOCK = "\u27e6dock\u27e7";

  private TestModels() {}

  /** The scheme names found, for {@code @MethodSource}. */
  static Stream<String> schemes() {
    return Learners.schemes().stream();
  }

  /** Learns {@code scheme} to {@code vocabularySize} ids on one thread; the tokenizer encodes with the counts' pipeline. */
  static Tokenizer train(String scheme, PieceCounts counts, int vocabularySize, List<String> reserved) {
    return Learners.learner(scheme, LearnerSettings.of(vocabularySize).withReservedTokens(reserved).withThreads(1)).train(counts);
  }
}
