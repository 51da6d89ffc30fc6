package dev.morsel.tokenize.cli;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.core.StreamReadFeature;
import dev.morsel.tokenize.Decoding;
import dev.morsel.tokenize.StreamDecoder;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code morsel decode}: ids back to text. Ids are parsed as they stream in and decoded through a
 * {@link StreamDecoder}, so memory does not grow with the length of a line.
 */
@Command(name = "decode", mixinStandardHelpOptions = true, separator = " ",
    description = "Decode ids into text. Each input line is space-separated ids, or a JSON object with an \"ids\" array"
        + " (as 'morsel encode --format json' writes).",
    footer = {"", "Examples:", "  morsel decode --model ferry.morsel 412 88 1093",
        "  morsel encode --model ferry.morsel --format json < in.txt \\",
        "      | morsel decode --model ferry.morsel"})
final class DecodeCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Option(names = {"-m", "--model"}, required = true, paramLabel = "FILE", description = "The model file.")
  Path model;

  @Parameters(paramLabel = "ID", description = "Ids to decode as one sequence; without any, lines are read from --input or standard input.")
  List<String> ids = new ArrayList<>();

  @Option(names = "--input", paramLabel = "FILE", description = "Read lines of ids from this file instead of standard input.")
  Path input;

  @Option(names = "--drop-reserved", description = "Leave out reserved tokens and padding.")
  boolean dropReserved;

  @Option(names = "--strict", description = "Fail on ids whose bytes are not valid UTF-8 instead of writing U+FFFD.")
  boolean strict;

  private static final JsonFactory JSON = JsonFactory.builder().disable(StreamReadFeature.INCLUDE_SOURCE_IN_LOCATION).build();

  @Override
  public Integer call() throws Exception {
    Tokenizer t = Tokenizers.load(model);
    PrintWriter out = spec.commandLine().getOut();
    Decoding d = strict ? Decoding.STRICT : Decoding.REPLACE;
    if (!ids.isEmpty()) {
      byte[] joined = String.join(" ", ids).getBytes(StandardCharsets.UTF_8);
      decodeAll(t, new ByteArrayInputStream(joined), "arguments", d, out);
    } else if (input != null) {
      if (Files.isDirectory(input)) {
        throw new IllegalArgumentException("cannot read " + input + ": it is a folder, not a file");
      }
      try (InputStream in = Files.newInputStream(input)) {
        decodeAll(t, in, input.toString(), d, out);
      }
    } else {
      decodeAll(t, System.in, "standard input", d, out);
    }
    out.flush();
    return 0;
  }

  /** Decodes every line of {@code in}; each output line is flushed as it ends. */
  void decodeAll(Tokenizer t, InputStream in, String source, Decoding d, PrintWriter out) throws IOException {
    LineStream lines = new LineStream(in);
    long n = 0;
    while (lines.nextLine()) {
      n++;
      Sink sink = new Sink(t, dropReserved, d, out, source, n);
      parse(lines, source, n, sink);
      sink.end();
      out.append('\n');
      out.flush();
    }
  }

  /** Where parsed ids go: checked, decoded and written. */
  interface IdSink {
    void id(int id, long field);
  }

  /** Writes the decoded text of one line as the ids arrive; errors name the line and the id's 1-based position. */
  static final class Sink implements IdSink {
    private final Tokenizer t;
    private final StreamDecoder decoder;
    private final PrintWriter out;
    private final String source;
    private final long line;
    private final int vocabularySize;
    private long field;

    Sink(Tokenizer t, boolean dropReserved, Decoding d, PrintWriter out, String source, long line) {
      this.t = t;
      this.decoder = t.streamDecoder(dropReserved, d);
      this.out = out;
      this.source = source;
      this.line = line;
      this.vocabularySize = t.vocabularySize();
    }

    @Override
    public void id(int id, long field) {
      this.field = field;
      if (id < 0 || id >= vocabularySize) {
        throw new IllegalArgumentException(String.format(Locale.ROOT,
            "%s: id %d (number %,d on the line) is outside the vocabulary of %,d ids (0..%,d)", where(source, line), id,
            field, vocabularySize, vocabularySize - 1));
      }
      try {
        out.append(decoder.accept(id));
      } catch (IllegalArgumentException e) {
        throw illFormed(e);
      }
    }

    void end() {
      try {
        out.append(decoder.flush());
      } catch (IllegalArgumentException e) {
        throw illFormed(e);
      }
    }

    private IllegalArgumentException illFormed(IllegalArgumentException e) {
      return new IllegalArgumentException(String.format(Locale.ROOT,
          "%s: the ids up to number %,d on the line do not decode to valid UTF-8 (--strict); leave out --strict to write"
              + " U+FFFD instead", where(source, line), field), e);
    }
  }

  static String where(String source, long line) {
    return source.equals("arguments") ? "arguments" : String.format(Locale.ROOT, "%s line %,d", source, line);
  }

  /**
   * Parses one line of ids from {@code lines} into {@code sink}: space- or comma-separated integers,
   * or one JSON object with an "ids" array. Errors name the line and the bad field (1-based).
   */
  static void parse(LineStream lines, String source, long line, IdSink sink) throws IOException {
    int c = lines.read();
    while (c == ' ' || c == '\t' || c == '\r') {
      c = lines.read();
    }
    if (c == '{') {
      lines.unread(c);
      parseJson(lines, source, line, sink);
      return;
    }
    long field = 0;
    while (c >= 0) {
      if (c == ' ' || c == '\t' || c == '\r' || c == ',') {
        c = lines.read();
        continue;
      }
      field++;
      StringBuilder text = new StringBuilder();
      long value = 0;
      boolean negative = false;
      boolean ok = true;
      int digits = 0;
      if (c == '-' || c == '+') {
        negative = c == '-';
        text.append((char) c);
        c = lines.read();
      }
      while (c >= 0 && c != ' ' && c != '\t' && c != '\r' && c != ',') {
        if (text.length() < 40) {
          text.appendCodePoint(c < 0x80 ? c : '?');
        }
        if (c >= '0' && c <= '9' && ok) {
          value = value * 10 + (c - '0');
          digits++;
          ok = value <= Integer.MAX_VALUE + 1L;
        } else {
          ok = false;
        }
        c = lines.read();
      }
      if (!ok || digits == 0) {
        throw new IllegalArgumentException(String.format(Locale.ROOT, "%s: field %,d ('%s') is not an integer id",
            where(source, line), field, text));
      }
      long v = negative ? -value : value;
      sink.id(v < Integer.MIN_VALUE || v > Integer.MAX_VALUE ? -1 : (int) v, field);
    }
  }

  private static void parseJson(LineStream lines, String source, long line, IdSink sink) throws IOException {
    String where = where(source, line);
    boolean found = false;
    try (JsonParser p = JSON.createParser(lines)) {
      if (p.nextToken() != JsonToken.START_OBJECT) {
        throw new IllegalArgumentException(where + ": expected a JSON object");
      }
      while (p.nextToken() == JsonToken.FIELD_NAME) {
        String name = p.currentName();
        JsonToken v = p.nextToken();
        if (name.equals("ids") && !found) {
          if (v != JsonToken.START_ARRAY) {
            throw new IllegalArgumentException(where + ": \"ids\" is not an array");
          }
          long field = 0;
          while (p.nextToken() != JsonToken.END_ARRAY) {
            field++;
            if (p.currentToken() != JsonToken.VALUE_NUMBER_INT) {
              throw new IllegalArgumentException(String.format(Locale.ROOT,
                  "%s: \"ids\" entry %,d ('%s') is not an integer id", where, field, p.getText()));
            }
            long id = p.getLongValue();
            sink.id(id < Integer.MIN_VALUE || id > Integer.MAX_VALUE ? -1 : (int) id, field);
          }
          found = true;
        } else {
          p.skipChildren();
        }
      }
      if (p.currentToken() != JsonToken.END_OBJECT) {
        throw new IllegalArgumentException(where + ": malformed JSON");
      }
      if (p.nextToken() != null) {
        throw new IllegalArgumentException(where + ": text after the JSON object");
      }
    } catch (JsonProcessingException e) {
      throw new IllegalArgumentException(String.format(Locale.ROOT, "%s, column %,d: malformed JSON: %s", where,
          e.getLocation() == null ? 0 : e.getLocation().getColumnNr(), e.getOriginalMessage().lines().findFirst().orElse("")),
          e);
    }
    if (!found) {
      throw new IllegalArgumentException(where + ": the JSON object has no \"ids\" array");
    }
  }

  /**
   * An input stream read one line at a time: {@link #read()} returns -1 at the end of the current
   * line (the LF is consumed), and {@link #nextLine()} moves to the next one. Bytes are passed
   * through as they are (the ids format is ASCII; a JSON parser checks its own UTF-8).
   */
  static final class LineStream extends InputStream {
    private final InputStream in;
    private final byte[] buf = new byte[1 << 16];
    private int pos;
    private int limit;
    private boolean lineEnded = true;
    private boolean eof;
    private int pushed = -1;

    LineStream(InputStream in) {
      this.in = in;
    }

    /** Skips what is left of the current line; true if another line follows. */
    boolean nextLine() throws IOException {
      while (!lineEnded) {
        read();
      }
      if (!fill()) {
        return false;
      }
      lineEnded = false;
      pushed = -1;
      return true;
    }

    void unread(int b) {
      pushed = b;
    }

    private boolean fill() throws IOException {
      if (pos < limit) {
        return true;
      }
      if (eof) {
        return false;
      }
      int n;
      do {
        n = in.read(buf, 0, buf.length);
      } while (n == 0);
      if (n < 0) {
        eof = true;
        return false;
      }
      pos = 0;
      limit = n;
      return true;
    }

    @Override
    public int read() throws IOException {
      if (pushed >= 0) {
        int b = pushed;
        pushed = -1;
        return b;
      }
      if (lineEnded || !fill()) {
        lineEnded = true;
        return -1;
      }
      int b = buf[pos++] & 0xFF;
      if (b == '\n') {
        lineEnded = true;
        return -1;
      }
      return b;
    }

    @Override
    public int read(byte[] b, int off, int len) throws IOException {
      if (len == 0) {
        return 0;
      }
      int n = 0;
      if (pushed >= 0) {
        b[off + n++] = (byte) pushed;
        pushed = -1;
      }
      if (lineEnded) {
        return n == 0 ? -1 : n;
      }
      while (n < len) {
        if (!fill()) {
          lineEnded = true;
          break;
        }
        int end = Math.min(limit, pos + (len - n));
        int i = pos;
        while (i < end && buf[i] != '\n') {
          i++;
        }
        System.arraycopy(buf, pos, b, off + n, i - pos);
        n += i - pos;
        if (i < end) {
          pos = i + 1;
          lineEnded = true;
          break;
        }
        pos = i;
      }
      return n == 0 ? -1 : n;
    }
  }
}
