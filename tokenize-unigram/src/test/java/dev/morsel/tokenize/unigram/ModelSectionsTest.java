package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import dev.morsel.tokenize.testkit.Sections;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.SegmenterProvider;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.ServiceLoader;
import org.junit.jupiter.api.Test;

/** Save and load through the model sections; corrupt sections are rejected with the section and entry named. */
class ModelSectionsTest {
  private static final List<String> PIECES = List.of(" ferry", " quay", "f", "e", "r", "y", " ", "q", "u", "a", "\u26f4",
      "\uD83D\uDEA2");

  private static UnigramSegmenter model(boolean bytes) {
    double[] scores = new double[PIECES.size()];
    for (int i = 0; i < scores.length; i++) {
      scores[i] = -2.0 - i * 0.5;
    }
    return UnigramSegmenter.create(List.of("\u00a7hail", "\u00a7moor"), bytes, "\u2983?\u2984", PIECES, scores);
  }

  private static SegmenterProvider provider() {
    for (SegmenterProvider p : ServiceLoader.load(SegmenterProvider.class)) {
      if (p.scheme().equals(UnigramSegmenter.SCHEME)) {
        return p;
      }
    }
    throw new AssertionError("no SegmenterProvider of scheme unigram on the class path (META-INF/services)");
  }

  private static int[] encode(Segmenter s, String text) {
    IntArrayList ids = new IntArrayList();
    s.segment(text, 0, text.length(), (id, a, b) -> ids.add(id));
    return ids.toIntArray();
  }

  @Test
  void saveAndLoadGiveIdenticalVocabularyAndIds() {
    for (boolean bytes : new boolean[] {false, true}) {
      UnigramSegmenter m = model(bytes);
      ModelWriter w = new ModelWriter();
      m.write(w);
      Segmenter back = provider().read(Sections.of(w), dev.morsel.tokenize.format.ModelLimits.defaults());
      assertEquals(m.vocabularySize(), back.vocabularySize());
      assertEquals(UnigramSegmenter.SCHEME, back.scheme());
      assertEquals(m.unknownId(), back.unknownId());
      for (int id = 0; id < m.vocabularySize(); id++) {
        assertEquals(m.token(id), back.token(id), "id " + id);
        assertEquals(id, back.id(m.token(id)), "id " + id);
        assertEquals(m.score(id), ((UnigramSegmenter) back).score(id), 0, "id " + id);
      }
      String text = " ferry quay\u26f4 \uD83D\uDEA2 qu\u00e9";
      assertArrayEquals(encode(m, text), encode(back, text));
      ModelWriter w2 = new ModelWriter();
      ((UnigramSegmenter) back).write(w2);
      assertEquals(Sections.of(w).fingerprint(), Sections.of(w2).fingerprint());
    }
  }

  /** A valid UNST section with the UNVO section rewritten from {@code pieces} and {@code scores}. */
  private static Map<String, byte[]> withPieces(List<String> pieces, double[] scores) {
    ModelWriter w = new ModelWriter();
    model(false).write(w);
    Map<String, byte[]> p = new HashMap<>(w.payloads());
    ByteBuffer b = ByteBuffer.allocate(1 << 12).order(ByteOrder.LITTLE_ENDIAN);
    b.putInt(pieces.size());
    for (int i = 0; i < pieces.size(); i++) {
      byte[] s = pieces.get(i).getBytes(StandardCharsets.UTF_8);
      b.putInt(s.length).put(s).putDouble(scores[i]);
    }
    byte[] out = new byte[b.position()];
    b.flip().get(out);
    p.put("UNVO", out);
    return p;
  }

