package dev.morsel.tokenize.wordpiece.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.Extender;
import dev.morsel.tokenize.train.ExtensionSettings;
import dev.morsel.tokenize.train.AlphabetPolicy;
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
  static final String MAX_ALPHABET = AlphabetPolicy.MAX_SIZE_OPTION;
  static final String MIN_PAIR_COUNT = "min-pair-count";
  static final String BYTE_SPELLING = "byte-spelling";
  static final String SCORE = "score";
  static final String MARKER = "marker";
  static final String UNKNOWN_TOKEN = "unknown-token";
  static final String AUTO = AlphabetPolicy.AUTO;

  private static final List<String> SCORES = List.of(name(WordPieceTraining.Score.LIKELIHOOD_GAIN),
      name(WordPieceTraining.Score.PAIR_RATIO));

  private static List<LearnerOption> declared() {
    List<LearnerOption> all = new java.util.ArrayList<>();
    all.add(LearnerOption.of(BYTE_SPELLING, AUTO,
        "characters outside the alphabet are spelled with byte tokens (UTF-8), not the unknown token for their piece;"
            + " auto: on from " + WordPieceTraining.BYTE_SPELLING_FROM + " ids"));
    all.addAll(AlphabetPolicy.options(
        "a quarter of the ids left after the reserved and unknown tokens (each character has two forms)"));
    all.addAll(MORE);
    return List.copyOf(all);
  }

  private static final List<LearnerOption> MORE = List.of(
      LearnerOption.of(MIN_PAIR_COUNT, Long.toString(WordPieceTraining.DEFAULT_MIN_PAIR_COUNT),
          "pairs occurring fewer times are never merged"),
      LearnerOption.of(SCORE, SCORES.get(0), "how candidate pairs are ranked: " + String.join(" or ", SCORES)),
      LearnerOption.of(MARKER, WordPieceSettings.DEFAULT_MARKER, "the prefix that marks a continuation token"),
      LearnerOption.of(UNKNOWN_TOKEN, WordPieceSettings.DEFAULT_UNKNOWN, "the spelling of the unknown token"));

  private static final List<LearnerOption> OPTIONS = declared();

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
      wp = WordPieceSettings.defaults().withMarker(options.string(MARKER)).withUnknownToken(options.string(UNKNOWN_TOKEN))
          .withByteSpelling(options.string(BYTE_SPELLING).equals(AUTO)
              ? WordPieceTraining.defaultByteSpelling(settings.vocabularySize()) : options.booleanValue(BYTE_SPELLING));
    } catch (IllegalArgumentException e) {
      throw new IllegalArgumentException(scheme() + " options: " + e.getMessage(), e);
    }
    String score = options.choice(SCORE, SCORES);
    AlphabetPolicy policy = AlphabetPolicy.fromOptions(options);
    boolean auto = policy.maxSize() == AlphabetPolicy.DERIVED_MAX_SIZE;
    int alphabet = auto ? WordPieceTraining.derivedAlphabetCap(settings.vocabularySize(),
        settings.reservedTokens().size() + (wp.byteSpelling() ? 256 : 0))
        : policy.maxSize();
    Learner learner = WordPieceTraining.builder()
        .vocabularySize(settings.vocabularySize())
        .minCount(settings.minCount())
        .reservedTokens(settings.reservedTokens())
        .listener(settings.listener())
        .alphabet(policy)
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
          throw new IllegalArgumentException(e.getMessage()
              .replace("lower the alphabet's maxSize or coverage", "lower option " + MAX_ALPHABET + " or "
                  + AlphabetPolicy.COVERAGE_OPTION + note), e);
        }
      }
    };
  }

  /**
   * Options {@code max-alphabet} (the code points the base lacks that may be added; {@code auto}: a
   * quarter of the added ids, as a learner's derived cap is a quarter of its free ids),
   * {@code min-pair-count} and {@code score} apply;
   * {@code marker} and {@code unknown-token} are the base's and must be left at their defaults or equal the base's.
   */
  @Override
  public Extender extender(ExtensionSettings settings, LearnerOptions options) {
    String score = options.choice(SCORE, SCORES);
    AlphabetPolicy policy = AlphabetPolicy.fromOptions(options);
    int alphabet = policy.maxSize() == AlphabetPolicy.DERIVED_MAX_SIZE ? Math.max(1, settings.addedIds() / 4)
        : policy.maxSize();
    WordPieceExtension inner = new WordPieceExtension(settings.addedIds(), settings.minCount(), alphabet,
        options.longValue(MIN_PAIR_COUNT, 1, Long.MAX_VALUE),
        score.equals(SCORES.get(0)) ? WordPieceTraining.Score.LIKELIHOOD_GAIN : WordPieceTraining.Score.PAIR_RATIO,
        settings.listener());
    String marker = options.string(MARKER);
    String unknown = options.string(UNKNOWN_TOKEN);
    return new Extender() {
      @Override
      public String scheme() {
        return WordPieceSegmenter.SCHEME;
      }

      @Override
      public Tokenizer extend(Tokenizer base, PieceCounts counts) {
        WordPieceSegmenter seg = WordPieceExtension.baseSegmenter(base, counts);
        WordPieceSettings own = seg.settings();
        if (!marker.equals(WordPieceSettings.DEFAULT_MARKER) && !marker.equals(own.marker())) {
          throw options.wrong(MARKER, marker, "differs from the base's marker '" + own.marker()
              + "'; an extension keeps the base's", null);
        }
        if (!unknown.equals(WordPieceSettings.DEFAULT_UNKNOWN) && !unknown.equals(own.unknownToken())) {
          throw options.wrong(UNKNOWN_TOKEN, unknown, "differs from the base's unknown token '" + own.unknownToken()
              + "'; an extension keeps the base's", null);
        }
        return inner.extend(base, counts, seg);
      }
    };
  }

  private static String name(WordPieceTraining.Score s) {
    return s.name().toLowerCase(Locale.ROOT).replace('_', '-');
  }
}
