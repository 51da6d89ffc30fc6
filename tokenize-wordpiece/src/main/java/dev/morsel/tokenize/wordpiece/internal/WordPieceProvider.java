package dev.morsel.tokenize.wordpiece.internal;

import dev.morsel.tokenize.format.AlphabetRecord;
import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.ReviewDocument;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.SegmenterProvider;

/**
 * Finds {@link WordPieceSegmenter} by kind {@value WordPieceSegmenter#SCHEME} through
 * {@link java.util.ServiceLoader}. Not part of the API.
 */
public final class WordPieceProvider implements SegmenterProvider {
  /** Called by {@link java.util.ServiceLoader}. */
  public WordPieceProvider() {}

  @Override
  public String scheme() {
    return WordPieceSegmenter.SCHEME;
  }

  @Override
  public Segmenter read(ModelSections sections, ModelLimits limits) {
    WordPieceSegmenter s = WordPieceSegmenter.read(sections, limits);
    s.recordAlphabet(AlphabetRecord.read(sections));
    return s;
  }

  @Override
  public Segmenter readReview(ReviewDocument review) {
    WordPieceSegmenter s = WordPieceSegmenter.readReview(review);
    s.recordAlphabet(AlphabetRecord.readReview(review));
    return s;
  }
}
