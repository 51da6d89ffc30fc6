package dev.morsel.tokenize.bpe.internal;

import java.io.ByteArrayOutputStream;
import java.util.Arrays;

/**
 * UTF-8 encoding as the segmenter and learner see text: a surrogate pair is one supplementary
 * character (four bytes); a lone surrogate is encoded as U+FFFD (EF BF BD). Normalization already
 * replaces lone surrogates; this is the same rule applied defensively.
 */
public final class Utf8 {
  private Utf8() {}

  /** The UTF-8 bytes of {@code s} under the rule above. */
  public static byte[] encode(CharSequence s) {
    byte[] out = new byte[s.length() * 3];
    int n = encode(s, 0, s.length(), out, null, null);
    return Arrays.copyOf(out, n);
  }

  /**
   * Encodes {@code text[start, end)} into {@code out} (capacity at least {@code 3 * (end - start)}),
   * returning the byte count. If {@code charStart} is not null, it receives, for every byte, the
   * start of its character relative to {@code start}, and {@code charEnd} the end.
   */
  public static int encode(CharSequence text, int start, int end, byte[] out, int[] charStart, int[] charEnd) {
    int n = 0;
    int i = start;
    boolean spans = charStart != null;
    while (i < end) {
      char c = text.charAt(i);
      int rel = i - start;
      if (c < 0x80) {
        out[n] = (byte) c;
        if (spans) {
          charStart[n] = rel;
          charEnd[n] = rel + 1;
        }
        n++;
        i++;
        continue;
      }
      int from = n;
      int width = 1;
      if (c < 0x800) {
        out[n++] = (byte) (0xC0 | (c >>> 6));
        out[n++] = (byte) (0x80 | (c & 0x3F));
      } else if (!Character.isSurrogate(c)) {
        out[n++] = (byte) (0xE0 | (c >>> 12));
        out[n++] = (byte) (0x80 | ((c >>> 6) & 0x3F));
        out[n++] = (byte) (0x80 | (c & 0x3F));
      } else if (Character.isHighSurrogate(c) && i + 1 < end && Character.isLowSurrogate(text.charAt(i + 1))) {
        int cp = Character.toCodePoint(c, text.charAt(i + 1));
        out[n++] = (byte) (0xF0 | (cp >>> 18));
        out[n++] = (byte) (0x80 | ((cp >>> 12) & 0x3F));
        out[n++] = (byte) (0x80 | ((cp >>> 6) & 0x3F));
        out[n++] = (byte) (0x80 | (cp & 0x3F));
        width = 2;
      } else {
        out[n++] = (byte) 0xEF; // lone surrogate: U+FFFD
        out[n++] = (byte) 0xBF;
        out[n++] = (byte) 0xBD;
      }
      if (spans) {
        for (int k = from; k < n; k++) {
          charStart[k] = rel;
          charEnd[k] = rel + width;
        }
      }
      i += width;
    }
    return n;
  }

  static void write(int cp, ByteArrayOutputStream out) {
    if (cp < 0x80) {
      out.write(cp);
    } else if (cp < 0x800) {
      out.write(0xC0 | (cp >>> 6));
      out.write(0x80 | (cp & 0x3F));
    } else if (cp < 0x10000) {
      out.write(0xE0 | (cp >>> 12));
      out.write(0x80 | ((cp >>> 6) & 0x3F));
      out.write(0x80 | (cp & 0x3F));
    } else {
      out.write(0xF0 | (cp >>> 18));
      out.write(0x80 | ((cp >>> 12) & 0x3F));
      out.write(0x80 | ((cp >>> 6) & 0x3F));
      out.write(0x80 | (cp & 0x3F));
    }
  }

  /**
   * Strict UTF-8 (RFC 3629 section 3: no overlong forms, no surrogates, nothing above U+10FFFF) of
   * {@code bytes[from, from + len)} into {@code out}; the char count, or -1 if malformed or longer
   * than {@code out}. Allocates nothing.
   */
  public static int decodeStrict(byte[] bytes, int from, int len, char[] out) {
    int n = 0;
    int end = from + len;
    for (int i = from; i < end; ) {
      int b = bytes[i] & 0xFF;
      int cp;
      int w;
      if (b < 0x80) {
        cp = b;
        w = 1;
      } else if (b >= 0xC2 && b < 0xE0) {
        cp = b & 0x1F;
        w = 2;
      } else if (b >= 0xE0 && b < 0xF0) {
        cp = b & 0x0F;
        w = 3;
      } else if (b >= 0xF0 && b < 0xF5) {
        cp = b & 0x07;
        w = 4;
      } else {
        return -1;
      }
      if (i + w > end) {
        return -1;
      }
      for (int k = 1; k < w; k++) {
        int c = bytes[i + k] & 0xFF;
        if ((c & 0xC0) != 0x80) {
          return -1;
        }
        cp = (cp << 6) | (c & 0x3F);
      }
      if ((w == 3 && (cp < 0x800 || (cp >= 0xD800 && cp < 0xE000))) || (w == 4 && (cp < 0x10000 || cp > 0x10FFFF))) {
        return -1;
      }
      int units = cp >= 0x10000 ? 2 : 1;
      if (n + units > out.length) {
        return -1;
      }
      if (units == 2) {
        out[n++] = Character.highSurrogate(cp);
        out[n++] = Character.lowSurrogate(cp);
      } else {
        out[n++] = (char) cp;
      }
      i += w;
    }
    return n;
  }
}
