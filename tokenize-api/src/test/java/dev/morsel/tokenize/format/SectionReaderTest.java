package dev.morsel.tokenize.format;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.function.Consumer;
import org.junit.jupiter.api.Test;

/** Section payload reading: little-endian values, and forged counts rejected before any allocation. */
class SectionReaderTest {

  private static SectionReader over(byte[] b) {
    return new SectionReader("VOCB", ByteBuffer.wrap(b));
  }

  /** A payload that starts with the u32 {@code count} followed by {@code tail} zero bytes. */
  private static byte[] countThen(int count, int tail) {
    return ByteBuffer.allocate(4 + tail).order(ByteOrder.LITTLE_ENDIAN).putInt(count).array();
  }

  @Test
  void forgedCountsAreRejectedBeforeAllocation() {
    int[] counts = {Integer.MAX_VALUE, Integer.MIN_VALUE, -1, 1 << 29, 1 << 20, 17};
    int cases = 0;
    for (int count : counts) {
      for (String kind : new String[] {"ints", "bytes", "string", "count"}) {
        SectionReader r = over(countThen(count, 16)); // only 16 bytes follow: every count above fails
        Consumer<SectionReader> call = kind.equals("ints") ? x -> x.getInts("piece ids")
            : kind.equals("bytes") ? x -> x.getBytes("piece bytes")
            : kind.equals("string") ? x -> x.getString("spelling")
            : x -> x.getCount("pairs", Integer.MAX_VALUE, 8);
        ModelFormatException e = assertThrows(ModelFormatException.class, () -> call.accept(r),
            kind + " with count " + Integer.toUnsignedString(count));
        assertEquals("VOCB", e.section());
        cases++;
      }
    }
    System.out.println("[section-reader] forged counts rejected: " + cases);
    assertEquals(counts.length * 4, cases);
  }

  @Test
  void countOfMaxIntNamesTheRange() {
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> over(countThen(Integer.MAX_VALUE, 0)).getInts("piece ids"));
    assertTrue(e.getMessage().contains("2147483647") && e.getMessage().contains("offset 0"), e.getMessage());
  }

  @Test
  void valuesAreLittleEndian() {
    byte[] b = {0x01, 0x02, 0x03, 0x04, 2, 0, 0, 0, 7, 0, 0, 0, (byte) 0xFF, (byte) 0xFF, (byte) 0xFF, 0x7F};
    SectionReader r = over(b);
    assertEquals(0x04030201, r.getInt("magic"));
    assertArrayEquals(new int[] {7, Integer.MAX_VALUE}, r.getInts("ids"));
    r.expectEnd();
    assertEquals(16, r.position());
  }

  @Test
  void writerAndReaderAgree() {
    ModelWriter w = new ModelWriter();
    w.section("TEST").putByte(0xAB).putInt(-2).putLong(1L << 40).putFloat(0.25f).putDouble(-1.5)
        .putBytes(new byte[] {9, 8}).putString("Øresund crossing").putInts(new int[] {3, 1, 4});
    SectionReader r = new SectionReader("TEST", ByteBuffer.wrap(w.payloads().get("TEST")));
    assertEquals(0xAB, r.getByte("b"));
    assertEquals(-2, r.getInt("i"));
    assertEquals(1L << 40, r.getLong("l"));
    assertEquals(0.25f, r.getFloat("f"));
    assertEquals(-1.5, r.getDouble("d"));
    assertArrayEquals(new byte[] {9, 8}, r.getBytes("bytes"));
    assertEquals("Øresund crossing", r.getString("s"));
    assertArrayEquals(new int[] {3, 1, 4}, r.getInts("ints"));
    r.expectEnd();
  }

  @Test
  void sliceIsAReadOnlyViewAndBoundsAreChecked() {
    byte[] b = {1, 2, 3, 4, 5};
    SectionReader r = over(b);
    ByteBuffer s = r.getSlice("block", 3);
    assertTrue(s.isReadOnly());
    assertEquals(3, s.remaining());
    b[0] = 42;
    assertEquals(42, s.get(0), "a view, not a copy");
    assertEquals(3, r.position());
    assertThrows(ModelFormatException.class, () -> r.getSlice("block", 3));
    assertThrows(ModelFormatException.class, () -> r.getSlice("block", -1));
  }

  @Test
  void malformedUtf8AndTrailingBytesAreRejected() {
    byte[] b = {2, 0, 0, 0, (byte) 0xC3, 0x28};
    ModelFormatException e = assertThrows(ModelFormatException.class, () -> over(b).getString("spelling"));
    assertTrue(e.getMessage().contains("UTF-8"), e.getMessage());
    SectionReader r = over(new byte[] {1, 0, 0, 0, 9});
    r.getInt("x");
    e = assertThrows(ModelFormatException.class, r::expectEnd);
    assertTrue(e.getMessage().contains("1 unexpected trailing bytes"), e.getMessage());
  }
}
