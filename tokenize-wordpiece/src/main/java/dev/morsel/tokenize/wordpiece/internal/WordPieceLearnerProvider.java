package dev.morsel.tokenize.wordpiece.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerOption;
import dev.morsel.tokenize.train.LearnerOptions;
import dev.morsel.tokenize.train.LearnerProvider;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.wordpiece.WordPieceLearner;
import dev.morsel.tokenize.wordpiece.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.WordPieceSettings;
import java.util.List;
import java.util.Locale;

/** Makes {@link WordPieceLearner}s by scheme name; registered for {@link java.util.ServiceLoader}. */
public final class WordPieceLearnerProvider implements LearnerProvider {
  static final String MAX_ALPHABET = "max-alphabet";
  static final String MIN_PAIR_COUNT = "min-pair-count";
  static final String SCORE = "score";
  static final String MARKER = "marker";
  static final String UNKNOWN_TOKEN = "unknown-token";

  private static final List<String> SCORES = List.of(name(WordPieceLearner.Score.LIKELIHOOD_GAIN),
      name(WordPieceLearner.Score.PAIR_RATIO));

  private static final List<LearnerOption> OPTIONS = List.of(
      LearnerOption.of(MAX_ALPHABET, Integer.toString(WordPieceLearner.DEFAULT_MAX_ALPHABET),
          "most distinct code points kept in the alphabet"),
      LearnerOption.of(MIN_PAIR_COUNT, Long.toString(WordPieceLearner.DEFAULT_MIN_PAIR_COUNT),
          "pairs occurring fewer times are never merged"),
      LearnerOption.of(SCORE, SCORES.get(0), "how candidate pairs are ranked: " + String.join(" or ", SCORES)),
      LearnerOption.of(MARKER, WordPieceSettings.DEFAULT_MARKER, "the prefix that marks a continuation token"),
      LearnerOption.of(UNKNOWN_TOKEN, WordPieceSettings.DEFAULT_UNKNOWN, "the spelling of the unknown token"));

  /** For {@link java.util.ServiceLoader}. */
  public WordPieceLearnerProvider() {}

  @Override
  public String scheme() {
    return WordPieceSegmenter.KIND;
  }

  @Override
  public String description() {
    return "WordPiece: greedy longest match with continuation tokens; unknown for characters outside its alphabet";
  }

  @Override
  public List<LearnerOption> options() {
    return OPTIONS;
  }

  @Override
  public Learner learner(LearnerSettings settings, LearnerOptions options) {
    WordPieceSettings wp;
    try {
      wp = WordPieceSettings.defaults().withMarker(options.string(MARKER)).withUnknownToken(options.string(UNKNOWN_TOKEN));
    } catch (IllegalArgumentException e) {
      throw new IllegalArgumentException(scheme() + " options: " + e.getMessage(), e);
    }
    String score = options.choice(SCORE, SCORES);
    WordPieceLearner learner = WordPieceLearner.builder()
        .vocabularySize(settings.vocabularySize())
        .minCount(settings.minCount())
        .reservedTokens(settings.reservedTokens())
        .listener(settings.listener())
        .maxAlphabet(options.intValue(MAX_ALPHABET, 1, Integer.MAX_VALUE))
        .minPairCount(options.longValue(MIN_PAIR_COUNT, 1, Long.MAX_VALUE))
        .score(score.equals(SCORES.get(0)) ? WordPieceLearner.Score.LIKELIHOOD_GAIN : WordPieceLearner.Score.PAIR_RATIO)
        .settings(wp)
        .build();
    return new Learner() {
      @Override
      public String scheme() {
        return WordPieceSegmenter.KIND;
      }

      @Override
      public Tokenizer train(PieceCounts counts) {
        return Tokenizers.of(counts.pipeline(), learner.train(counts));
      }
    };
  }

  private static String name(WordPieceLearner.Score s) {
    return s.name().toLowerCase(Locale.ROOT).replace('_', '-');
  }
}
