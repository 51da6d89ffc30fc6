package dev.morsel.tokenize.bpe.internal;

import java.io.ByteArrayOutputStream;
import java.util.Arrays;

/**
 * UTF-8 encoding as the segmenter and trainer see text: a surrogate pair is one supplementary
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
}
