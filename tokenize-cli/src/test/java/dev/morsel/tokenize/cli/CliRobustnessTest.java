package dev.morsel.tokenize.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import java.io.ByteArrayOutputStream;
import java.io.File;
import java.io.InputStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * End-to-end runs of the command line on inputs a real corpus brings: a size a scheme cannot reach,
 * bytes that are not UTF-8 deep in a file, a line of 20 MB under a small heap, malformed pair input,
 * sizes that cannot work, and the wording of errors and help.
 */
class CliRobustnessTest {
  @TempDir
  static Path dir;

  static Path corpus;
  static List<String> lines;
  static Path model;

  @BeforeAll
  static void setUp() throws Exception {
    corpus = dir.resolve("corpus");
    Files.createDirectories(corpus);
    lines = new ArrayList<>();
    for (String f : DemoCommand.FILES) {
      try (InputStream in = CliRobustnessTest.class.getResourceAsStream("demo/" + f)) {
        byte[] b = in.readAllBytes();
        Files.write(corpus.resolve(f), b);
        lines.addAll(new String(b, StandardCharsets.UTF_8).lines().toList());
      }
    }
    model = dir.resolve("bpe.morsel");
    CliTest.Run r = CliTest.run("train", "--vocab-size", "1000", "--out", model.toString(), corpus.toString());
    assertEquals(0, r.code(), r.err());
  }

  // ------------------------------------------------------------------ sweep: infeasible cells

  @Test
  void sweepWithAnInfeasibleCellWritesCsvAndHtmlAndExitsZero() throws Exception {
    Path out = dir.resolve("sweep-infeasible");
    // wordpiece at 60 with an alphabet of 300 characters cannot hold the alphabet; bpe at 60 is below its 256 byte tokens
    CliTest.Run r = CliTest.run("sweep", "--max-warmup", "1", "--schemes", "bpe,wordpiece", "--sizes", "60,600",
        "--option", "wordpiece:max-alphabet=300", "--out",
        out.toString(), corpus.toString());
    assertEquals(0, r.code(), r.err());
    assertTrue(r.err().contains("wordpiece at 60 is not feasible") && r.err().contains("--option max-alphabet"), r.err());
    assertTrue(r.err().contains("bpe at 60 is not feasible") && r.err().contains("--vocab-size 60"), r.err());
    assertFalse(r.err().contains("vocabularySize") || r.err().contains("maxAlphabet"), "no Java setting names: " + r.err());
    List<String> csv = Files.readAllLines(out.resolve("sweep.csv"));
    assertEquals(Report.CSV_HEADER, csv.get(0));
    int groups = DemoCommand.FILES.size() + 1;
    assertEquals(1 + 2 * 2 * groups, csv.size());
    long infeasible = csv.stream().filter(l -> l.contains(",no,") && l.contains("not feasible")).count();
    assertEquals(2 * groups, infeasible, String.join("\n", csv));
    assertTrue(csv.stream().anyMatch(l -> l.startsWith("wordpiece,600,") && l.contains(",yes,")), "the sweep went on");
    String html = Files.readString(out.resolve("sweep.html"));
    assertTrue(html.contains("not feasible"), "the report marks the cell");
    assertTrue(html.contains("Not feasible (grey × on the size axis): bpe at 60, wordpiece at 60"), "listed under the charts");
    assertTrue(r.out().contains("not feasible"), r.out());
  }

  @Test
  void csvGivesSpeedOnlyOnOverallRowsAndTheReportRecordsItsInputs() throws Exception {
    Path out = dir.resolve("sweep-report");
    CliTest.Run r = CliTest.run("sweep", "--max-warmup", "1", "--schemes", "bpe,unigram", "--sizes", "400,1600", "--out", out.toString(),
        corpus.toString());
    assertEquals(0, r.code(), r.err());
    List<String> csv = Files.readAllLines(out.resolve("sweep.csv"));
    List<String> header = List.of(csv.get(0).split(","));
    int speed = header.indexOf("encode_mb_per_s");
    int group = header.indexOf("group");
    for (String line : csv.subList(1, csv.size())) {
      String[] f = line.split(",", -1);
      if (f[group].equals(Sweep.ALL)) {
        assertTrue(Double.parseDouble(f[speed]) > 0, line);
      } else {
        assertEquals("", f[speed], "a per-file row does not repeat the overall speed: " + line);
      }
    }
    String html = Files.readString(out.resolve("sweep.html"));
    for (String fact : List.of("messages-en.txt (", "held out", "normalization nfc, splitting runs:space=next,digits=whole", "morsel ",
        "machine", "date", "vocabulary size (log scale)", "1,600", "Unknown tokens vs vocabulary size")) {
      assertTrue(html.contains(fact), "the report records " + fact);
    }
    assertFalse(html.matches("(?s).*>\\s*\\d(\\.\\d+)?E-?\\d+\\s*<.*"), "no scientific-notation tick labels");
    // every byte-level scheme falls back to bytes: the unknown chart is flat and says why
    assertTrue(html.contains("No unknown token at any size"), "the empty chart says why");
  }

