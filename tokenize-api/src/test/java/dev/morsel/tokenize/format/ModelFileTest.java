package dev.morsel.tokenize.format;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.ReadOnlyBufferException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.Collections;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.TreeMap;
import java.util.stream.LongStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/** Round trips, determinism, the fingerprint definition and a file assembled by hand from docs/format.md. */
class ModelFileTest {

  private static final char[] TAG_CHARS = "ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789".toCharArray();

  static LongStream seeds() {
    return LongStream.range(0, 60).map(i -> 0x5EA5_0000L + i);
  }

  /** A random section map: 0..12 sections, random tags (sometimes META), payloads of 0..300 bytes. */
  static Map<String, byte[]> randomSections(SplittableRandom rnd) {
    Map<String, byte[]> m = new HashMap<>();
    int n = rnd.nextInt(13);
    for (int i = 0; i < n; i++) {
      String tag;
      if (rnd.nextInt(5) == 0) {
        tag = "META";
      } else {
        char[] c = new char[4];
        for (int k = 0; k < 4; k++) {
          c[k] = TAG_CHARS[rnd.nextInt(TAG_CHARS.length)];
        }
        tag = new String(c);
      }
      byte[] p = new byte[rnd.nextInt(4) == 0 ? rnd.nextInt(9) : rnd.nextInt(301)];
      rnd.nextBytes(p);
      m.put(tag, p);
    }
    return m;
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void randomSectionsRoundTrip(long seed) {
    Map<String, byte[]> in = randomSections(new SplittableRandom(seed));
    String why = "seed " + seed + " tags " + new TreeMap<>(in).keySet();
    byte[] file = ModelFile.write(in);
    ModelSections s = ModelFile.read(file);
    assertEquals(new ArrayList<>(new TreeMap<>(in).keySet()), new ArrayList<>(s.tags()), why);
    for (Map.Entry<String, byte[]> e : in.entrySet()) {
      assertTrue(s.has(e.getKey()), why);
      assertArrayEquals(e.getValue(), bytes(s.payload(e.getKey())), why + " section " + e.getKey());
      SectionReader r = s.reader(e.getKey());
      assertEquals(e.getValue().length, r.remaining(), why);
    }
    assertEquals(ModelFile.fingerprint(in), s.fingerprint(), why);
    assertEquals(oracleFingerprint(in), s.fingerprint(), why);
    assertEquals(0, file.length % 8, why + ": file length is a multiple of 8");

    // deterministic: another map type and insertion order gives the same bytes
    List<String> keys = new ArrayList<>(in.keySet());
    Collections.reverse(keys);
    Map<String, byte[]> reordered = new LinkedHashMap<>();
    keys.forEach(k -> reordered.put(k, in.get(k).clone()));
    assertArrayEquals(file, ModelFile.write(reordered), why);

    // a direct buffer with a non-zero position reads the same and keeps its position
    ByteBuffer direct = ByteBuffer.allocateDirect(file.length + 5);
    direct.position(5);
    direct.put(file).position(5);
    ModelSections d = ModelFile.read(direct);
    assertEquals(5, direct.position(), why);
    assertEquals(s.fingerprint(), d.fingerprint(), why);
    for (String tag : in.keySet()) {
      assertArrayEquals(in.get(tag), bytes(d.payload(tag)), why + " direct " + tag);
    }
  }

  /** The fingerprint, computed here from its definition in docs/format.md with the JDK digest. */
  static String oracleFingerprint(Map<String, byte[]> sections) {
    try {
      MessageDigest md = MessageDigest.getInstance("SHA-256");
      for (Map.Entry<String, byte[]> e : new TreeMap<>(sections).entrySet()) {
        if (e.getKey().equals("META")) {
          continue;
        }
        md.update(e.getKey().getBytes(StandardCharsets.US_ASCII));
        md.update(ByteBuffer.allocate(8).order(ByteOrder.LITTLE_ENDIAN).putLong(e.getValue().length).array());
        md.update(e.getValue());
      }
      StringBuilder sb = new StringBuilder();
      for (byte b : md.digest()) {
        sb.append(String.format("%02x", b & 0xFF));
      }
      return sb.toString();
    } catch (java.security.NoSuchAlgorithmException e) {
      throw new AssertionError(e);
    }
  }

  static byte[] bytes(ByteBuffer b) {
    byte[] out = new byte[b.remaining()];
    b.duplicate().get(out);
    return out;
  }

  static Map<String, byte[]> ferrySections() {
    Map<String, byte[]> m = new TreeMap<>();
    m.put("SCHM", "skerry-bpe".getBytes(StandardCharsets.UTF_8));
    m.put("PIPE", "nfc|rules".getBytes(StandardCharsets.UTF_8));
    m.put("VOCB", "the 07:40 sailing to Holmsund is delayed".getBytes(StandardCharsets.UTF_8));
    m.put("META", "built-by harbour office".getBytes(StandardCharsets.UTF_8));
    m.put("EMPT", new byte[0]);
    return m;
  }

  @Test
  void fingerprintIgnoresMetaOnly() {
    Map<String, byte[]> base = ferrySections();
    String f = ModelFile.fingerprint(base);
    assertEquals(64, f.length());
    assertTrue(f.matches("[0-9a-f]{64}"), f);

    Map<String, byte[]> meta = new TreeMap<>(base);
    meta.put("META", "built-by night shift".getBytes(StandardCharsets.UTF_8));
    assertEquals(f, ModelFile.fingerprint(meta), "META is excluded");
    meta.remove("META");
    assertEquals(f, ModelFile.fingerprint(meta), "META absent is the same");

    Map<String, byte[]> renamed = new TreeMap<>(base);
    renamed.put("VOCC", renamed.remove("VOCB"));
    assertNotEquals(f, ModelFile.fingerprint(renamed), "tag is part of the content");

    Map<String, byte[]> moved = new TreeMap<>(base);
    // same concatenated bytes, different split between sections: the length field tells them apart
    moved.put("SCHM", "skerry-bp".getBytes(StandardCharsets.UTF_8));
    moved.put("PIPE", "enfc|rules".getBytes(StandardCharsets.UTF_8));
    assertNotEquals(f, ModelFile.fingerprint(moved), "payload boundaries are part of the content");

    Map<String, byte[]> empty = new TreeMap<>(base);
    empty.remove("EMPT");
    assertNotEquals(f, ModelFile.fingerprint(empty), "an empty section still counts");

    assertEquals(f, ModelFile.read(ModelFile.write(base)).fingerprint(), "stable across write/read");
    // the fingerprint of nothing is SHA-256 of the empty string (FIPS 180-4; from memory: e3b0c442...b855)
    assertEquals("e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855",
        ModelFile.fingerprint(Map.of("META", new byte[] {1, 2})));
  }

  /**
   * A file assembled byte by byte in this test from the layout in docs/format.md (no project code):
   * reading it must succeed, and writing the same payloads must give exactly these bytes.
   */
  @Test
  void handAssembledFileMatchesTheWriter() {
    byte[] kind = "skerry".getBytes(StandardCharsets.US_ASCII); // 6 bytes, 2 pad
    byte[] vocb = "Holmsund".getBytes(StandardCharsets.US_ASCII); // 8 bytes, no pad
    int table = 32 + 2 * 24;
    int total = table + 8 + 8;
    ByteBuffer b = ByteBuffer.allocate(total).order(ByteOrder.LITTLE_ENDIAN);
    b.put(new byte[] {(byte) 0x9E, 'M', 'O', 'R', 'S', '\r', '\n', 0});
    b.putInt(0x0001_0000); // version 1.0
    b.putInt(2);
    b.putLong(total);
    b.putInt(0);
    b.putInt(0); // header CRC, filled below
    b.put("SCHM".getBytes(StandardCharsets.US_ASCII)).putInt(DigestsTest.bitwiseCrc32c(kind)).putLong(table)
        .putLong(kind.length);
    b.put("VOCB".getBytes(StandardCharsets.US_ASCII)).putInt(DigestsTest.bitwiseCrc32c(vocb)).putLong(table + 8)
        .putLong(vocb.length);
    b.put(kind).put(new byte[2]).put(vocb);
    byte[] raw = b.array();
    byte[] covered = new byte[28 + 48];
    System.arraycopy(raw, 0, covered, 0, 28);
    System.arraycopy(raw, 32, covered, 28, 48);
    b.putInt(28, DigestsTest.bitwiseCrc32c(covered));

    ModelSections s = ModelFile.read(raw);
    assertEquals(List.of("SCHM", "VOCB"), new ArrayList<>(s.tags()));
    assertEquals("skerry", new String(bytes(s.payload("SCHM")), StandardCharsets.US_ASCII));
    assertArrayEquals(raw, ModelFile.write(Map.of("SCHM", kind, "VOCB", vocb)));
  }

  /** The worked example in docs/format.md, section 2.8, byte for byte. */
  @Test
  void documentedExampleBytes() {
    ModelWriter w = new ModelWriter();
    w.section("SCHM").putString("skerry");
    String documented = "9e4d4f52530d0a00" + "00000100" + "01000000" + "4800000000000000" + "00000000" + "0690e7e0"
        + "5343484d" + "8c3923df" + "3800000000000000" + "0a00000000000000"
        + "06000000736b6572" + "7279000000000000";
    assertEquals(documented, Digests.hex(w.toModelFile()));
    // the CRCs quoted there, recomputed with the independent bitwise CRC-32C
    byte[] f = w.toModelFile();
    byte[] covered = new byte[28 + 24];
    System.arraycopy(f, 0, covered, 0, 28);
    System.arraycopy(f, 32, covered, 28, 24);
    assertEquals(0xE0E79006, DigestsTest.bitwiseCrc32c(covered));
    assertEquals(0xDF23398C, DigestsTest.bitwiseCrc32c(java.util.Arrays.copyOfRange(f, 56, 66)));
  }

  @Test
  void emptyModelIsJustTheHeader() {
    byte[] file = ModelFile.write(Map.of());
    assertEquals(32, file.length);
    ModelSections s = ModelFile.read(file);
    assertTrue(s.tags().isEmpty());
  }

  @Test
  void sectionsAreReadOnlyViewsWithoutCopy() {
    byte[] file = ModelFile.write(ferrySections());
    ModelSections s = ModelFile.read(file);
    ByteBuffer p = s.payload("VOCB");
    assertTrue(p.isReadOnly());
    assertEquals(ByteOrder.LITTLE_ENDIAN, p.order());
    assertThrows(ReadOnlyBufferException.class, () -> p.put(0, (byte) 1));
    // a view, not a copy: the bytes come from the array the file was read from
    int at = indexOf(file, "the 07:40".getBytes(StandardCharsets.US_ASCII));
    file[at] = 'T';
    assertEquals('T', s.payload("VOCB").get(0));
    ModelFormatException e = assertThrows(ModelFormatException.class, () -> s.reader("ABSN"));
    assertEquals("ABSN", e.section());
  }

  @Test
  void writerRejectsBadInput() {
    assertThrows(IllegalArgumentException.class, () -> ModelFile.write(Map.of("kind", new byte[1])));
    assertThrows(IllegalArgumentException.class, () -> ModelFile.write(Map.of("KINDS", new byte[1])));
    Map<String, byte[]> withNull = new HashMap<>();
    withNull.put("SCHM", null);
    assertThrows(IllegalArgumentException.class, () -> ModelFile.write(withNull));
    Map<String, byte[]> many = new TreeMap<>();
    for (int i = 0; i <= ModelFile.MAX_SECTIONS; i++) {
      many.put(String.format("S%03d", i), new byte[0]);
    }
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> ModelFile.write(many));
    assertTrue(e.getMessage().contains("MAX_SECTIONS=64"), e.getMessage());
    assertThrows(IllegalArgumentException.class, () -> ModelFile.fingerprint(Map.of("ab12", new byte[0])));
  }

