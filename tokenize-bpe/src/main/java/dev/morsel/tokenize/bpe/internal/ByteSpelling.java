package dev.morsel.tokenize.bpe.internal;

import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;

/**
 * Morsel's display convention for byte-level tokens, and its inverse.
 *
 * <p>Display: every well-formed UTF-8 sequence is shown as its character, except that the backslash
 * is shown as {@code \\} and the C0 controls and DEL (U+0000..U+001F, U+007F) as {@code \xHH}. Every
 * byte that is not part of a complete well-formed UTF-8 sequence (a lone continuation byte, a
 * truncated lead, an overlong form, an encoded surrogate, anything above U+10FFFF) is shown as
 * {@code \xHH} with two lowercase hex digits. The display is therefore a function of the bytes, and
 * {@link #parse} maps it back to exactly those bytes, so distinct byte strings have distinct displays.
 *
 * <p>Line form (ranked pair lists): the display with the space U+0020 also written as {@code \x20},
 * so that one space can separate two tokens on a line. {@link #parse} reads both forms.
 */
public final class ByteSpelling {
  private static final char[] HEX = "0123456789abcdef".toCharArray();

  private ByteSpelling() {}

  /** The display spelling of {@code b[off, off+len)}. */
  public static String display(byte[] b, int off, int len) {
    return render(b, off, len, false);
  }

  /** The line form of {@code b[off, off+len)}: the display with spaces escaped. */
  public static String lineForm(byte[] b, int off, int len) {
    return render(b, off, len, true);
  }

  private static String render(byte[] b, int off, int len, boolean escapeSpace) {
    StringBuilder sb = new StringBuilder(len + 4);
    int i = off;
    int end = off + len;
    while (i < end) {
      int c = b[i] & 0xFF;
      if (c < 0x80) {
        if (c < 0x20 || c == 0x7F || (escapeSpace && c == 0x20)) {
          hex(sb, c);
        } else if (c == '\\') {
          sb.append("\\\\");
        } else {
          sb.append((char) c);
        }
        i++;
        continue;
      }
      int n = wellFormedLength(b, i, end);
      if (n == 0) {
        hex(sb, c);
        i++;
      } else {
        sb.append(new String(b, i, n, StandardCharsets.UTF_8));
        i += n;
      }
    }
    return sb.toString();
  }

  private static void hex(StringBuilder sb, int c) {
    sb.append('\\').append('x').append(HEX[c >>> 4]).append(HEX[c & 15]);
  }

  /**
   * Length (2..4) of the well-formed multi-byte UTF-8 sequence starting at {@code b[i]} (a byte of at
   * least 0x80), or 0 if none starts there (Unicode Standard, chapter 3, Table 3-7).
   */
  static int wellFormedLength(byte[] b, int i, int end) {
    int c = b[i] & 0xFF;
    int n;
    int lo = 0x80;
    int hi = 0xBF;
    if (c >= 0xC2 && c <= 0xDF) {
      n = 2;
    } else if (c >= 0xE0 && c <= 0xEF) {
      n = 3;
      if (c == 0xE0) {
        lo = 0xA0;
      } else if (c == 0xED) {
        hi = 0x9F;
      }
    } else if (c >= 0xF0 && c <= 0xF4) {
      n = 4;
      if (c == 0xF0) {
        lo = 0x90;
      } else if (c == 0xF4) {
        hi = 0x8F;
      }
    } else {
      return 0;
    }
    if (i + n > end) {
      return 0;
    }
    int c1 = b[i + 1] & 0xFF;
    if (c1 < lo || c1 > hi) {
      return 0;
    }
    for (int k = 2; k < n; k++) {
      int ck = b[i + k] & 0xFF;
      if (ck < 0x80 || ck > 0xBF) {
        return 0;
      }
    }
    return n;
  }

  /**
   * The bytes spelled by {@code s} in display or line form: {@code \\} is a backslash, {@code \xHH}
   * one byte, any other character its UTF-8.
   *
   * @throws IllegalArgumentException for a malformed escape or a lone surrogate, naming the index
   */
  public static byte[] parse(String s) {
    ByteArrayOutputStream out = new ByteArrayOutputStream(s.length() + 4);
    int i = 0;
    int n = s.length();
    while (i < n) {
      char c = s.charAt(i);
      if (c == '\\') {
        if (i + 1 < n && s.charAt(i + 1) == '\\') {
          out.write('\\');
          i += 2;
        } else if (i + 3 < n && s.charAt(i + 1) == 'x' && hexValue(s.charAt(i + 2)) >= 0
            && hexValue(s.charAt(i + 3)) >= 0) {
          out.write(hexValue(s.charAt(i + 2)) * 16 + hexValue(s.charAt(i + 3)));
          i += 4;
        } else {
          throw new IllegalArgumentException("malformed escape at index " + i + " of '" + s
              + "': expected \\\\ or \\x and two hex digits");
        }
        continue;
      }
      int cp;
      if (Character.isHighSurrogate(c) && i + 1 < n && Character.isLowSurrogate(s.charAt(i + 1))) {
        cp = Character.toCodePoint(c, s.charAt(i + 1));
        i += 2;
      } else if (Character.isSurrogate(c)) {
        throw new IllegalArgumentException("lone surrogate at index " + i + " of a token spelling");
      } else {
        cp = c;
        i++;
      }
      Utf8.write(cp, out);
    }
    return out.toByteArray();
  }

  private static int hexValue(char c) {
    if (c >= '0' && c <= '9') {
      return c - '0';
    }
    if (c >= 'a' && c <= 'f') {
      return c - 'a' + 10;
    }
    if (c >= 'A' && c <= 'F') {
      return c - 'A' + 10;
    }
    return -1;
  }
}
