package dev.morsel.tokenize.format;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.lang.UCharacterCategory;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;
import java.util.Locale;
import java.util.Objects;

/**
 * Morsel's review text: the constants of the format, the escaping of one field, and the reader of a
 * plain token list. Stateless and thread-safe. The whole format is specified in {@code
 * docs/format.md}, section "Review text format"; {@link ReviewWriter} writes it and {@link
 * ReviewDocument} reads it.
 *
 * <h2>Shape</h2>
 * UTF-8 text, lines ending in LF (a CR before the LF is ignored). Line 1 is the header
 * {@code morsel-review TAB 1 TAB scheme}. After it, every line is empty (skipped), a note (first
 * character {@value #NOTE_SIGN}, U+00B6 PILCROW SIGN; skipped), a section heading ({@value
 * #SECTION_SIGN}, U+00A7 SECTION SIGN, one space, the section name, then TAB and the column names)
 * or a row of the current section: exactly as many fields as the heading has columns, separated by
 * TAB.
 *
 * <h2>Field escaping</h2>
 * {@link #escape(byte[])} writes any byte string as one field in which every character is visible and
 * no TAB, line break or space occurs:
 * <table>
 *   <caption>escapes</caption>
 *   <tr><th>bytes</th><th>written as</th></tr>
 *   <tr><td>backslash</td><td>{@code \\}</td></tr>
 *   <tr><td>space U+0020</td><td>{@code \s}</td></tr>
 *   <tr><td>tab, line feed, carriage return</td><td>{@code \t}, {@code \n}, {@code \r}</td></tr>
 *   <tr><td>a byte that is not part of a well-formed UTF-8 sequence [1]</td><td>{@code \{HH}}: two hex digits</td></tr>
 *   <tr><td>another character of general category Cc, Cf, Co, Cn, Zs, Zl or Zp [2], or
 *       {@value #SECTION_SIGN} or {@value #NOTE_SIGN} as the first character of a field</td>
 *       <td>{@code \{U+HHHH}}: the code point in the Unicode standard's own notation, 4 to 6 hex digits</td></tr>
 *   <tr><td>every other character</td><td>itself</td></tr>
 * </table>
 * Hex digits are written in upper case and read in either case. {@link #unescape(String)} inverts
 * this exactly: {@code unescape(escape(b))} equals {@code b} for every byte array. It rejects an
 * unknown or truncated escape, a code point that is not a Unicode scalar value, and any character
 * written literally that the escaping always escapes (a literal space, TAB or invisible format
 * character could otherwise change a token unseen).
 *
 * <p>Note: UTF-8 well-formedness follows [1]; general categories follow [2], in the Unicode version of
 * the bundled ICU.
 * <ol>
 *   <li>The Unicode Standard, Version 15.0, Section 3.9, Table 3-7 "Well-Formed UTF-8 Byte Sequences".
 *   <li>The Unicode Standard, Section 4.5 "General Category" (UAX #44 for the property values).
 * </ol>
 *
 * @since 0.1.0
 */
public final class ReviewText {
  // ------------------------------------------------------------------ configuration

  /** The first field of the header line. */
  public static final String FORMAT = "morsel-review";

  /** The format version this library writes and reads (the second field of the header line). */
  public static final int VERSION = 1;

  /** First character of a section heading: U+00A7 SECTION SIGN. */
  public static final char SECTION_SIGN = '\u00A7';

  /** First character of a note line, which readers skip: U+00B6 PILCROW SIGN. */
  public static final char NOTE_SIGN = '\u00B6';

  /** ASCII escape table: 0 = literal, 'u' = a code point escape, otherwise the escape letter. */
  private static final byte[] ASCII_ESCAPE = new byte[128];

