package dev.morsel.tokenize;

/**
 * Which end of a sequence an operation (truncation, padding) works on.
 *
 * @since 0.1.0
 */
public enum Side {
  /** The beginning of the sequence. */
  START,
  /** The end of the sequence. */
  END
}
