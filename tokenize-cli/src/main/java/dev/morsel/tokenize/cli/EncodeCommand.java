package dev.morsel.tokenize.cli;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import dev.morsel.tokenize.Limits;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.train.Utf8Lines;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code morsel encode}: text to ids, one line in, one line out. Memory stays within a small
 * multiple of the longest line: lines are read one at a time, batches are bounded in lines and in
 * characters, and JSON is written token by token straight to the output.
 */
@Command(name = "encode", mixinStandardHelpOptions = true, separator = " ",
    description = "Encode texts (arguments, files, or standard input; one text per line) into token ids.",
    footer = {"", "Examples:",
        "  morsel encode --model ferry.morsel 'Is the 07:40 from Oskevik late?'",
        "  morsel encode --model ferry.morsel --format json --input messages.txt",
        "  printf 'question\\tanswer\\n' | morsel encode --model ferry.morsel --pair"})
final class EncodeCommand implements Callable<Integer> {
  /** Lines encoded per batch: bounds memory on endless input while keeping every thread busy. */
  static final int BATCH_LINES = 4096;
  /** Characters per batch (8 Mi chars, 16 MiB of text): a batch of long lines is cut early. */
  static final long BATCH_CHARS = 1L << 23;
  /**
   * A line longer than this (1 Mi chars) is encoded in parts of about this length, cut where a
   * piece boundary is certain (see {@link #cut}), so that normalization, alignment and token arrays
   * never hold more than one part: a 20 MB line then encodes in a 256 MB heap.
   */
  static final int PART_CHARS = 1 << 20;

  @Spec
  CommandSpec spec;

  @Option(names = {"-m", "--model"}, required = true, paramLabel = "FILE", description = "The model file.")
  Path model;

  @Parameters(paramLabel = "TEXT", description = "Texts to encode; without any, lines are read from --input or standard input.")
  List<String> texts = new ArrayList<>();

  @Option(names = "--input", paramLabel = "FILE", description = "Read texts from these files (repeatable; .gz allowed).")
  List<Path> inputs = new ArrayList<>();

  @Option(names = "--format", paramLabel = "ids|json", defaultValue = "ids",
      description = "ids (space-separated) or json (JSON Lines with ids, tokens, texts, starts, ends) (default: ${DEFAULT-VALUE}).")
  String format;

  @Option(names = "--trusted", description = "Treat the input as trusted: exact reserved-token spellings become reserved tokens. Never use on user input.")
  boolean trusted;

  @Option(names = "--pair", description = "Each line holds two texts separated by a TAB; encode them as a pair. A line without a TAB is an error.")
  boolean pair;

  @Option(names = "--frame-begin", paramLabel = "SPELLING", description = "Framing: a reserved token put before the (first) text (repeatable).")
  List<String> frameBegin = new ArrayList<>();

  @Option(names = "--frame-between", paramLabel = "SPELLING", description = "Framing: a reserved token put between the two texts of a --pair (repeatable).")
  List<String> frameBetween = new ArrayList<>();

  @Option(names = "--frame-end", paramLabel = "SPELLING", description = "Framing: a reserved token put after the (last) text (repeatable).")
  List<String> frameEnd = new ArrayList<>();

  @Option(names = "--max-chars", paramLabel = "N", defaultValue = "" + Limits.DEFAULT_MAX_INPUT_LENGTH,
      description = "Longest text in UTF-16 chars; a longer line is an error naming it (default: ${DEFAULT-VALUE}).")
  int maxChars;

  @Option(names = "--threads", paramLabel = "N", description = "Threads for batch encoding (default: all cores).")
  int threads = Runtime.getRuntime().availableProcessors();

  @Mixin
  Corpus.BadUtf8 badUtf8;

  private static final JsonFactory JSON = new JsonFactory();
  private JsonGenerator json;

