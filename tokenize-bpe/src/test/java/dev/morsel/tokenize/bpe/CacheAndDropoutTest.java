package dev.morsel.tokenize.bpe;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import dev.morsel.tokenize.spi.TokenSink;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.concurrent.atomic.AtomicReference;
import org.junit.jupiter.api.Test;

/** Piece cache (on/off/cold/warm/racing) and BPE-dropout (Provilkov et al. 2020). */
class CacheAndDropoutTest {

  private static List<String> pieces(int bodies) {
    List<String> out = new ArrayList<>();
    for (String b : Fixtures.europarlBodies().subList(0, bodies)) {
      int[] p = Fixtures.pieces(b);
      for (int j = 0; j < p.length; j += 2) {
        out.add(b.substring(p[j], p[j + 1]));
      }
    }
    return out;
  }

  /** ids and spans of every piece, flattened as id, start, end triples per piece. */
  private static List<int[]> run(BpeSegmenter seg, List<String> pieces) {
    List<int[]> out = new ArrayList<>(pieces.size());
    for (String p : pieces) {
      Fixtures.Collected c = Fixtures.segment(seg, p, 0, p.length());
      int[] t = new int[3 * c.size];
      for (int i = 0; i < c.size; i++) {
        t[3 * i] = c.ids[i];
        t[3 * i + 1] = c.starts[i];
        t[3 * i + 2] = c.ends[i];
      }
      out.add(t);
    }
    return out;
  }

  private static void assertSame(List<int[]> a, List<int[]> b, List<String> pieces, String what) {
    for (int i = 0; i < a.size(); i++) {
      assertArrayEquals(a.get(i), b.get(i), what + ": piece " + i + " '" + pieces.get(i) + "'");
    }
  }

  @Test
  void cacheOnOffColdWarmAndTinyGiveIdenticalResults() {
    BpeSegmenter model = Fixtures.europarlModel();
    List<String> ps = pieces(1500);
    List<int[]> off = run(model.withCacheEntries(0), ps);
    BpeSegmenter on = model.withCacheEntries(BpeSegmenter.DEFAULT_CACHE_ENTRIES);
    assertSame(off, run(on, ps), ps, "cold");
    assertSame(off, run(on, ps), ps, "warm");
    BpeSegmenter tiny = model.withCacheEntries(4); // constant evictions and slot collisions
    assertSame(off, run(tiny, ps), ps, "tiny");
    assertSame(off, run(tiny, ps), ps, "tiny warm");
    assertEquals(4, tiny.cacheEntries());
  }

  @Test
  void racingThreadsOnOneSmallCacheGetCorrectResults() throws Exception {
    BpeSegmenter model = Fixtures.europarlModel();
    List<String> ps = pieces(600);
    List<int[]> off = run(model.withCacheEntries(0), ps);
    BpeSegmenter shared = model.withCacheEntries(64);
    AtomicReference<Throwable> failure = new AtomicReference<>();
    Thread[] ts = new Thread[2];
    for (int t = 0; t < ts.length; t++) {
      ts[t] = new Thread(() -> {
        try {
          for (int round = 0; round < 3; round++) {
            assertSame(off, run(shared, ps), ps, "racing");
          }
        } catch (Throwable e) {
          failure.compareAndSet(null, e);
        }
      });
      ts[t].start();
    }
    for (Thread t : ts) {
      t.join();
    }
    if (failure.get() != null) {
      throw new AssertionError(failure.get());
    }
  }

  /** This thread's allocated bytes (HotSpot's per-thread counter, looked up reflectively), or -1. */
  private static long allocatedBytes() {
    try {
      Object mx = Class.forName("java.lang.management.ManagementFactory").getMethod("getThreadMXBean").invoke(null);
      Class<?> ext = Class.forName("com.sun.management.ThreadMXBean");
      if (!ext.isInstance(mx)) {
        return -1;
      }
      return (Long) ext.getMethod("getCurrentThreadAllocatedBytes").invoke(mx);
    } catch (ReflectiveOperationException | RuntimeException e) {
      return -1;
    }
  }

  @Test
  void cacheHitsAndSteadyStateMissesDoNotAllocatePerPiece() {
    assumeTrue(allocatedBytes() >= 0, "thread allocation counter unavailable");
    BpeSegmenter model = Fixtures.europarlModel();
    String text = " Passengers for the island ferry: boarding continues at the southern quay";
    int[] p = Fixtures.pieces(text);
    long[] sum = new long[1];
    TokenSink sink = (id, s, e) -> sum[0] += id + s + e;
    for (BpeSegmenter seg : List.of(model, model.withCacheEntries(0))) {
      for (int warm = 0; warm < 20_000; warm++) {
        for (int j = 0; j < p.length; j += 2) {
          seg.segment(text, p[j], p[j + 1], sink);
        }
      }
      long before = allocatedBytes();
      for (int round = 0; round < 10_000; round++) {
        for (int j = 0; j < p.length; j += 2) {
          seg.segment(text, p[j], p[j + 1], sink);
        }
      }
      long used = allocatedBytes() - before;
      // 10,000 rounds x 11 pieces: even 8 bytes per piece would be 880 KB; allow only noise.
      assertTrue(used < 64 * 1024, seg + " allocated " + used + " bytes for 110,000 pieces");
    }
    assertTrue(sum[0] > 0);
  }

