package dev.morsel.tokenize.spi;

import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.ReviewDocument;

/**
 * Reads a {@link Segmenter} of one scheme from a model file. Found through {@link java.util.ServiceLoader}
 * by {@link #scheme()}, so the api module knows no segmenter class.
 *
 * @since 0.1.0
 */
public interface SegmenterProvider {
  /** The scheme name written in model files, for example {@code "bpe"}. */
  String scheme();

  /**
   * Builds the segmenter from its sections, validating everything first. Every count and entry read
   * from the file is checked against {@code limits} (vocabulary entries, merges, reserved tokens,
   * token bytes) before anything proportional to it is allocated, through
   * {@link ModelLimits#readVocabularyCount}, {@link ModelLimits#readMergeCount},
   * {@link ModelLimits#readReservedCount} and {@link ModelLimits#readToken}.
   *
   * @throws dev.morsel.tokenize.format.ModelFormatException naming the section that is wrong, or the
   *     limit that is exceeded and how to raise it
   */
  Segmenter read(ModelSections sections, ModelLimits limits);

  /**
   * Builds the segmenter from its sections of a review text (those its {@link
   * Segmenter#writeReview} writes), validating everything first. Ask for each section with {@link
   * ReviewDocument#section}; report a wrong value with the row's {@code fail}, which names the line
   * and the column.
   *
   * @throws dev.morsel.tokenize.format.ModelFormatException naming the line and column that is wrong;
   *     by default, because this scheme has no review text form
   */
  default Segmenter readReview(ReviewDocument review) {
    throw review.fail("segmenters of scheme " + scheme() + " have no review text form");
  }
}
