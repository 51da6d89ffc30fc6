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
import java.util.zip.GZIPInputStream;

/**
 * The lines of a list of files, in order, decoded as strict UTF-8 (malformed or unmappable input is
 * a {@link CorpusException} with its byte offset). A file whose name ends in {@code .gz} is
 * decompressed. Lines end with LF; a CR before the LF is dropped; a last line without LF counts if
 * it is not empty. Not thread-safe; close it to release the open file.
 */
final class Utf8Lines implements Iterator<CharSequence>, Closeable {
  /** Read buffer in bytes and decode buffer in chars; 64 KiB amortizes read calls. */
  private static final int BUFFER = 1 << 16;
  /** Longest line in chars (2^28 chars = 512 MiB of heap); longer is a CorpusException. */
  static final int MAX_LINE_CHARS = 1 << 28;

  private final List<Path> files;
  private int fileIndex = -1;
  private Path file;
  private InputStream stream;
  private final CharsetDecoder decoder = StandardCharsets.UTF_8.newDecoder()
      .onMalformedInput(CodingErrorAction.REPORT)
      .onUnmappableCharacter(CodingErrorAction.REPORT);
  private final ByteBuffer in = ByteBuffer.allocate(BUFFER);
  private final CharBuffer out = CharBuffer.allocate(BUFFER);
  private final StringBuilder line = new StringBuilder();
  private final ArrayDeque<String> ready = new ArrayDeque<>();
  private long base; // file offset of in[0]
  private long lineNo; // 1-based number of the line being built
  private boolean eof;

  Utf8Lines(List<Path> files) {
    this.files = files;
  }

  @Override
  public boolean hasNext() {
    try {
      while (ready.isEmpty()) {
        if (stream == null && !openNext()) {
          return false;
        }
        step();
      }
      return true;
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read " + file, e);
    }
  }

  @Override
  public CharSequence next() {
    if (!hasNext()) {
      throw new NoSuchElementException();
    }
    return ready.poll();
  }

  @Override
  public void close() {
    if (stream != null) {
      try {
        stream.close();
      } catch (IOException e) {
        throw new UncheckedIOException("cannot close " + file, e);
      } finally {
        stream = null;
      }
    }
  }

  private boolean openNext() throws IOException {
    if (fileIndex + 1 >= files.size()) {
      return false;
    }
    file = files.get(++fileIndex);
    InputStream s = Files.newInputStream(file);
    if (file.getFileName() != null && file.getFileName().toString().endsWith(".gz")) {
      try {
        s = new GZIPInputStream(s, BUFFER);
      } catch (IOException e) {
        s.close();
        throw e;
      }
    }
    stream = s;
    decoder.reset();
    in.clear().flip();
    out.clear();
    line.setLength(0);
    base = 0;
    lineNo = 1;
    eof = false;
    return true;
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
        throw new CorpusException(file, base + in.position(), lineNo,
            "invalid UTF-8 (" + (r.isMalformed() ? "malformed" : "unmappable") + " sequence of " + r.length() + " byte(s))");
      }
      drain();
      if (r.isUnderflow()) {
        break;
      }
    }
    if (eof) {
      decoder.flush(out);
      drain();
      if (line.length() > 0) {
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
      throw new CorpusException(file, base + in.position(), lineNo,
          "line longer than " + MAX_LINE_CHARS + " chars (Utf8Lines.MAX_LINE_CHARS)");
    }
    out.clear();
  }

  private void emit() {
    int n = line.length();
    if (n > 0 && line.charAt(n - 1) == '\r') {
      n--;
    }
    ready.add(line.substring(0, n));
    line.setLength(0);
  }
}