  // ------------------------------------------------------------------ bad UTF-8: the right line everywhere

  @Test
  void aBadByteOnLine5001IsReportedAsLine5001ByEveryCommand() throws Exception {
    List<byte[]> rows = new ArrayList<>();
    for (int i = 0; i < 6000; i++) {
      rows.add(lines.get(i % lines.size()).getBytes(StandardCharsets.UTF_8));
    }
    ByteArrayOutputStream b = new ByteArrayOutputStream();
    long offset = -1;
    for (int i = 0; i < rows.size(); i++) {
      byte[] row = rows.get(i);
      if (i == 5000) {
        b.write(row, 0, 5);
        offset = b.size();
        b.write(0xFF);
        b.write(row, 5, row.length - 5);
      } else {
        b.write(row);
      }
      b.write('\n');
    }
    Path bad = dir.resolve("bad-5001.txt");
    Files.write(bad, b.toByteArray());
    String where = String.format(java.util.Locale.ROOT, "line 5,001 (byte offset %,d)", offset);
    String input = new String(b.toByteArray(), StandardCharsets.ISO_8859_1);
    List<CliTest.Run> runs = List.of(
        CliTest.run("train", "--vocab-size", "400", "--out", dir.resolve("x.morsel").toString(), bad.toString()),
        CliTest.run("encode", "--model", model.toString(), "--input", bad.toString()),
        CliTest.run("inspect", "--model", model.toString(), "--sample", bad.toString()),
        CliTest.run("sweep", "--schemes", "bpe", "--sizes", "400", "--out", dir.resolve("s").toString(), bad.toString()),
        CliTest.run("bench", "--model", model.toString(), "--warmup", "0", "--max-warmup", "0", "--rounds", "1",
            bad.toString()),
        feedBytes(b.toByteArray(), "encode", "--model", model.toString()),
        feedBytes(b.toByteArray(), "train", "--vocab-size", "400", "--out", dir.resolve("y.morsel").toString(), "-"));
    for (CliTest.Run r : runs) {
      assertEquals(Morsel.FAILED, r.code(), r.err());
      assertTrue(r.err().contains(where), r.err());
      assertTrue(r.err().contains("--bad-utf8"), "names the option that reads past it: " + r.err());
      assertFalse(r.err().contains("MalformedInputException"), r.err());
      assertEquals(1, r.err().lines().count(), "one line (and no stack trace): " + r.err());
    }
    // encode wrote every line before the bad one
    assertEquals(5000, runs.get(1).out().lines().count());
    assertTrue(input.length() > 0);

    CliTest.Run skip = CliTest.run("encode", "--model", model.toString(), "--bad-utf8", "skip", "--input", bad.toString());
    assertEquals(0, skip.code(), skip.err());
    assertEquals(5999, skip.out().lines().count());
    assertTrue(skip.err().contains("skipped 1 line"), skip.err());
    CliTest.Run replace = CliTest.run("encode", "--model", model.toString(), "--bad-utf8", "replace", "--format", "json",
        "--input", bad.toString());
    assertEquals(0, replace.code(), replace.err());
    assertEquals(6000, replace.out().lines().count());
    assertTrue(replace.out().lines().skip(5000).findFirst().orElseThrow().contains("\uFFFD"), "U+FFFD in line 5,001");
    assertTrue(replace.err().contains("replaced bad bytes in 1 line"), replace.err());
  }

  /** Runs with raw bytes on standard input (CliTest.feed takes text). */
  static synchronized CliTest.Run feedBytes(byte[] stdin, String... args) {
    StringWriter out = new StringWriter();
    StringWriter err = new StringWriter();
    InputStream saved = System.in;
    try {
      System.setIn(new java.io.ByteArrayInputStream(stdin));
      int code = Morsel.run(args, new PrintWriter(out, true), new PrintWriter(err, true));
      return new CliTest.Run(code, out.toString(), err.toString());
    } finally {
      System.setIn(saved);
    }
  }

