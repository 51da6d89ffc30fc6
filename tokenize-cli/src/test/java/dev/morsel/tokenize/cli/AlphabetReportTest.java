package dev.morsel.tokenize.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * What the command line says about alphabets: {@code train} prints the policy's result in one line
 * (and every left-out character with {@code --verbose}), {@code inspect} shows what the model file
 * records, and {@code sweep} breaks its figures down by Unicode script. Corpus: the bundled ferry
 * messages plus a file of rarer characters of our own (Greek, Cyrillic and Han harbour notices).
 */
class AlphabetReportTest {
  @TempDir
  static Path dir;

  static Path corpus;

  @BeforeAll
  static void corpus() throws Exception {
    corpus = dir.resolve("corpus");
    Files.createDirectories(corpus);
    for (String f : DemoCommand.FILES) {
      try (InputStream in = AlphabetReportTest.class.getResourceAsStream("demo/" + f)) {
        Files.copy(in, corpus.resolve(f));
      }
    }
    StringBuilder rare = new StringBuilder();
    for (int i = 0; i < 40; i++) {
      rare.append("渡轮 Oskevik 港口 ").append(i).append(" Ωμέγα пристань\n");
    }
    Files.write(corpus.resolve("notices.txt"), rare.toString().getBytes(StandardCharsets.UTF_8));
  }

  @Test
  void trainPrintsTheAlphabetAndInspectShowsTheRecord() {
    Path model = dir.resolve("wp.morsel");
    CliTest.Run train = CliTest.run("train", "--scheme", "wordpiece", "--vocab-size", "1200", "--option",
        "alphabet-coverage=0.999", "--option", "byte-spelling=true", "--out", model.toString(), corpus.toString());
    assertEquals(0, train.code(), train.err());
    String line = train.out().lines().filter(l -> l.startsWith("alphabet ")).findFirst().orElse("");
    assertTrue(line.contains("policy coverage 0.999") && line.contains("left out") && line.contains("spelled with byte tokens"),
        train.out());
    CliTest.Run verbose = CliTest.run("train", "--verbose", "--scheme", "wordpiece", "--vocab-size", "1200", "--option",
        "alphabet-coverage=0.99", "--out", dir.resolve("wp2.morsel").toString(), corpus.toString());
    assertEquals(0, verbose.code(), verbose.err());
    assertTrue(verbose.out().contains("left out         "), verbose.out());
    // below 2,048 ids byte spelling is off by default: the line says so
    assertTrue(verbose.out().contains("encoded as the unknown token"), verbose.out());
    CliTest.Run inspect = CliTest.run("inspect", "--model", model.toString());
    assertEquals(0, inspect.code(), inspect.err());
    assertTrue(inspect.out().contains("alphabet         ") && inspect.out().contains("(asked 0.999,")
        && inspect.out().contains("others spelled with byte tokens"), inspect.out());
  }

  @Test
  void sweepWritesThePerScriptFigures() throws Exception {
    Path out = dir.resolve("sweep");
    CliTest.Run r = CliTest.run("sweep", "--max-warmup", "1", "--schemes", "wordpiece,unigram", "--sizes", "600",
        "--option", "wordpiece:byte-spelling=false", "--out", out.toString(), corpus.toString());
    assertEquals(0, r.code(), r.err());
    List<String> csv = Files.readAllLines(out.resolve("sweep-scripts.csv"));
    assertEquals(Report.SCRIPTS_CSV_HEADER, csv.get(0));
    assertTrue(csv.stream().anyMatch(l -> l.startsWith("wordpiece,600,") && l.contains(",Han,")), csv.toString());
    assertTrue(csv.stream().anyMatch(l -> l.startsWith("unigram,600,") && l.contains(",Latin,")), csv.toString());
    long chars = 0;
    for (String l : csv.subList(1, csv.size())) {
      String[] f = l.split(",");
      long c = Long.parseLong(f[4]);
      long unknown = Long.parseLong(f[7]);
      long bytes = Long.parseLong(f[8]);
      assertTrue(unknown + bytes <= c, l);
      if (f[0].equals("wordpiece")) {
        assertEquals(0, bytes, "byte spelling is off for wordpiece here: " + l);
        chars += c;
      }
    }
    // the per-script characters add up to the held-out characters of the overall row
    List<String> overall = Files.readAllLines(out.resolve("sweep.csv"));
    long expected = overall.stream().filter(l -> l.startsWith("wordpiece,600,") && l.contains(",(all),"))
        .mapToLong(l -> Long.parseLong(l.split(",")[7])).sum();
    assertEquals(expected, chars);
    String html = Files.readString(out.resolve("sweep.html"));
    assertTrue(html.contains("<h2 id=\"by-script\">By script</h2>") && html.contains("<td class=\"t\">Han</td>"), html);
  }
}
