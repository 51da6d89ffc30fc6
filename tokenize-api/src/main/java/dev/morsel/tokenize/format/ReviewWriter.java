package dev.morsel.tokenize.format;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.HashSet;
import java.util.Objects;
import java.util.Set;
import java.util.regex.Pattern;

/**
 * Writes a review text (see {@link ReviewText} and {@code docs/format.md}): the header line on
 * creation, then notes, section headings and rows. Every row is checked against its heading's column
 * count and every field against the escaping, so the writer cannot produce a file its reader
 * refuses. Not thread-safe.
 *
 * @since 0.1.0
 */
public final class ReviewWriter {
  /** Section and column names: a lower-case ASCII letter, then lower-case letters, digits or '-'. */
  static final Pattern NAME = Pattern.compile("[a-z][a-z0-9-]*");

  private final Appendable out;
  private final Set<String> sections = new HashSet<>();
  private int columns = -1;
  private String section;

  private ReviewWriter(Appendable out) {
    this.out = out;
  }

  /**
   * Starts a review text of scheme {@code scheme} on {@code out} by writing the header line.
   *
   * @throws IllegalArgumentException if {@code scheme} is empty
   * @throws UncheckedIOException if {@code out} fails
   */
  public static ReviewWriter start(Appendable out, String scheme) {
    Objects.requireNonNull(out, "out");
    Objects.requireNonNull(scheme, "scheme");
    if (scheme.isEmpty()) {
      throw new IllegalArgumentException("scheme must not be empty");
    }
    ReviewWriter w = new ReviewWriter(out);
    w.line(ReviewText.FORMAT + '\t' + ReviewText.VERSION + '\t' + ReviewText.escape(scheme));
    return w;
  }

  /**
   * Writes a note line for people ({@value ReviewText#NOTE_SIGN}, a space, {@code text}); readers skip it.
   *
   * @throws IllegalArgumentException if {@code text} holds a line break
   */
  public ReviewWriter note(String text) {
    if (text.indexOf('\n') >= 0 || text.indexOf('\r') >= 0) {
      throw new IllegalArgumentException("a note is one line; it holds a line break");
    }
    return line(ReviewText.NOTE_SIGN + " " + text);
  }

  /**
   * Starts section {@code name} with the given column names.
   *
   * @throws IllegalArgumentException if a name is malformed (see {@link #NAME}), there is no column,
   *     or the section was written before
   */
  public ReviewWriter section(String name, String... columnNames) {
    checkName("section", name);
    if (columnNames.length == 0) {
      throw new IllegalArgumentException("section " + name + " needs at least one column");
    }
    if (!sections.add(name)) {
      throw new IllegalArgumentException("section " + name + " written twice");
    }
    StringBuilder sb = new StringBuilder().append(ReviewText.SECTION_SIGN).append(' ').append(name);
    for (String c : columnNames) {
      checkName("column", c);
      sb.append('\t').append(c);
    }
    section = name;
    columns = columnNames.length;
    return line(sb.toString());
  }

  /**
   * Writes one row of the current section. Each field is already in field form: a number, a word
   * from the section's vocabulary, or the result of {@link ReviewText#escape(byte[])}.
   *
   * @throws IllegalStateException if no section was started
   * @throws IllegalArgumentException if the number of fields is not the section's column count, or a
   *     field is not in field form
   */
  public ReviewWriter row(String... fields) {
    if (section == null) {
      throw new IllegalStateException("a row needs a section; call section(..) first");
    }
    if (fields.length != columns) {
      throw new IllegalArgumentException("section " + section + " has " + columns + " columns, the row " + fields.length);
    }
    if (columns == 1 && fields[0].isEmpty()) {
      throw new IllegalArgumentException("a row of one empty field would be an empty line, which readers skip");
    }
    StringBuilder sb = new StringBuilder();
    for (int i = 0; i < fields.length; i++) {
      String f = fields[i];
      try {
        ReviewText.unescape(f, 0, f.length());
      } catch (ReviewText.BadField e) {
        throw new IllegalArgumentException("field " + (i + 1) + " of a row of section " + section
            + " is not in field form: character " + e.character + ": " + e.getMessage());
      }
      if (!f.isEmpty() && (f.charAt(0) == ReviewText.SECTION_SIGN || f.charAt(0) == ReviewText.NOTE_SIGN)) {
        throw new IllegalArgumentException("field " + (i + 1) + " of a row of section " + section
            + " starts with a section or note sign; escape it");
      }
      if (i > 0) {
        sb.append('\t');
      }
      sb.append(f);
    }
    return line(sb.toString());
  }

  /**
   * The field form of a finite number, as {@link Double#toString(double)} writes it, which {@link
   * ReviewDocument.Row#decimal} reads back bit for bit.
   *
   * @throws IllegalArgumentException if {@code v} is NaN or infinite
   */
  public static String decimal(double v) {
    if (!Double.isFinite(v)) {
      throw new IllegalArgumentException(v + " is not finite");
    }
    return Double.toString(v);
  }

  private static void checkName(String what, String name) {
    Objects.requireNonNull(name, what);
    if (!NAME.matcher(name).matches()) {
      throw new IllegalArgumentException(what + " name '" + name + "' is not a lower-case letter followed by"
          + " lower-case letters, digits or '-'");
    }
  }

  private ReviewWriter line(String s) {
    try {
      out.append(s).append('\n');
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return this;
  }
}
