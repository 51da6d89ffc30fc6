package dev.morsel.tokenize.train;

import java.io.Closeable;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CoderResult;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.Iterator;
import java.util.List;
import java.util.NoSuchElementException;
import java.util.Objects;
import java.util.zip.GZIPInputStream;
import it.unimi.dsi.fastutil.longs.LongArrayFIFOQueue;

/**
 * The lines of a list of files, or of one stream, in order, decoded as UTF-8. A file whose name
 * ends in {@code .gz} is decompressed. Lines end with LF; a CR before the LF is dropped; a last line
 * without LF counts if it is not empty. Not thread-safe; close it to release the open file.
 *
 * <p>Bytes that are not UTF-8 follow a {@link Malformed} policy: {@link Malformed#FAIL} (the
 * default) throws a {@link CorpusException} naming the source, the 1-based line and the byte
 * offset; {@link Malformed#REPLACE} writes U+FFFD for each bad sequence; {@link Malformed#SKIP}
 * leaves out every line that holds one. {@link #malformedLines()} counts the lines replaced or
 * skipped. Line numbers are exact whatever the buffering: {@link #line()} is the number of the line
 * last returned by {@link #next()}.
 *
 * @since 0.1.0
 */
public final class Utf8Lines implements Iterator<String>, Closeable {
  /** What to do with a line that holds bytes that are not UTF-8. */
  public enum Malformed {
    /** Throw a {@link CorpusException} naming the source, line and byte offset. */
    FAIL,
    /** Write U+FFFD for each malformed sequence and keep the line. */
    REPLACE,
    /** Leave out the whole line. */
    SKIP
  }

  /** Read buffer in bytes and decode buffer in chars; 64 KiB amortizes read calls. */
  private static final int BUFFER = 1 << 16;
  /** Longest line in chars (2^28 chars = 512 MiB of heap); longer is a CorpusException. */
  static final int MAX_LINE_CHARS = 1 << 28;

  private final List<Path> files; // null: one stream
  private final InputStream given;
  private final String givenName;
  private final Malformed policy;
  private int fileIndex = -1;
  private Path file;
  private String source;
  private InputStream stream;
  private final CharsetDecoder decoder = StandardCharsets.UTF_8.newDecoder()
      .onMalformedInput(CodingErrorAction.REPORT)
      .onUnmappableCharacter(CodingErrorAction.REPORT);
  private final ByteBuffer in = ByteBuffer.allocate(BUFFER);
  private final CharBuffer out = CharBuffer.allocate(BUFFER);
  private final StringBuilder line = new StringBuilder();
  private final ArrayDeque<String> ready = new ArrayDeque<>();
  private final LongArrayFIFOQueue readyLines = new LongArrayFIFOQueue();
  private final ArrayDeque<String> readySources = new ArrayDeque<>();
  private long base; // file offset of in[0]
  private long lineNo; // 1-based number of the line being built
  private boolean lineMalformed; // the line being built held a malformed sequence
  private boolean eof;
  private CorpusException pending; // a failure met while reading ahead
  private long rawBytes; // bytes read from the underlying files or stream (compressed for .gz)
  private long malformedLines;
  private long lastLine;
  private String lastSource;

  Utf8Lines(List<Path> files) {
    this(files, null, null, Malformed.FAIL);
  }

  private Utf8Lines(List<Path> files, InputStream given, String givenName, Malformed policy) {
    this.files = files;
    this.given = given;
    this.givenName = givenName;
    this.policy = Objects.requireNonNull(policy, "policy");
  }

  /** The lines of {@code files}, in order, with the given policy for bytes that are not UTF-8. */
  public static Utf8Lines open(List<Path> files, Malformed policy) {
    List<Path> copy = List.copyOf(files);
    return new Utf8Lines(copy, null, null, policy);
  }

  /**
   * The lines of one stream (standard input, say), named {@code name} in errors; the stream is
   * closed with this reader. It is read as it is: not decompressed.
   */
  public static Utf8Lines of(InputStream in, String name, Malformed policy) {
    return new Utf8Lines(null, Objects.requireNonNull(in, "in"), Objects.requireNonNull(name, "name"), policy);
  }

  /** The 1-based number, within its file, of the line last returned by {@link #next()}; 0 before the first. */
  public long line() {
    return lastLine;
  }

  /** The file (or stream name) of the line last returned by {@link #next()}; null before the first. */
  public String source() {
    return lastSource;
  }

  /** Bytes read so far from the files or the stream, as stored (compressed bytes for a {@code .gz} file). */
  public long bytesRead() {
    return rawBytes;
  }

  /** Lines so far that held bytes that are not UTF-8 and were replaced or skipped. */
  public long malformedLines() {
    return malformedLines;
  }

  @Override
  public boolean hasNext() {
    try {
      while (ready.isEmpty()) {
        if (pending != null) {
          throw pending;
        }
        if (stream == null && !openNext()) {
          return false;
        }
        step();
      }
      return true;
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read " + source + ": " + reason(e), e);
    }
  }

