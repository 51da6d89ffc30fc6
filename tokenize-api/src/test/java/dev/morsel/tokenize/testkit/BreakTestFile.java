package dev.morsel.tokenize.testkit;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.zip.GZIPInputStream;

/**
 * Reads a Unicode break conformance file ({@code GraphemeBreakTest.txt}, {@code WordBreakTest.txt};
 * the layout is given in their headers and in UAX #29, section "Testing"): each non-comment line is
 * code points in hex separated by {@code ÷} (a break here) or {@code ×} (no break here), with a
 * {@code #} comment after. The files are vendored gzipped with their licence under
 * {@code src/test/resources/unicode/}.
 */
public final class BreakTestFile {
  private BreakTestFile() {}

  /**
   * One test line: its 1-based line number in the file, the text, the break positions as UTF-16
   * indices in ascending order (0 and the end included, as the file states them), and the raw line.
   */
  public record Line(int number, String text, List<Integer> breaks, String source) {}

  /** Every test line of the gzipped resource {@code resource} (absolute, on the class path). */
  public static List<Line> read(String resource) throws IOException {
    List<Line> lines = new ArrayList<>();
    try (InputStream raw = BreakTestFile.class.getResourceAsStream(resource)) {
      if (raw == null) {
        throw new IOException("missing test resource " + resource);
      }
      BufferedReader in = new BufferedReader(new InputStreamReader(new GZIPInputStream(raw), StandardCharsets.UTF_8));
      int number = 0;
      for (String line = in.readLine(); line != null; line = in.readLine()) {
        number++;
        int hash = line.indexOf('#');
        String body = (hash < 0 ? line : line.substring(0, hash)).trim();
        if (body.isEmpty()) {
          continue;
        }
        StringBuilder text = new StringBuilder();
        List<Integer> breaks = new ArrayList<>();
        for (String field : body.split("\\s+")) {
          if (field.equals("\u00F7")) {
            breaks.add(text.length());
          } else if (field.equals("\u00D7")) {
            continue;
          } else {
            try {
              text.appendCodePoint(Integer.parseInt(field, 16));
            } catch (IllegalArgumentException e) {
              throw new IOException(resource + " line " + number + ": '" + field + "' is neither a break sign nor a code point", e);
            }
          }
        }
        lines.add(new Line(number, text.toString(), Collections.unmodifiableList(breaks), line));
      }
    }
    return Collections.unmodifiableList(lines);
  }
}
