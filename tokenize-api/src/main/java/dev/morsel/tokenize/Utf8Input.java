package dev.morsel.tokenize;

/**
 * Decodes UTF-8 input for encoding, keeping the byte offset of every UTF-16 unit, so token spans map
 * back to byte offsets in O(1). Reusable (one instance per encode context, one thread at a time).
 *
 * <p>Ill-formed input: under {@link Decoding#REPLACE} each maximal subpart of an ill-formed sequence
 * becomes one U+FFFD (Unicode Standard, section 3.9, "U+FFFD Substitution of Maximal Subparts", Table
 * 3-7 for the well-formed byte ranges), and that U+FFFD's span is exactly the bad bytes; under
 * {@link Decoding#STRICT} the first ill-formed byte throws, naming its offset.
 */
final class Utf8Input {
  /** Buffers grown past this many units are dropped after the call (reason: 64 Ki units = 384 KiB). */
  static final int RETAINED_UNITS = 1 << 16;

  char[] chars = new char[256];
  /** byteAt[i] = offset (relative to the input's start) of the first byte of the code point holding unit i; byteAt[n] = length. */
  int[] byteAt = new int[257];
  byte[] copy = new byte[0]; // for buffers without an accessible array
  int length;

  /** Decodes {@code b[off, off + len)}; returns the text. */
  String decode(byte[] b, int off, int len, Decoding policy) {
    if (chars.length < len) {
      chars = new char[len];
      byteAt = new int[len + 1];
    }
    final char[] out = chars;
    final int[] at = byteAt;
    int o = 0;
    int i = 0;
    // tight ASCII loop first: most input is ASCII, and its units and bytes are one to one
    while (i < len) {
      int b0 = b[off + i];
      if (b0 < 0) {
        break;
      }
      out[o] = (char) b0;
      at[o++] = i++;
    }
    while (i < len) {
      int b0 = b[off + i] & 0xFF;
      if (b0 < 0x80) {
        out[o] = (char) b0;
        at[o++] = i++;
        continue;
      }
      long seq = sequence(b, off + i, off + len);
      int cp = (int) seq;
      int j = (int) (seq >>> 32);
      if (cp < 0) {
        if (policy == Decoding.STRICT) {
          throwIllFormed(i, b0);
        }
        out[o] = '\ufffd';
        at[o++] = i;
        i += j; // the maximal subpart: the lead byte and the continuation bytes that were still valid
        continue;
      }
      if (cp >= 0x10000) {
        out[o] = Character.highSurrogate(cp);
        at[o++] = i;
        out[o] = Character.lowSurrogate(cp);
        at[o++] = i;
      } else {
        out[o] = (char) cp;
        at[o++] = i;
      }
      i += j;
    }
    at[o] = len;
    length = o;
    return new String(out, 0, o);
  }

  /**
   * The UTF-8 sequence with its lead byte (not ASCII) at {@code b[i]}, reading no byte at or after
   * {@code end}: {@code length << 32 | codePoint} when it is well-formed, and {@code subpart << 32 |
   * 0xFFFFFFFF} (code point -1) when it is not, where {@code subpart} is the length of the maximal
   * subpart to replace by one U+FFFD (Unicode Standard, section 3.9, Table 3-7 for the well-formed
   * byte ranges): the lead byte and the continuation bytes that were still valid.
   */
  static long sequence(byte[] b, int i, int end) {
    int b0 = b[i] & 0xFF;
    int need;
    int lo = 0x80;
    int hi = 0xBF;
    int cp;
    if (b0 >= 0xC2 && b0 <= 0xDF) {
      need = 1;
      cp = b0 & 0x1F;
    } else if (b0 >= 0xE0 && b0 <= 0xEF) {
      need = 2;
      cp = b0 & 0x0F;
      lo = b0 == 0xE0 ? 0xA0 : 0x80;
      hi = b0 == 0xED ? 0x9F : 0xBF;
    } else if (b0 >= 0xF0 && b0 <= 0xF4) {
      need = 3;
      cp = b0 & 0x07;
      lo = b0 == 0xF0 ? 0x90 : 0x80;
      hi = b0 == 0xF4 ? 0x8F : 0xBF;
    } else {
      return 1L << 32 | 0xFFFFFFFFL;
    }
    int j = 1;
    for (; j <= need && i + j < end; j++) {
      int c = b[i + j] & 0xFF;
      if (c < (j == 1 ? lo : 0x80) || c > (j == 1 ? hi : 0xBF)) {
        break;
      }
      cp = (cp << 6) | (c & 0x3F);
    }
    return j <= need ? (long) j << 32 | 0xFFFFFFFFL : (long) (need + 1) << 32 | cp;
  }

  /** Copies {@code n} bytes at absolute {@code index} of {@code buf} into a reusable array. */
  byte[] copyOf(java.nio.ByteBuffer buf, int index, int n) {
    if (copy.length < n) {
      copy = new byte[n];
    }
    buf.get(index, copy, 0, n);
    return copy;
  }

  /** Whether this decoder grew past {@link #RETAINED_UNITS} and should be dropped. */
  boolean oversized() {
    return chars.length > RETAINED_UNITS || copy.length > RETAINED_UNITS;
  }

  private static void throwIllFormed(int at, int b0) {
    throw new IllegalArgumentException("ill-formed UTF-8 at byte " + at + " of the input (byte 0x"
        + Integer.toHexString(b0).toUpperCase(java.util.Locale.ROOT)
        + " does not start a well-formed sequence there); use Decoding.REPLACE to substitute U+FFFD");
  }
}