  private static String reason(IOException e) {
    String m = e.getMessage();
    return e instanceof java.nio.file.NoSuchFileException ? "no such file"
        : e instanceof java.nio.file.AccessDeniedException ? "permission denied"
        : m == null ? e.getClass().getSimpleName() : m;
  }

  @Override
  public String next() {
    if (!hasNext()) {
      throw new NoSuchElementException();
    }
    lastLine = readyLines.dequeueLong();
    lastSource = readySources.poll();
    return ready.poll();
  }

  @Override
  public void close() {
    if (stream != null) {
      try {
        stream.close();
      } catch (IOException e) {
        throw new UncheckedIOException("cannot close " + source + ": " + reason(e), e);
      } finally {
        stream = null;
      }
    }
  }

  private boolean openNext() throws IOException {
    if (files == null) {
      if (fileIndex >= 0) {
        return false;
      }
      fileIndex = 0;
      source = givenName;
      stream = new Counting(given);
      resetState();
      return true;
    }
    if (fileIndex + 1 >= files.size()) {
      return false;
    }
    file = files.get(++fileIndex);
    source = file.toString();
    if (Files.isDirectory(file)) {
      throw new UncheckedIOException("cannot read " + file + ": it is a folder, not a file",
          new IOException("is a directory"));
    }
    InputStream s = new Counting(Files.newInputStream(file));
    if (file.getFileName() != null && file.getFileName().toString().endsWith(".gz")) {
      try {
        s = new GZIPInputStream(s, BUFFER);
      } catch (IOException e) {
        s.close();
        throw e;
      }
    }
    stream = s;
    resetState();
    return true;
  }

  private void resetState() {
    decoder.reset();
    in.clear().flip();
    out.clear();
    line.setLength(0);
    base = 0;
    lineNo = 1;
    lineMalformed = false;
    eof = false;
  }

  /** Reads and decodes one buffer of the current file; queues the lines it completes. */
  private void step() throws IOException {
    base += in.position();
    in.compact();
    int n = stream.read(in.array(), in.position(), in.remaining());
    if (n < 0) {
      eof = true;
    } else {
      in.position(in.position() + n);
    }
    in.flip();
    while (true) {
      CoderResult r = decoder.decode(in, out, eof);
      if (r.isError()) {
        drain();
        if (policy == Malformed.FAIL) {
          // thrown once the lines before it have been returned
          pending = new CorpusException(source, file, base + in.position(), lineNo,
              "invalid UTF-8 (" + (r.isMalformed() ? "malformed" : "unmappable") + " sequence of " + r.length() + " byte(s))");
          return;
        }
        lineMalformed = true;
        if (policy == Malformed.REPLACE) {
          line.append('\uFFFD');
        }
        in.position(in.position() + r.length());
        continue;
      }
      drain();
      if (r.isUnderflow()) {
        break;
      }
    }
    if (eof) {
      decoder.flush(out);
      drain();
      if (line.length() > 0 || lineMalformed) {
        emit();
      }
      close();
    }
  }

  private void drain() {
    out.flip();
    char[] a = out.array();
    int end = out.limit();
    int from = out.position();
    for (int i = from; i < end; i++) {
      if (a[i] == '\n') {
        line.append(a, from, i - from);
        emit();
        lineNo++;
        from = i + 1;
      }
    }
    line.append(a, from, end - from);
    if (line.length() > MAX_LINE_CHARS) {
      throw new CorpusException(source, file, base + in.position(), lineNo,
          "line longer than " + MAX_LINE_CHARS + " chars, the longest line a corpus may hold");
    }
    out.clear();
  }

  private void emit() {
    int n = line.length();
    if (n > 0 && line.charAt(n - 1) == '\r') {
      n--;
    }
    boolean skip = false;
    if (lineMalformed) {
      malformedLines++;
      skip = policy == Malformed.SKIP;
      lineMalformed = false;
    }
    if (!skip) {
      ready.add(line.substring(0, n));
      readyLines.enqueue(lineNo);
      readySources.add(source);
    }
    line.setLength(0);
    if (line.capacity() > BUFFER * 16) {
      line.trimToSize(); // a long line does not keep its buffer for the rest of the file
    }
  }

  /** Counts the bytes read from the underlying stream, for {@link #bytesRead()}. */
  private final class Counting extends java.io.FilterInputStream {
    Counting(InputStream in) {
      super(in);
    }

    @Override
    public int read() throws IOException {
      int b = super.read();
      if (b >= 0) {
        rawBytes++;
      }
      return b;
    }

    @Override
    public int read(byte[] b, int off, int len) throws IOException {
      int n = super.read(b, off, len);
      if (n > 0) {
        rawBytes += n;
      }
      return n;
    }
  }
}