  /** General categories written as a code point escape: bit (1 << category). */
  private static final int NON_PRINTABLE = 1 << UCharacterCategory.CONTROL | 1 << UCharacterCategory.FORMAT
      | 1 << UCharacterCategory.PRIVATE_USE | 1 << UCharacterCategory.UNASSIGNED
      | 1 << UCharacterCategory.SURROGATE | 1 << UCharacterCategory.SPACE_SEPARATOR
      | 1 << UCharacterCategory.LINE_SEPARATOR | 1 << UCharacterCategory.PARAGRAPH_SEPARATOR;

  private static final char[] HEX = "0123456789ABCDEF".toCharArray();

  static {
    for (int c = 0; c < 0x20; c++) {
      ASCII_ESCAPE[c] = 'u';
    }
    ASCII_ESCAPE[0x7F] = 'u';
    ASCII_ESCAPE['\t'] = 't';
    ASCII_ESCAPE['\n'] = 'n';
    ASCII_ESCAPE['\r'] = 'r';
    ASCII_ESCAPE[' '] = 's';
    ASCII_ESCAPE['\\'] = '\\';
  }

  private ReviewText() {}

  // ------------------------------------------------------------------ escaping

  /**
   * The escaped field form of {@code bytes} (see the class description).
   *
   * @throws NullPointerException if {@code bytes} is null
   */
  public static String escape(byte[] bytes) {
    StringBuilder sb = new StringBuilder(bytes.length + 8);
    int i = 0;
    final int n = bytes.length;
    while (i < n) {
      int b = bytes[i];
      if (b >= 0) { // ASCII fast path
        byte e = ASCII_ESCAPE[b];
        if (e == 0) {
          sb.append((char) b);
        } else if (e == 'u') {
          appendCodePoint(sb, b);
        } else {
          sb.append('\\').append((char) e);
        }
        i++;
      } else {
        i = escapeNonAscii(bytes, i, sb);
      }
    }
    return sb.toString();
  }

  /**
   * The escaped field form of the UTF-8 of {@code text}.
   *
   * @throws IllegalArgumentException if {@code text} holds a lone surrogate
   */
  public static String escape(String text) {
    for (int i = 0; i < text.length(); i++) {
      char c = text.charAt(i);
      if (Character.isSurrogate(c)) {
        if (Character.isHighSurrogate(c) && i + 1 < text.length() && Character.isLowSurrogate(text.charAt(i + 1))) {
          i++;
        } else {
          throw new IllegalArgumentException("text holds a lone surrogate at index " + i);
        }
      }
    }
    return escape(text.getBytes(StandardCharsets.UTF_8));
  }

  /** Escapes the sequence starting at the non-ASCII byte {@code bytes[i]}; returns the next index. */
  private static int escapeNonAscii(byte[] bytes, int i, StringBuilder sb) {
    int len = wellFormedLength(bytes, i, bytes.length);
    if (len == 0) {
      sb.append("\\{").append(HEX[(bytes[i] >>> 4) & 0xF]).append(HEX[bytes[i] & 0xF]).append('}');
      return i + 1;
    }
    int cp = bytes[i] & (0xFF >>> (len + 1));
    for (int k = 1; k < len; k++) {
      cp = cp << 6 | (bytes[i + k] & 0x3F);
    }
    if (isPrintable(cp) && !(sb.length() == 0 && (cp == SECTION_SIGN || cp == NOTE_SIGN))) {
      sb.appendCodePoint(cp);
    } else {
      appendCodePoint(sb, cp);
    }
    return i + len;
  }

  private static void appendCodePoint(StringBuilder sb, int cp) {
    String hex = Integer.toHexString(cp).toUpperCase(Locale.ROOT);
    sb.append("\\{U+");
    for (int k = hex.length(); k < 4; k++) {
      sb.append('0');
    }
    sb.append(hex).append('}');
  }

