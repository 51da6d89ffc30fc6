package dev.morsel.tokenize.train;

import dev.morsel.tokenize.ReservedTokens;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import java.util.List;

/**
 * A learner that learns nothing, for the tests of {@link Learners}: the api test kit's byte
 * segmenter with the reserved tokens after the 256 byte ids, and {@code spare-ids} free ids more.
 * Registered for {@link java.util.ServiceLoader} in this module's test resources only.
 */
public final class TestByteLearnerProvider implements LearnerProvider {
  static final String SPARE_IDS = "spare-ids";

  /** For {@link java.util.ServiceLoader}. */
  public TestByteLearnerProvider() {}

  @Override
  public String scheme() {
    return ByteSegmenter.SCHEME;
  }

  @Override
  public String description() {
    return "one token per UTF-8 byte, for tests";
  }

  @Override
  public List<LearnerOption> options() {
    return List.of(LearnerOption.of(SPARE_IDS, "0", "free ids after the reserved tokens"));
  }

  @Override
  public Learner learner(LearnerSettings settings, LearnerOptions options) {
    int spare = options.intValue(SPARE_IDS, 0, 1 << 16);
    List<String> reserved = settings.reservedTokens();
    int size = 256 + reserved.size() + spare;
    if (settings.vocabularySize() != size) {
      throw new IllegalArgumentException("vocabularySize=" + settings.vocabularySize() + " must be " + size
          + " (256 bytes + " + reserved.size() + " reserved + " + SPARE_IDS + "=" + spare + ")");
    }
    return new Learner() {
      @Override
      public String scheme() {
        return ByteSegmenter.SCHEME;
      }

      @Override
      public Tokenizer train(PieceCounts counts) {
        ReservedTokens.Builder b = ReservedTokens.builder();
        for (int i = 0; i < reserved.size(); i++) {
          b.add(reserved.get(i), 256 + i);
        }
        return Tokenizers.of(counts.pipeline(), new ByteSegmenter(reserved.size() + spare), b.build(), Template.none());
      }
    };
  }
}
