package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.Paths;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * The measurement that chose the default splitting ({@link Splitting#runs()}): for each candidate
 * splitting, train each scheme at a fixed vocabulary size on nine tenths of a corpus and measure
 * the held-out tenth. Prints one Markdown table per corpus and scheme.
 *
 * <p>Corpora: the Europarl bodies of {@link Corpus} (every line), and the demo passenger messages
 * of tokenize-cli (the four {@code messages-*.txt} files, read from the source tree). Within each
 * corpus (each demo file on its own), line {@code i} (0-based) is held out when
 * {@code i % 10 == 9}. The pipeline is NFC plus the candidate splitting, the same for training and
 * measuring.
 *
 * <p>Per candidate it reports held-out tokens per word (words: maximal runs of non-whitespace),
 * UTF-8 bytes of the normalized text per token, the number of held-out lines whose round trip
 * {@code decode(encode(x)) == normalize(x)} fails, and the training seconds.
 *
 * <p>Run from the repository root (about 6 minutes on 2 shared cores with the default schemes;
 * unigram adds about 75 s per candidate on Europarl, so it is left out by default):
 * <pre>
 * ./mvnw -B -ntp -q -pl tokenize-bench -am package -DskipTests
 * java -Xmx3g -cp tokenize-bench/target/morsel-bench.jar dev.morsel.tokenize.bench.SplittingStudy \
 *     [schemes, default bpe,wordpiece]
 * </pre>
 * System properties: {@code morsel.study.europarlSize} (default 8000) and
 * {@code morsel.study.demoSize} (default 1000) are the vocabulary sizes; {@code morsel.study.corpora}
 * picks corpora (default {@code europarl,demo}); {@code morsel.study.demo} is the demo directory
 * (default {@code tokenize-cli/src/main/resources/dev/morsel/tokenize/cli/demo}).
 */
public final class SplittingStudy {
  private static final int HOLD_OUT_EVERY = 10;

  private SplittingStudy() {}

  /** The candidates, in table order. */
  static List<Splitting> candidates() {
    List<Splitting> out = new ArrayList<>();
    for (Splitting.Space space : Splitting.Space.values()) {
      for (int digits : new int[] {1, 2, 3, Splitting.WHOLE_DIGIT_RUNS}) {
        out.add(Splitting.runs(space, digits));
      }
    }
    out.add(Splitting.words());
    out.add(Splitting.whitespace());
    return out;
  }

  /** Runs the study. */
  public static void main(String[] args) {
    List<String> schemes = List.of((args.length > 0 ? args[0] : "bpe,wordpiece").split(","));
    List<String> corpora = List.of(System.getProperty("morsel.study.corpora", "europarl,demo").split(","));
    int europarlSize = Integer.getInteger("morsel.study.europarlSize", 8000);
    int demoSize = Integer.getInteger("morsel.study.demoSize", 1000);
    Path demoDir = Paths.get(System.getProperty("morsel.study.demo",
        "tokenize-cli/src/main/resources/dev/morsel/tokenize/cli/demo"));
    long t0 = System.nanoTime();
    if (corpora.contains("europarl")) {
      Map<String, List<String>> europarl = new LinkedHashMap<>();
      europarl.put("europarl", Corpus.bodies());
      study("Europarl sample (" + Corpus.bodies().size() + " lines)", europarl, europarlSize, schemes);
    }
    if (corpora.contains("demo")) {
      study("demo passenger messages", demo(demoDir), demoSize, schemes);
    }
    System.out.printf(Locale.ROOT, "%nstudy took %.0f s%n", (System.nanoTime() - t0) / 1e9);
  }

  private static void study(String title, Map<String, List<String>> groups, int size, List<String> schemes) {
    List<String> train = new ArrayList<>();
    List<String> held = new ArrayList<>();
    for (List<String> lines : groups.values()) {
      for (int i = 0; i < lines.size(); i++) {
        (i % HOLD_OUT_EVERY == HOLD_OUT_EVERY - 1 ? held : train).add(lines.get(i));
      }
    }
    for (String scheme : schemes) {
      System.out.printf(Locale.ROOT, "%n### %s, %s %d (train %d lines, held out %d)%n%n", title, scheme, size,
          train.size(), held.size());
      System.out.println("| splitting | tokens/word | bytes/token | round-trip failures | train s |");
      System.out.println("|---|---:|---:|---:|---:|");
      for (Splitting s : candidates()) {
        Pipeline p = Pipeline.of(Normalization.of(Normalization.Form.NFC), s);
        long t0 = System.nanoTime();
        PieceCounts counts = PieceCounter.builder().pipeline(p).threads(2).build().count(train);
        Tokenizer t = Learners.learner(scheme, LearnerSettings.of(size).withThreads(2)).train(counts);
        double seconds = (System.nanoTime() - t0) / 1e9;
        long words = 0;
        long bytes = 0;
        long tokens = 0;
        long failures = 0;
        for (String line : held) {
          String normalized = p.normalization().apply(line).text();
          words += words(normalized);
          bytes += normalized.getBytes(StandardCharsets.UTF_8).length;
          Tokens x = t.encode(line);
          tokens += x.size();
          if (!t.decode(x.ids()).equals(normalized)) {
            failures++;
          }
        }
        System.out.printf(Locale.ROOT, "| `%s` | %.4f | %.3f | %d | %.1f |%n", s.spec(), (double) tokens / words,
            (double) bytes / tokens, failures, seconds);
      }
    }
  }

  /** Maximal runs of non-whitespace. */
  static long words(String s) {
    long n = 0;
    boolean in = false;
    for (int i = 0; i < s.length(); i++) {
      boolean ws = Character.isWhitespace(s.charAt(i));
      if (!ws && !in) {
        n++;
      }
      in = !ws;
    }
    return n;
  }

  private static Map<String, List<String>> demo(Path dir) {
    Map<String, List<String>> out = new LinkedHashMap<>();
    try (DirectoryStream<Path> files = Files.newDirectoryStream(dir, "messages-*.txt")) {
      List<Path> sorted = new ArrayList<>();
      files.forEach(sorted::add);
      sorted.sort(null);
      for (Path f : sorted) {
        out.put(f.getFileName().toString(), Files.readAllLines(f, StandardCharsets.UTF_8));
      }
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read the demo corpus in " + dir.toAbsolutePath(), e);
    }
    if (out.isEmpty()) {
      throw new IllegalStateException("no messages-*.txt in " + dir.toAbsolutePath());
    }
    return out;
  }
}