  /**
   * Length (2..4) of the well-formed UTF-8 sequence starting at the non-ASCII byte {@code b[i]} and
   * ending by {@code end}, or 0 if none starts there. The ranges are those of Unicode Table 3-7.
   */
  static int wellFormedLength(byte[] b, int i, int end) {
    int b0 = b[i] & 0xFF;
    if (b0 >= 0xC2 && b0 <= 0xDF) {
      return i + 1 < end && cont(b[i + 1], 0x80, 0xBF) ? 2 : 0;
    }
    if (b0 >= 0xE0 && b0 <= 0xEF) {
      int lo = b0 == 0xE0 ? 0xA0 : 0x80;
      int hi = b0 == 0xED ? 0x9F : 0xBF;
      return i + 2 < end && cont(b[i + 1], lo, hi) && cont(b[i + 2], 0x80, 0xBF) ? 3 : 0;
    }
    if (b0 >= 0xF0 && b0 <= 0xF4) {
      int lo = b0 == 0xF0 ? 0x90 : 0x80;
      int hi = b0 == 0xF4 ? 0x8F : 0xBF;
      return i + 3 < end && cont(b[i + 1], lo, hi) && cont(b[i + 2], 0x80, 0xBF) && cont(b[i + 3], 0x80, 0xBF)
          ? 4 : 0;
    }
    return 0;
  }

  private static boolean cont(byte b, int lo, int hi) {
    int v = b & 0xFF;
    return v >= lo && v <= hi;
  }

  /** Whether a non-ASCII code point is written as itself. */
  static boolean isPrintable(int cp) {
    return (NON_PRINTABLE & (1 << UCharacter.getType(cp))) == 0;
  }

  /**
   * The bytes that the field {@code text} stands for.
   *
   * @throws IllegalArgumentException naming the 1-based character (in code points) of a malformed
   *     escape or of a character that must be escaped
   */
  public static byte[] unescape(String text) {
    Objects.requireNonNull(text, "text");
    try {
      return unescape(text, 0, text.length());
    } catch (BadField e) {
      throw new IllegalArgumentException("character " + e.character + ": " + e.getMessage());
    }
  }

  /** A field error at a 1-based character position (in code points) of the field. */
  static final class BadField extends Exception {
    private static final long serialVersionUID = 1L;
    final int character;

    BadField(int character, String message) {
      super(message, null, false, false);
      this.character = character;
    }
  }

  /** Unescapes {@code s[from, to)}. */
  static byte[] unescape(String s, int from, int to) throws BadField {
    byte[] out = new byte[to - from];
    int n = 0;
    int i = from;
    while (i < to) {
      char c = s.charAt(i);
      if (c < 0x80 && c != '\\') {
        if (ASCII_ESCAPE[c] != 0) {
          throw bad(s, from, i, "character " + describe(c) + " must be written as an escape");
        }
        out = ensure(out, n, 1);
        out[n++] = (byte) c;
        i++;
      } else if (c == '\\') {
        if (i + 1 >= to) {
          throw bad(s, from, i, "a backslash at the end of a field starts no escape");
        }
        char e = s.charAt(i + 1);
        int value;
        int next = i + 2;
        switch (e) {
          case '\\': value = '\\'; break;
          case 's': value = ' '; break;
          case 't': value = '\t'; break;
          case 'n': value = '\n'; break;
          case 'r': value = '\r'; break;
          case '{': {
            int close = -1;
            for (int k = i + 2; k < to && k <= i + 10; k++) {
              if (s.charAt(k) == '}') {
                close = k;
                break;
              }
            }
            if (close < 0) {
              throw bad(s, from, i, "\\{ must be followed by two hex digits or U+ and 4 to 6 hex digits, then }");
            }
            boolean codePoint = close - i - 2 >= 2 && s.charAt(i + 2) == 'U' && s.charAt(i + 3) == '+';
            int digitsFrom = codePoint ? i + 4 : i + 2;
            int digits = close - digitsFrom;
            if (codePoint ? digits < 4 || digits > 6 : digits != 2) {
              throw bad(s, from, i, codePoint ? "\\{U+..} needs 4 to 6 hex digits" : "\\{..} needs two hex digits");
            }
            int v = 0;
            for (int k = digitsFrom; k < close; k++) {
              int d = hexValue(s.charAt(k));
              if (d < 0) {
                throw bad(s, from, k, "'" + s.charAt(k) + "' is not a hex digit");
              }
              v = v << 4 | d;
            }
            if (!codePoint) {
              out = ensure(out, n, 1);
              out[n++] = (byte) v;
              i = close + 1;
              continue;
            }
            if (v > Character.MAX_CODE_POINT || (v >= 0xD800 && v <= 0xDFFF)) {
              throw bad(s, from, i, "U+" + s.substring(digitsFrom, close) + " is not a Unicode scalar value");
            }
            value = v;
            next = close + 1;
            break;
          }
          default:
            throw bad(s, from, i, "unknown escape \\" + new String(Character.toChars(s.codePointAt(i + 1))));
        }
        out = ensure(out, n, 4);
        n = putUtf8(out, n, value);
        i = next;
      } else {
        int cp = s.codePointAt(i);
        if (Character.isSurrogate(c) && cp == c) {
          throw bad(s, from, i, "unpaired surrogate " + describe(c));
        }
        if (!isPrintable(cp)) {
          throw bad(s, from, i, "character " + describe(cp) + " must be written as an escape");
        }
        out = ensure(out, n, 4);
        n = putUtf8(out, n, cp);
        i += Character.charCount(cp);
      }
    }
    return n == out.length ? out : Arrays.copyOf(out, n);
  }

