package dev.morsel.tokenize.wordpiece.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerOption;
import dev.morsel.tokenize.train.LearnerOptions;
import dev.morsel.tokenize.train.LearnerProvider;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.List;
import java.util.Locale;

/** Makes WordPiece learners by scheme name; registered for {@link java.util.ServiceLoader}. */
public final class WordPieceLearnerProvider implements LearnerProvider {
  static final String MAX_ALPHABET = "max-alphabet";
  static final String MIN_PAIR_COUNT = "min-pair-count";
  static final String SCORE = "score";
  static final String MARKER = "marker";
  static final String UNKNOWN_TOKEN = "unknown-token";
  /** {@code max-alphabet=auto}: the alphabet takes at most this share of the vocabulary (each code point has two forms). */
  static final int AUTO_ALPHABET_DIVISOR = 4;
  static final String AUTO = "auto";

  private static final List<String> SCORES = List.of(name(WordPieceTraining.Score.LIKELIHOOD_GAIN),
      name(WordPieceTraining.Score.PAIR_RATIO));

  private static final List<LearnerOption> OPTIONS = List.of(
      LearnerOption.of(MAX_ALPHABET, AUTO,
          "most distinct code points kept in the alphabet (each has two forms); auto: at most "
              + WordPieceTraining.DEFAULT_MAX_ALPHABET + " and a quarter of the vocabulary"),
      LearnerOption.of(MIN_PAIR_COUNT, Long.toString(WordPieceTraining.DEFAULT_MIN_PAIR_COUNT),
          "pairs occurring fewer times are never merged"),
      LearnerOption.of(SCORE, SCORES.get(0), "how candidate pairs are ranked: " + String.join(" or ", SCORES)),
      LearnerOption.of(MARKER, WordPieceSettings.DEFAULT_MARKER, "the prefix that marks a continuation token"),
      LearnerOption.of(UNKNOWN_TOKEN, WordPieceSettings.DEFAULT_UNKNOWN, "the spelling of the unknown token"));

  /** For {@link java.util.ServiceLoader}. */
  public WordPieceLearnerProvider() {}

  @Override
  public String scheme() {
    return WordPieceSegmenter.SCHEME;
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
    boolean auto = options.string(MAX_ALPHABET).equals(AUTO);
    int alphabet = auto ? autoAlphabet(settings.vocabularySize(), settings.reservedTokens().size() + 1)
        : options.intValue(MAX_ALPHABET, 1, Integer.MAX_VALUE);
    Learner learner = WordPieceTraining.builder()
        .vocabularySize(settings.vocabularySize())
        .minCount(settings.minCount())
        .reservedTokens(settings.reservedTokens())
        .listener(settings.listener())
        .maxAlphabet(alphabet)
        .minPairCount(options.longValue(MIN_PAIR_COUNT, 1, Long.MAX_VALUE))
        .score(score.equals(SCORES.get(0)) ? WordPieceTraining.Score.LIKELIHOOD_GAIN : WordPieceTraining.Score.PAIR_RATIO)
        .settings(wp)
        .build();
    String note = " (option " + MAX_ALPHABET + (auto ? " chosen automatically: " : " now ") + alphabet + " code points)";
    return new Learner() {
      @Override
      public String scheme() {
        return WordPieceSegmenter.SCHEME;
      }

      @Override
      public Tokenizer train(PieceCounts counts) {
        try {
          return learner.train(counts);
        } catch (IllegalArgumentException e) {
          // in the words of this provider's options
          throw new IllegalArgumentException(e.getMessage().replace("maxAlphabet=" + alphabet, "option " + MAX_ALPHABET)
              .replace("lower maxAlphabet", "lower option " + MAX_ALPHABET + note), e);
        }
      }
    };
  }

  /**
   * {@code max-alphabet=auto}: the learner's default of {@value WordPieceTraining#DEFAULT_MAX_ALPHABET}
   * code points, lowered so that both forms of every code point take at most half of the vocabulary.
   */
  static int autoAlphabet(int vocabularySize, int reservedIds) {
    int room = (vocabularySize - reservedIds - 1) / AUTO_ALPHABET_DIVISOR;
    return Math.max(1, Math.min(WordPieceTraining.DEFAULT_MAX_ALPHABET, room));
  }

  private static String name(WordPieceTraining.Score s) {
    return s.name().toLowerCase(Locale.ROOT).replace('_', '-');
  }
}