  private static void rejected(Map<String, byte[]> payloads, String section, String... words) {
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> provider().read(Sections.of(payloads), dev.morsel.tokenize.format.ModelLimits.defaults()));
    assertEquals(section, e.section(), e.getMessage());
    for (String w : words) {
      assertTrue(e.getMessage().contains(w), e.getMessage() + " lacks '" + w + "'");
    }
  }

  @Test
  void nanAndInfiniteScoresAreRejectedNamingTheEntry() {
    for (double bad : new double[] {Double.NaN, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY}) {
      rejected(withPieces(List.of("a", "b", "c", "d"), new double[] {-1, -2, -3, bad}), "UNVO", "piece 3");
    }
  }

  @Test
  void duplicateEmptyAndReservedPiecesAreRejected() {
    rejected(withPieces(List.of("a", "b", "a"), new double[] {-1, -2, -3}), "UNVO", "piece 2");
    rejected(withPieces(List.of("a", ""), new double[] {-1, -2}), "UNVO", "piece 1");
    rejected(withPieces(List.of("\u00a7moor"), new double[] {-1}), "UNVO", "piece 0");
    // a surrogate code point encoded as if it were a character (ED A0 BD) is not UTF-8 (Unicode Standard, section 3.9, D92)
    Map<String, byte[]> p = withPieces(List.of("ok", "xyzw"), new double[] {-1, -1});
    byte[] v = p.get("UNVO");
    int at = 4 + 4 + 2 + 8 + 4 + 1; // count, "ok" entry, length of piece 1, its first byte
    v[at] = (byte) 0xED;
    v[at + 1] = (byte) 0xA0;
    v[at + 2] = (byte) 0xBD;
    rejected(p, "UNVO", "piece 1", "UTF-8");
  }

  @Test
  void truncatedAndForgedSectionsAreRejected() {
    ModelWriter w = new ModelWriter();
    model(true).write(w);
    Map<String, byte[]> good = w.payloads();

    Map<String, byte[]> cut = new HashMap<>(good);
    cut.put("UNVO", java.util.Arrays.copyOf(good.get("UNVO"), good.get("UNVO").length - 3));
    rejected(cut, "UNVO", "score of piece " + (PIECES.size() - 1));

    Map<String, byte[]> forged = new HashMap<>(good);
    byte[] v = good.get("UNVO").clone();
    v[3] = 0x7F; // piece count near 2^31: must fail before allocating
    forged.put("UNVO", v);
    rejected(forged, "UNVO", "pieces");

    Map<String, byte[]> version = new HashMap<>(good);
    byte[] s = good.get("UNST").clone();
    s[0] = 9;
    version.put("UNST", s);
    rejected(version, "UNST", "format version 9");

    Map<String, byte[]> flag = new HashMap<>(good);
    byte[] f = good.get("UNST").clone();
    f[4] = 2;
    flag.put("UNST", f);
    rejected(flag, "UNST", "byte spelling flag 2");

    Map<String, byte[]> trailing = new HashMap<>(good);
    trailing.put("UNST", java.util.Arrays.copyOf(good.get("UNST"), good.get("UNST").length + 1));
    rejected(trailing, "UNST", "trailing");

    Map<String, byte[]> missing = new HashMap<>(good);
    missing.remove("UNVO");
    rejected(missing, "UNVO");
  }

  @Test
  void factoryRejectsBadScoresAndPieces() {
    assertThrows(IllegalArgumentException.class,
        () -> UnigramSegmenter.create(List.of(), false, "?", List.of("a", "b"), new double[] {-1, Double.NaN}));
    assertThrows(IllegalArgumentException.class,
        () -> UnigramSegmenter.create(List.of(), false, "?", List.of("a"), new double[] {Double.POSITIVE_INFINITY}));
    assertThrows(IllegalArgumentException.class,
        () -> UnigramSegmenter.create(List.of(), false, "?", List.of("a"), new double[] {-1, -2}));
    assertThrows(IllegalArgumentException.class,
        () -> UnigramSegmenter.create(List.of(), false, "?", List.of("a", "?"), new double[] {-1, -2}));
    assertThrows(IllegalArgumentException.class,
        () -> UnigramSegmenter.create(List.of(), false, "?", List.of("a".repeat(UnigramSegmenter.MAX_PIECE_LENGTH + 1)),
            new double[] {-1}));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> UnigramSegmenter.create(List.of(), true, "?", List.of("a", "\u2983" + "41\u2984"), new double[] {-1, -2}));
    assertTrue(e.getMessage().contains("piece 1"), e.getMessage());
    e = assertThrows(IllegalArgumentException.class,
        () -> UnigramSegmenter.create(List.of(), false, "?", List.of("ok", "x\uD83D"), new double[] {-1, -2}));
    assertTrue(e.getMessage().contains("piece 1") && e.getMessage().contains("surrogate"), e.getMessage());
    e = assertThrows(IllegalArgumentException.class,
        () -> UnigramSegmenter.create(List.of("\u00a7hail", "\u00a7hail"), false, "?", List.of("a"), new double[] {-1}));
    assertTrue(e.getMessage().contains("reserved token 1"), e.getMessage());
  }

  @Test
  void decodeTokenWritesBytesAndSpellings() {
    UnigramSegmenter m = model(true);
    java.io.ByteArrayOutputStream out = new java.io.ByteArrayOutputStream();
    m.decodeToken(m.firstByteId() + 0xE2, out::write);
    m.decodeToken(m.id(" quay"), out::write);
    m.decodeToken(m.unknownId(), out::write);
    byte[] want = ("\u0000 quay\u2983?\u2984").getBytes(StandardCharsets.UTF_8);
    want[0] = (byte) 0xE2;
    assertArrayEquals(want, out.toByteArray());
    assertThrows(IndexOutOfBoundsException.class, () -> m.decodeToken(m.vocabularySize(), out::write));
    assertThrows(IndexOutOfBoundsException.class, () -> m.token(-1));
    assertEquals(-1, m.id("no such token"));
  }

  @Test
  void reservedTokensAreNeverProducedBySegmentation() {
    UnigramSegmenter m = model(true);
    String text = "\u00a7hail \u00a7moor";
    m.segment(text, 0, text.length(), (id, s, e) -> assertTrue(id >= m.reservedCount(), "reserved id " + id));
    assertEquals(0, m.id("\u00a7hail"));
    assertEquals(1, m.id("\u00a7moor"));
  }
}
