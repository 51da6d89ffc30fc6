package dev.morsel.tokenize.modules;

import dev.morsel.tokenize.train.testkit.LearnerChecks;
import org.junit.jupiter.api.Test;

/**
 * The {@code unigram} learner found by scheme name, as the command-line tool, the benchmarks and Spark
 * find it ({@link LearnerChecks}): bound to the counted pipeline and the reserved tokens,
 * deterministic, its declared defaults the ones it uses, wrong options refused by name.
 */
class LearnerProviderTest {
  @Test
  void learnsThroughTheLearnerSpi() {
    LearnerChecks.assertLearnsThroughTheSpi("unigram");
  }
}
