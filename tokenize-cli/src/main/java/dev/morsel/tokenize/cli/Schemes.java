package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.bpe.BpeLearner;
import dev.morsel.tokenize.bpe.BpeSegmenter;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import dev.morsel.tokenize.unigram.UnigramLearner;
import dev.morsel.tokenize.unigram.UnigramModel;
import dev.morsel.tokenize.wordpiece.WordPieceLearner;
import dev.morsel.tokenize.wordpiece.WordPieceSegmenter;
import java.util.List;
import java.util.Locale;

/**
 * Trains a tokenizer of a named scheme from piece counts: the one place that knows every trainer.
 * A {@link Plan} is made, and its settings checked, before any counting, so a size that cannot work
 * fails at once; errors speak of command-line options, not Java settings.
 */
final class Schemes {
  /** The scheme names, in the order reports list them. */
  static final List<String> NAMES = List.of("bpe", "wordpiece", "unigram");
  /** {@code --alphabet auto}: the WordPiece alphabet takes at most this share of the vocabulary (each code point has two forms). */
  static final int AUTO_ALPHABET_DIVISOR = 4;

  private Schemes() {}

  static void check(String scheme) {
    if (!NAMES.contains(scheme)) {
      throw new Morsel.UsageException("unknown scheme '" + scheme + "'; choose one of " + String.join(", ", NAMES));
    }
  }

  /**
   * The WordPiece alphabet for {@code --alphabet}: a number of code points, or {@code auto} (0 here):
   * the learner's default of {@value WordPieceLearner#DEFAULT_MAX_ALPHABET} code points, lowered so that
   * both forms of every code point take at most half of the vocabulary.
   */
  static int alphabetFor(int alphabet, int vocabularySize, int reserved) {
    if (alphabet > 0) {
      return alphabet;
    }
    int room = (vocabularySize - reserved - 1) / AUTO_ALPHABET_DIVISOR;
    return Math.max(1, Math.min(WordPieceLearner.DEFAULT_MAX_ALPHABET, room));
  }

  /** A trainer whose settings are checked. */
  interface Plan {
    Tokenizer train(PieceCounts counts, TrainingListener listener);
  }

  /**
   * Checks the settings of {@code scheme} at {@code vocabularySize} before counting: a {@link
   * Morsel.UsageException} names the option to change.
   *
   * @param alphabet WordPiece alphabet in code points; 0 chooses it from the vocabulary size
   */
  static Plan plan(String scheme, Pipeline pipeline, int vocabularySize, List<String> reserved, int alphabet, int threads) {
    check(scheme);
    if (vocabularySize <= 0) {
      throw new Morsel.UsageException("--vocab-size must be positive, got " + vocabularySize);
    }
    int floor = floor(scheme, reserved.size());
    if (vocabularySize < floor) {
      throw new Morsel.UsageException(String.format(Locale.ROOT, "--vocab-size %,d is below %,d, the least %s can use (%s)",
          vocabularySize, floor, scheme, floorReason(scheme, reserved.size())));
    }
    try {
      switch (scheme) {
        case "bpe": {
          BpeLearner.Builder b = BpeLearner.builder().vocabularySize(vocabularySize).reservedTokens(reserved).threads(threads);
          b.build();
          return (counts, listener) -> {
            BpeSegmenter s = b.listener(listener).build().train(counts);
            return Tokenizers.of(pipeline, s, s.reservedTokens(), Template.none());
          };
        }
        case "wordpiece": {
          int maxAlphabet = alphabetFor(alphabet, vocabularySize, reserved.size() + 1);
          WordPieceLearner.Builder b = WordPieceLearner.builder().vocabularySize(vocabularySize).reservedTokens(reserved)
              .maxAlphabet(maxAlphabet);
          b.build();
          return (counts, listener) -> {
            try {
              WordPieceSegmenter s = b.listener(listener).build().train(counts);
              return Tokenizers.of(pipeline, s, s.reservedTokens(), Template.none());
            } catch (IllegalArgumentException e) {
              throw new IllegalArgumentException(cliWords(e.getMessage(), maxAlphabet, alphabet == 0), e);
            }
          };
        }
        default: {
          UnigramLearner.Builder b = UnigramLearner.builder().vocabularySize(vocabularySize).reservedTokens(reserved)
              .rawBytes(true).threads(threads);
          b.build();
          return (counts, listener) -> {
            try {
              UnigramModel s = b.listener(listener).build().train(counts);
              return Tokenizers.of(pipeline, s, s.reservedTokens(), Template.none());
            } catch (IllegalArgumentException e) {
              throw new IllegalArgumentException(cliWords(e.getMessage(), 0, false), e);
            }
          };
        }
      }
    } catch (IllegalArgumentException e) {
      throw new Morsel.UsageException(cliWords(e.getMessage(), 0, false));
    }
  }

  /** The least vocabulary size a scheme accepts before it has seen the corpus. */
  static int floor(String scheme, int reserved) {
    switch (scheme) {
      case "bpe": return 256 + reserved;
      case "wordpiece": return 2 + reserved;
      default: return 256 + reserved + 2;
    }
  }

  private static String floorReason(String scheme, int reserved) {
    String r = reserved == 0 ? "" : " + " + reserved + " reserved token" + (reserved == 1 ? "" : "s");
    switch (scheme) {
      case "bpe": return "256 byte tokens" + r;
      case "wordpiece": return "the unknown token" + r + " + at least one character";
      default: return "256 byte tokens + the unknown token" + r + " + at least one character";
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
