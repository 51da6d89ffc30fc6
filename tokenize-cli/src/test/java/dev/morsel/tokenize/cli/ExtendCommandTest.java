package dev.morsel.tokenize.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * {@code morsel extend} and {@code morsel compare}, end to end on the demo corpus: a model of the
 * English messages extended with the Norwegian ones, compared on both.
 */
class ExtendCommandTest {
  @TempDir
  static Path dir;

  static Path corpus;

  @BeforeAll
  static void copyCorpus() throws Exception {
    corpus = dir.resolve("corpus");
    Files.createDirectories(corpus);
    for (String f : DemoCommand.FILES) {
      try (java.io.InputStream in = ExtendCommandTest.class.getResourceAsStream("demo/" + f)) {
        Files.copy(in, corpus.resolve(f));
      }
    }
  }

  static List<String> schemes() {
    return Schemes.NAMES;
  }

  @ParameterizedTest
  @MethodSource("schemes")
  void extendsKeepsEveryIdAndCompareShowsTheGain(String scheme) throws Exception {
    Path en = corpus.resolve("messages-en.txt");
    Path no = corpus.resolve("messages-no.txt");
    Path base = dir.resolve(scheme + "-en.morsel");
    Path ext = dir.resolve(scheme + "-en-no.morsel");
    CliTest.Run train = CliTest.run("train", "--scheme", scheme, "--vocab-size", "600", "--reserved", "\u27e8hold\u27e9",
        "--out", base.toString(), en.toString());
    assertEquals(0, train.code(), train.err());
    CliTest.Run extend = CliTest.run("extend", "--model", base.toString(), "--add", "300", "--threads", "2", "--out",
        ext.toString(), no.toString());
    assertEquals(0, extend.code(), extend.err());
    Tokenizer b = Tokenizers.load(base);
    Tokenizer e = Tokenizers.load(ext);
    assertTrue(extend.out().contains("extends          " + b.fingerprint()), extend.out());
    assertEquals(b.fingerprint(), e.lineage().orElseThrow().baseFingerprint());
    for (int id = 0; id < b.vocabularySize(); id++) {
      assertEquals(b.token(id), e.token(id), "id " + id);
    }
    CliTest.Run inspect = CliTest.run("inspect", "--model", ext.toString(), "--top", "0");
    assertTrue(inspect.out().contains("extends          " + b.fingerprint()), inspect.out());

    Path out = dir.resolve(scheme + "-compare");
    CliTest.Run compare = CliTest.run("compare", "--max-warmup", "0.2", "--model", base.toString(), "--model", ext.toString(),
        "--out", out.toString(), en.toString(), no.toString());
    assertEquals(0, compare.code(), compare.err());
    List<String> csv = Files.readAllLines(out.resolve("compare.csv"));
    assertEquals(Report.CSV_HEADER, csv.get(0));
    assertEquals(1 + 2 * 3, csv.size(), "two models, two files and the overall row each");
    double baseNo = Double.NaN;
    double extNo = Double.NaN;
    for (String line : csv.subList(1, csv.size())) {
      String[] f = line.split(",");
      if (f[3].equals("messages-no.txt")) {
        if (f[0].startsWith(base.getFileName().toString())) {
          baseNo = Double.parseDouble(f[11]);
        } else {
          extNo = Double.parseDouble(f[11]);
        }
      }
    }
    assertTrue(extNo < baseNo, "tokens per word on the new domain: base " + baseNo + ", extended " + extNo);
    String html = Files.readString(out.resolve("compare.html"));
    assertTrue(html.contains("extends " + base.getFileName()), "the report names the lineage");
    // the per-input chart holds a bar of each model, not only of the largest one
    int at = html.indexOf("<figure id=\"chart-fertility\">");
    String figure = html.substring(at, html.indexOf("</figure>", at));
    assertTrue(figure.contains(base.getFileName().toString()) && figure.contains(ext.getFileName().toString()), figure);
  }

  @ParameterizedTest
  @MethodSource("schemes")
  void refusesBadArguments(String scheme) throws Exception {
    Path base = dir.resolve(scheme + "-small.morsel");
    Path en = corpus.resolve("messages-en.txt");
    assertEquals(0, CliTest.run("train", "--scheme", scheme, "--vocab-size", "500", "--out", base.toString(),
        en.toString()).code());
    CliTest.Run zero = CliTest.run("extend", "--model", base.toString(), "--add", "0", "--out",
        dir.resolve("x.morsel").toString(), en.toString());
    assertTrue(zero.code() != 0 && zero.err().contains("--add"), zero.err());
    CliTest.Run option = CliTest.run("extend", "--model", base.toString(), "--add", "10", "--option", "no-such=1", "--out",
        dir.resolve("x.morsel").toString(), en.toString());
    assertTrue(option.code() != 0 && option.err().contains("no-such"), option.err());
  }
}