  @Override
  public Integer call() throws Exception {
    if (!format.equals("ids") && !format.equals("json")) {
      throw new Morsel.UsageException("--format must be ids or json, got '" + format + "'");
    }
    if (threads <= 0) {
      throw new Morsel.UsageException("--threads must be positive, got " + threads);
    }
    if (maxChars <= 0) {
      throw new Morsel.UsageException("--max-chars must be positive, got " + maxChars);
    }
    if (!frameBetween.isEmpty() && !pair) {
      throw new Morsel.UsageException("--frame-between needs --pair");
    }
    Utf8Lines.Malformed policy = badUtf8.policy();
    Tokenizer t = Tokenizers.load(model);
    t = t.withLimits(Limits.defaults().withMaxInputLength(maxChars).withMaxPieceLength(maxChars));
    if (!frameBegin.isEmpty() || !frameBetween.isEmpty() || !frameEnd.isEmpty()) {
      try {
        t = t.withTemplate(Template.of(frameBegin, frameBetween, frameEnd));
      } catch (IllegalArgumentException e) {
        throw new Morsel.UsageException("framing: " + e.getMessage() + " (reserve it with 'morsel train --reserved')");
      }
    }
    PrintWriter out = spec.commandLine().getOut();
    if (format.equals("json")) {
      json = JSON.createGenerator(out);
      json.setRootValueSeparator(null);
    }
    Trust trust = trusted ? Trust.TRUSTED : Trust.UNTRUSTED;
    ExecutorService pool = Executors.newFixedThreadPool(threads, r -> {
      Thread th = new Thread(r, "morsel-encode");
      th.setDaemon(true);
      return th;
    });
    try {
      Batch batch = new Batch();
      if (!texts.isEmpty()) {
        long n = 0;
        for (String s : texts) {
          batch.add(s, "argument", ++n);
        }
        flush(t, batch, trust, pool, out);
      } else {
        try (Utf8Lines lines = inputs.isEmpty() ? Corpus.stdin(policy) : Corpus.open(inputs, policy)) {
          while (true) {
            try {
              if (!lines.hasNext()) {
                break;
              }
            } catch (RuntimeException e) {
              flush(t, batch, trust, pool, out); // every line before the bad one is written
              throw e;
            }
            String line = lines.next();
            batch.add(line, lines.source(), lines.line());
            if (batch.size() >= BATCH_LINES || batch.chars >= BATCH_CHARS) {
              flush(t, batch, trust, pool, out);
            }
          }
          flush(t, batch, trust, pool, out);
          Corpus.summary(spec.commandLine().getErr(), "encode", lines.malformedLines(), policy);
        }
      }
    } finally {
      pool.shutdownNow();
      if (json != null) {
        json.flush();
      }
    }
    out.flush();
    return 0;
  }

  /**
   * Whether a long line may be encoded in parts with the same result as in one piece: the pipeline
   * splits at all (not {@code none}), there is no framing, and in trusted mode no reserved spelling
   * holds a space (a cut falls on a space).
   */
  static boolean inParts(Tokenizer t, Trust trust) {
    if (t.pipeline().splitting().spec().equals("none") || !t.template().equals(Template.none())) {
      return false;
    }
    if (trust == Trust.TRUSTED) {
      for (String r : t.reservedTokens().spellings()) {
        if (r.indexOf(' ') >= 0) {
          return false;
        }
      }
    }
    return true;
  }

  /**
   * The end of the part that starts at {@code from}: the first position at or after {@code from +
   * size} holding a space U+0020 between a letter or digit and a letter, or the end of the text. A
   * piece always starts at such a space under rule-based, word and whitespace splitting, and no
   * normalization form composes across it (U+0020 is a starter that combines with nothing), so
   * encoding the parts separately gives the same ids and offsets as encoding the whole text (checked
   * against whole-text encoding for every scheme in the tests).
   */
  static int cut(String text, int from, int size) {
    int n = text.length();
    for (int p = Math.max(from + size, 1); p + 1 < n; p++) {
      if (text.charAt(p) == ' ' && Character.isLetter(text.charAt(p + 1))
          && Character.isLetterOrDigit(text.codePointBefore(p))) {
        return p;
      }
    }
    return n;
  }

