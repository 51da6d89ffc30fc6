package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.ControlTokens;
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

  /** Trains {@code scheme} to {@code vocabularySize} ids (control tokens included). */
  static Tokenizer train(String scheme, PieceCounts counts, Pipeline pipeline, int vocabularySize, List<String> controls,
      int threads, TrainingListener listener) {
    check(scheme);
    switch (scheme) {
      case "bpe": {
        BpeSegmenter s = BpeLearner.builder().vocabularySize(vocabularySize).controlTokens(controls).threads(threads)
            .listener(listener).build().train(counts);
        return Tokenizers.of(pipeline, s, s.controlTokens(), Template.none());
      }
      case "wordpiece": {
        WordPieceSegmenter s = WordPieceLearner.builder().vocabularySize(vocabularySize).controlTokens(controls)
            .listener(listener).build().train(counts);
        return Tokenizers.of(pipeline, s, s.controlTokens(), Template.none());
      }
      case "unigram": {
        UnigramModel s = UnigramLearner.builder().vocabularySize(vocabularySize).controlTokens(controls).rawBytes(true)
            .threads(threads).listener(listener).build().train(counts);
        return Tokenizers.of(pipeline, s, s.controlTokens(), Template.none());
      }
      default:
        throw new Morsel.UsageException("unknown scheme '" + scheme + "'");
    }
  }

  /** The control tokens of a trained tokenizer, for reports. */
  static ControlTokens controls(Tokenizer t) {
    return t.controlTokens();
  }
}
