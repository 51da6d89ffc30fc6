package dev.morsel.tokenize.format;

/**
 * A model file (or a review text or token list) is malformed. The message names the
 * section (or line) and the offset where the problem was found; nothing was built from it.
 *
 * @since 0.1.0
 */
public final class ModelFormatException extends RuntimeException {
  private static final long serialVersionUID = 1L;

  private final String section;
  private final String detail;

  /**
   * @param section the section tag (or a file/line description) where the problem is; may be {@code "header"}
   * @param message what is wrong
   */
  public ModelFormatException(String section, String message) {
    super("model section " + section + ": " + message);
    this.section = section;
    this.detail = message;
  }

  /** As {@link #ModelFormatException(String, String)} with a cause. */
  public ModelFormatException(String section, String message, Throwable cause) {
    super("model section " + section + ": " + message, cause);
    this.section = section;
    this.detail = message;
  }

  /** For text sources: the message is {@code "<source>:<line>: <message>"}. */
  private ModelFormatException(String sourceLine, String message, boolean text) {
    super(sourceLine + ": " + message);
    this.section = sourceLine;
    this.detail = message;
  }

  /**
   * A text-format error at {@code source:line} (1-based line); the message is {@code
   * "<source>:<line>: <message>"} and {@link #section()} is {@code "<source>:<line>"}.
   */
  public static ModelFormatException atLine(String source, long line, String message) {
    return new ModelFormatException(source + ":" + line, message, true);
  }

  /** The message without the section prefix. */
  String detail() {
    return detail;
  }

  /** The section tag, or {@code "header"}, {@code "table"}, or a source description for text formats. */
  public String section() {
    return section;
  }
}