  private static BadField bad(String s, int from, int index, String message) {
    return new BadField(s.codePointCount(from, index) + 1, message);
  }

  private static byte[] ensure(byte[] out, int n, int extra) {
    return n + extra <= out.length ? out : Arrays.copyOf(out, Math.max(out.length * 2, n + extra));
  }

  private static int putUtf8(byte[] out, int n, int cp) {
    if (cp < 0x80) {
      out[n++] = (byte) cp;
    } else if (cp < 0x800) {
      out[n++] = (byte) (0xC0 | cp >>> 6);
      out[n++] = (byte) (0x80 | (cp & 0x3F));
    } else if (cp < 0x10000) {
      out[n++] = (byte) (0xE0 | cp >>> 12);
      out[n++] = (byte) (0x80 | ((cp >>> 6) & 0x3F));
      out[n++] = (byte) (0x80 | (cp & 0x3F));
    } else {
      out[n++] = (byte) (0xF0 | cp >>> 18);
      out[n++] = (byte) (0x80 | ((cp >>> 12) & 0x3F));
      out[n++] = (byte) (0x80 | ((cp >>> 6) & 0x3F));
      out[n++] = (byte) (0x80 | (cp & 0x3F));
    }
    return n;
  }

  private static int hexValue(char c) {
    if (c >= '0' && c <= '9') {
      return c - '0';
    }
    if (c >= 'A' && c <= 'F') {
      return c - 'A' + 10;
    }
    if (c >= 'a' && c <= 'f') {
      return c - 'a' + 10;
    }
    return -1;
  }

  static String describe(int cp) {
    return String.format(Locale.ROOT, "U+%04X", cp);
  }

  /**
   * The text of a whole file's bytes, strictly decoded.
   *
   * @throws ModelFormatException at {@code source:line} and the byte offset of the first malformed sequence
   */
  static String strictUtf8(byte[] b, String source) {
    CharsetDecoder d = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
        .onUnmappableCharacter(CodingErrorAction.REPORT);
    ByteBuffer in = ByteBuffer.wrap(b);
    java.nio.CharBuffer out = java.nio.CharBuffer.allocate(b.length);
    java.nio.charset.CoderResult r = d.decode(in, out, true);
    if (r.isError()) {
      int at = in.position();
      long line = 1;
      long lineStart = 0;
      for (int i = 0; i < at; i++) {
        if (b[i] == '\n') {
          line++;
          lineStart = i + 1;
        }
      }
      throw ModelFormatException.atLine(source, line, "byte " + (at - lineStart + 1) + " of the line: not valid UTF-8");
    }
    d.flush(out);
    out.flip();
    return out.toString();
  }