  /** Encodes one long line part by part, writing ids or one JSON object as the parts are done. */
  void encodeInParts(Tokenizer t, String line, Trust trust, int size, PrintWriter out) throws IOException {
    if (json == null) {
      boolean first = true;
      StringBuilder sb = new StringBuilder();
      for (int from = 0; from < line.length(); ) {
        int to = cut(line, from, size);
        Tokens r = t.encode(line.substring(from, to), trust);
        for (int k = 0; k < r.size(); k++) {
          if (!first) {
            sb.append(' ');
          }
          first = false;
          sb.append(r.id(k));
        }
        out.append(sb);
        sb.setLength(0);
        from = to;
      }
      out.append('\n');
      return;
    }
    // JSON needs each array whole: keep ids and spans of all parts in blocks (12 bytes a token, no copying as it grows)
    IntBlocks ids = new IntBlocks();
    IntBlocks starts = new IntBlocks();
    IntBlocks ends = new IntBlocks();
    for (int from = 0; from < line.length(); ) {
      int to = cut(line, from, size);
      Tokens r = t.encode(line.substring(from, to), trust);
      for (int k = 0; k < r.size(); k++) {
        ids.add(r.id(k));
        starts.add(from + r.start(k));
        ends.add(from + r.end(k));
      }
      from = to;
    }
    writeJson(json, t, new Spans() {
      @Override
      public long size() {
        return ids.size();
      }

      @Override
      public int id(long i) {
        return ids.get(i);
      }

      @Override
      public int start(long i) {
        return starts.get(i);
      }

      @Override
      public int end(long i) {
        return ends.get(i);
      }

      @Override
      public int segment(long i) {
        return 0;
      }
    }, line, null);
    json.flush();
    out.append('\n');
  }

  /** A growable int sequence in fixed blocks of 64 Ki ints: growing never copies what is stored. */
  static final class IntBlocks {
    private static final int SHIFT = 16;
    private final List<int[]> blocks = new ArrayList<>();
    private long size;

    void add(int v) {
      int at = (int) (size & ((1 << SHIFT) - 1));
      if (at == 0) {
        blocks.add(new int[1 << SHIFT]);
      }
      blocks.get(blocks.size() - 1)[at] = v;
      size++;
    }

    int get(long i) {
      return blocks.get((int) (i >>> SHIFT))[(int) (i & ((1 << SHIFT) - 1))];
    }

    long size() {
      return size;
    }
  }

  /** Lines waiting to be encoded, with where each came from. */
  private static final class Batch {
    final List<String> lines = new ArrayList<>();
    final List<String> sources = new ArrayList<>();
    final List<Long> numbers = new ArrayList<>();
    long chars;

    void add(String line, String source, long number) {
      lines.add(line);
      sources.add(source);
      numbers.add(number);
      chars += line.length();
    }

    int size() {
      return lines.size();
    }

    String where(int i) {
      return sources.get(i) + (sources.get(i).equals("argument") ? " " : " line ") + String.format(Locale.ROOT, "%,d",
          numbers.get(i));
    }

    void clear() {
      lines.clear();
      sources.clear();
      numbers.clear();
      chars = 0;
    }
  }

