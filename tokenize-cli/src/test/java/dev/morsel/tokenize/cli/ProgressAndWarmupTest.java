package dev.morsel.tokenize.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Iterator;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The warm-up criterion and the progress display's text rules. */
class ProgressAndWarmupTest {

  @Test
  void warmUpStopsAtTheFirstThreeAgreeingPasses() {
    // a JIT-like curve of rates: slow rounds, then a plateau within 5 %
    Iterator<Double> rates = List.of(1.0, 3.0, 6.0, 9.5, 10.0, 9.8, 9.9, 10.0).iterator();
    Steady.Warmup w = Steady.warmUp(rates::next, 0.05, 0, Long.MAX_VALUE);
    assertTrue(w.stable());
    // (10.0 - 9.5) / 9.5 = 5.3 %: the first three within 5 % are 10.0, 9.8, 9.9
    assertEquals(7, w.passes());
    assertTrue(w.describe().contains("7 rounds") && w.describe().contains("within 5%"), w.describe());
  }

  @Test
  void warmUpThatNeverSettlesSaysSo() {
    double[] r = {100};
    Steady.Warmup w = Steady.warmUp(() -> r[0] *= 2, 0.05, 0, 0);
    assertFalse(w.stable());
    assertTrue(w.describe().contains("NOT stable"), w.describe());
  }

  @Test
  void detailTextIsCutAtAWordBoundaryAndHasAFixedWidth() {
    String d = Progress.fit("round 3, iteration 2, 12000 tokens, log-likelihood -1.2345E7", 28);
    assertEquals(28, d.length());
    assertTrue(d.strip().endsWith("…"), d);
    assertTrue(d.startsWith("round 3, iteration 2,"), d);
    assertFalse(d.contains("toke…"), "not cut mid-word: " + d);
    assertEquals(28, Progress.fit("", 28).length());
    assertEquals(Progress.phase("em"), Progress.phase("prune"), "EM and pruning rounds share one bar");
  }
}
