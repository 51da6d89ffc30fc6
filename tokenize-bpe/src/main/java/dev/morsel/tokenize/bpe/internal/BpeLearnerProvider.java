package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.train.ExtensionSettings;
import dev.morsel.tokenize.train.Extender;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerOption;
import dev.morsel.tokenize.train.LearnerOptions;
import dev.morsel.tokenize.train.LearnerProvider;
import dev.morsel.tokenize.train.LearnerSettings;
import java.util.List;

/** Makes BPE learners by scheme name; registered for {@link java.util.ServiceLoader}. */
public final class BpeLearnerProvider implements LearnerProvider {
  static final String MIN_PAIR_COUNT = "min-pair-count";
  static final String MAX_TOKEN_BYTES = "max-token-bytes";
  static final String MAX_PIECE_BYTES = "max-piece-bytes";

  private static final List<LearnerOption> MORE = List.of(
      LearnerOption.of(MIN_PAIR_COUNT, Long.toString(BpeTraining.DEFAULT_MIN_PAIR_COUNT),
          "smallest count-weighted pair count worth a merge"),
      LearnerOption.of(MAX_TOKEN_BYTES, Integer.toString(BpeTraining.DEFAULT_MAX_TOKEN_BYTES),
          "longest token, in bytes of UTF-8 (2.." + BpeSegmenter.MAX_TOKEN_BYTES + ")"),
      LearnerOption.of(MAX_PIECE_BYTES, Integer.toString(BpeTraining.DEFAULT_MAX_PIECE_BYTES),
          "pieces longer than this many bytes of UTF-8 are left out of learning"));

  private static final List<LearnerOption> OPTIONS = declared();

  private static List<LearnerOption> declared() {
    List<LearnerOption> all = new java.util.ArrayList<>(AlphabetPolicy.options(
        "no cap (the coverage decides); merges never join bytes of characters left out"));
    all.addAll(MORE);
    return List.copyOf(all);
  }

  /** For {@link java.util.ServiceLoader}. */
  public BpeLearnerProvider() {}

  @Override
  public String scheme() {
    return BpeSegmenter.SCHEME;
  }

  @Override
  public String description() {
    return "byte-level BPE: merges of byte pairs, never an unknown token";
  }

  @Override
  public List<LearnerOption> options() {
    return OPTIONS;
  }

  @Override
  public Learner learner(LearnerSettings settings, LearnerOptions options) {
    return BpeTraining.builder()
        .vocabularySize(settings.vocabularySize())
        .minCount(settings.minCount())
        .reservedTokens(settings.reservedTokens())
        .threads(settings.threads())
        .listener(settings.listener())
        .minPairCount(options.longValue(MIN_PAIR_COUNT, 1, Long.MAX_VALUE))
        .maxTokenBytes(options.intValue(MAX_TOKEN_BYTES, 2, BpeSegmenter.MAX_TOKEN_BYTES))
        .maxPieceBytes(options.intValue(MAX_PIECE_BYTES, 2, Integer.MAX_VALUE))
        .alphabet(AlphabetPolicy.fromOptions(options))
        .build();
  }

  /** All three options apply to the new merges. */
  @Override
  public Extender extender(ExtensionSettings settings, LearnerOptions options) {
    return new BpeExtension(settings.addedIds(), options.longValue(MIN_PAIR_COUNT, 1, Long.MAX_VALUE),
        options.intValue(MAX_TOKEN_BYTES, 2, BpeSegmenter.MAX_TOKEN_BYTES),
        settings.minCount(), options.intValue(MAX_PIECE_BYTES, 2, Integer.MAX_VALUE), settings.threads(),
        settings.listener());
  }
}
