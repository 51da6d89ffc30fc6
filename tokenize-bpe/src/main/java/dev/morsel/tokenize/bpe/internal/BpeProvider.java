package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.ReviewDocument;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.SegmenterProvider;

/** Reads {@link BpeSegmenter}s from model files; registered for {@link java.util.ServiceLoader}. */
public final class BpeProvider implements SegmenterProvider {
  /** For {@link java.util.ServiceLoader}. */
  public BpeProvider() {}

  @Override
  public String scheme() {
    return BpeSegmenter.SCHEME;
  }

  @Override
  public Segmenter read(ModelSections sections, ModelLimits limits) {
    return BpeSegmenter.read(sections, limits);
  }

  @Override
  public Segmenter readReview(ReviewDocument review) {
    return BpeSegmenter.readReview(review);
  }
}
