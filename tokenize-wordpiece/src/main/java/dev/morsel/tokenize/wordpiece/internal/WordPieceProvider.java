package dev.morsel.tokenize.wordpiece.internal;

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
    return WordPieceSegmenter.read(sections, limits);
  }

  @Override
  public Segmenter readReview(ReviewDocument review) {
    return WordPieceSegmenter.readReview(review);
  }
}
