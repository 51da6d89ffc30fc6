package dev.morsel.tokenize.train;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.TreeMap;
import org.junit.jupiter.api.RepeatedTest;
import org.junit.jupiter.api.RepetitionInfo;
import org.junit.jupiter.api.Test;

/**
 * The alphabet a policy chooses, against an independent count written here: tally every character
 * of every piece times its count in a {@link TreeMap}, sort by count (larger first, then smaller code
 * point), and accumulate until the share is reached or the cap is hit.
 */
class AlphabetPolicyTest {

  @RepeatedTest(40)
  void selectionMatchesASortAndAccumulateOracle(RepetitionInfo info) {
    SplittableRandom rnd = new SplittableRandom(0xA1FAB37L + info.getCurrentRepetition());
    Map<String, Long> m = new HashMap<>();
    int pieces = 1 + rnd.nextInt(60);
    for (int i = 0; i < pieces; i++) {
      StringBuilder b = new StringBuilder();
      int len = 1 + rnd.nextInt(6);
      for (int k = 0; k < len; k++) {
        int pick = rnd.nextInt(10);
        // Latin, Han, and a character outside the BMP, with a skewed frequency
        int cp = pick < 6 ? 'a' + rnd.nextInt(6) : pick < 9 ? 0x4E00 + rnd.nextInt(40) : 0x1F6A2 + rnd.nextInt(3);
        b.appendCodePoint(cp);
      }
      m.merge(b.toString(), 1L + rnd.nextInt(20), Long::sum);
    }
    PieceCounts counts = PieceCounts.of(m);
    double coverage = new double[] {0.5, 0.9, 0.99, 0.9999, 1.0}[rnd.nextInt(5)];
    int cap = rnd.nextInt(3) == 0 ? 1 + rnd.nextInt(30) : Integer.MAX_VALUE;
    Alphabet a = AlphabetPolicy.of(coverage, cap).select(counts, 7, true);

    // the oracle
    TreeMap<Integer, Long> tally = new TreeMap<>();
    for (Map.Entry<String, Long> e : m.entrySet()) {
      e.getKey().codePoints().forEach(cp -> tally.merge(cp, e.getValue(), Long::sum));
    }
    List<Map.Entry<Integer, Long>> ranked = new ArrayList<>(tally.entrySet());
    ranked.sort((x, y) -> x.getValue().equals(y.getValue()) ? Integer.compare(x.getKey(), y.getKey())
        : Long.compare(y.getValue(), x.getValue()));
    long total = ranked.stream().mapToLong(Map.Entry::getValue).sum();
    List<Integer> expected = new ArrayList<>();
    long sum = 0;
    for (Map.Entry<Integer, Long> e : ranked) {
      if (expected.size() == cap || (coverage < 1.0 && sum >= coverage * total)) {
        break;
      }
      expected.add(e.getKey());
      sum += e.getValue();
    }

    assertEquals(expected.size(), a.size());
    for (int r = 0; r < expected.size(); r++) {
      assertEquals((int) expected.get(r), a.codePoint(r), "rank " + r);
      assertEquals((long) tally.get(expected.get(r)), a.count(r));
    }
    assertEquals(total, a.totalOccurrences());
    assertEquals(sum, a.coveredOccurrences());
    assertEquals(ranked.size() - expected.size(), a.leftOutSize());
    for (int r = 0; r < a.leftOutSize(); r++) {
      assertEquals((int) ranked.get(expected.size() + r).getKey(), a.leftOutCodePoint(r));
      assertFalse(a.contains(a.leftOutCodePoint(r)));
    }
    if (cap == Integer.MAX_VALUE) {
      assertTrue(a.coverageReached() >= coverage, a.summary());
    }
  }

  @Test
  void aDerivedCapIsTheLearnersAndTheSummaryNamesWhatWasLeftOut() {
    PieceCounts counts = PieceCounts.of(Map.of("Oskevik", 50L, "渡轮", 2L, "Ω", 1L));
    Alphabet a = AlphabetPolicy.defaults().withCoverage(1.0).select(counts, 5, false);
    assertEquals(5, a.size(), "the derived cap");
    assertEquals(5, a.maxSize());
    assertEquals(4, a.leftOutSize());
    // 'k' U+006B (50), then '渡' U+6E21 and '轮' U+8F6E (2 each), then 'Ω' (1)
    String s = a.summary();
    assertTrue(s.contains("'Ω' U+03A9 ×1") && s.contains("unknown token"), s);
    assertTrue(AlphabetPolicy.of(1.0, 100).select(counts, 5, true).leftOutSize() == 0);
  }

  @Test
  void badSettingsAreRefusedByName() {
    assertTrue(assertThrows(IllegalArgumentException.class, () -> AlphabetPolicy.of(0, 10)).getMessage().contains("coverage=0"));
    assertTrue(assertThrows(IllegalArgumentException.class, () -> AlphabetPolicy.of(1.5, 10)).getMessage().contains("coverage=1.5"));
    assertTrue(assertThrows(IllegalArgumentException.class, () -> AlphabetPolicy.of(Double.NaN, 10)).getMessage().contains("coverage=NaN"));
    assertTrue(assertThrows(IllegalArgumentException.class, () -> AlphabetPolicy.defaults().withMaxSize(-2)).getMessage().contains("maxSize=-2"));
    LearnerOptions o = LearnerOptions.of("x", AlphabetPolicy.options("a cap"), Map.of(AlphabetPolicy.COVERAGE_OPTION, "0"));
    assertTrue(assertThrows(IllegalArgumentException.class, () -> AlphabetPolicy.fromOptions(o)).getMessage()
        .contains("alphabet-coverage=0"));
    LearnerOptions ok = LearnerOptions.of("x", AlphabetPolicy.options("a cap"), Map.of(AlphabetPolicy.COVERAGE_OPTION, "1",
        AlphabetPolicy.MAX_SIZE_OPTION, "300"));
    assertEquals(AlphabetPolicy.of(1.0, 300), AlphabetPolicy.fromOptions(ok));
  }
}
