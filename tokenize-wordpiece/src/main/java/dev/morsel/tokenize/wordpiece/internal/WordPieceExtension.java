package dev.morsel.tokenize.wordpiece.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.Extender;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import java.util.Objects;

/**
 * Extends a WordPiece model with the units that the learner's likelihood-gain criterion picks on a
 * new corpus ({@link WordPieceTraining#extend}): the base's units are the starting units, the new
 * pieces are written in them as encoding writes them, and the pairs with the highest gain are
 * merged into new units, appended after the base's ids. The base's marker, unknown token, reserved
 * tokens and piece-limit setting are kept. Greedy longest match encodes a piece that was one base
 * token as that token still (no longer token fits inside it). Immutable and thread-safe.
 */
public final class WordPieceExtension implements Extender {
  private final int addedIds;
  private final long minCount;
  private final int maxAlphabet;
  private final long minPairCount;
  private final WordPieceTraining.Score score;
  private final TrainingListener listener;

  /**
   * An extender with every setting checked.
   *
   * @throws IllegalArgumentException naming the setting that is out of range
   */
  public WordPieceExtension(int addedIds, long minCount, int maxAlphabet, long minPairCount,
      WordPieceTraining.Score score, TrainingListener listener) {
    if (addedIds < 1 || addedIds > WordPieceSegmenter.MAX_VOCABULARY_SIZE - 2) {
      throw new IllegalArgumentException("addedIds=" + addedIds + " is outside [1, "
          + (WordPieceSegmenter.MAX_VOCABULARY_SIZE - 2) + "] (a WordPiece model holds at most "
          + WordPieceSegmenter.MAX_VOCABULARY_SIZE + " ids)");
    }
    if (minCount < 1) {
      throw new IllegalArgumentException("minCount=" + minCount + " must be at least 1");
    }
    if (maxAlphabet < 1) {
      throw new IllegalArgumentException("maxAlphabet=" + maxAlphabet + " must be at least 1");
    }
    if (minPairCount < 1) {
      throw new IllegalArgumentException("minPairCount=" + minPairCount + " must be at least 1");
    }
    this.addedIds = addedIds;
    this.minCount = minCount;
    this.maxAlphabet = maxAlphabet;
    this.minPairCount = minPairCount;
    this.score = Objects.requireNonNull(score, "score");
    this.listener = Objects.requireNonNull(listener, "listener");
  }

  @Override
  public String scheme() {
    return WordPieceSegmenter.SCHEME;
  }

  @Override
  public Tokenizer extend(Tokenizer base, PieceCounts counts) {
    return extend(base, counts, baseSegmenter(base, counts));
  }

  /**
   * The base's segmenter, after the checks every extender makes ({@link Extender#checkInputs}) and the
   * check that it is this module's WordPiece segmenter.
   *
   * @throws IllegalArgumentException naming what is wrong
   */
  static WordPieceSegmenter baseSegmenter(Tokenizer base, PieceCounts counts) {
    Extender.checkInputs(WordPieceSegmenter.SCHEME, base, counts);
    Segmenter seg = Tokenizers.segmenterOf(base);
    if (!(seg instanceof WordPieceSegmenter)) {
      throw new IllegalArgumentException("the base's segmenter is not Morsel's WordPiece segmenter: " + seg);
    }
    return (WordPieceSegmenter) seg;
  }

  /** {@link #extend(Tokenizer, PieceCounts)} with the base's segmenter already checked ({@link #baseSegmenter}). */
  Tokenizer extend(Tokenizer base, PieceCounts counts, WordPieceSegmenter s) {
    long total = (long) s.vocabularySize() + addedIds;
    if (total > WordPieceSegmenter.MAX_VOCABULARY_SIZE) {
      throw new IllegalArgumentException("addedIds=" + addedIds + " would give " + total + " ids, over the "
          + WordPieceSegmenter.MAX_VOCABULARY_SIZE + " a WordPiece model may hold");
    }
    WordPieceTraining training = WordPieceTraining.builder()
        .vocabularySize((int) total)
        .minCount(minCount)
        .alphabet(AlphabetPolicy.defaults().withMaxSize(maxAlphabet))
        .reservedTokens(s.reservedSpellings())
        .settings(s.settings())
        .score(score)
        .minPairCount(minPairCount)
        .listener(listener)
        .build();
    WordPieceSegmenter extended = training.extend(s, counts, base.reservedTokens().spellings());
    if (extended.vocabularySize() == s.vocabularySize()) {
      throw new IllegalArgumentException("the piece counts offer no new unit (every pair is already a unit of the base"
          + (minPairCount > 1 ? ", or occurs fewer than minPairCount=" + minPairCount + " times" : "") + ")");
    }
    return Tokenizers.extension(base, extended);
  }
}
