package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.LearnerOption;
import dev.morsel.tokenize.train.LearnerOptions;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Trains a tokenizer of a named scheme from piece counts through the learner service interface
 * ({@link Learners}): the tool lists and builds whatever segmenter modules are on its class path.
 * A {@link Plan} is made, and its settings checked, before any counting, so a size that cannot work
 * fails at once; errors speak of command-line options, not Java settings.
 */
final class Schemes {
  /** The scheme names found, in the order reports list them. */
  static final List<String> NAMES = Learners.schemes();
  /** The learner option that caps an alphabet, where a scheme declares it ({@code --alphabet}). */
  static final String MAX_ALPHABET = "max-alphabet";
  /** {@code --alphabet auto}: the alphabet takes at most this share of the vocabulary (each code point has two forms). */
  static final int AUTO_ALPHABET_DIVISOR = 4;
  /** {@code --alphabet auto}: the most code points kept, whatever the vocabulary size. */
  static final int AUTO_ALPHABET_MAX = 1000;

  private Schemes() {}

  static void check(String scheme) {
    if (!NAMES.contains(scheme)) {
      throw new Morsel.UsageException("unknown scheme '" + scheme + "'; choose one of " + String.join(", ", NAMES));
    }
  }

  /**
   * The alphabet for {@code --alphabet}: a number of code points, or {@code auto} (0 here): at most
   * {@value #AUTO_ALPHABET_MAX} code points, lowered so that both forms of every code point take at
   * most half of the vocabulary.
   */
  static int alphabetFor(int alphabet, int vocabularySize, int reserved) {
    if (alphabet > 0) {
      return alphabet;
    }
    int room = (vocabularySize - reserved - 1) / AUTO_ALPHABET_DIVISOR;
    return Math.max(1, Math.min(AUTO_ALPHABET_MAX, room));
  }

  /** A trainer whose settings are checked. */
  interface Plan {
    Tokenizer train(PieceCounts counts, TrainingListener listener);
  }

  /**
   * Checks the settings of {@code scheme} at {@code vocabularySize} before counting: a {@link
   * Morsel.UsageException} names the option to change.
   *
   * @param alphabet alphabet in code points for schemes that declare {@value #MAX_ALPHABET}; 0 chooses
   *     it from the vocabulary size
   * @param options the scheme's own {@code name=value} options ({@code --option})
   */
  static Plan plan(String scheme, int vocabularySize, List<String> reserved, int alphabet, List<String> options,
      int threads) {
    check(scheme);
    if (vocabularySize <= 0) {
      throw new Morsel.UsageException("--vocab-size must be positive, got " + vocabularySize);
    }
    int floor = floor(scheme, reserved.size());
    if (vocabularySize < floor) {
      throw new Morsel.UsageException(String.format(Locale.ROOT, "--vocab-size %,d is below %,d, the least %s can use (%s)",
          vocabularySize, floor, scheme, floorReason(scheme, reserved.size())));
    }
    Map<String, String> given;
    try {
      given = new LinkedHashMap<>(LearnerOptions.parse(options));
    } catch (IllegalArgumentException | NullPointerException e) {
      throw new Morsel.UsageException("--option: " + e.getMessage());
    }
    boolean declaresAlphabet = Learners.provider(scheme).options().stream().map(LearnerOption::name)
        .anyMatch(MAX_ALPHABET::equals);
    int maxAlphabet = 0;
    if (declaresAlphabet && !given.containsKey(MAX_ALPHABET)) {
      maxAlphabet = alphabetFor(alphabet, vocabularySize, reserved.size() + 1);
      given.put(MAX_ALPHABET, Integer.toString(maxAlphabet));
    }
    boolean auto = alphabet == 0;
    int shownAlphabet = maxAlphabet;
    LearnerSettings settings;
    try {
      settings = LearnerSettings.of(vocabularySize).withReservedTokens(reserved).withThreads(threads);
      Learners.learner(scheme, settings, given); // every setting checked now, before counting
    } catch (IllegalArgumentException | NullPointerException e) {
      throw new Morsel.UsageException(cliWords(e.getMessage(), shownAlphabet, auto));
    }
    LearnerSettings checked = settings;
    return (counts, listener) -> {
      try {
        return Learners.learner(scheme, checked.withListener(listener), given).train(counts);
      } catch (IllegalArgumentException e) {
        throw new IllegalArgumentException(cliWords(e.getMessage(), shownAlphabet, auto), e);
      }
    };
  }

  /** The least vocabulary size a scheme accepts before it has seen the corpus. */
  static int floor(String scheme, int reserved) {
    switch (scheme) {
      case "bpe": return 256 + reserved;
      case "wordpiece": return 2 + reserved;
      case "unigram": return 256 + reserved + 2;
      default: return reserved + 1; // a scheme this tool has no floor for: its learner checks the rest
    }
  }

  private static String floorReason(String scheme, int reserved) {
    String r = reserved == 0 ? "" : " + " + reserved + " reserved token" + (reserved == 1 ? "" : "s");
    switch (scheme) {
      case "bpe": return "256 byte tokens" + r;
      case "wordpiece": return "the unknown token" + r + " + at least one character";
      case "unigram": return "256 byte tokens + the unknown token" + r + " + at least one character";
      default: return "at least one token" + r;
    }
  }

  /** Rewrites a trainer's message in terms of command-line options. */
  static String cliWords(String message, int maxAlphabet, boolean auto) {
    String m = message;
    if (m.contains("smaller than the alphabet")) {
      m = m.replace("; raise vocabularySize or lower maxAlphabet", "")
          + String.format(Locale.ROOT, "; raise --vocab-size or lower --alphabet (%s %,d code points)",
              auto ? "chosen automatically:" : "now", maxAlphabet);
    }
    return m.replace("vocabularySize=", "--vocab-size ").replace("maxAlphabet=", "--alphabet ")
        .replace(" (UnigramLearner.Builder.maxPieceLength)", "");
  }
}
