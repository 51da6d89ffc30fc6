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
    super(file + ": " + problem + " at byte offset " + byteOffset + " (line " + line + ")");
    this.file = file;
    this.byteOffset = byteOffset;
    this.line = line;
  }

  /** The file being read. */
  public Path file() {
    return file;
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
