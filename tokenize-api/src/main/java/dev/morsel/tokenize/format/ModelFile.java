package dev.morsel.tokenize.format;

import java.nio.ByteBuffer;
import java.util.Map;

/**
 * Morsel's model file container. SKELETON: signatures fixed, bodies to be written.
 *
 * @since 0.1.0
 */
public final class ModelFile {
  private ModelFile() {}

  /** The container's bytes for these section payloads (tag order). */
  public static byte[] write(Map<String, byte[]> sections) { throw new UnsupportedOperationException(); }

  /** Validates the whole container, then returns its sections (views into {@code file}). */
  public static ModelSections read(ByteBuffer file) { throw new UnsupportedOperationException(); }

  /** Reads and validates a model file's bytes. */
  public static ModelSections read(byte[] file) { throw new UnsupportedOperationException(); }

  /** Reads and validates a model file. */
  public static ModelSections read(java.nio.file.Path file) { throw new UnsupportedOperationException(); }

  /** SHA-256 (lowercase hex) of the canonical content: every section but {@code META}, in tag order. */
  public static String fingerprint(Map<String, byte[]> sections) { throw new UnsupportedOperationException(); }
}
