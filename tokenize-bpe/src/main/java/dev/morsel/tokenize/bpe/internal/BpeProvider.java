package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.format.AlphabetRecord;
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
    BpeSegmenter s = BpeSegmenter.read(sections, limits);
    s.recordAlphabet(AlphabetRecord.read(sections));
    return s;
  }

  @Override
  public Segmenter readReview(ReviewDocument review) {
    BpeSegmenter s = BpeSegmenter.readReview(review);
    s.recordAlphabet(AlphabetRecord.readReview(review));
    return s;
  }
}
