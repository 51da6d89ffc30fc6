package dev.morsel.tokenize.wordpiece.internal;

import dev.morsel.tokenize.format.ModelFormatException;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.List;

/**
 * A plain token list: UTF-8 text, one token spelling a line, in id order. Inside a line, a backslash
 * starts an escape: {@code \\} (backslash), {@code \n}, {@code \r}, {@code \t} and {@code \}{@code
 * uXXXX} (one UTF-16 unit, four hex digits); nothing else is special, so leading and trailing spaces
 * belong to the token. A trailing CR (CRLF files) and a byte order mark on line 1 are ignored.
 * Errors name the line.
 */
final class TokenListText {
  private TokenListText() {}

  /** Reads all lines as token spellings; {@code source} names the input in errors. */
  static List<String> read(Reader in, String source) {
    List<String> out = new ArrayList<>();
    BufferedReader r = in instanceof BufferedReader ? (BufferedReader) in : new BufferedReader(in);
    try {
      String line;
      int lineNo = 0;
      while ((line = r.readLine()) != null) {
        lineNo++;
        if (lineNo == 1 && line.startsWith("\uFEFF")) {
          line = line.substring(1);
        }
        out.add(unescape(line, source, lineNo));
      }
    } catch (IOException e) {
      throw new UncheckedIOException("reading " + source, e);
    }
    return out;
  }

  static String unescape(String line, String source, int lineNo) {
    if (line.isEmpty()) {
      throw new ModelFormatException(source + " line " + lineNo, "empty token");
    }
    if (line.indexOf('\\') < 0) {
      return line;
    }
    StringBuilder sb = new StringBuilder(line.length());
    for (int i = 0; i < line.length(); i++) {
      char c = line.charAt(i);
      if (c != '\\') {
        sb.append(c);
        continue;
      }
      if (i + 1 == line.length()) {
        throw new ModelFormatException(source + " line " + lineNo, "lone backslash at column " + (i + 1));
      }
      char e = line.charAt(++i);
      switch (e) {
        case '\\': sb.append('\\'); break;
        case 'n': sb.append('\n'); break;
        case 'r': sb.append('\r'); break;
        case 't': sb.append('\t'); break;
        case 'u':
          if (i + 4 >= line.length()) {
            throw new ModelFormatException(source + " line " + lineNo, "short \\u escape at column " + i);
          }
          int v = 0;
          for (int k = 1; k <= 4; k++) {
            int d = Character.digit(line.charAt(i + k), 16);
            if (d < 0) {
              throw new ModelFormatException(source + " line " + lineNo, "bad hex digit in \\u escape at column "
                  + (i + k + 1));
            }
            v = v * 16 + d;
          }
          sb.append((char) v);
          i += 4;
          break;
        default:
          throw new ModelFormatException(source + " line " + lineNo, "unknown escape \\" + e + " at column " + i);
      }
    }
    return sb.toString();
  }

  /** Writes one spelling as a line. */
  static void writeLine(Appendable out, String token) throws IOException {
    for (int i = 0; i < token.length(); i++) {
      char c = token.charAt(i);
      switch (c) {
        case '\\': out.append("\\\\"); break;
        case '\n': out.append("\\n"); break;
        case '\r': out.append("\\r"); break;
        case '\t': out.append("\\t"); break;
        default:
          if (Character.isISOControl(c) || c == '\uFEFF' || c == '\u2028' || c == '\u2029' || c == '\u0085') {
            out.append(String.format("\\u%04x", (int) c));
          } else {
            out.append(c);
          }
      }
    }
    out.append('\n');
  }
}
