package dev.morsel.tokenize.format;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Map;
import java.util.Objects;
import java.util.TreeMap;

/**
 * Morsel's model file container: a little-endian header with magic bytes and a format version, a
 * table of sections (four-character tag, CRC-32C, offset, length) and the 8-byte aligned payloads.
 * The byte layout is specified in {@code docs/format.md}. Stateless and thread-safe.
 *
 * <p>Contract:
 * <ul>
 *   <li>{@link #write(Map)} is deterministic: the same payloads give the same bytes (the layout is
 *       canonical: tag order, fixed alignment, zero padding).
 *   <li>{@link #read(ByteBuffer)} validates <em>everything</em> (magic, version, counts, lengths,
 *       offsets, tag syntax and order, header CRC, every payload CRC, padding, total length) before it
 *       returns; every failure is a {@link ModelFormatException} naming the section ({@code "header"},
 *       {@code "table"} or the tag) and the offset, with expected and found values. No length read
 *       from a file leads to an allocation larger than the file.
 *   <li>The {@linkplain #fingerprint(Map) fingerprint} is SHA-256 over the canonical content of every
 *       section except {@link #TAG_METADATA}; it is the same before writing and after reading.
 * </ul>
 *
 * <p>Note: the checksum is CRC-32C [1] ({@link java.util.zip.CRC32C}); the digest is SHA-256 [2].
 * <ol>
 *   <li>RFC 3720, iSCSI, Section 12.1 and Appendix B.4 (CRC-32C, Castagnoli polynomial).
 *   <li>FIPS PUB 180-4, Secure Hash Standard.
 * </ol>
 *
 * @since 0.1.0
 */
public final class ModelFile {
  /** Largest model file, in bytes: 2 GiB - 1, because a file is read as one {@link ByteBuffer}. */
  public static final long MAX_MODEL_BYTES = Integer.MAX_VALUE;

  /** Largest number of sections; a model needs about ten, and the table then stays under 2 KiB. */
  public static final int MAX_SECTIONS = 64;

  /** Section tag: the scheme, one string. */
  public static final String TAG_SCHEME = "SCHM";

  /** Section tag: the pipeline, two strings (normalization spec, splitting spec). */
  public static final String TAG_PIPELINE = "PIPE";

  /** Section tag: reserved tokens, a count then (id u32, spelling string) per token. */
  public static final String TAG_RESERVED = "RSRV";

  /** Section tag: the framing template, three lists of reserved spellings (begin, separator, end). */
  public static final String TAG_FRAMING = "FRAM";

  /** Section tag: free key/value metadata, excluded from the fingerprint. */
  public static final String TAG_METADATA = "META";

  private ModelFile() {}

  /**
   * The container's bytes for these section payloads (tag order).
   *
   * @param sections payloads by tag; tags are four characters from {@code A-Z0-9}; the arrays are read, not kept
   * @throws IllegalArgumentException for a malformed tag, a null payload, more than {@link #MAX_SECTIONS}
   *     sections or a total over {@link #MAX_MODEL_BYTES}
   */
  public static byte[] write(Map<String, byte[]> sections) {
    return ModelFileLayout.write(sections);
  }

  /**
   * Validates the whole container, then returns its sections (views into {@code file}). Reads
   * {@code file}'s bytes from its position to its limit and does not move its position; heap, direct
   * and mapped buffers all work. The sections are read-only slices (no copy), valid as long as the
   * buffer's memory is. Uses {@link ModelLimits#defaults()}.
   *
   * @throws ModelFormatException if anything in the container is wrong
   */
  public static ModelSections read(ByteBuffer file) {
    return read(file, ModelLimits.defaults());
  }

  /**
   * As {@link #read(ByteBuffer)} with explicit limits.
   *
   * @throws ModelFormatException if anything in the container is wrong or a limit is exceeded
   */
  public static ModelSections read(ByteBuffer file, ModelLimits limits) {
    Objects.requireNonNull(file, "file");
    Objects.requireNonNull(limits, "limits");
    return new ValidatedSections(ModelFileLayout.validate(file, limits));
  }

  /**
   * As {@link #read(ByteBuffer)} over an array; the sections view the array, so do not change it afterwards.
   *
   * @throws ModelFormatException if anything in the container is wrong
   */
  public static ModelSections read(byte[] file) {
    Objects.requireNonNull(file, "file");
    return read(ByteBuffer.wrap(file));
  }

  /**
   * Memory-maps the file at {@code path} read-only and validates it as {@link #read(ByteBuffer)}.
   *
   * @throws UncheckedIOException naming the path if the file cannot be opened or mapped
   * @throws ModelFormatException naming the path and the section if the content is wrong
   */
  public static ModelSections read(Path path) {
    return read(path, ModelLimits.defaults());
  }

  /**
   * As {@link #read(Path)} with explicit limits; a file over {@code maxModelBytes} is refused before it is mapped.
   *
   * @throws UncheckedIOException naming the path if the file cannot be opened or mapped
   * @throws ModelFormatException naming the path and the section if the content is wrong or a limit is exceeded
   */
  public static ModelSections read(Path path, ModelLimits limits) {
    Objects.requireNonNull(path, "path");
    Objects.requireNonNull(limits, "limits");
    if (Files.isDirectory(path)) {
      throw new UncheckedIOException("cannot read model file " + path + ": it is a folder, not a file",
          new IOException(path + " is a directory"));
    }
    ByteBuffer mapped;
    try (FileChannel ch = FileChannel.open(path, StandardOpenOption.READ)) {
      long size = ch.size();
      if (size > limits.maxModelBytes()) {
        throw new ModelFormatException("header", path + ": file of " + size + " bytes exceeds "
            + ModelLimits.setting("maxModelBytes", limits.maxModelBytes()));
      }
      mapped = ch.map(FileChannel.MapMode.READ_ONLY, 0, size);
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read model file " + path + ": " + reason(e), e);
    }
    try {
      return read(mapped, limits);
    } catch (ModelFormatException e) {
      throw new ModelFormatException(e.section(), path + ": " + e.detail(), e);
    }
  }

  /**
   * SHA-256 (lowercase hex) of the canonical content: every section but {@code META}, in tag order.
   * For each section: its four tag bytes, its payload length as 8 bytes little-endian, its payload.
   * Equals {@link ModelSections#fingerprint()} of the file {@link #write(Map)} makes from the same map.
   *
   * @throws IllegalArgumentException for a malformed tag or a null payload
   */
  public static String fingerprint(Map<String, byte[]> sections) {
    Objects.requireNonNull(sections, "sections");
    TreeMap<String, ByteBuffer> sorted = new TreeMap<>();
    for (Map.Entry<String, byte[]> e : sections.entrySet()) {
      if (!ModelFileLayout.isTag(e.getKey())) {
        throw new IllegalArgumentException("section tag '" + e.getKey() + "' is not four characters from A-Z0-9");
      }
      if (e.getValue() == null) {
        throw new IllegalArgumentException("section " + e.getKey() + " has a null payload");
      }
      sorted.put(e.getKey(), ByteBuffer.wrap(e.getValue()));
    }
    return Digests.fingerprint(sorted);
  }

  /** Why a file cannot be read, in words: the exception's message alone is often just the path. */
  private static String reason(IOException e) {
    if (e instanceof java.nio.file.NoSuchFileException) {
      return "no such file";
    }
    if (e instanceof java.nio.file.AccessDeniedException) {
      return "permission denied";
    }
    String m = e.getMessage();
    return m == null ? e.getClass().getSimpleName() : m;
  }
}
