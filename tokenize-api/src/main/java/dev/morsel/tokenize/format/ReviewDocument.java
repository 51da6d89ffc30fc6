package dev.morsel.tokenize.format;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.regex.Pattern;

/**
 * A review text read and checked for shape (see {@link ReviewText} and {@code docs/format.md}): the
 * header, and each section's heading and rows, with every row's field count checked. What the
 * fields mean is checked by the owner of each section, through {@link Row}'s typed accessors, whose
 * errors name the source, the line and the column. Immutable once read.
 *
 * <p>Owners ask for their sections by name and column names ({@link #section}, {@link
 * #optionalSection}); {@link #expectNoOtherSections()} then refuses any section nobody asked for.
 *
 * @since 0.1.0
 */
public final class ReviewDocument {
  /** Decimal integers: 0, or an optional minus and digits without a leading zero. */
  private static final Pattern INTEGER = Pattern.compile("0|-?[1-9][0-9]*");
  /** Decimal numbers as {@link Double#toString(double)} writes them, plus plain integers. */
  private static final Pattern DECIMAL = Pattern.compile("-?(0|[1-9][0-9]*)(\\.[0-9]+)?(E-?[0-9]+)?");

  private final String source;
  private final String scheme;
  private final Map<String, Section> sections;

  private ReviewDocument(String source, String scheme, Map<String, Section> sections) {
    this.source = source;
    this.scheme = scheme;
    this.sections = sections;
  }

  // ------------------------------------------------------------------ reading

  /**
   * Reads a review text from {@code in}; {@code source} names it in errors (a file name, say).
   *
   * @throws ModelFormatException at {@code source:line} for a malformed header, heading or row
   * @throws UncheckedIOException if reading fails
   */
  public static ReviewDocument read(BufferedReader in, String source) {
    Objects.requireNonNull(in, "in");
    Objects.requireNonNull(source, "source");
    ReviewText.LineSource lines = new ReviewText.LineSource(in, source);
    String header = lines.next();
    if (header == null) {
      throw ModelFormatException.atLine(source, 1, "the file is empty; a review text starts with the header "
          + ReviewText.FORMAT + " TAB " + ReviewText.VERSION + " TAB scheme");
    }
    String[] h = header.split("\t", -1);
    if (!h[0].equals(ReviewText.FORMAT)) {
      throw ModelFormatException.atLine(source, 1, "column 1: not a Morsel review text (expected the header "
          + ReviewText.FORMAT + " TAB " + ReviewText.VERSION + " TAB scheme)");
    }
    if (h.length != 3) {
      throw ModelFormatException.atLine(source, 1, "the header has " + h.length + " columns, expected 3 ("
          + ReviewText.FORMAT + ", version, scheme)");
    }
    if (!INTEGER.matcher(h[1]).matches() || h[1].length() > 9) {
      throw ModelFormatException.atLine(source, 1, "column 2 (version): '" + h[1] + "' is not a version number");
    }
    int version = Integer.parseInt(h[1]);
    if (version != ReviewText.VERSION) {
      throw ModelFormatException.atLine(source, 1, "column 2 (version): review text version " + version + " is "
          + (version > ReviewText.VERSION ? "newer than" : "not") + " this reader's version " + ReviewText.VERSION);
    }
    String scheme = text(source, 1, 3, "scheme", h[2]);
    if (scheme.isEmpty()) {
      throw ModelFormatException.atLine(source, 1, "column 3 (scheme): the scheme is empty");
    }
    Map<String, Section> sections = new LinkedHashMap<>();
    Section current = null;
    List<Row> rows = null;
    String line;
    while ((line = lines.next()) != null) {
      long no = lines.number();
      if (line.isEmpty() || line.charAt(0) == ReviewText.NOTE_SIGN) {
        continue;
      }
      if (line.charAt(0) == ReviewText.SECTION_SIGN) {
        if (line.length() < 2 || line.charAt(1) != ' ') {
          throw ModelFormatException.atLine(source, no, "column 1: a section heading is "
              + ReviewText.SECTION_SIGN + ", one space and the section name");
        }
        String[] f = line.substring(2).split("\t", -1);
        for (int i = 0; i < f.length; i++) {
          if (!ReviewWriter.NAME.matcher(f[i]).matches()) {
            throw ModelFormatException.atLine(source, no, "column " + (i + 1) + ": '" + f[i] + "' is not a "
                + (i == 0 ? "section" : "column") + " name (a lower-case letter, then lower-case letters, digits or '-')");
          }
        }
        if (f.length < 2) {
          throw ModelFormatException.atLine(source, no, "section " + f[0] + " names no column");
        }
        Section previous = sections.get(f[0]);
        if (previous != null) {
          throw ModelFormatException.atLine(source, no, "column 1: section " + f[0] + " repeats line " + previous.line);
        }
        rows = new ArrayList<>();
        String[] columns = new String[f.length - 1];
        System.arraycopy(f, 1, columns, 0, columns.length);
        current = new Section(source, f[0], no, List.of(columns), Collections.unmodifiableList(rows));
        sections.put(f[0], current);
        continue;
      }
      if (current == null) {
        throw ModelFormatException.atLine(source, no, "a row before the first section heading");
      }
      String[] f = line.split("\t", -1);
      if (f.length != current.columns.size()) {
        throw ModelFormatException.atLine(source, no, "the row has " + f.length + " columns, section "
            + current.name + " has " + current.columns.size() + " (" + String.join(", ", current.columns) + ")");
      }
      rows.add(new Row(current, no, f));
    }
    return new ReviewDocument(source, scheme, Collections.unmodifiableMap(sections));
  }

