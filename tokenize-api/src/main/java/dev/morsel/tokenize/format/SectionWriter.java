package dev.morsel.tokenize.format;

import java.nio.charset.StandardCharsets;
import java.util.Arrays;

/**
 * Writes one section's payload, little-endian. Not thread-safe; obtained from {@link ModelWriter}.
 *
 * @since 0.1.0
 */
public final class SectionWriter {
  /** Largest payload: the largest array most JVMs allocate (Integer.MAX_VALUE - 16, a margin for headers). */
  private static final int MAX_PAYLOAD = Integer.MAX_VALUE - 16;

  private byte[] buf = new byte[64];
  private int size;

  SectionWriter() {}

  private void ensure(long extra) {
    if (size + extra > buf.length) {
      long need = size + extra;
      if (need > MAX_PAYLOAD) {
        throw new IllegalStateException("section payload of " + need + " bytes would exceed " + MAX_PAYLOAD
            + " bytes (a model file is at most ModelFile.MAX_MODEL_BYTES)");
      }
      long want = Math.max(Math.min((long) buf.length * 2, MAX_PAYLOAD), need);
      buf = Arrays.copyOf(buf, (int) want);
    }
  }

  /** Appends one byte. */
  public SectionWriter putByte(int v) {
    ensure(1);
    buf[size++] = (byte) v;
    return this;
  }

  /** Appends a 32-bit int. */
  public SectionWriter putInt(int v) {
    ensure(4);
    buf[size++] = (byte) v;
    buf[size++] = (byte) (v >>> 8);
    buf[size++] = (byte) (v >>> 16);
    buf[size++] = (byte) (v >>> 24);
    return this;
  }

  /** Appends a 64-bit long. */
  public SectionWriter putLong(long v) {
    putInt((int) v);
    return putInt((int) (v >>> 32));
  }

  /** Appends a float as its IEEE 754 bits. */
  public SectionWriter putFloat(float v) {
    return putInt(Float.floatToRawIntBits(v));
  }

  /** Appends a double as its IEEE 754 bits. */
  public SectionWriter putDouble(double v) {
    return putLong(Double.doubleToRawLongBits(v));
  }

  /** Appends a byte array prefixed with its length (u32). */
  public SectionWriter putBytes(byte[] b) {
    putInt(b.length);
    ensure(b.length);
    System.arraycopy(b, 0, buf, size, b.length);
    size += b.length;
    return this;
  }

  /** Appends a string as UTF-8 prefixed with its byte length (u32). */
  public SectionWriter putString(String s) {
    return putBytes(s.getBytes(StandardCharsets.UTF_8));
  }

  /** Appends an int array prefixed with its length (u32). */
  public SectionWriter putInts(int[] a) {
    putInt(a.length);
    ensure(4L * a.length);
    for (int v : a) {
      putInt(v);
    }
    return this;
  }

  /** Bytes written so far. */
  public int size() {
    return size;
  }

  /** A copy of the payload. */
  public byte[] toByteArray() {
    return Arrays.copyOf(buf, size);
  }
}
