package dev.morsel.tokenize.format;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.Collections;
import java.util.Map;
import java.util.Objects;
import java.util.TreeMap;

/**
 * Descriptor of the model container: offsets of every field, the canonical writer and the validator.
 * All integers are little-endian; "u32"/"u64" are unsigned.
 *
 * <pre>
 *  header (32 bytes)
 *  0        8        12       16                24       28       32
 *  +--------+--------+--------+-----------------+--------+--------+
 *  | magic  |version | count  |   file length   |reserved|hdr CRC |
 *  | 8 B    |u32 M.m | u32    |   u64           |u32 = 0 |CRC-32C |
 *  +--------+--------+--------+-----------------+--------+--------+
 *  magic    = 9E 4D 4F 52 53 0D 0A 00   (0x9E, "MORS", CR, LF, NUL)
 *  version  = major &lt;&lt; 16 | minor
 *  hdr CRC  = CRC-32C over bytes [0, 28) followed by the whole section table
 *
 *  section table (count entries of 24 bytes, from offset 32, strictly ascending tags)
 *  +0       +4       +8                +16               +24
 *  +--------+--------+-----------------+-----------------+
 *  | tag    |payload |  offset         |  length         |
 *  | 4 ASCII|CRC-32C |  u64            |  u64            |
 *  +--------+--------+-----------------+-----------------+
 *
 *  payloads, in table order; the first starts at 32 + 24 * count (a multiple of 8), each next one
 *  at the end of the previous one rounded up to a multiple of 8; pad bytes are zero; the file ends
 *  at the end of the last payload rounded up to a multiple of 8.
 * </pre>
 *
 * <p>The layout is canonical: a given set of payloads has exactly one valid encoding, so the
 * validator requires every offset to equal the one the writer computes. That single rule rules out
 * overlap, gaps other than padding, and payloads outside the file.
 */
final class ModelFileLayout {
  // ------------------------------------------------------------------ header offsets, in order

  static final int MAGIC_OFFSET = 0;
  static final int MAGIC_LENGTH = 8;
  static final int VERSION_OFFSET = 8;
  static final int COUNT_OFFSET = 12;
  static final int FILE_LENGTH_OFFSET = 16;
  static final int RESERVED_OFFSET = 24;
  static final int HEADER_CRC_OFFSET = 28;
  static final int HEADER_LENGTH = 32;

  // ------------------------------------------------------------------ table entry offsets, in order

  static final int ENTRY_TAG_OFFSET = 0;
  static final int ENTRY_CRC_OFFSET = 4;
  static final int ENTRY_PAYLOAD_OFFSET = 8;
  static final int ENTRY_PAYLOAD_LENGTH = 16;
  static final int ENTRY_LENGTH = 24;

  /** Payload alignment in bytes (lets readers view payloads as long/double arrays). */
  static final int ALIGNMENT = 8;

  /**
   * The magic. It answers one question before anything else is read: are these the bytes of a Morsel
   * model, untouched by text handling? Models travel as objects fetched by key from a store, as byte
   * arrays broadcast to Spark executors, and as resources packed into JARs; the failures seen on
   * those paths are the wrong bytes altogether (an error page saved under the model's key, another
   * broadcast, a review text) and bytes that some tool treated as text. Byte by byte:
   * <ul>
   *   <li>{@code 0x9E}: a UTF-8 continuation byte, which no text file starts with (so neither a
   *       review text nor an error page looks like a model) and which any decode-and-re-encode as
   *       UTF-8 turns into U+FFFD's three bytes;
   *   <li>{@code "MORS"}: names the format in a hex dump;
   *   <li>CR LF: changes if a checkout or a build step converts line endings of a resource it takes
   *       for text;
   *   <li>{@code 0x00}: no guard, it fills the magic to eight bytes so the header fields after it are
   *       aligned.
   * </ul>
   * Damage inside the file is for the CRCs to find, not the magic.
   */
  static final byte[] MAGIC = {(byte) 0x9E, 'M', 'O', 'R', 'S', 0x0D, 0x0A, 0x00};

  static final int MAJOR = 1;
  static final int MINOR = 0;

  private ModelFileLayout() {}

  static int packVersion(int major, int minor) {
    return major << 16 | minor;
  }

  static long align(long n) {
    return (n + ALIGNMENT - 1) & -ALIGNMENT;
  }

  static boolean isTag(String tag) {
    if (tag == null || tag.length() != 4) {
      return false;
    }
    for (int i = 0; i < 4; i++) {
      if (!isTagChar(tag.charAt(i))) {
        return false;
      }
    }
    return true;
  }

