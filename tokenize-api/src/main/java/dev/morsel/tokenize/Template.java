package dev.morsel.tokenize;

import java.util.List;
import java.util.Objects;

/**
 * Framing: the reserved tokens put around one encoded text ({@code begin text end}) or two
 * ({@code begin first separator second end}). Spellings name registered reserved tokens. Markers get
 * an empty span at their position and the {@link Tokens#FRAME} flag. Immutable.
 *
 * @since 0.1.0
 */
public final class Template {
  private static final Template NONE = new Template(List.of(), List.of(), List.of());

  private final List<String> begin;
  private final List<String> separator;
  private final List<String> end;

  private Template(List<String> begin, List<String> separator, List<String> end) {
    this.begin = List.copyOf(begin);
    this.separator = List.copyOf(separator);
    this.end = List.copyOf(end);
  }

  /** No framing. */
  public static Template none() {
    return NONE;
  }

  /**
   * A template.
   *
   * @param begin reserved spellings put before the (first) text
   * @param separator reserved spellings put between the two texts
   * @param end reserved spellings put after the (last) text
   */
  public static Template of(List<String> begin, List<String> separator, List<String> end) {
    Objects.requireNonNull(begin, "begin");
    Objects.requireNonNull(separator, "separator");
    Objects.requireNonNull(end, "end");
    return new Template(begin, separator, end);
  }

  /** Markers before the text. */
  public List<String> begin() {
    return begin;
  }

  /** Markers between two texts. */
  public List<String> separator() {
    return separator;
  }

  /** Markers after the text. */
  public List<String> end() {
    return end;
  }

  /**
   * Number of markers that frame {@code segments} texts: {@code begin + end} for one text,
   * {@code begin + separator + end} for two.
   *
   * @param segments 1 or 2
   * @throws IllegalArgumentException if {@code segments} is neither 1 nor 2
   */
  public int markers(int segments) {
    if (segments == 1) {
      return begin.size() + end.size();
    }
    if (segments == 2) {
      return begin.size() + separator.size() + end.size();
    }
    throw new IllegalArgumentException("a template frames 1 or 2 texts, got segments=" + segments);
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Template && begin.equals(((Template) o).begin) && separator.equals(((Template) o).separator)
        && end.equals(((Template) o).end);
  }

  @Override
  public int hashCode() {
    return Objects.hash(begin, separator, end);
  }

  @Override
  public String toString() {
    return "Template[begin=" + begin + ", separator=" + separator + ", end=" + end + "]";
  }
}
