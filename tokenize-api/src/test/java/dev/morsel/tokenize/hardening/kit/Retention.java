package dev.morsel.tokenize.hardening.kit;

import dev.morsel.tokenize.Limits;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;

/**
 * Heap retained by tokenizers that are used and dropped. A service that reloads its model on a
 * schedule, or builds a copy per request, must not grow its heap: a tokenizer that nothing
 * references is garbage, however many threads used it and however long those threads live.
 *
 * <p>Method: the worker threads live through the whole run (retention through state kept per
 * thread shows only then); the heap is measured as used heap after {@link #settle() repeated full
 * collections}, once after a warm-up and once after the cycles, and the growth is the difference.
 * A design that keeps per-thread buffers per tokenizer retains hundreds of KiB a cycle and fails the
 * bound many times over.
 */
public final class Retention {
  private Retention() {}

  /** Used heap after full collections, in bytes: the lowest of a few settled readings. */
  public static long settle() {
    Runtime rt = Runtime.getRuntime();
    long best = Long.MAX_VALUE;
    for (int i = 0; i < 4; i++) {
      System.gc();
      try {
        Thread.sleep(20);
      } catch (InterruptedException e) {
        Thread.currentThread().interrupt();
        break;
      }
      best = Math.min(best, rt.totalMemory() - rt.freeMemory());
    }
    return best;
  }

  /**
   * {@code cycles} times: load a tokenizer from {@code model}, encode every input on each of
   * {@code threads} long-lived threads, drop it. Returns the heap growth in bytes over the cycles
   * (after {@code cycles / 10} warm-up cycles that are not counted).
   */
  public static long reloadGrowth(byte[] model, List<String> inputs, int threads, int cycles) throws Exception {
    ExecutorService pool = Executors.newFixedThreadPool(threads);
    try {
      int warm = Math.max(2, cycles / 10);
      for (int c = 0; c < warm; c++) {
        cycle(Tokenizers.load(model), inputs, threads, pool);
      }
      long before = settle();
      for (int c = 0; c < cycles; c++) {
        cycle(Tokenizers.load(model), inputs, threads, pool);
      }
      return settle() - before;
    } finally {
      pool.shutdownNow();
    }
  }

  /**
   * {@code copies} times: a {@code withLimits} and a {@code withTemplate} copy of {@code base}, each
   * encoding the inputs on each of {@code threads} long-lived threads, then dropped. Returns the heap
   * growth in bytes (after a warm-up of {@code copies / 10}).
   */
  public static long copyGrowth(Tokenizer base, List<String> inputs, int threads, int copies) throws Exception {
    ExecutorService pool = Executors.newFixedThreadPool(threads);
    try {
      int warm = Math.max(2, copies / 10);
      for (int c = 0; c < warm; c++) {
        copyCycle(base, c, inputs, threads, pool);
      }
      long before = settle();
      for (int c = 0; c < copies; c++) {
        copyCycle(base, c, inputs, threads, pool);
      }
      return settle() - before;
    } finally {
      pool.shutdownNow();
    }
  }

  private static void copyCycle(Tokenizer base, int c, List<String> inputs, int threads, ExecutorService pool)
      throws Exception {
    Tokenizer limited = base.withLimits(Limits.defaults().withMaxInputLength(1 << 20 | c));
    cycle(limited, inputs, threads, pool);
    Tokenizer framed = base.withTemplate(Template.none());
    cycle(framed, inputs, threads, pool);
  }

  private static void cycle(Tokenizer t, List<String> inputs, int threads, ExecutorService pool) throws Exception {
    List<Future<Integer>> fs = new ArrayList<>(threads);
    for (int w = 0; w < threads; w++) {
      fs.add(pool.submit(() -> {
        int n = 0;
        for (String s : inputs) {
          n += t.encode(s).size();
        }
        return n;
      }));
    }
    int first = -1;
    for (Future<Integer> f : fs) {
      int n = f.get(5, TimeUnit.MINUTES); // hang guard only
      if (first >= 0 && n != first) {
        throw new AssertionError("threads encoded the same inputs to " + first + " and " + n + " tokens");
      }
      first = n;
    }
  }
}
