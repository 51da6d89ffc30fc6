package dev.morsel.tokenize.spark;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.bpe.BpeSegmenter;
import dev.morsel.tokenize.bpe.BpeLearner;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.wordpiece.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.WordPieceLearner;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;

/**
 * The segmenters the Spark tests run with, one trainer per scheme. A new scheme is one more entry
 * in {@link #TRAINERS} (and its module as a test dependency).
 */
final class TestModels {
  /** A reserved token spelling of our own, for the trust tests. */
  static final String DOCK = "\u27e6dock\u27e7";

  /** Trains a scheme's segmenter to a vocabulary size, with the given reserved tokens, into a tokenizer. */
  interface Trainer {
    Tokenizer train(PieceCounts counts, Pipeline pipeline, int vocabularySize, List<String> reserved);
  }

  static final Map<String, Trainer> TRAINERS = new LinkedHashMap<>();

  static {
    TRAINERS.put("bpe", (counts, pipeline, size, reserved) -> {
      BpeSegmenter s = BpeLearner.builder().vocabularySize(size).reservedTokens(reserved).threads(1).build().train(counts);
      return Tokenizers.of(pipeline, s, s.reservedTokens(), Template.none());
    });
    TRAINERS.put("wordpiece", (counts, pipeline, size, reserved) -> {
      WordPieceSegmenter s = WordPieceLearner.builder().vocabularySize(size).reservedTokens(reserved).build().train(counts);
      return Tokenizers.of(pipeline, s, s.reservedTokens(), Template.none());
    });
  }

  private TestModels() {}

  /** The scheme names, for {@code @MethodSource}. */
  static Stream<String> schemes() {
    return TRAINERS.keySet().stream();
  }

  static Tokenizer train(String scheme, PieceCounts counts, Pipeline pipeline, int vocabularySize, List<String> reserved) {
    return TRAINERS.get(scheme).train(counts, pipeline, vocabularySize, reserved);
  }
}