  private void flush(Tokenizer t, Batch batch, Trust trust, ExecutorService pool, PrintWriter out) throws IOException {
    if (batch.size() == 0) {
      return;
    }
    for (int i = 0; i < batch.size(); i++) {
      if (batch.lines.get(i).length() > maxChars) {
        throw new IllegalArgumentException(String.format(Locale.ROOT, "%s is %,d chars long, over --max-chars %,d",
            batch.where(i), batch.lines.get(i).length(), maxChars));
      }
    }
    List<Tokens> results;
    List<String[]> pairs = null;
    if (pair) {
      pairs = new ArrayList<>(batch.size());
      results = new ArrayList<>(batch.size());
      for (int i = 0; i < batch.size(); i++) {
        String line = batch.lines.get(i);
        int tab = line.indexOf('\t');
        if (tab < 0) {
          throw new IllegalArgumentException(batch.where(i) + " holds no TAB: --pair needs two texts separated by a TAB");
        }
        String[] p = {line.substring(0, tab), line.substring(tab + 1)};
        pairs.add(p);
        results.add(t.encodePair(p[0], p[1], trust));
      }
    } else if (batch.size() == 1 && batch.lines.get(0).length() > PART_CHARS && inParts(t, trust)) {
      encodeInParts(t, batch.lines.get(0), trust, PART_CHARS, out);
      out.flush();
      batch.clear();
      return;
    } else if (batch.size() == 1) {
      results = new ArrayList<>(List.of(t.encode(batch.lines.get(0), trust)));
    } else {
      results = new ArrayList<>(t.encodeAll(batch.lines, trust, pool));
    }
    for (int i = 0; i < results.size(); i++) {
      Tokens r = results.get(i);
      results.set(i, null); // a long line's tokens can go once written
      if (json == null) {
        StringBuilder sb = new StringBuilder(r.size() * 6);
        for (int k = 0; k < r.size(); k++) {
          if (k > 0) {
            sb.append(' ');
          }
          sb.append(r.id(k));
          if (sb.length() >= 1 << 16) {
            out.append(sb);
            sb.setLength(0);
          }
        }
        out.append(sb).append('\n');
      } else {
        writeJson(json, t, Spans.of(r), pair ? pairs.get(i)[0] : batch.lines.get(i), pair ? pairs.get(i)[1] : null);
        json.flush();
        out.append('\n');
      }
    }
    out.flush();
    batch.clear();
  }

  /** Tokens and their spans, from one {@link Tokens} or from the parts of a long line. */
  interface Spans {
    long size();

    int id(long i);

    int start(long i);

    int end(long i);

    int segment(long i);

    static Spans of(Tokens r) {
      return new Spans() {
        @Override
        public long size() {
          return r.size();
        }

        @Override
        public int id(long i) {
          return r.id((int) i);
        }

        @Override
        public int start(long i) {
          return r.start((int) i);
        }

        @Override
        public int end(long i) {
          return r.end((int) i);
        }

        @Override
        public int segment(long i) {
          return r.segment((int) i);
        }
      };
    }
  }

  /** One JSON line: ids, display tokens, original text of each token, UTF-16 starts and ends (and segments for pairs). */
  static void writeJson(JsonGenerator g, Tokenizer t, Spans r, String first, String second) {
    try {
      long n = r.size();
      g.writeStartObject();
      g.writeArrayFieldStart("ids");
      for (long i = 0; i < n; i++) {
        g.writeNumber(r.id(i));
      }
      g.writeEndArray();
      g.writeArrayFieldStart("tokens");
      for (long i = 0; i < n; i++) {
        g.writeString(t.token(r.id(i)));
      }
      g.writeEndArray();
      g.writeArrayFieldStart("texts");
      for (long i = 0; i < n; i++) {
        String src = r.segment(i) == 0 ? first : second;
        g.writeString(src.substring(r.start(i), r.end(i)));
      }
      g.writeEndArray();
      g.writeArrayFieldStart("starts");
      for (long i = 0; i < n; i++) {
        g.writeNumber(r.start(i));
      }
      g.writeEndArray();
      g.writeArrayFieldStart("ends");
      for (long i = 0; i < n; i++) {
        g.writeNumber(r.end(i));
      }
      g.writeEndArray();
      if (second != null) {
        g.writeArrayFieldStart("segments");
        for (long i = 0; i < n; i++) {
          g.writeNumber(r.segment(i));
        }
        g.writeEndArray();
      }
      g.writeEndObject();
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

}
