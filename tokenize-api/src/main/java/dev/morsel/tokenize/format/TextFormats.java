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
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * Morsel's readable text formats: a byte escaping that puts any token on one line, and readers for
 * plain token lists and ranked pair lists. Stateless and thread-safe.
 *
 * <h2>Escaping</h2>
 * {@link #escape(byte[])} writes the bytes as UTF-8 text in which every character is visible:
 * <table>
 *   <caption>escapes</caption>
 *   <tr><th>input</th><th>written as</th></tr>
 *   <tr><td>backslash</td><td>{@code \\}</td></tr>
 *   <tr><td>space U+0020</td><td>{@code \s} (so leading and trailing spaces are visible)</td></tr>
 *   <tr><td>tab, line feed, carriage return</td><td>{@code \t}, {@code \n}, {@code \r}</td></tr>
 *   <tr><td>{@code #} as the first character</td><td>{@code \#} (a leading {@code #} starts a comment)</td></tr>
 *   <tr><td>other ASCII controls (U+0000..U+001F, U+007F)</td><td>{@code \xHH}</td></tr>
 *   <tr><td>a byte that is not part of a well-formed UTF-8 sequence (Unicode Table 3-7)</td><td>{@code \xHH}</td></tr>
 *   <tr><td>any other character that is not printable: general categories Cc, Cf, Co, Cn, Zs, Zl, Zp</td>
 *       <td><code>&#92;u{H…}</code>, 1 to 6 hex digits of the code point</td></tr>
 *   <tr><td>every other character</td><td>itself</td></tr>
 * </table>
 * Hex digits are written in upper case and read in either case. {@link #unescape(String)} inverts
 * this exactly: {@code unescape(escape(b))} equals {@code b} for every byte array. It rejects
 * unknown or truncated escapes, code points that are not Unicode scalar values, and characters
 * written literally that the escaping always escapes (a literal space, tab or invisible format
 * character could otherwise change a token unseen); errors name the 1-based column in code points.
 * Printability follows the Unicode version of the bundled ICU.
 *
 * <h2>Token lists</h2>
 * One escaped token a line, UTF-8. Empty lines are skipped; a line whose first character is {@code #}
 * is a comment. A token can therefore not be empty. A duplicate token is an error naming both lines.
 *
 * <h2>Pair lists</h2>
 * One pair a line: two escaped tokens separated by exactly one space (tokens never contain a literal
 * space). Ranks are the order of the pair lines, from 0; empty and comment lines as in token lists.
 * A line without exactly one space, an empty side or a repeated pair is an error.
 *
 * <p>Readers report errors as {@link ModelFormatException} whose section is {@code "<source>:<line>"}
 * (line 1-based). The {@link Path} readers decode UTF-8 strictly; for the {@link BufferedReader}
 * readers the caller chooses the decoding ({@link #utf8Reader(InputStream)} gives a strict one).
 *
 * <p>Note: UTF-8 well-formedness follows [1]; general categories follow [2].
 * <ol>
 *   <li>The Unicode Standard, Version 15.0, Section 3.9, Table 3-7 "Well-Formed UTF-8 Byte Sequences".
 *   <li>The Unicode Standard, Section 4.5 "General Category" (UAX #44 for the property values).
 * </ol>
 *
 * @since 0.1.0
 */
public final class TextFormats {
  // ------------------------------------------------------------------ configuration

  /** The comment character at the start of a line in token and pair lists. */
  public static final char COMMENT = '#';

  /** ASCII escape table: 0 = literal, otherwise the escape letter, or 'x' for a hex byte. */
  private static final byte[] ASCII_ESCAPE = new byte[128];

  /** General categories that are written as <code>&#92;u{..}</code>: bit (1 << category). */
  private static final int NON_PRINTABLE = 1 << UCharacterCategory.CONTROL | 1 << UCharacterCategory.FORMAT
      | 1 << UCharacterCategory.PRIVATE_USE | 1 << UCharacterCategory.UNASSIGNED
      | 1 << UCharacterCategory.SURROGATE | 1 << UCharacterCategory.SPACE_SEPARATOR
      | 1 << UCharacterCategory.LINE_SEPARATOR | 1 << UCharacterCategory.PARAGRAPH_SEPARATOR;

  private static final char[] HEX = "0123456789ABCDEF".toCharArray();

  static {
    for (int c = 0; c < 0x20; c++) {
      ASCII_ESCAPE[c] = 'x';
    }
    ASCII_ESCAPE[0x7F] = 'x';
    ASCII_ESCAPE['\t'] = 't';
    ASCII_ESCAPE['\n'] = 'n';
    ASCII_ESCAPE['\r'] = 'r';
    ASCII_ESCAPE[' '] = 's';
    ASCII_ESCAPE['\\'] = '\\';
  }

  private TextFormats() {}

  // ------------------------------------------------------------------ escaping

  /**
   * The escaped, single-line text form of {@code bytes} (see the class description).
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
          if (b == COMMENT && sb.length() == 0) {
            sb.append('\\').append(COMMENT);
          } else {
            sb.append((char) b);
          }
        } else if (e == 'x') {
          appendHexByte(sb, b);
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

  /** Escapes the sequence starting at the non-ASCII byte {@code bytes[i]}; returns the next index. */
  private static int escapeNonAscii(byte[] bytes, int i, StringBuilder sb) {
    int len = wellFormedLength(bytes, i);
    if (len == 0) {
      appendHexByte(sb, bytes[i]);
      return i + 1;
    }
    int cp = bytes[i] & (0xFF >>> (len + 1));
    for (int k = 1; k < len; k++) {
      cp = cp << 6 | (bytes[i + k] & 0x3F);
    }
    if (isPrintable(cp)) {
      sb.appendCodePoint(cp);
    } else {
      sb.append("\\u{").append(Integer.toHexString(cp).toUpperCase(java.util.Locale.ROOT)).append('}');
    }
    return i + len;
  }

  /**
   * Length (2..4) of the well-formed UTF-8 sequence starting at the non-ASCII byte {@code b[i]}, or 0
   * if none starts there. The ranges are those of Unicode Table 3-7.
   */
  static int wellFormedLength(byte[] b, int i) {
    int b0 = b[i] & 0xFF;
    int n = b.length;
    if (b0 >= 0xC2 && b0 <= 0xDF) {
      return i + 1 < n && cont(b[i + 1], 0x80, 0xBF) ? 2 : 0;
    }
    if (b0 >= 0xE0 && b0 <= 0xEF) {
      int lo = b0 == 0xE0 ? 0xA0 : 0x80;
      int hi = b0 == 0xED ? 0x9F : 0xBF;
      return i + 2 < n && cont(b[i + 1], lo, hi) && cont(b[i + 2], 0x80, 0xBF) ? 3 : 0;
    }
    if (b0 >= 0xF0 && b0 <= 0xF4) {
      int lo = b0 == 0xF0 ? 0x90 : 0x80;
      int hi = b0 == 0xF4 ? 0x8F : 0xBF;
      return i + 3 < n && cont(b[i + 1], lo, hi) && cont(b[i + 2], 0x80, 0xBF) && cont(b[i + 3], 0x80, 0xBF) ? 4 : 0;
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

  private static void appendHexByte(StringBuilder sb, int b) {
    sb.append('\\').append('x').append(HEX[(b >>> 4) & 0xF]).append(HEX[b & 0xF]);
  }

  /**
   * The bytes that {@code text} (an escaped form, see the class description) stands for.
   *
   * @throws IllegalArgumentException naming the 1-based column (in code points) of a malformed escape
   *     or of a character that must be escaped
   */
  public static byte[] unescape(String text) {
    Objects.requireNonNull(text, "text");
    return unescape(text, 0, text.length(), null, 0);
  }

  /**
   * Unescapes {@code s[from, to)}. Errors: {@link ModelFormatException} at {@code source:line} when
   * {@code source} is given, else {@link IllegalArgumentException}; columns count from the line start.
   */
  private static byte[] unescape(String s, int from, int to, String source, long line) {
    byte[] out = new byte[to - from];
    int n = 0;
    int i = from;
    while (i < to) {
      char c = s.charAt(i);
      if (c < 0x80 && c != '\\') {
        if (ASCII_ESCAPE[c] != 0) {
          throw error(s, i, "character " + describe(c) + " must be written as an escape", source, line);
        }
        out = ensure(out, n, 1);
        out[n++] = (byte) c;
        i++;
      } else if (c == '\\') {
        if (i + 1 >= to) {
          throw error(s, i, "backslash at the end of the token starts no escape", source, line);
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
          case COMMENT: value = COMMENT; break;
          case 'x': {
            int h = i + 2 < to ? hexValue(s.charAt(i + 2)) : -1;
            int l = i + 3 < to ? hexValue(s.charAt(i + 3)) : -1;
            if (h < 0 || l < 0) {
              throw error(s, i, "\\x must be followed by two hex digits", source, line);
            }
            out = ensure(out, n, 1);
            out[n++] = (byte) (h << 4 | l);
            i += 4;
            continue;
          }
          case 'u': {
            int close = -1;
            if (i + 2 < to && s.charAt(i + 2) == '{') {
              for (int k = i + 3; k < to && k <= i + 9; k++) {
                if (s.charAt(k) == '}') {
                  close = k;
                  break;
                }
              }
            }
            if (close < 0 || close == i + 3) {
              throw error(s, i, "\\u must be followed by {1 to 6 hex digits}", source, line);
            }
            int cp = 0;
            for (int k = i + 3; k < close; k++) {
              int d = hexValue(s.charAt(k));
              if (d < 0) {
                throw error(s, k, "'" + s.charAt(k) + "' is not a hex digit in a \\u{..} escape", source, line);
              }
              cp = cp << 4 | d;
            }
            if (cp > Character.MAX_CODE_POINT || (cp >= 0xD800 && cp <= 0xDFFF)) {
              throw error(s, i, "\\u{" + s.substring(i + 3, close) + "} is not a Unicode scalar value", source, line);
            }
            value = cp;
            next = close + 1;
            break;
          }
          default:
            throw error(s, i, "unknown escape \\" + new String(Character.toChars(s.codePointAt(i + 1))), source, line);
        }
        out = ensure(out, n, 4);
        n = putUtf8(out, n, value);
        i = next;
      } else {
        int cp = s.codePointAt(i);
        if (Character.isSurrogate(c) && cp == c) {
          throw error(s, i, "unpaired surrogate " + describe(c), source, line);
        }
        if (!isPrintable(cp)) {
          throw error(s, i, "character " + describe(cp) + " must be written as an escape", source, line);
        }
        out = ensure(out, n, 4);
        n = putUtf8(out, n, cp);
        i += Character.charCount(cp);
      }
    }
    return n == out.length ? out : Arrays.copyOf(out, n);
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

  private static String describe(int cp) {
    return String.format("U+%04X", cp);
  }

  // ------------------------------------------------------------------ token lists

  /**
   * Reads a token list (see the class description) from {@code in}; {@code source} names it in errors.
   *
   * @return the tokens in file order, as fresh arrays owned by the caller, in an unmodifiable list
   * @throws ModelFormatException at {@code source:line} for a malformed or repeated token
   * @throws UncheckedIOException if reading fails
   */
  public static List<byte[]> readTokens(BufferedReader in, String source) {
    Objects.requireNonNull(in, "in");
    Objects.requireNonNull(source, "source");
    List<byte[]> tokens = new ArrayList<>();
    Map<ByteBuffer, Long> seen = new HashMap<>();
    forEachEntryLine(in, source, (line, no) -> {
      byte[] token = unescape(line, 0, line.length(), source, no);
      Long first = seen.putIfAbsent(ByteBuffer.wrap(token), no);
      if (first != null) {
        throw ModelFormatException.atLine(source, no, "token " + line + " repeats line " + first);
      }
      tokens.add(token);
    });
    return Collections.unmodifiableList(tokens);
  }

  /**
   * Reads a token list from a UTF-8 file (strictly decoded); errors name the file.
   *
   * @throws ModelFormatException at {@code path:line}
   * @throws UncheckedIOException naming the path if the file cannot be read
   */
  public static List<byte[]> readTokens(Path path) {
    try (BufferedReader in = Files.newBufferedReader(path, StandardCharsets.UTF_8)) {
      return readTokens(in, path.toString());
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read token list " + path + ": " + e.getMessage(), e);
    }
  }

  /**
   * Writes a token list: one escaped token a line, each followed by {@code \n}.
   *
   * @throws IllegalArgumentException if a token is empty (a list cannot hold one)
   * @throws UncheckedIOException if writing fails
   */
  public static void writeTokens(Iterable<byte[]> tokens, Appendable out) {
    try {
      int i = 0;
      for (byte[] t : tokens) {
        if (t.length == 0) {
          throw new IllegalArgumentException("token " + i + " is empty; a token list cannot hold an empty token");
        }
        out.append(escape(t)).append('\n');
        i++;
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  // ------------------------------------------------------------------ pair lists

  /**
   * One ranked pair of a pair list. Immutable.
   *
   * @since 0.1.0
   */
  public static final class Pair {
    private final byte[] left;
    private final byte[] right;
    private final int rank;
    private final long line;

    private Pair(byte[] left, byte[] right, int rank, long line) {
      this.left = left;
      this.right = right;
      this.rank = rank;
      this.line = line;
    }

    /** The first token (a copy). */
    public byte[] left() {
      return left.clone();
    }

    /** The second token (a copy). */
    public byte[] right() {
      return right.clone();
    }

    /** The rank: 0 for the first pair line, 1 for the next, and so on. */
    public int rank() {
      return rank;
    }

    /** The 1-based line the pair was read from. */
    public long line() {
      return line;
    }

    @Override
    public String toString() {
      return "Pair[" + rank + ": " + escape(left) + " " + escape(right) + " (line " + line + ")]";
    }
  }

  /**
   * Reads a ranked pair list (see the class description) from {@code in}.
   *
   * @return pairs in rank order, unmodifiable
   * @throws ModelFormatException at {@code source:line} for a malformed or repeated pair
   * @throws UncheckedIOException if reading fails
   */
  public static List<Pair> readPairs(BufferedReader in, String source) {
    Objects.requireNonNull(in, "in");
    Objects.requireNonNull(source, "source");
    List<Pair> pairs = new ArrayList<>();
    Map<ByteBuffer, Long> seen = new HashMap<>();
    forEachEntryLine(in, source, (line, no) -> {
      int space = line.indexOf(' ');
      if (space < 0) {
        throw ModelFormatException.atLine(source, no, "expected two tokens separated by one space, found no space");
      }
      int second = line.indexOf(' ', space + 1);
      if (second >= 0) {
        throw ModelFormatException.atLine(source, no, "expected two tokens separated by one space, found another "
            + "space at column " + (line.codePointCount(0, second) + 1) + " (write a space inside a token as \\s)");
      }
      if (space == 0 || space == line.length() - 1) {
        throw ModelFormatException.atLine(source, no, (space == 0 ? "first" : "second") + " token is empty");
      }
      byte[] left = unescape(line, 0, space, source, no);
      byte[] right = unescape(line, space + 1, line.length(), source, no);
      ByteBuffer key = ByteBuffer.allocate(8 + left.length + right.length).putInt(left.length).put(left)
          .putInt(right.length).put(right);
      key.flip();
      Long first = seen.putIfAbsent(key, no);
      if (first != null) {
        throw ModelFormatException.atLine(source, no, "pair " + line + " repeats line " + first);
      }
      pairs.add(new Pair(left, right, pairs.size(), no));
    });
    return Collections.unmodifiableList(pairs);
  }

  /**
   * Reads a pair list from a UTF-8 file (strictly decoded); errors name the file.
   *
   * @throws ModelFormatException at {@code path:line}
   * @throws UncheckedIOException naming the path if the file cannot be read
   */
  public static List<Pair> readPairs(Path path) {
    try (BufferedReader in = Files.newBufferedReader(path, StandardCharsets.UTF_8)) {
      return readPairs(in, path.toString());
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read pair list " + path + ": " + e.getMessage(), e);
    }
  }

  /**
   * Writes a pair list: per pair {@code escape(left) + " " + escape(right) + "\n"}, in the given order.
   *
   * @throws IllegalArgumentException if a token is empty or the two lists differ in size
   * @throws UncheckedIOException if writing fails
   */
  public static void writePairs(List<byte[]> lefts, List<byte[]> rights, Appendable out) {
    if (lefts.size() != rights.size()) {
      throw new IllegalArgumentException(lefts.size() + " left tokens but " + rights.size() + " right tokens");
    }
    try {
      for (int i = 0; i < lefts.size(); i++) {
        if (lefts.get(i).length == 0 || rights.get(i).length == 0) {
          throw new IllegalArgumentException("pair " + i + " has an empty token");
        }
        out.append(escape(lefts.get(i))).append(' ').append(escape(rights.get(i))).append('\n');
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  /**
   * A strict UTF-8 reader over {@code in}: malformed input fails the read (reported by the list
   * readers as a {@link ModelFormatException} at the line) instead of becoming U+FFFD.
   */
  public static BufferedReader utf8Reader(InputStream in) {
    CharsetDecoder d = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
        .onUnmappableCharacter(CodingErrorAction.REPORT);
    return new BufferedReader(new InputStreamReader(in, d));
  }

  // ------------------------------------------------------------------ internals

  private interface LineHandler {
    void accept(String line, long lineNumber);
  }

  /** Calls {@code handler} for each line that is neither empty nor a comment. */
  private static void forEachEntryLine(BufferedReader in, String source, LineHandler handler) {
    long no = 0;
    try {
      String line;
      while (true) {
        try {
          line = in.readLine();
        } catch (CharacterCodingException e) {
          throw ModelFormatException.atLine(source, no + 1, "not valid UTF-8 (" + e + ")");
        }
        if (line == null) {
          return;
        }
        no++;
        if (line.isEmpty() || line.charAt(0) == COMMENT) {
          continue;
        }
        handler.accept(line, no);
      }
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read " + source + " after line " + no + ": " + e.getMessage(), e);
    }
  }

  // ------------------------------------------------------------------ errors

  private static RuntimeException error(String s, int index, String message, String source, long line) {
    String msg = "column " + (s.codePointCount(0, index) + 1) + ": " + message;
    return source == null ? new IllegalArgumentException(msg) : ModelFormatException.atLine(source, line, msg);
  }
}
