package dev.morsel.tokenize.format;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;

/**
 * Reads one section's payload, little-endian, with every length checked against the bytes that
 * remain <em>before</em> anything is allocated, so a forged count can never cause an
 * {@link OutOfMemoryError}. Every failure is a {@link ModelFormatException} naming the section and
 * the offset. Not thread-safe.
 *
 * @since 0.1.0
 */
public final class SectionReader {
  private final String tag;
  private final ByteBuffer buf;

  /** Reads {@code payload} (its position to its limit) as section {@code tag}. */
  public SectionReader(String tag, ByteBuffer payload) {
    this.tag = java.util.Objects.requireNonNull(tag, "tag");
    this.buf = payload.slice().order(ByteOrder.LITTLE_ENDIAN);
  }

  /** The section tag. */
  public String tag() {
    return tag;
  }

  /** Bytes not yet read. */
  public int remaining() {
    return buf.remaining();
  }

  /** Current offset within the payload. */
  public int position() {
    return buf.position();
  }

  private void need(long n, String what) {
    if (n < 0 || n > buf.remaining()) {
      throw fail(what + " needs " + n + " bytes but only " + buf.remaining() + " remain");
    }
  }

  /** Reads one unsigned byte. */
  public int getByte(String what) {
    need(1, what);
    return buf.get() & 0xFF;
  }

  /** Reads a 32-bit int. */
  public int getInt(String what) {
    need(4, what);
    return buf.getInt();
  }

  /** Reads a 64-bit long. */
  public long getLong(String what) {
    need(8, what);
    return buf.getLong();
  }

  /** Reads a float. */
  public float getFloat(String what) {
    need(4, what);
    return buf.getFloat();
  }

  /** Reads a double. */
  public double getDouble(String what) {
    need(8, what);
    return buf.getDouble();
  }

  /**
   * Reads a count (u32) that must lie in {@code [0, max]} and for which at least
   * {@code count * minBytesEach} bytes remain.
   */
  public int getCount(String what, int max, int minBytesEach) {
    int at = buf.position();
    int n = getInt(what);
    if (n < 0 || n > max) {
      throw new ModelFormatException(tag, what + " count " + Integer.toUnsignedString(n) + " at offset " + at
          + " is outside [0, " + max + "]");
    }
    need((long) n * minBytesEach, what);
    return n;
  }

  /**
   * Reads a count (u32) that must not exceed {@code limit} (the {@link ModelLimits} setting
   * {@code setting}; {@code shape} formats the count, e.g. {@code "vocabulary of %d entries"}) and
   * for which {@code count * minBytesEach} bytes remain.
   */
  int getLimitedCount(String what, String shape, int limit, String setting, int minBytesEach) {
    int at = buf.position();
    long n = Integer.toUnsignedLong(getInt(what));
    if (n > limit) {
      throw new ModelFormatException(tag, what + ": " + String.format(java.util.Locale.ROOT, shape, n) + " at offset "
          + at + " exceeds " + ModelLimits.setting(setting, limit));
    }
    need(n * minBytesEach, what);
    return (int) n;
  }

  /** Reads a length-prefixed UTF-8 string of at most {@code maxBytes} bytes ({@link ModelLimits#maxTokenBytes()}). */
  String getLimitedString(String what, int maxBytes) {
    int at = buf.position();
    long n = Integer.toUnsignedLong(getInt(what));
    if (n > maxBytes) {
      throw new ModelFormatException(tag, what + " of " + n + " bytes at offset " + at + " exceeds "
          + ModelLimits.setting("maxTokenBytes", maxBytes));
    }
    need(n, what);
    byte[] b = new byte[(int) n];
    buf.get(b);
    return utf8(b, what, at);
  }

  /** Reads a length-prefixed byte array. */
  public byte[] getBytes(String what) {
    int n = getCount(what, Integer.MAX_VALUE, 1);
    byte[] b = new byte[n];
    buf.get(b);
    return b;
  }

  /**
   * A read-only view of the next {@code length} bytes (no copy), little-endian, position 0; advances
   * past them. Lets segmenters use large arrays in place (e.g. {@code getSlice(..).asIntBuffer()}).
   *
   * @throws ModelFormatException if fewer than {@code length} bytes remain or {@code length < 0}
   */
  public ByteBuffer getSlice(String what, int length) {
    need(length, what);
    int at = buf.position();
    ByteBuffer view = buf.duplicate().position(at).limit(at + length).slice().asReadOnlyBuffer()
        .order(ByteOrder.LITTLE_ENDIAN);
    buf.position(at + length);
    return view;
  }

  /** Reads a length-prefixed UTF-8 string, rejecting malformed UTF-8. */
  public String getString(String what) {
    int at = buf.position();
    byte[] b = getBytes(what);
    return utf8(b, what, at);
  }

  private String utf8(byte[] b, String what, int at) {
    try {
      return StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
          .onUnmappableCharacter(CodingErrorAction.REPORT).decode(ByteBuffer.wrap(b)).toString();
    } catch (CharacterCodingException e) {
      throw new ModelFormatException(tag, what + " at offset " + at + " is not valid UTF-8", e);
    }
  }

  /** Reads a length-prefixed int array. */
  public int[] getInts(String what) {
    int n = getCount(what, Integer.MAX_VALUE / 4, 4);
    int[] a = new int[n];
    buf.asIntBuffer().get(a);
    buf.position(buf.position() + 4 * n);
    return a;
  }

  /** Fails unless every byte was read. */
  public void expectEnd() {
    if (buf.hasRemaining()) {
      throw fail(buf.remaining() + " unexpected trailing bytes");
    }
  }

  /** A format exception naming this section and the current offset. */
  public ModelFormatException fail(String message) {
    return new ModelFormatException(tag, message + " (at offset " + buf.position() + ")");
  }
}
