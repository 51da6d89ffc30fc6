package dev.morsel.tokenize.cli;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code morsel encode}: text to ids, one line in, one line out. */
@Command(name = "encode", mixinStandardHelpOptions = true,
    description = "Encode texts (arguments, files, or standard input; one text per line) into token ids.",
    footer = {"", "Examples:", "  morsel encode --model ferry.morsel 'Is the 07:40 from Oskevik late?'",
        "  morsel encode --model ferry.morsel --format json --input messages.txt",
        "  printf 'question\\tanswer\\n' | morsel encode --model ferry.morsel --pair"})
final class EncodeCommand implements Callable<Integer> {
  /** Lines encoded per batch: bounds memory on endless input while keeping every thread busy. */
  static final int BATCH_LINES = 4096;

  @Spec
  CommandSpec spec;

  @Option(names = {"-m", "--model"}, required = true, description = "The model file.")
  Path model;

  @Parameters(paramLabel = "TEXT", description = "Texts to encode; without any, lines are read from --input or standard input.")
  List<String> texts = new ArrayList<>();

  @Option(names = "--input", paramLabel = "FILE", description = "Read texts from these files (repeatable; .gz allowed).")
  List<Path> inputs = new ArrayList<>();

  @Option(names = "--format", defaultValue = "ids", description = "ids (space-separated) or json (JSON Lines with tokens and offsets) (default: ${DEFAULT-VALUE}).")
  String format;

  @Option(names = "--trusted", description = "Treat the input as trusted: exact reserved-token spellings become reserved tokens. Never use on user input.")
  boolean trusted;

  @Option(names = "--pair", description = "Each line holds two texts separated by a TAB; encode them as a pair.")
  boolean pair;

  @Option(names = "--threads", description = "Threads for batch encoding (default: all cores).")
  int threads = Runtime.getRuntime().availableProcessors();

  @Override
  public Integer call() throws Exception {
    if (!format.equals("ids") && !format.equals("json")) {
      throw new Morsel.UsageException("--format must be ids or json, got '" + format + "'");
    }
    if (threads <= 0) {
      throw new Morsel.UsageException("--threads must be positive, got " + threads);
    }
    Tokenizer t = Tokenizers.load(model);
    PrintWriter out = spec.commandLine().getOut();
    Trust trust = trusted ? Trust.TRUSTED : Trust.UNTRUSTED;
    ExecutorService pool = Executors.newFixedThreadPool(threads, r -> {
      Thread th = new Thread(r, "morsel-encode");
      th.setDaemon(true);
      return th;
    });
    try {
      List<String> batch = new ArrayList<>();
      if (!texts.isEmpty()) {
        batch.addAll(texts);
        flush(t, batch, trust, pool, out);
      } else if (!inputs.isEmpty()) {
        for (Path p : inputs) {
          try (BufferedReader r = Lines.open(p)) {
            stream(t, r, trust, pool, out, p.toString());
          }
        }
      } else {
        stream(t, Lines.stdin(), trust, pool, out, "standard input");
      }
    } finally {
      pool.shutdownNow();
    }
    out.flush();
    return 0;
  }

  private void stream(Tokenizer t, BufferedReader r, Trust trust, ExecutorService pool, PrintWriter out, String source)
      throws IOException {
    List<String> batch = new ArrayList<>(BATCH_LINES);
    String line;
    long n = 0;
    try {
      while ((line = r.readLine()) != null) {
        n++;
        batch.add(line);
        if (batch.size() == BATCH_LINES) {
          flush(t, batch, trust, pool, out);
        }
      }
    } catch (java.nio.charset.CharacterCodingException e) {
      throw new IllegalArgumentException(source + ": line " + (n + 1) + " is not valid UTF-8", e);
    }
    flush(t, batch, trust, pool, out);
  }

  private void flush(Tokenizer t, List<String> batch, Trust trust, ExecutorService pool, PrintWriter out) {
    if (batch.isEmpty()) {
      return;
    }
    List<Tokens> results;
    List<String[]> pairs = null;
    if (pair) {
      pairs = new ArrayList<>(batch.size());
      for (String line : batch) {
        int tab = line.indexOf('\t');
        pairs.add(tab < 0 ? new String[] {line, ""} : new String[] {line.substring(0, tab), line.substring(tab + 1)});
      }
      results = new ArrayList<>(batch.size());
      for (String[] p : pairs) {
        results.add(t.encodePair(p[0], p[1], trust));
      }
    } else {
      results = t.encodeAll(batch, trust, pool);
    }
    for (int i = 0; i < results.size(); i++) {
      Tokens r = results.get(i);
      if (format.equals("ids")) {
        StringBuilder sb = new StringBuilder();
        for (int k = 0; k < r.size(); k++) {
          if (k > 0) {
            sb.append(' ');
          }
          sb.append(r.id(k));
        }
        out.println(sb);
      } else {
        out.println(json(t, r, pair ? pairs.get(i)[0] : batch.get(i), pair ? pairs.get(i)[1] : null));
      }
    }
    batch.clear();
  }

  private static final JsonFactory JSON = new JsonFactory();

  /** One JSON line: ids, display tokens, original text of each token, UTF-16 starts and ends (and segments for pairs). */
  static String json(Tokenizer t, Tokens r, String first, String second) {
    StringWriter w = new StringWriter();
    try (JsonGenerator g = JSON.createGenerator(w)) {
      g.writeStartObject();
      g.writeArrayFieldStart("ids");
      for (int i = 0; i < r.size(); i++) {
        g.writeNumber(r.id(i));
      }
      g.writeEndArray();
      g.writeArrayFieldStart("tokens");
      for (int i = 0; i < r.size(); i++) {
        g.writeString(t.token(r.id(i)));
      }
      g.writeEndArray();
      g.writeArrayFieldStart("texts");
      for (int i = 0; i < r.size(); i++) {
        String src = r.segment(i) == 0 ? first : second;
        g.writeString(src.substring(r.start(i), r.end(i)));
      }
      g.writeEndArray();
      g.writeArrayFieldStart("starts");
      for (int i = 0; i < r.size(); i++) {
        g.writeNumber(r.start(i));
      }
      g.writeEndArray();
      g.writeArrayFieldStart("ends");
      for (int i = 0; i < r.size(); i++) {
        g.writeNumber(r.end(i));
      }
      g.writeEndArray();
      if (second != null) {
        g.writeArrayFieldStart("segments");
        for (int i = 0; i < r.size(); i++) {
          g.writeNumber(r.segment(i));
        }
        g.writeEndArray();
      }
      g.writeEndObject();
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return w.toString();
  }
}
