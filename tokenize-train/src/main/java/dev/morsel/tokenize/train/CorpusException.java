package dev.morsel.tokenize.train;

import java.nio.file.Path;

/**
 * A corpus file that cannot be read as text: bytes that are not valid UTF-8, or a line over the
 * length limit. The message names the file, the byte offset and the line; the same facts are
 * available from the accessors. Unchecked.
 *
 * @since 0.1.0
 */
public final class CorpusException extends IllegalArgumentException {
  private static final long serialVersionUID = 1L;

  private final transient Path file;
  private final String source;
  private final String problem;
  private final long byteOffset;
  private final long line;

  /**
   * @param file the file being read
   * @param byteOffset offset of the first bad byte from the start of the file (of the decompressed
   *     data for a {@code .gz} file)
   * @param line 1-based number of the line holding it
   * @param problem what is wrong, for the message
   */
  public CorpusException(Path file, long byteOffset, long line, String problem) {
    this(String.valueOf(file), file, byteOffset, line, problem);
  }

  /**
   * A stream that is not a file (standard input, say), named {@code source} in the message; {@link
   * #file()} is then null.
   *
   * @param source the name of the stream or file, for the message
   * @param file the file being read, or null for a stream
   * @param byteOffset offset of the first bad byte from the start of the stream
   * @param line 1-based number of the line holding it
   * @param problem what is wrong, for the message
   */
  public CorpusException(String source, Path file, long byteOffset, long line, String problem) {
    super(source + ": " + problem + " at byte offset " + byteOffset + " (line " + line + ")");
    this.source = source;
    this.problem = problem;
    this.file = file;
    this.byteOffset = byteOffset;
    this.line = line;
  }

  /** The file being read, or null for a stream that is not a file. */
  public Path file() {
    return file;
  }

  /** The name of the file or stream being read. */
  public String source() {
    return source;
  }

  /** What is wrong, without the place (for example {@code "invalid UTF-8 (malformed sequence of 1 byte(s))"}). */
  public String problem() {
    return problem;
  }

  /**
   * Offset in bytes of the bad sequence from the start of the file; for a {@code .gz} file, from the
   * start of the decompressed data.
   */
  public long byteOffset() {
    return byteOffset;
  }

  /** 1-based line number of the bad sequence (lines end with LF). */
  public long line() {
    return line;
  }
}