  /**
   * Reads a review text from a UTF-8 file (strictly decoded); errors name the file.
   *
   * @throws ModelFormatException at {@code path:line}
   * @throws UncheckedIOException naming the path if the file cannot be read
   */
  public static ReviewDocument read(Path path) {
    byte[] b;
    try {
      b = Files.readAllBytes(path);
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read review text " + path + ": " + e.getMessage(), e);
    }
    return read(new BufferedReader(new StringReader(ReviewText.strictUtf8(b, path.toString()))), path.toString());
  }

  // ------------------------------------------------------------------ API

  /** The source name given to the reader. */
  public String source() {
    return source;
  }

  /** The scheme named in the header. */
  public String scheme() {
    return scheme;
  }

  /**
   * Section {@code name}, which must be present with exactly these column names.
   *
   * @throws ModelFormatException if the section is missing (naming the source) or its columns differ
   *     (naming the heading line and the first differing column)
   */
  public Section section(String name, String... columns) {
    Section s = optionalSection(name, columns);
    if (s == null) {
      throw new ModelFormatException(source, "the review text of scheme " + scheme + " has no section " + name
          + " (columns " + String.join(", ", columns) + "); sections present: " + sections.keySet());
    }
    return s;
  }

  /**
   * Section {@code name} with exactly these column names, or null if absent.
   *
   * @throws ModelFormatException naming the heading line and column if the columns differ
   */
  public Section optionalSection(String name, String... columns) {
    Section s = sections.get(name);
    if (s == null) {
      return null;
    }
    for (int i = 0; i < Math.max(columns.length, s.columns.size()); i++) {
      String want = i < columns.length ? columns[i] : null;
      String have = i < s.columns.size() ? s.columns.get(i) : null;
      if (!Objects.equals(want, have)) {
        throw ModelFormatException.atLine(source, s.line, "column " + (i + 2) + ": section " + name + " has the columns "
            + String.join(", ", columns) + (have == null ? "; a column is missing here" : "; found '" + have + "'"));
      }
    }
    s.used = true;
    return s;
  }

  /**
   * Refuses every section that no owner asked for.
   *
   * @throws ModelFormatException naming the heading line of the first such section
   */
  public void expectNoOtherSections() {
    for (Section s : sections.values()) {
      if (!s.used) {
        throw ModelFormatException.atLine(source, s.line, "column 1: no section " + s.name + " belongs in a review text of scheme "
            + scheme);
      }
    }
  }

  /** An error about the whole document, naming its source. */
  public ModelFormatException fail(String message) {
    return new ModelFormatException(source, message);
  }

  @Override
  public String toString() {
    return "ReviewDocument[" + source + ", scheme " + scheme + ", sections " + sections.keySet() + "]";
  }

  // ------------------------------------------------------------------ sections and rows

  /**
   * One section: its heading line, its column names and its rows in file order. Immutable.
   *
   * @since 0.1.0
   */
  public static final class Section {
    private final String source;
    private final String name;
    private final long line;
    private final List<String> columns;
    private final List<Row> rows;
    private boolean used;

    private Section(String source, String name, long line, List<String> columns, List<Row> rows) {
      this.source = source;
      this.name = name;
      this.line = line;
      this.columns = columns;
      this.rows = rows;
    }

    /** The section name. */
    public String name() {
      return name;
    }

    /** The 1-based line of the heading. */
    public long line() {
      return line;
    }

    /** The rows, in file order (unmodifiable). */
    public List<Row> rows() {
      return rows;
    }