  @Test
  void dropoutZeroIsPlainAndOneIsSingleBytes() {
    // Provilkov et al. (2020), section 3: p = 0 is standard BPE; p = 1 leaves the word as characters
    // (here: bytes, since the base units are bytes).
    BpeSegmenter model = Fixtures.europarlModel();
    List<String> ps = pieces(300);
    assertSame(run(model, ps), run(model.withDropout(0.0, 99), ps), ps, "p=0");
    BpeSegmenter all = model.withDropout(1.0, 99);
    for (String p : ps) {
      Fixtures.Collected c = Fixtures.segment(all, p, 0, p.length());
      byte[] b = p.getBytes(StandardCharsets.UTF_8);
      int[] want = new int[b.length];
      for (int i = 0; i < b.length; i++) {
        want[i] = b[i] & 0xFF;
      }
      assertArrayEquals(want, c.ids(), p);
    }
  }

  @Test
  void dropoutIsDeterministicPerSeedAndLossless() {
    BpeSegmenter model = Fixtures.europarlModel();
    List<String> ps = pieces(300);
    List<int[]> a = run(model.withDropout(0.1, 2024), ps);
    List<int[]> b = run(model.withDropout(0.1, 2024), ps);
    assertSame(a, b, ps, "same seed");
    List<int[]> c = run(model.withDropout(0.1, 2025), ps);
    List<int[]> plain = run(model, ps);
    int differsFromOtherSeed = 0;
    int differsFromPlain = 0;
    for (int i = 0; i < ps.size(); i++) {
      if (!java.util.Arrays.equals(a.get(i), c.get(i))) {
        differsFromOtherSeed++;
      }
      if (!java.util.Arrays.equals(a.get(i), plain.get(i))) {
        differsFromPlain++;
      }
      int[] t = a.get(i);
      int[] ids = new int[t.length / 3];
      for (int j = 0; j < ids.length; j++) {
        ids[j] = t[3 * j];
      }
      assertArrayEquals(ps.get(i).getBytes(StandardCharsets.UTF_8), Fixtures.decode(model, ids), ps.get(i));
    }
    assertTrue(differsFromOtherSeed > 0 && differsFromPlain > 0, differsFromOtherSeed + " / " + differsFromPlain);
    // explicit generator
    BpeSegmenter d = model.withDropout(0.3, 1);
    Fixtures.Collected x = new Fixtures.Collected();
    Fixtures.Collected y = new Fixtures.Collected();
    d.segment(" international", 0, 14, x::add, new SplittableRandom(5));
    d.segment(" international", 0, 14, y::add, new SplittableRandom(5));
    assertArrayEquals(x.ids(), y.ids());
  }

  /**
   * Independent textbook BPE-dropout (Provilkov et al. 2020, section 3: at each merge step every
   * candidate merge is removed with probability p) compared in distribution with ours: total
   * variation distance of the segmentation frequencies over 40,000 samples each.
   */
  @Test
  void dropoutMatchesTextbookDistribution() {
    BpeSegmenter model = Fixtures.europarlModel();
    Map<List<Integer>, Integer> ranks = TextbookBpe.ranks(model);
    String word = " Commission";
    byte[] bytes = word.getBytes(StandardCharsets.UTF_8);
    double p = 0.25;
    int n = 40_000;
    Map<String, Integer> ours = new HashMap<>();
    Map<String, Integer> textbook = new HashMap<>();
    BpeSegmenter d = model.withDropout(p, 11);
    SplittableRandom r = new SplittableRandom(12);
    for (int i = 0; i < n; i++) {
      Fixtures.Collected c = Fixtures.segment(d, word, 0, word.length());
      ours.merge(java.util.Arrays.toString(c.ids()), 1, Integer::sum);
      textbook.merge(java.util.Arrays.toString(textbookDropout(bytes, ranks, p, r)), 1, Integer::sum);
    }
    double tv = 0;
    java.util.Set<String> keys = new java.util.HashSet<>(ours.keySet());
    keys.addAll(textbook.keySet());
    for (String k : keys) {
      tv += Math.abs(ours.getOrDefault(k, 0) - textbook.getOrDefault(k, 0)) / (double) n;
    }
    tv /= 2;
    assertTrue(keys.size() > 5, "dropout produced " + keys.size() + " segmentations");
    assertTrue(tv < 0.04, "total variation distance " + tv + " over " + keys.size() + " segmentations");
  }

  private static int[] textbookDropout(byte[] utf8, Map<List<Integer>, Integer> ranks, double p, SplittableRandom r) {
    List<Integer> syms = new ArrayList<>();
    for (byte b : utf8) {
      syms.add(b & 0xFF);
    }
    while (true) {
      int bestAt = -1;
      int bestRank = Integer.MAX_VALUE;
      for (int i = 0; i + 1 < syms.size(); i++) {
        Integer rank = ranks.get(List.of(syms.get(i), syms.get(i + 1)));
        if (rank == null || r.nextDouble() < p) {
          continue;
        }
        if (rank < bestRank) {
          bestRank = rank;
          bestAt = i;
        }
      }
      if (bestAt < 0) {
        break;
      }
      syms.set(bestAt, 256 + bestRank);
      syms.remove(bestAt + 1);
    }
    return syms.stream().mapToInt(Integer::intValue).toArray();
  }

  @Test
  void badOptionsNameTheSetting() {
    BpeSegmenter model = Fixtures.europarlModel();
    BpeLearnerTest.assertMessage("cacheEntries=-1", () -> model.withCacheEntries(-1));
    BpeLearnerTest.assertMessage("dropout=1.5", () -> model.withDropout(1.5, 0));
    BpeLearnerTest.assertMessage("dropout=NaN", () -> model.withDropout(Double.NaN, 0));
    assertThrows(IndexOutOfBoundsException.class, () -> model.segment("quay", 2, 9, (i, s, e) -> {}));
    assertNotEquals(0.0, model.withDropout(0.5, 0).dropout());
  }
}