  private static boolean isTagChar(int c) {
    return (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9');
  }

  /** File size for payloads of these lengths (in order); no overflow for any int lengths. */
  static long fileLength(long[] lengths) {
    long end = HEADER_LENGTH + (long) ENTRY_LENGTH * lengths.length;
    for (long len : lengths) {
      end = align(end + len);
    }
    return end;
  }

  // ------------------------------------------------------------------ writer

  /** The canonical bytes for these payloads; see {@link ModelFile#write(Map)}. */
  static byte[] write(Map<String, byte[]> sections) {
    Objects.requireNonNull(sections, "sections");
    TreeMap<String, byte[]> sorted = new TreeMap<>();
    for (Map.Entry<String, byte[]> e : sections.entrySet()) {
      String tag = e.getKey();
      if (!isTag(tag)) {
        throw new IllegalArgumentException("section tag '" + tag + "' is not four characters from A-Z0-9");
      }
      if (e.getValue() == null) {
        throw new IllegalArgumentException("section " + tag + " has a null payload");
      }
      sorted.put(tag, e.getValue());
    }
    if (sorted.size() > ModelFile.MAX_SECTIONS) {
      throw new IllegalArgumentException(sorted.size() + " sections exceed the limit MAX_SECTIONS="
          + ModelFile.MAX_SECTIONS);
    }
    long[] lengths = sorted.values().stream().mapToLong(b -> b.length).toArray();
    long total = fileLength(lengths);
    if (total > ModelFile.MAX_MODEL_BYTES) {
      throw new IllegalArgumentException("model of " + total + " bytes exceeds the limit MAX_MODEL_BYTES="
          + ModelFile.MAX_MODEL_BYTES);
    }
    byte[] out = new byte[(int) total];
    ByteBuffer b = ByteBuffer.wrap(out).order(ByteOrder.LITTLE_ENDIAN);
    b.put(MAGIC_OFFSET, MAGIC);
    b.putInt(VERSION_OFFSET, packVersion(MAJOR, MINOR));
    b.putInt(COUNT_OFFSET, sorted.size());
    b.putLong(FILE_LENGTH_OFFSET, total);
    b.putInt(RESERVED_OFFSET, 0);
    int entry = HEADER_LENGTH;
    long at = HEADER_LENGTH + (long) ENTRY_LENGTH * sorted.size();
    for (Map.Entry<String, byte[]> e : sorted.entrySet()) {
      byte[] p = e.getValue();
      for (int i = 0; i < 4; i++) {
        out[entry + ENTRY_TAG_OFFSET + i] = (byte) e.getKey().charAt(i);
      }
      b.putInt(entry + ENTRY_CRC_OFFSET, Digests.crc32c(p, 0, p.length));
      b.putLong(entry + ENTRY_PAYLOAD_OFFSET, at);
      b.putLong(entry + ENTRY_PAYLOAD_LENGTH, p.length);
      System.arraycopy(p, 0, out, (int) at, p.length);
      at = align(at + p.length);
      entry += ENTRY_LENGTH;
    }
    b.putInt(HEADER_CRC_OFFSET, headerCrc(b, sorted.size()));
    return out;
  }

  private static int headerCrc(ByteBuffer file, int count) {
    java.util.zip.CRC32C crc = new java.util.zip.CRC32C();
    crc.update(file.duplicate().position(0).limit(HEADER_CRC_OFFSET));
    crc.update(file.duplicate().position(HEADER_LENGTH).limit(HEADER_LENGTH + ENTRY_LENGTH * count));
    return (int) crc.getValue();
  }

  // ------------------------------------------------------------------ validator

  /**
   * Validates the whole container in {@code file[position, limit)} and returns read-only,
   * little-endian views of the payloads by tag, in tag order. Allocates nothing proportional to a
   * length read from the file; every failure is a {@link ModelFormatException}.
   */
  static Map<String, ByteBuffer> validate(ByteBuffer file, ModelLimits limits) {
    ByteBuffer f = file.slice().asReadOnlyBuffer().order(ByteOrder.LITTLE_ENDIAN);
    final int size = f.remaining();
    if (size > limits.maxModelBytes()) {
      throw new ModelFormatException("header", "file of " + size + " bytes exceeds "
          + ModelLimits.setting("maxModelBytes", limits.maxModelBytes()));
    }
    if (size < HEADER_LENGTH) {
      throw new ModelFormatException("header", "file of " + size + " bytes is shorter than the " + HEADER_LENGTH
          + "-byte header");
    }
    for (int i = 0; i < MAGIC_LENGTH; i++) {
      byte found = f.get(MAGIC_OFFSET + i);
      if (found != MAGIC[i]) {
        throw new ModelFormatException("header", "magic byte at offset " + (MAGIC_OFFSET + i) + " is " + hexByte(found)
            + ", expected " + hexByte(MAGIC[i]) + " (not a model file, or altered in transfer)");
      }
    }
    int version = f.getInt(VERSION_OFFSET);
    int major = version >>> 16;
    int minor = version & 0xFFFF;
    if (major != MAJOR) {
      throw new ModelFormatException("header", "format version " + major + "." + minor + " at offset " + VERSION_OFFSET
          + (major > MAJOR ? " is newer than" : " is not supported by") + " this reader's version " + MAJOR + "."
          + MINOR);
    }
    long count = Integer.toUnsignedLong(f.getInt(COUNT_OFFSET));
    if (count > limits.maxSections()) {
      throw new ModelFormatException("header", "section count " + count + " at offset " + COUNT_OFFSET
          + " exceeds " + ModelLimits.setting("maxSections", limits.maxSections()));
    }
    long declared = f.getLong(FILE_LENGTH_OFFSET);
    if (declared != size) {
      throw new ModelFormatException("header", "file length field at offset " + FILE_LENGTH_OFFSET + " is "
          + Long.toUnsignedString(declared) + ", expected " + size + " (the bytes present; truncated or extended?)");
    }
    int reserved = f.getInt(RESERVED_OFFSET);
    if (reserved != 0) {
      throw new ModelFormatException("header", "reserved field at offset " + RESERVED_OFFSET + " is "
          + hexInt(reserved) + ", expected 0");
    }
    int n = (int) count;
    long tableEnd = HEADER_LENGTH + (long) ENTRY_LENGTH * n;
    if (tableEnd > size) {
      throw new ModelFormatException("table", "section table of " + n + " entries ends at offset " + tableEnd
          + ", past the end of the " + size + "-byte file");
    }
    int storedCrc = f.getInt(HEADER_CRC_OFFSET);
    int crc = headerCrc(f, n);
    if (crc != storedCrc) {
      throw new ModelFormatException("header", "CRC-32C of header and table at offset " + HEADER_CRC_OFFSET + " is "
          + hexInt(storedCrc) + ", computed " + hexInt(crc));
    }
    String[] tags = new String[n]; // n <= maxSections (checked above)
    for (int i = 0; i < n; i++) {
      int entry = HEADER_LENGTH + ENTRY_LENGTH * i;
      tags[i] = readTag(f, entry, i);
      if (i > 0 && tags[i - 1].compareTo(tags[i]) >= 0) {
        throw new ModelFormatException("table", "entry " + i + " at offset " + entry + ": tag " + tags[i]
            + (tags[i - 1].equals(tags[i]) ? " repeats the previous entry" : " is out of order after " + tags[i - 1]));
      }
    }
    TreeMap<String, ByteBuffer> out = new TreeMap<>();
    String previous = null;
    long expectedOffset = tableEnd;
    for (int i = 0; i < n; i++) {
      int entry = HEADER_LENGTH + ENTRY_LENGTH * i;
      String tag = tags[i];
      previous = tag;
      long offset = f.getLong(entry + ENTRY_PAYLOAD_OFFSET);
      long length = f.getLong(entry + ENTRY_PAYLOAD_LENGTH);
      if (offset != expectedOffset) {
        throw new ModelFormatException(tag, "payload offset " + Long.toUnsignedString(offset) + " (table offset "
            + (entry + ENTRY_PAYLOAD_OFFSET) + ") is not the canonical " + expectedOffset);
      }
      if (Long.compareUnsigned(length, size - offset) > 0) {
        throw new ModelFormatException(tag, "payload length " + Long.toUnsignedString(length) + " (table offset "
            + (entry + ENTRY_PAYLOAD_LENGTH) + ") runs past the end of the " + size + "-byte file from offset " + offset);
      }
      int start = (int) offset;
      int end = (int) (offset + length);
      ByteBuffer payload = f.duplicate().position(start).limit(end).slice().order(ByteOrder.LITTLE_ENDIAN);
      int storedPayloadCrc = f.getInt(entry + ENTRY_CRC_OFFSET);
      int payloadCrc = Digests.crc32c(payload);
      if (payloadCrc != storedPayloadCrc) {
        throw new ModelFormatException(tag, "CRC-32C of the payload at [" + start + ", " + end + ") is "
            + hexInt(payloadCrc) + ", the table (offset " + (entry + ENTRY_CRC_OFFSET) + ") says "
            + hexInt(storedPayloadCrc));
      }
      long padEnd = align(end);
      if (padEnd > size) {
        throw new ModelFormatException(tag, "padding after the payload needs the file to reach offset " + padEnd
            + ", but it has " + size + " bytes");
      }
      checkZero(f, end, (int) padEnd, tag);
      out.put(tag, payload);
      expectedOffset = padEnd;
    }
    if (expectedOffset != size) {
      throw new ModelFormatException(n == 0 ? "table" : previous, "file has " + (size - expectedOffset)
          + " bytes after the last section, which ends at offset " + expectedOffset);
    }
    return Collections.unmodifiableMap(out);
  }

  private static String readTag(ByteBuffer f, int entry, int index) {
    char[] c = new char[4];
    for (int k = 0; k < 4; k++) {
      int b = f.get(entry + ENTRY_TAG_OFFSET + k) & 0xFF;
      if (!isTagChar(b)) {
        throw new ModelFormatException("table", "entry " + index + ": tag byte at offset " + (entry + k) + " is "
            + hexByte((byte) b) + ", expected A-Z or 0-9");
      }
      c[k] = (char) b;
    }
    return new String(c);
  }

  private static void checkZero(ByteBuffer f, int from, int to, String tag) {
    for (int i = from; i < to; i++) {
      byte b = f.get(i);
      if (b != 0) {
        throw new ModelFormatException(tag, "padding byte at offset " + i + " is " + hexByte(b) + ", expected 0x00");
      }
    }
  }

  static String hexByte(byte b) {
    return String.format("0x%02X", b & 0xFF);
  }

  static String hexInt(int v) {
    return String.format("0x%08X", v);
  }
}