    /**
     * The rows indexed by the integer in column {@code column} (an id or a rank): each of {@code
     * 0..n-1} must occur exactly once, {@code n} being the number of rows, in any row order.
     *
     * @throws ModelFormatException at the row whose number is malformed, out of range or repeated
     */
    public Row[] byIndex(int column) {
      int n = rows.size();
      Row[] out = new Row[n];
      for (Row r : rows) {
        int i = (int) r.integer(column, 0, n - 1L);
        if (out[i] != null) {
          throw r.fail(column, columns.get(column) + " " + i + " repeats line " + out[i].line());
        }
        out[i] = r;
      }
      return out;
    }

    /** An error about the section as a whole, at its heading line. */
    public ModelFormatException fail(String message) {
      return ModelFormatException.atLine(source, line, "section " + name + ": " + message);
    }
  }

  /**
   * One row: its line and its raw fields. The accessors take a 0-based column index and report errors
   * as {@code source:line: column N (name): ...} with N 1-based. Immutable.
   *
   * @since 0.1.0
   */
  public static final class Row {
    private final Section section;
    private final long line;
    private final String[] fields;

    private Row(Section section, long line, String[] fields) {
      this.section = section;
      this.line = line;
      this.fields = fields;
    }

    /** The 1-based line number. */
    public long line() {
      return line;
    }

    /** The field of column {@code column} as written (escapes not resolved). */
    public String raw(int column) {
      return fields[Objects.checkIndex(column, fields.length)];
    }

    /** The bytes of column {@code column}'s field, escapes resolved. */
    public byte[] bytes(int column) {
      String f = raw(column);
      try {
        return ReviewText.unescape(f, 0, f.length());
      } catch (ReviewText.BadField e) {
        throw fail(column, "character " + e.character + ": " + e.getMessage());
      }
    }

    /** The text of column {@code column}'s field: its bytes, which must be well-formed UTF-8. */
    public String text(int column) {
      return ReviewDocument.text(section.source, line, column + 1, section.columns.get(column), raw(column));
    }

    /** The field of column {@code column}, which must be one of {@code words}. */
    public String word(int column, String... words) {
      String f = raw(column);
      for (String w : words) {
        if (w.equals(f)) {
          return w;
        }
      }
      throw fail(column, "'" + f + "' is not one of " + String.join(", ", words));
    }

    /**
     * The decimal integer in column {@code column} (0, or an optional minus sign and digits without a
     * leading zero), which must
     * lie in {@code [min, max]}.
     */
    public long integer(int column, long min, long max) {
      String f = raw(column);
      if (!INTEGER.matcher(f).matches() || f.length() > 19) {
        throw fail(column, "'" + f + "' is not a decimal integer");
      }
      long v;
      try {
        v = Long.parseLong(f);
      } catch (NumberFormatException e) {
        throw fail(column, "'" + f + "' is not a decimal integer");
      }
      if (v < min || v > max) {
        throw fail(column, v + " is outside [" + min + ", " + max + "]");
      }
      return v;
    }

    /**
     * The finite decimal number in column {@code column}, as {@link Double#toString(double)} writes it
     * (digits, optional fraction, optional {@code E} exponent); reading the written form gives back
     * the same {@code double} bit for bit.
     */
    public double decimal(int column) {
      String f = raw(column);
      if (!DECIMAL.matcher(f).matches()) {
        throw fail(column, "'" + f + "' is not a decimal number");
      }
      double v = Double.parseDouble(f);
      if (Double.isInfinite(v)) {
        throw fail(column, "'" + f + "' is outside the range of a double");
      }
      return v;
    }

    /** A format error at this row's line and column {@code column} (0-based). */
    public ModelFormatException fail(int column, String message) {
      return ModelFormatException.atLine(section.source, line, "column " + (column + 1) + " ("
          + section.columns.get(column) + "): " + message);
    }

    /** A format error at this row's line. */
    public ModelFormatException fail(String message) {
      return ModelFormatException.atLine(section.source, line, message);
    }
  }

  private static String text(String source, long line, int column, String name, String field) {
    byte[] b;
    try {
      b = ReviewText.unescape(field, 0, field.length());
    } catch (ReviewText.BadField e) {
      throw ModelFormatException.atLine(source, line, "column " + column + " (" + name + "): character "
          + e.character + ": " + e.getMessage());
    }
    String s = ReviewText.decodeUtf8(b);
    if (s == null) {
      throw ModelFormatException.atLine(source, line, "column " + column + " (" + name + "): the bytes "
          + field + " are not well-formed UTF-8 text");
    }
    return s;
  }
}
