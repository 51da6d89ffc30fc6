package dev.morsel.tokenize.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizers;
import java.io.ByteArrayInputStream;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/** End-to-end runs of the command line, in-process, on the bundled demo corpus. */
class CliTest {
  @TempDir
  static Path dir;

  static Path corpus;

  /** Result of one run. */
  record Run(int code, String out, String err) {}

  static Run run(String... args) {
    return feed(null, args);
  }

  static synchronized Run feed(String stdin, String... args) {
    StringWriter out = new StringWriter();
    StringWriter err = new StringWriter();
    InputStream saved = System.in;
    try {
      if (stdin != null) {
        System.setIn(new ByteArrayInputStream(stdin.getBytes(StandardCharsets.UTF_8)));
      }
      int code = Morsel.run(args, new PrintWriter(out, true), new PrintWriter(err, true));
      return new Run(code, out.toString(), err.toString());
    } finally {
      System.setIn(saved);
    }
  }

  @BeforeAll
  static void copyCorpus() throws Exception {
    corpus = dir.resolve("corpus");
    Files.createDirectories(corpus);
    for (String f : DemoCommand.FILES) {
      try (InputStream in = CliTest.class.getResourceAsStream("demo/" + f)) {
        Files.copy(in, corpus.resolve(f));
      }
    }
  }

  static List<String> schemes() {
    return Schemes.NAMES;
  }

  @ParameterizedTest
  @MethodSource("schemes")
  void trainInspectEncodeDecodeRoundTrip(String scheme) throws Exception {
    Path model = dir.resolve(scheme + ".morsel");
    Run train = run("train", "--scheme", scheme, "--vocab-size", "800", "--reserved", "\u27e8hold\u27e9", "--out",
        model.toString(), corpus.toString());
    assertEquals(0, train.code(), train.err());
    assertTrue(train.out().contains("fingerprint"), train.out());
    // review text: export, import, the same fingerprint; the import refuses a damaged line naming it
    Path text = dir.resolve(scheme + "-review.tsv");
    Run export = run("review", "--model", model.toString(), "--out", text.toString());
    assertEquals(0, export.code(), export.err());
    assertTrue(Files.readString(text).startsWith("morsel-review\t1\t" + scheme + "\n"));
    Path again = dir.resolve(scheme + "-again.morsel");
    Run imported = run("review", "--from", text.toString(), "--out", again.toString());
    assertEquals(0, imported.code(), imported.err());
    assertEquals(Tokenizers.load(model).fingerprint(), Tokenizers.load(again).fingerprint());
    assertTrue(imported.err().contains(Tokenizers.load(model).fingerprint()), imported.err());
    Path broken = dir.resolve(scheme + "-broken.tsv");
    Files.writeString(broken, Files.readString(text).replaceFirst("\nnormalization\t", "\nnormalisation\t"));
    Run refused = run("review", "--from", broken.toString(), "--out", dir.resolve("x.morsel").toString());
    assertEquals(1, refused.code());
    assertTrue(refused.err().contains(broken + ":4: column 1 (setting): 'normalisation' is not one of"), refused.err());
    assertEquals(2, run("review", "--from", text.toString()).code(), "import needs --out");
    Run inspect = run("inspect", "--model", model.toString(), "--explain", "Harrowmere ferry");
    assertEquals(0, inspect.code(), inspect.err());
    assertTrue(inspect.out().contains("scheme           " + scheme), inspect.out());
    assertTrue(inspect.out().contains("\u27e8hold\u27e9"), inspect.out());
    assertTrue(inspect.out().contains("explain"), inspect.out());

    List<String> lines = Files.readAllLines(corpus.resolve("messages-de.txt")).subList(0, 40);
    String input = String.join("\n", lines) + "\n";
    Run enc = feed(input, "encode", "--model", model.toString());
    assertEquals(0, enc.code(), enc.err());
    Run dec = feed(enc.out(), "decode", "--model", model.toString());
    assertEquals(0, dec.code(), dec.err());
    List<String> decoded = dec.out().lines().toList();
    assertEquals(lines.size(), decoded.size());
    for (int i = 0; i < lines.size(); i++) {
      String normalized = Pipeline.defaults().normalization().apply(lines.get(i)).text();
      if (!decoded.get(i).contains("\u2370")) { // WordPiece's unknown spelling: lossy only where it appears
        assertEquals(normalized, decoded.get(i), "line " + i);
      }
    }

    Run json = feed(input, "encode", "--model", model.toString(), "--format", "json");
    assertEquals(0, json.code(), json.err());
    List<String> jsonLines = json.out().lines().toList();
    assertEquals(lines.size(), jsonLines.size());
    for (int i = 0; i < lines.size(); i++) {
      checkOffsets(jsonLines.get(i), lines.get(i));
    }
    Run viaJson = feed(json.out(), "decode", "--model", model.toString());
    assertEquals(dec.out(), viaJson.out());
  }

