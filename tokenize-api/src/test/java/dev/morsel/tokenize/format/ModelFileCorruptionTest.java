package dev.morsel.tokenize.format;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.Map;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.TreeMap;
import java.util.zip.CRC32C;
import org.junit.jupiter.api.Test;

/**
 * Damaged and forged containers: every one must be rejected with a {@link ModelFormatException}
 * (never another exception, never an {@link OutOfMemoryError}), naming a known section. These are
 * the container's own invariants (docs/format.md); each test asserts the number of cases it ran and
 * prints it.
 */
class ModelFileCorruptionTest {
  private static final long[] HUGE = {
      (1L << 31) - 1, 1L << 31, (1L << 32) - 1, 1L << 32, 1L << 62, Long.MIN_VALUE /* 2^63 */, -1L /* 2^64-1 */};

  static Map<String, byte[]> sample() {
    Map<String, byte[]> m = new TreeMap<>();
    m.put("RSRV", "~~ferry-full~~ ~~harbour-closed~~".getBytes(StandardCharsets.UTF_8)); // 33 bytes, padded
    m.put("EMPT", new byte[0]);
    m.put("SCHM", "skerry-bpe".getBytes(StandardCharsets.UTF_8));
    m.put("META", "route Holmsund–Varø".getBytes(StandardCharsets.UTF_8));
    byte[] vocab = new byte[517];
    new SplittableRandom(77).nextBytes(vocab);
    m.put("VOCB", vocab);
    return m;
  }

  static final byte[] FILE = ModelFile.write(sample());
  static final int TABLE_END = 32 + 24 * sample().size();
  static final Set<String> SECTIONS = Set.of("header", "table", "RSRV", "EMPT", "SCHM", "META", "VOCB");

