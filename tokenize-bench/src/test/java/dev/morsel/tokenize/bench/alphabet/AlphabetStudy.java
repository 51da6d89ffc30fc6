package dev.morsel.tokenize.bench.alphabet;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.Alphabet;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.condition.EnabledIfSystemProperty;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Prints the large-alphabet table of {@code docs/guide.md}: for each scheme and alphabet coverage,
 * at 8,000 ids, the alphabet size, held-out tokens per character on the mixed text and on its
 * Chinese part, and the unknown and byte-spelled rates. A measurement (a few minutes), so it runs
 * only when asked:
 *
 * <pre>
 * ./mvnw -B -q -pl tokenize-bench -am test -Dtest=AlphabetStudy -Dsurefire.failIfNoSpecifiedTests=false \
 *     -Dmorsel.alphabetStudy=true
 * </pre>
 *
 * <p>Besides printing, it checks what must hold in every row: with byte spelling no character is
 * unknown and every line round-trips, and a larger coverage never gives a smaller alphabet.
 */
@EnabledIfSystemProperty(named = "morsel.alphabetStudy", matches = "true")
class AlphabetStudy {

  @Test
  void printTheTable() {
    int size = 8000;
    double[] coverages = {0.999, 0.9995, 0.9999, 0.99999, 1.0};
    PieceCounts counts = Mix.mixedCounts();
    List<String> held = new ArrayList<>(Mix.europarlHeld());
    held.addAll(Mix.chineseHeld());
    System.out.println("| scheme | byte spelling | coverage | alphabet | tokens/char (all) | tokens/char (zh) | unknown | byte-spelled | round trip |");
    System.out.println("|---|---|---:|---:|---:|---:|---:|---:|---|");
    for (String scheme : List.of("bpe", "wordpiece", "unigram")) {
      for (boolean bytes : scheme.equals("bpe") ? new boolean[] {true} : new boolean[] {true, false}) {
        int previous = 0;
        for (double c : coverages) {
          Alphabet[] seen = new Alphabet[1];
          TrainingListener l = new TrainingListener() {
            @Override
            public void progress(String stage, long done, long total, String detail) {}

            @Override
            public void alphabet(String s, Alphabet a) {
              seen[0] = a;
            }
          };
          List<String> options = new ArrayList<>(List.of(AlphabetPolicy.COVERAGE_OPTION + "=" + c));
          if (!scheme.equals("bpe")) {
            options.add("byte-spelling=" + bytes);
          }
          long t0 = System.nanoTime();
          Tokenizer t;
          try {
            t = Learners.learner(scheme, LearnerSettings.of(size).withThreads(2).withListener(l),
                options.toArray(new String[0])).train(counts);
          } catch (IllegalArgumentException e) {
            System.out.println("| " + scheme + " | " + c + " | not feasible: " + e.getMessage() + " |");
            continue;
          }
          long ms = (System.nanoTime() - t0) / 1_000_000;
          Mix.Figures all = Mix.measure(t, held);
          Mix.Figures zh = Mix.measure(t, Mix.chineseHeld());
          System.out.printf(Locale.ROOT, "| %s | %s | %s | %,d | %.4f | %.4f | %.4f %% | %.4f %% | %s |%n", scheme,
              bytes ? "yes" : "no", c, seen[0].size(), all.tokensPerCharacter(),
              zh.tokensPerCharacter(), 100 * all.unknownRate(), 100 * all.byteRate(),
              all.roundTripFailures == 0 ? "exact" : all.roundTripFailures + " lines differ");
          System.err.println(scheme + " " + c + " trained in " + ms + " ms; " + seen[0].summary());
          assertTrue(seen[0].size() >= previous, "alphabet grows with coverage");
          previous = seen[0].size();
          if (bytes) {
            assertEquals(0, all.unknownCharacters, scheme + " with byte spelling");
            assertEquals(0, all.roundTripFailures, scheme + " with byte spelling: " + all.firstFailure);
          }
        }
      }
    }
  }
}
