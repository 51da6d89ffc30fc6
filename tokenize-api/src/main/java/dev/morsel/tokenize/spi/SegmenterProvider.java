package dev.morsel.tokenize.spi;

import dev.morsel.tokenize.format.ModelSections;

/**
 * Reads a {@link Segmenter} of one kind from a model file. Found through {@link java.util.ServiceLoader}
 * by {@link #kind()}, so the api module knows no segmenter class.
 *
 * @since 0.1.0
 */
public interface SegmenterProvider {
  /** The kind name written in model files, for example {@code "bpe"}. */
  String kind();

  /**
   * Builds the segmenter from its sections, validating everything first.
   *
   * @throws dev.morsel.tokenize.format.ModelFormatException naming the section that is wrong
   */
  Segmenter read(ModelSections sections);
}