  // ------------------------------------------------------------------ memory: a 20 MB line in a 256 MB heap

  @Test
  void aTwentyMegabyteLineEncodesToJsonAndDecodesUnderA256MbHeap() throws Exception {
    StringBuilder sb = new StringBuilder(21_000_000);
    for (int i = 0; sb.length() < 20_000_000; i++) {
      sb.append(lines.get(i % lines.size())).append(' ');
    }
    String text = sb.toString();
    Path in = dir.resolve("long.txt");
    Files.writeString(in, text + "\n");
    Path json = dir.resolve("long.json");
    Path back = dir.resolve("long.back");
    child(List.of("encode", "--model", model.toString(), "--format", "json", "--input", in.toString()), null, json);
    child(List.of("decode", "--model", model.toString()), json, back);
    assertEquals(text + "\n", Files.readString(back), "decode gives back the 20 MB line");
  }

  /** Runs the CLI in a child JVM with -Xmx256m; fails with its standard error if it does not exit 0. */
  private static void child(List<String> args, Path stdin, Path stdout) throws Exception {
    List<String> cmd = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
        "-Xmx256m", "-cp", System.getProperty("java.class.path"), Morsel.class.getName()));
    cmd.addAll(args);
    Path err = dir.resolve("child.err");
    ProcessBuilder pb = new ProcessBuilder(cmd).redirectOutput(stdout.toFile()).redirectError(err.toFile());
    if (stdin != null) {
      pb.redirectInput(stdin.toFile());
    } else {
      pb.redirectInput(new File("/dev/null").exists() ? ProcessBuilder.Redirect.from(new File("/dev/null"))
          : ProcessBuilder.Redirect.PIPE);
    }
    Process p = pb.start();
    assertTrue(p.waitFor(120, TimeUnit.SECONDS), "child finished");
    assertEquals(0, p.exitValue(), args + ": " + Files.readString(err));
  }

  @ParameterizedTest
  @ValueSource(strings = {"bpe", "wordpiece", "unigram"})
  void aLongLineEncodedInPartsEqualsTheWholeLine(String scheme) throws Exception {
    Path m = dir.resolve("parts-" + scheme + ".morsel");
    assertEquals(0, CliTest.run("train", "--scheme", scheme, "--vocab-size", "900", "--out", m.toString(),
        corpus.toString()).code());
    Tokenizer t = Tokenizers.load(m);
    String text = String.join(" ", lines.subList(0, 600)) + "  1234567 x-y  ⟨hold⟩ \uD83D\uDEA2 end";
    assertTrue(EncodeCommand.inParts(t, Trust.UNTRUSTED));
    Tokens whole = t.encode(text);
    for (int part : new int[] {1, 7, 100, 4096}) {
      EncodeCommand c = new EncodeCommand();
      StringWriter w = new StringWriter();
      PrintWriter out = new PrintWriter(w);
      c.encodeInParts(t, text, Trust.UNTRUSTED, part, out);
      out.flush();
      int[] ids = java.util.Arrays.stream(w.toString().strip().split(" ")).mapToInt(Integer::parseInt).toArray();
      assertArrayEquals(whole.ids(), ids, scheme + ", parts of " + part + " chars");
    }
  }

  // ------------------------------------------------------------------ pair input, sizes, wording, help

  @Test
  void aPairLineWithoutATabIsRefusedNamingTheLine() {
    CliTest.Run r = CliTest.feed("question\tanswer\nno tab on this line\n", "encode", "--model", model.toString(), "--pair");
    assertEquals(Morsel.FAILED, r.code());
    assertTrue(r.err().contains("standard input line 2") && r.err().contains("TAB"), r.err());
  }

  @Test
  void theVocabularySizeIsCheckedBeforeCounting() throws Exception {
    // the corpus is not UTF-8 on its first line: had counting started, the error would be about that
    Path bad = dir.resolve("bad-first.txt");
    Files.write(bad, new byte[] {'a', (byte) 0xFF, '\n'});
    CliTest.Run bpe = CliTest.run("train", "--scheme", "bpe", "--vocab-size", "100", "--out",
        dir.resolve("z.morsel").toString(), bad.toString());
    assertEquals(Morsel.USAGE, bpe.code(), bpe.err());
    assertTrue(bpe.err().contains("--vocab-size 100 is below 256"), bpe.err());
    CliTest.Run huge = CliTest.run("train", "--scheme", "wordpiece", "--vocab-size", "1000000000", "--out",
        dir.resolve("z.morsel").toString(), bad.toString());
    assertEquals(Morsel.USAGE, huge.code(), huge.err());
    assertTrue(huge.err().contains("--vocab-size 1000000000"), huge.err());
  }

  @Test
  void aShortfallIsSaidOnStandardError() {
    CliTest.Run r = CliTest.run("train", "--vocab-size", "1000000000", "--out", dir.resolve("short.morsel").toString(),
        corpus.toString());
    assertEquals(0, r.code(), r.err());
    assertTrue(r.err().contains("fewer than --vocab-size 1,000,000,000"), r.err());
  }

  @Test
  void errorsAreOneLineWithTheReasonAndThePlace() throws Exception {
    CliTest.Run missing = CliTest.run("encode", "--model", dir.resolve("nope.morsel").toString(), "hi");
    assertTrue(missing.err().strip().endsWith("nope.morsel: no such file"), missing.err());
    CliTest.Run folder = CliTest.run("encode", "--model", dir.toString(), "hi");
    assertTrue(folder.err().contains("it is a folder"), folder.err());
    CliTest.Run json = CliTest.feed("{\"ids\": [1, 2]}\n{\"ids\": [1, x]}\n", "decode", "--model", model.toString());
    assertEquals(Morsel.FAILED, json.code());
    assertEquals(1, json.err().lines().count(), json.err());
    assertTrue(json.err().contains("standard input line 2, column") && !json.err().contains("REDACTED"), json.err());
    CliTest.Run range = CliTest.feed("1 2\n3 999999\n", "decode", "--model", model.toString());
    assertTrue(range.err().contains("standard input line 2: id 999999 (number 2 on the line)"), range.err());
    CliTest.Run field = CliTest.feed("1 2\n3 x7\n", "decode", "--model", model.toString());
    assertTrue(field.err().contains("standard input line 2: field 2 ('x7')"), field.err());
    CliTest.Run unknown = CliTest.run("frobnicate");
    assertEquals(Morsel.USAGE, unknown.code());
    assertTrue(unknown.err().contains("unknown command 'frobnicate'") && unknown.err().contains("train, encode"),
        unknown.err());
    CliTest.Run strict = CliTest.run("decode", "--model", model.toString(), "--strict", "200");
    assertEquals(Morsel.FAILED, strict.code());
    assertTrue(strict.err().contains("leave out --strict") && !strict.err().contains("Decoding."), strict.err());
    CliTest.Run tooLong = CliTest.run("encode", "--model", model.toString(), "--max-chars", "5", "a longer text");
    assertTrue(tooLong.err().contains("over --max-chars 5") && !tooLong.err().contains("Limits."), tooLong.err());
  }

  @Test
  void helpShowsOptionNamesAndValuesNotJavaFields() {
    for (String command : List.of("train", "encode", "decode", "inspect", "sweep", "bench", "demo")) {
      CliTest.Run help = CliTest.run(command, "--help");
      assertEquals(0, help.code());
      for (String field : List.of("<vocabularySize>", "<maxPieces>", "<every>", "<model>", "<threads>", "=<")) {
        assertFalse(help.out().contains(field), command + " help shows " + field + ":\n" + help.out());
      }
    }
    String train = CliTest.run("train", "--help").out();
    assertTrue(train.replaceAll("\\s+", " ").contains("runs:space=own|next|previous,digits=whole|1..64 (runs of one character class; where a space goes; digit runs whole or cut into groups of at most N)"), train);
  }

  @Test
  void benchSaysHowLongItWarmedUp() {
    CliTest.Run r = CliTest.run("bench", "--model", model.toString(), "--threads", "1", "--warmup", "0", "--rounds", "2",
        corpus.resolve("messages-en.txt").toString());
    assertEquals(0, r.code(), r.err());
    assertTrue(r.out().contains("warm-up: until 3 consecutive passes agreed within 5%"), r.out());
    assertTrue(r.out().matches("(?s).*\\d+ passes, \\d+\\.\\d s.*"), r.out());
  }
}
