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
    // a JIT-like curve: slow passes, then a plateau within 5 %
    Iterator<Long> times = List.of(900L, 500L, 300L, 210L, 200L, 204L, 202L, 200L).iterator();
    Steady.Warmup w = Steady.warmUp(times::next, 0.05, 0, Long.MAX_VALUE);
    assertTrue(w.stable());
    assertEquals(6, w.passes(), "210, 200, 204 are the first three within 5%");
    assertTrue(w.describe().contains("6 passes") && w.describe().contains("within 5%"), w.describe());
  }

  @Test
  void warmUpThatNeverSettlesSaysSo() {
    long[] t = {100};
    Steady.Warmup w = Steady.warmUp(() -> t[0] *= 2, 0.05, 0, 0);
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
