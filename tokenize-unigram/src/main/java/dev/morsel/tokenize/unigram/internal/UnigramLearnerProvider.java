package dev.morsel.tokenize.unigram.internal;

import dev.morsel.tokenize.train.Extender;
import dev.morsel.tokenize.train.ExtensionSettings;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerOption;
import dev.morsel.tokenize.train.LearnerOptions;
import dev.morsel.tokenize.train.LearnerProvider;
import dev.morsel.tokenize.train.LearnerSettings;
import java.util.List;

/** Makes unigram learners by scheme name; registered for {@link java.util.ServiceLoader}. */
public final class UnigramLearnerProvider implements LearnerProvider {
  static final String BYTE_SPELLING = "byte-spelling";
  static final String UNKNOWN_TOKEN = "unknown-token";
  static final String CANDIDATE_MULTIPLE = "candidate-multiple";
  static final String MAX_TOKEN_CODE_POINTS = "max-token-code-points";
  static final String KEEP_SHARE = "keep-share";
  static final String EM_PASSES = "em-passes";
  static final String SEED_TABLE_LIMIT = "seed-table-limit";
  static final String MAX_PIECE_LENGTH = "max-piece-length";

  private static List<LearnerOption> declared() {
    List<LearnerOption> all = new java.util.ArrayList<>();
    all.add(LearnerOption.of(BYTE_SPELLING, Boolean.toString(Training.DEFAULT_BYTE_SPELLING),
        "characters outside the alphabet are spelled with byte tokens (UTF-8), not the unknown token"));
    all.addAll(AlphabetPolicy.options("half the ids left after the reserved, byte and unknown tokens"));
    all.addAll(MORE);
    return List.copyOf(all);
  }

  private static final List<LearnerOption> MORE = List.of(
      LearnerOption.of(UNKNOWN_TOKEN, UnigramSegmenter.DEFAULT_UNKNOWN, "the spelling of the unknown token"),
      LearnerOption.of(CANDIDATE_MULTIPLE, Integer.toString(Training.DEFAULT_CANDIDATE_MULTIPLE),
          "seed candidates as a multiple of the pieces wanted (1..1000)"),
      LearnerOption.of(MAX_TOKEN_CODE_POINTS, Integer.toString(Training.DEFAULT_MAX_TOKEN_CODE_POINTS),
          "longest token learned, in code points (1..64)"),
      LearnerOption.of(KEEP_SHARE, Double.toString(Training.DEFAULT_KEEP_SHARE),
          "share of the vocabulary each pruning round keeps, in (0, 0.99]"),
      LearnerOption.of(EM_PASSES, Integer.toString(Training.DEFAULT_EM_PASSES), "EM passes before each pruning round (1..100)"),
      LearnerOption.of(SEED_TABLE_LIMIT, Integer.toString(Training.DEFAULT_SEED_TABLE_LIMIT),
          "entries of the seed substring table before rare ones are dropped"),
      LearnerOption.of(MAX_PIECE_LENGTH, Integer.toString(Training.DEFAULT_MAX_PIECE_LENGTH),
          "pieces longer than this many UTF-16 units are left out of learning"));

  private static final List<LearnerOption> OPTIONS = declared();

  /** For {@link java.util.ServiceLoader}. */
  public UnigramLearnerProvider() {}

  @Override
  public String scheme() {
    return UnigramSegmenter.SCHEME;
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
    boolean byteSpelling = options.booleanValue(BYTE_SPELLING);
    AlphabetPolicy alphabet = AlphabetPolicy.fromOptions(options);
    String unknown = options.string(UNKNOWN_TOKEN);
    int candidates = options.intValue(CANDIDATE_MULTIPLE, 1, 1000);
    int tokenLength = options.intValue(MAX_TOKEN_CODE_POINTS, 1, 64);
    double keep = options.doubleValue(KEEP_SHARE, 0, Training.MAX_KEEP_SHARE, true);
    int passes = options.intValue(EM_PASSES, 1, 100);
    int seedTable = options.intValue(SEED_TABLE_LIMIT, 1000, 100_000_000);
    int pieceLength = options.intValue(MAX_PIECE_LENGTH, 1, 1 << 26);
    try {
      return new Training(settings.vocabularySize(), candidates, tokenLength, keep, passes, byteSpelling, alphabet,
          settings.reservedTokens(), unknown, Math.min(settings.threads(), Training.MAX_THREADS), seedTable, pieceLength,
          settings.minCount(), settings.listener());
    } catch (IllegalArgumentException e) {
      throw new IllegalArgumentException(scheme() + ": " + e.getMessage(), e);
    }
  }

  /**
   * The seed, pruning and piece-length options apply to the new pieces; {@code raw-bytes} and
   * {@code unknown-token} are the base's (given values are ignored).
   */
  @Override
  public Extender extender(ExtensionSettings settings, LearnerOptions options) {
    try {
      return new UnigramExtension(settings.addedIds(), options.intValue(CANDIDATE_MULTIPLE, 1, 1000),
          options.intValue(MAX_TOKEN_CODE_POINTS, 1, 64), options.doubleValue(KEEP_SHARE, 0, Training.MAX_KEEP_SHARE, true),
          options.intValue(EM_PASSES, 1, 100), options.intValue(SEED_TABLE_LIMIT, 1000, 100_000_000),
          options.intValue(MAX_PIECE_LENGTH, 1, 1 << 26), settings.minCount(),
          Math.min(settings.threads(), Training.MAX_THREADS), settings.listener());
    } catch (IllegalArgumentException e) {
      throw new IllegalArgumentException(scheme() + ": " + e.getMessage(), e);
    }
  }
}
