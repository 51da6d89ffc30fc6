package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.ReservedTokens;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.bpe.BpeSegmenter;
import dev.morsel.tokenize.bpe.BpeLearner;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.unigram.UnigramModel;
import dev.morsel.tokenize.unigram.UnigramLearner;
import dev.morsel.tokenize.wordpiece.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.WordPieceLearner;
import dev.morsel.tokenize.train.TrainingListener;
import java.util.List;

/** Trains a tokenizer of a named scheme from piece counts: the one place that knows every trainer. */
final class Schemes {
  /** The scheme names, in the order reports list them. */
  static final List<String> NAMES = List.of("bpe", "wordpiece", "unigram");

  private Schemes() {}

  static void check(String scheme) {
    if (!NAMES.contains(scheme)) {
      throw new Morsel.UsageException("unknown scheme '" + scheme + "'; choose one of " + NAMES);
    }
  }

  /** Trains {@code scheme} to {@code vocabularySize} ids (reserved tokens included). */
  static Tokenizer train(String scheme, PieceCounts counts, Pipeline pipeline, int vocabularySize, List<String> reserved,
      int threads, TrainingListener listener) {
    check(scheme);
    switch (scheme) {
      case "bpe": {
        BpeSegmenter s = BpeLearner.builder().vocabularySize(vocabularySize).reservedTokens(reserved).threads(threads)
            .listener(listener).build().train(counts);
        return Tokenizers.of(pipeline, s, s.reservedTokens(), Template.none());
      }
      case "wordpiece": {
        WordPieceSegmenter s = WordPieceLearner.builder().vocabularySize(vocabularySize).reservedTokens(reserved)
            .listener(listener).build().train(counts);
        return Tokenizers.of(pipeline, s, s.reservedTokens(), Template.none());
      }
      case "unigram": {
        UnigramModel s = UnigramLearner.builder().vocabularySize(vocabularySize).reservedTokens(reserved).rawBytes(true)
            .threads(threads).listener(listener).build().train(counts);
        return Tokenizers.of(pipeline, s, s.reservedTokens(), Template.none());
      }
      default:
        throw new Morsel.UsageException("unknown scheme '" + scheme + "'");
    }
  }

  /** The reserved tokens of a trained tokenizer, for reports. */
  static ReservedTokens reserved(Tokenizer t) {
    return t.reservedTokens();
  }
}