  /** Every token's "texts" entry equals the input's characters at [start, end); spans are monotone. */
  private static void checkOffsets(String jsonLine, String text) throws Exception {
    List<Long> starts = new ArrayList<>();
    List<Long> ends = new ArrayList<>();
    List<String> texts = new ArrayList<>();
    try (JsonParser p = new JsonFactory().createParser(jsonLine)) {
      assertEquals(JsonToken.START_OBJECT, p.nextToken());
      while (p.nextToken() == JsonToken.FIELD_NAME) {
        String name = p.currentName();
        p.nextToken();
        while (p.nextToken() != JsonToken.END_ARRAY) {
          switch (name) {
            case "starts" -> starts.add(p.getLongValue());
            case "ends" -> ends.add(p.getLongValue());
            case "texts" -> texts.add(p.getText());
            default -> { }
          }
        }
      }
    }
    assertEquals(starts.size(), texts.size());
    long prevStart = 0;
    long prevEnd = 0;
    for (int k = 0; k < starts.size(); k++) {
      int s = starts.get(k).intValue();
      int e = ends.get(k).intValue();
      assertEquals(text.substring(s, e), texts.get(k));
      assertTrue(s >= prevStart && e >= prevEnd, "monotone spans");
      prevStart = s;
      prevEnd = e;
    }
    assertEquals(text.length(), prevEnd, "the last token ends at the end of the text");
  }

  @Test
  void trustedFlagIsNeededForReservedTokens() {
    Path model = dir.resolve("ctl.morsel");
    assertEquals(0, run("train", "--vocab-size", "400", "--reserved", "\u27e8hold\u27e9", "--out", model.toString(),
        corpus.toString()).code());
    Run plain = feed("Please \u27e8hold\u27e9 my cabin\n", "encode", "--model", model.toString());
    Run trusted = feed("Please \u27e8hold\u27e9 my cabin\n", "encode", "--model", model.toString(), "--trusted");
    assertFalse((" " + plain.out().strip() + " ").contains(" 0 "), "untrusted input never yields reserved id 0: " + plain.out());
    assertTrue((" " + trusted.out().strip() + " ").contains(" 0 "), "trusted input yields reserved id 0: " + trusted.out());
  }

  @Test
  void badUsageAndFailedWorkHaveTheirExitCodes() throws Exception {
    Run noModel = run("encode", "hello");
    assertEquals(Morsel.USAGE, noModel.code());
    assertTrue(noModel.err().contains("--model"), noModel.err());
    Run missing = run("encode", "--model", dir.resolve("nope.morsel").toString(), "hello");
    assertEquals(Morsel.FAILED, missing.code());
    assertTrue(missing.err().contains("nope.morsel"), missing.err());
    assertFalse(missing.err().contains("\tat "), "no stack trace without --verbose");
    Run unreadable = run("train", "--out", dir.resolve("x.morsel").toString(), dir.resolve("no-such-corpus.txt").toString());
    assertEquals(Morsel.FAILED, unreadable.code());
    assertTrue(unreadable.err().contains("no-such-corpus.txt"), unreadable.err());
    Run zero = run("train", "--vocab-size", "0", "--out", dir.resolve("x.morsel").toString(), corpus.toString());
    assertEquals(Morsel.USAGE, zero.code());
    assertTrue(zero.err().contains("--vocab-size"), zero.err());
    Run scheme = run("train", "--scheme", "sparkle", "--out", dir.resolve("x.morsel").toString(), corpus.toString());
    assertEquals(Morsel.USAGE, scheme.code());
    Path model = dir.resolve("ok.morsel");
    assertEquals(0, run("train", "--vocab-size", "400", "--out", model.toString(), corpus.toString()).code());
    Run malformed = feed("12 x7 4\n", "decode", "--model", model.toString());
    assertEquals(Morsel.FAILED, malformed.code());
    assertTrue(malformed.err().contains("line 1") && malformed.err().contains("x7"), malformed.err());
    Run outside = run("decode", "--model", model.toString(), "999999");
    assertEquals(Morsel.FAILED, outside.code());
    assertTrue(outside.err().contains("999999"), outside.err());
    Files.write(dir.resolve("corrupt.morsel"), new byte[] {1, 2, 3});
    Run corrupt = run("inspect", "--model", dir.resolve("corrupt.morsel").toString());
    assertEquals(Morsel.FAILED, corrupt.code());
    assertTrue(corrupt.err().contains("header"), corrupt.err());
    assertEquals(0, run("--version").code());
    assertEquals(0, run("train", "--help").code());
  }