  /** The payload offset the table entry of {@code tag} records (entries: tag, CRC, u64 offset, u64 length). */
  static int payloadOffset(byte[] f, String tag) {
    ByteBuffer b = ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN);
    for (int entry = 32; entry < TABLE_END; entry += 24) {
      if (new String(f, entry, 4, StandardCharsets.US_ASCII).equals(tag)) {
        return Math.toIntExact(b.getLong(entry + 8));
      }
    }
    throw new AssertionError("no table entry " + tag);
  }

  /** Recomputes the header CRC in place (so a forged field is seen by the bounds checks, not the CRC). */
  static void fixHeaderCrc(byte[] f) {
    ByteBuffer b = ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN);
    int n = b.getInt(12);
    CRC32C crc = new CRC32C();
    crc.update(f, 0, 28);
    long tableLen = 24L * Integer.toUnsignedLong(n);
    crc.update(f, 32, (int) Math.min(tableLen, f.length - 32));
    b.putInt(28, (int) crc.getValue());
  }

  /** Reads {@code f}; passes only if a ModelFormatException naming a known section comes out. */
  static ModelFormatException expectRejected(byte[] f, String what) {
    try {
      ModelFile.read(f);
    } catch (ModelFormatException e) {
      assertTrue(SECTIONS.contains(e.section()), what + ": unknown section in " + e.getMessage());
      return e;
    } catch (Throwable t) {
      throw new AssertionError(what + ": expected ModelFormatException, got " + t, t);
    }
    fail(what + ": damaged file was accepted");
    return null;
  }

  @Test
  void everySingleByteChangeInHeaderAndTableIsRejected() {
    int cases = 0;
    for (int pos = 0; pos < TABLE_END; pos++) {
      int orig = FILE[pos] & 0xFF;
      int[] values = {orig ^ 0x01, orig ^ 0x80, orig ^ 0xFF, (orig + 1) & 0xFF, orig == 0 ? 0x20 : 0x00};
      for (int v : values) {
        byte[] f = FILE.clone();
        f[pos] = (byte) v;
        ModelFormatException e = expectRejected(f, "byte " + pos + " changed 0x" + Integer.toHexString(orig)
            + " -> 0x" + Integer.toHexString(v));
        if (pos < 8) {
          assertEquals("header", e.section());
          assertTrue(e.getMessage().contains("offset " + pos), e.getMessage());
        }
        cases++;
      }
    }
    System.out.println("[corruption] header+table single-byte changes rejected: " + cases);
    assertEquals(TABLE_END * 5, cases);
  }

  @Test
  void payloadAndPaddingChangesAreRejectedNamingTheSection() {
    // exhaustive: every payload/padding byte flipped in its low bit; sample: seeded random values
    int cases = 0;
    for (int pos = TABLE_END; pos < FILE.length; pos++) {
      byte[] f = FILE.clone();
      f[pos] ^= 0x01;
      ModelFormatException e = expectRejected(f, "payload byte " + pos + " flipped");
      assertTrue(!e.section().equals("header") && !e.section().equals("table"), e.getMessage());
      cases++;
    }
    long seed = 0xFE77_0001L;
    SplittableRandom rnd = new SplittableRandom(seed);
    for (int t = 0; t < 2000; t++) {
      int pos = rnd.nextInt(TABLE_END, FILE.length);
      int delta = rnd.nextInt(1, 256);
      byte[] f = FILE.clone();
      f[pos] = (byte) (f[pos] + delta);
      expectRejected(f, "seed " + seed + " case " + t + ": byte " + pos + " + " + delta);
      cases++;
    }
    System.out.println("[corruption] payload/padding single-byte changes rejected: " + cases);
    assertEquals(FILE.length - TABLE_END + 2000, cases);
  }

  @Test
  void payloadDamageNamesTheSectionAndRange() {
    byte[] f = FILE.clone();
    int at = ModelFileTest.indexOf(f, "skerry-bpe".getBytes(StandardCharsets.UTF_8));
    f[at] = 'S';
    ModelFormatException e = expectRejected(f, "SCHEME payload");
    assertEquals("SCHM", e.section());
    assertTrue(e.getMessage().contains("CRC-32C") && e.getMessage().contains("[" + at + ","), e.getMessage());
  }

  @Test
  void everyTruncationAndExtensionIsRejected() {
    int cases = 0;
    for (int len = 0; len < FILE.length; len++) {
      expectRejected(Arrays.copyOf(FILE, len), "truncated to " + len);
      cases++;
    }
    for (int extra = 1; extra <= 16; extra++) {
      expectRejected(Arrays.copyOf(FILE, FILE.length + extra), "extended by " + extra);
      cases++;
    }
    // extended and the length field adjusted (with a valid CRC): trailing bytes are still found
    for (int extra : new int[] {1, 8, 64}) {
      byte[] f = Arrays.copyOf(FILE, FILE.length + extra);
      ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN).putLong(16, f.length);
      fixHeaderCrc(f);
      expectRejected(f, "extended by " + extra + " with matching length field");
      cases++;
    }
    System.out.println("[corruption] truncations/extensions rejected: " + cases + " (header+table end at "
        + TABLE_END + ", file " + FILE.length + " bytes)");
    assertEquals(FILE.length + 16 + 3, cases);
  }

  @Test
  void forgedLengthsOffsetsAndCountsAreRejectedWithoutAllocation() {
    int cases = 0;
    int n = sample().size();
    for (int entry = 0; entry < n; entry++) {
      int base = 32 + 24 * entry;
      for (long v : HUGE) {
        for (int field : new int[] {8, 16}) { // offset, length
          byte[] f = FILE.clone();
          ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN).putLong(base + field, v);
          fixHeaderCrc(f);
          expectRejected(f, "entry " + entry + (field == 8 ? " offset " : " length ") + Long.toUnsignedString(v));
          cases++;
        }
      }
      // lengths just past the end of the file and one byte too long
      for (long v : new long[] {FILE.length, FILE.length + 1L}) {
        byte[] f = FILE.clone();
        ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN).putLong(base + 16, v);
        fixHeaderCrc(f);
        expectRejected(f, "entry " + entry + " length " + v);
        cases++;
      }
    }
    for (long count : new long[] {n + 1, 65, 1L << 16, (1L << 31) - 1, 1L << 31, (1L << 32) - 1}) {
      byte[] f = FILE.clone();
      ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN).putInt(12, (int) count);
      fixHeaderCrc(f);
      ModelFormatException e = expectRejected(f, "count " + count);
      if (count > 64) {
        assertTrue(e.getMessage().contains("maxSections=64"), e.getMessage());
      }
      cases++;
    }
    for (long len : HUGE) {
      byte[] f = FILE.clone();
      ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN).putLong(16, len);
      fixHeaderCrc(f);
      expectRejected(f, "file length " + Long.toUnsignedString(len));
      cases++;
    }
    // a count within the limit whose table runs past the end of a short file
    byte[] header = Arrays.copyOf(ModelFile.write(Map.of()), 32);
    ByteBuffer hb = ByteBuffer.wrap(header).order(ByteOrder.LITTLE_ENDIAN);
    hb.putInt(12, 64);
    fixHeaderCrc(header);
    ModelFormatException e = expectRejected(header, "count 64 in a 32-byte file");
    assertEquals("table", e.section());
    cases++;
    System.out.println("[corruption] forged lengths/offsets/counts rejected: " + cases);
    assertEquals(n * (HUGE.length * 2 + 2) + 6 + HUGE.length + 1, cases);
  }

  @Test
  void reorderedAndDuplicatedTagsAreRejected() {
    // swap the first two table entries (tags now out of order), CRC fixed
    byte[] f = FILE.clone();
    byte[] first = Arrays.copyOfRange(f, 32, 56);
    System.arraycopy(f, 56, f, 32, 24);
    System.arraycopy(first, 0, f, 56, 24);
    fixHeaderCrc(f);
    ModelFormatException e = expectRejected(f, "swapped entries");
    assertEquals("table", e.section());
    // second tag made equal to the first
    f = FILE.clone();
    System.arraycopy(f, 32, f, 56, 4);
    fixHeaderCrc(f);
    e = expectRejected(f, "duplicate tag");
    assertTrue(e.getMessage().contains("repeats"), e.getMessage());
    // lowercase tag
    f = FILE.clone();
    f[32] = 'c';
    fixHeaderCrc(f);
    e = expectRejected(f, "lowercase tag");
    assertTrue(e.getMessage().contains("offset 32"), e.getMessage());
  }

  @Test
  void nonZeroPaddingIsRejectedEvenWithValidChecksums() {
    // RSRV's payload is 33 bytes: 7 pad bytes follow; the payload CRC does not cover them
    ModelSections s = ModelFile.read(FILE);
    int start = payloadOffset(FILE, "RSRV");
    assertEquals(33, s.payload("RSRV").remaining());
    byte[] f = FILE.clone();
    f[start + 33] = 0x01;
    ModelFormatException e = expectRejected(f, "padding");
    assertEquals("RSRV", e.section());
    assertTrue(e.getMessage().contains("padding byte at offset " + (start + 33)), e.getMessage());
  }
}