  /** Strict UTF-8 decoding of token bytes; null if they are not well-formed. */
  static String decodeUtf8(byte[] b) {
    try {
      return StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
          .onUnmappableCharacter(CodingErrorAction.REPORT).decode(ByteBuffer.wrap(b)).toString();
    } catch (CharacterCodingException e) {
      return null;
    }
  }

  // ------------------------------------------------------------------ plain token lists

  /**
   * Reads a plain token list: one token a line in the field escaping above, in order, with nothing
   * else (no header, notes or empty lines). A CR before the LF and a byte order mark on line 1 are
   * ignored. Repeated tokens are for the caller to judge.
   *
   * @return the tokens' bytes in file order, as fresh arrays, in an unmodifiable list
   * @throws ModelFormatException at {@code source:line} for an empty line, a malformed escape or
   *     malformed UTF-8
   * @throws UncheckedIOException if reading fails
   */
  public static List<byte[]> readTokenLines(BufferedReader in, String source) {
    Objects.requireNonNull(in, "in");
    Objects.requireNonNull(source, "source");
    List<byte[]> tokens = new ArrayList<>();
    LineSource lines = new LineSource(in, source);
    String line;
    while ((line = lines.next()) != null) {
      if (line.isEmpty()) {
        throw ModelFormatException.atLine(source, lines.number(), "empty line; a token list holds one token a line");
      }
      try {
        tokens.add(unescape(line, 0, line.length()));
      } catch (BadField e) {
        throw ModelFormatException.atLine(source, lines.number(), "character " + e.character + ": " + e.getMessage());
      }
    }
    return Collections.unmodifiableList(tokens);
  }

  /**
   * As {@link #readTokenLines}, for tokens that are text: each line's bytes must be well-formed UTF-8.
   *
   * @throws ModelFormatException at {@code source:line} as {@link #readTokenLines}, or for bytes that
   *     are not well-formed UTF-8
   */
  public static List<String> readTextLines(BufferedReader in, String source) {
    List<byte[]> lines = readTokenLines(in, source);
    List<String> out = new ArrayList<>(lines.size());
    for (int i = 0; i < lines.size(); i++) {
      String t = decodeUtf8(lines.get(i));
      if (t == null) {
        throw ModelFormatException.atLine(source, i + 1, "the bytes " + escape(lines.get(i))
            + " are not well-formed UTF-8 text");
      }
      out.add(t);
    }
    return Collections.unmodifiableList(out);
  }

  /**
   * A strict UTF-8 reader over {@code in}: malformed input fails the read (reported as a {@link
   * ModelFormatException} at its line) instead of becoming U+FFFD.
   */
  public static BufferedReader utf8Reader(InputStream in) {
    CharsetDecoder d = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
        .onUnmappableCharacter(CodingErrorAction.REPORT);
    return new BufferedReader(new InputStreamReader(in, d));
  }

  /** Lines of a text source, numbered from 1, with a trailing CR and a leading byte order mark removed. */
  static final class LineSource {
    private final BufferedReader in;
    private final String source;
    private long number;

    LineSource(BufferedReader in, String source) {
      this.in = in;
      this.source = source;
    }

    /** The next line, or null at the end. */
    String next() {
      String line;
      try {
        line = in.readLine();
      } catch (CharacterCodingException e) {
        throw ModelFormatException.atLine(source, number + 1, "not valid UTF-8 (" + e + ")");
      } catch (IOException e) {
        throw new UncheckedIOException("cannot read " + source + " after line " + number + ": " + e.getMessage(), e);
      }
      if (line == null) {
        return null;
      }
      number++;
      if (number == 1 && line.startsWith("\uFEFF")) {
        line = line.substring(1);
      }
      if (line.endsWith("\r")) {
        line = line.substring(0, line.length() - 1);
      }
      return line;
    }

    /** The number of the line last returned. */
    long number() {
      return number;
    }
  }
}