  /** The tool lists and builds schemes through the learner service interface: listing, options and their errors. */
  @Test
  void schemesAndTheirOptionsComeFromTheLearnerProviders() throws Exception {
    Run list = run("schemes");
    assertEquals(0, list.code(), list.err());
    for (dev.morsel.tokenize.train.LearnerProvider p : dev.morsel.tokenize.train.Learners.providers()) {
      assertTrue(list.out().contains(p.scheme() + "  " + p.description()), list.out());
      for (dev.morsel.tokenize.train.LearnerOption o : p.options()) {
        assertTrue(list.out().contains("--option " + o.name() + "=" + o.defaultValue()), list.out());
      }
    }
    assertEquals(List.of("bpe", "unigram", "wordpiece"), Schemes.NAMES, "the three modules on the tool's class path");
    Path plain = dir.resolve("plain.morsel");
    Path tight = dir.resolve("tight.morsel");
    assertEquals(0, run("train", "--vocab-size", "400", "--out", plain.toString(), corpus.toString()).code());
    Run option = run("train", "--vocab-size", "400", "--option", "max-token-bytes=3", "--out", tight.toString(), corpus.toString());
    assertEquals(0, option.code(), option.err());
    dev.morsel.tokenize.Tokenizer t = dev.morsel.tokenize.Tokenizers.load(tight);
    for (int id = 0; id < t.vocabularySize(); id++) {
      assertTrue(t.tokenBytes(id).length <= 3, "max-token-bytes=3 reached the learner: token " + id);
    }
    assertFalse(dev.morsel.tokenize.Tokenizers.load(plain).fingerprint().equals(t.fingerprint()));
    Run unknown = run("train", "--option", "max-token-length=3", "--out", tight.toString(), corpus.toString());
    assertEquals(Morsel.USAGE, unknown.code());
    assertTrue(unknown.err().contains("bpe has no option 'max-token-length'") && unknown.err().contains("max-token-bytes"),
        unknown.err());
    Run value = run("train", "--scheme", "unigram", "--option", "byte-spelling=maybe", "--out", tight.toString(), corpus.toString());
    assertEquals(Morsel.USAGE, value.code());
    assertTrue(value.err().contains("unigram --option byte-spelling=maybe is not true or false"), value.err());
    Run form = run("train", "--option", "max-token-bytes", "--out", tight.toString(), corpus.toString());
    assertEquals(Morsel.USAGE, form.code());
    assertTrue(form.err().contains("not name=value"), form.err());
  }

  @Test
  void sweepWritesACsvRowPerSchemeAndSizeAndOneChartPerFigure() throws Exception {
    Path out = dir.resolve("sweep");
    Run sweep = run("sweep", "--max-warmup", "1", "--sizes", "400,800,1600", "--out", out.toString(), corpus.toString());
    assertEquals(0, sweep.code(), sweep.err());
    List<String> csv = Files.readAllLines(out.resolve("sweep.csv"));
    assertEquals(Report.CSV_HEADER, csv.get(0));
    int groups = DemoCommand.FILES.size() + 1;
    assertEquals(1 + Schemes.NAMES.size() * 3 * groups, csv.size());
    String html = Files.readString(out.resolve("sweep.html"));
    for (String id : List.of("chart-length", "chart-unknown", "chart-fertility")) {
      int at = html.indexOf("<figure id=\"" + id + "\">");
      assertTrue(at >= 0, id);
      int end = html.indexOf("</figure>", at);
      String figure = html.substring(at, end);
      assertEquals(1, figure.split("<svg", -1).length - 1, id + " holds one SVG chart");
      assertTrue(figure.contains("</svg>"), id);
    }
    // plausibility: tokens per word falls as the vocabulary grows, per scheme (overall rows)
    for (String scheme : Schemes.NAMES) {
      double previous = Double.MAX_VALUE;
      for (String line : csv.subList(1, csv.size())) {
        String[] f = line.split(",");
        if (f[0].equals(scheme) && f[3].equals(Sweep.ALL)) {
          double tpw = Double.parseDouble(f[11]);
          assertTrue(tpw < previous, scheme + ": tokens per word " + tpw + " does not fall below " + previous);
          previous = tpw;
        }
      }
    }
  }
}
