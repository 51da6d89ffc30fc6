package dev.morsel.tokenize.unigram.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerOption;
import dev.morsel.tokenize.train.LearnerOptions;
import dev.morsel.tokenize.train.LearnerProvider;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.unigram.UnigramLearner;
import dev.morsel.tokenize.unigram.UnigramModel;
import java.util.List;

/** Makes {@link UnigramLearner}s by scheme name; registered for {@link java.util.ServiceLoader}. */
public final class UnigramLearnerProvider implements LearnerProvider {
  static final String RAW_BYTES = "raw-bytes";
  static final String UNKNOWN_TOKEN = "unknown-token";
  static final String CANDIDATE_MULTIPLE = "candidate-multiple";
  static final String MAX_TOKEN_CODE_POINTS = "max-token-code-points";
  static final String KEEP_SHARE = "keep-share";
  static final String EM_PASSES = "em-passes";
  static final String SEED_TABLE_LIMIT = "seed-table-limit";
  static final String MAX_PIECE_LENGTH = "max-piece-length";

  private static final List<LearnerOption> OPTIONS = List.of(
      LearnerOption.of(RAW_BYTES, "true", "characters outside the vocabulary become their UTF-8 bytes, not the unknown token"),
      LearnerOption.of(UNKNOWN_TOKEN, UnigramModel.DEFAULT_UNKNOWN, "the spelling of the unknown token"),
      LearnerOption.of(CANDIDATE_MULTIPLE, "8", "seed candidates as a multiple of the pieces wanted (1..1000)"),
      LearnerOption.of(MAX_TOKEN_CODE_POINTS, "16", "longest token learned, in code points (1..64)"),
      LearnerOption.of(KEEP_SHARE, "0.75", "share of the vocabulary each pruning round keeps, in (0, 1)"),
      LearnerOption.of(EM_PASSES, "2", "EM passes before each pruning round (1..100)"),
      LearnerOption.of(SEED_TABLE_LIMIT, "1000000", "entries of the seed substring table before rare ones are dropped"),
      LearnerOption.of(MAX_PIECE_LENGTH, Integer.toString(UnigramLearner.DEFAULT_MAX_PIECE_LENGTH),
          "pieces longer than this many UTF-16 units are left out of learning"));

  /** For {@link java.util.ServiceLoader}. */
  public UnigramLearnerProvider() {}

  @Override
  public String scheme() {
    return UnigramModel.KIND;
  }

  @Override
  public String description() {
    return "unigram language model: EM with pruning, Viterbi, n-best lists and sampling";
  }

  @Override
  public List<LearnerOption> options() {
    return OPTIONS;
  }

  @Override
  public Learner learner(LearnerSettings settings, LearnerOptions options) {
    UnigramLearner learner;
    try {
      learner = UnigramLearner.builder()
          .vocabularySize(settings.vocabularySize())
          .reservedTokens(settings.reservedTokens())
          .threads(Math.min(settings.threads(), 256))
          .listener(settings.listener())
          .rawBytes(options.booleanValue(RAW_BYTES))
          .unknownToken(options.string(UNKNOWN_TOKEN))
          .seedFactor(options.intValue(CANDIDATE_MULTIPLE, 1, 1000))
          .maxTokenLength(options.intValue(MAX_TOKEN_CODE_POINTS, 1, 64))
          .shrinkFactor(options.doubleValue(KEEP_SHARE, 0, 1, false))
          .emIterations(options.intValue(EM_PASSES, 1, 100))
          .seedTableLimit(options.intValue(SEED_TABLE_LIMIT, 1000, 100_000_000))
          .maxPieceLength(options.intValue(MAX_PIECE_LENGTH, 1, 1 << 26))
          .build();
    } catch (IllegalArgumentException e) {
      throw e.getMessage().startsWith(scheme()) ? e : new IllegalArgumentException(scheme() + ": " + e.getMessage(), e);
    }
    long minCount = settings.minCount();
    return new Learner() {
      @Override
      public String scheme() {
        return UnigramModel.KIND;
      }

      @Override
      public Tokenizer train(PieceCounts counts) {
        PieceCounts kept = minCount > 1 ? counts.withMinCount(minCount) : counts;
        if (kept.isEmpty() && !counts.isEmpty()) {
          throw new IllegalArgumentException("no piece has a count >= minCount=" + minCount);
        }
        return Tokenizers.of(counts.pipeline(), learner.train(kept));
      }
    };
  }
}
