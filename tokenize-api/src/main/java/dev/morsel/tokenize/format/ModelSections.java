package dev.morsel.tokenize.format;

import java.nio.ByteBuffer;
import java.util.Set;

/**
 * The validated sections of a model file, each a read-only view of its payload. Immutable.
 *
 * @since 0.1.0
 */
public interface ModelSections {
  /** The tags present, in tag order. */
  Set<String> tags();

  /** Whether section {@code tag} is present. */
  boolean has(String tag);

  /**
   * A reader over section {@code tag}'s payload (a fresh reader each call).
   *
   * @throws ModelFormatException if the section is missing
   */
  SectionReader reader(String tag);

  /**
   * A read-only, little-endian view of section {@code tag}'s whole payload (no copy; a fresh view each
   * call, position 0).
   *
   * @throws ModelFormatException if the section is missing
   */
  default ByteBuffer payload(String tag) {
    SectionReader r = reader(tag);
    return r.getSlice("payload", r.remaining());
  }

  /** SHA-256 (lowercase hex) of the canonical content: every section but {@code META}, in tag order. */
  String fingerprint();
}