  @Test
  void sizeComputationCannotOverflow() {
    long big = Integer.MAX_VALUE;
    long size = ModelFileLayout.fileLength(new long[] {big, big, big});
    assertEquals(32 + 3 * 24 + 3 * (big + 1), size);
    assertTrue(size > ModelFile.MAX_MODEL_BYTES);
  }

  @Test
  void limitsAreNamedWhenExceeded() {
    byte[] file = ModelFile.write(ferrySections());
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> ModelFile.read(ByteBuffer.wrap(file), ModelLimits.defaults().withMaxModelBytes(64)));
    assertTrue(e.getMessage().contains("maxModelBytes=64"), e.getMessage());
    e = assertThrows(ModelFormatException.class,
        () -> ModelFile.read(ByteBuffer.wrap(file), ModelLimits.defaults().withMaxSections(4)));
    assertTrue(e.getMessage().contains("maxSections=4"), e.getMessage());
    assertEquals(5, ModelFile.read(ByteBuffer.wrap(file), ModelLimits.defaults().withMaxSections(5)).tags().size());
    assertThrows(IllegalArgumentException.class, () -> ModelLimits.defaults().withMaxSections(65));
    assertThrows(IllegalArgumentException.class, () -> ModelLimits.defaults().withMaxModelBytes(1L << 31));
  }

  @Test
  void versionRules() {
    byte[] file = ModelFile.write(ferrySections());
    // a newer minor of the same major is accepted
    assertEquals(5, ModelFile.read(withVersion(file, 1, 7)).tags().size());
    ModelFormatException e = assertThrows(ModelFormatException.class, () -> ModelFile.read(withVersion(file, 2, 0)));
    assertEquals("header", e.section());
    assertTrue(e.getMessage().contains("2.0") && e.getMessage().contains("1.0"), e.getMessage());
    e = assertThrows(ModelFormatException.class, () -> ModelFile.read(withVersion(file, 0, 9)));
    assertTrue(e.getMessage().contains("0.9"), e.getMessage());
  }

  /** The file with another version and a recomputed header CRC, so only the version is wrong. */
  static byte[] withVersion(byte[] file, int major, int minor) {
    byte[] f = file.clone();
    ByteBuffer b = ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN);
    b.putInt(8, major << 16 | minor);
    ModelFileCorruptionTest.fixHeaderCrc(f);
    return f;
  }

  @Test
  void readsFromPathByMapping(@TempDir Path dir) throws Exception {
    Map<String, byte[]> in = ferrySections();
    Path p = dir.resolve("ferry.morsel");
    Files.write(p, ModelFile.write(in));
    ModelSections s = ModelFile.read(p);
    assertEquals(ModelFile.fingerprint(in), s.fingerprint());
    assertArrayEquals(in.get("VOCB"), bytes(s.payload("VOCB")));

    Path missing = dir.resolve("absent.morsel");
    UncheckedIOException io = assertThrows(UncheckedIOException.class, () -> ModelFile.read(missing));
    assertTrue(io.getMessage().contains(missing.toString()), io.getMessage());

    byte[] bad = ModelFile.write(in);
    bad[bad.length - 9] ^= 0x20;
    Path damaged = dir.resolve("damaged.morsel");
    Files.write(damaged, bad);
    ModelFormatException e = assertThrows(ModelFormatException.class, () -> ModelFile.read(damaged));
    assertTrue(e.getMessage().contains(damaged.toString()), e.getMessage());
    assertEquals("VOCB", e.section());
  }

  @Test
  void modelWriterProducesTheSameFile() {
    ModelWriter w = new ModelWriter();
    w.section("SCHM").putString("skerry-bpe");
    w.section("RSRV").putInt(1).putInt(0).putString("~~harbour-closed~~");
    byte[] file = w.toModelFile();
    assertArrayEquals(ModelFile.write(w.payloads()), file);
    SectionReader r = ModelFile.read(file).reader("RSRV");
    assertEquals(1, r.getCount("reserved tokens", 10, 8));
    assertEquals(0, r.getInt("id"));
    assertEquals("~~harbour-closed~~", r.getString("spelling"));
    r.expectEnd();
  }

  static int indexOf(byte[] hay, byte[] needle) {
    outer:
    for (int i = 0; i + needle.length <= hay.length; i++) {
      for (int k = 0; k < needle.length; k++) {
        if (hay[i + k] != needle[k]) {
          continue outer;
        }
      }
      return i;
    }
    throw new AssertionError("not found");
  }
}
