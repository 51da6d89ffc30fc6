package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.lang.management.ManagementFactory;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

/**
 * Memory figures, measured in the summary's own JVM (they count bytes, not time, so JMH adds
 * nothing):
 * <ul>
 *   <li>{@code first_encode_bytes_<scheme>}: bytes allocated by the first encode of an 80-char text
 *       on a newly started thread, read from {@code ThreadMXBean.getThreadAllocatedBytes} of that
 *       thread around the call; the tokenizer was used before on another thread (as in a service),
 *       and the figure is the median of {@value #FIRST_ENCODE_THREADS} threads. The result object
 *       itself is included.
 *   <li>{@code reload_retained_kib}: heap retained per cycle of load-from-bytes (BPE 32k) + encode of
 *       {@value #RELOAD_BODIES} bodies on each of 2 long-lived threads + drop, averaged over
 *       {@value #RELOAD_CYCLES} cycles: used heap after full collections after the cycles minus
 *       before them (after {@value #RELOAD_WARM} warm-up cycles).
 * </ul>
 */
final class MemoryProbes {
  static final int FIRST_ENCODE_THREADS = 9;
  static final int RELOAD_CYCLES = 200;
  static final int RELOAD_WARM = 10;
  static final int RELOAD_BODIES = 20;

  private MemoryProbes() {}

  /** The first 80 chars of the first body longer than that. */
  static String text80() {
    for (String b : Corpus.bodies()) {
      if (b.length() >= 80) {
        return b.substring(0, 80);
      }
    }
    throw new IllegalStateException("no body of 80 chars");
  }

  /** Median bytes allocated by the first encode of {@link #text80()} on a fresh thread. */
  static double firstEncodeBytes(Tokenizer t) {
    com.sun.management.ThreadMXBean mx = (com.sun.management.ThreadMXBean) ManagementFactory.getThreadMXBean();
    mx.setThreadAllocatedMemoryEnabled(true);
    String text = text80();
    for (int i = 0; i < 1000; i++) {
      t.encode(text); // warm: the tokenizer is in use, the code is compiled
    }
    long[] got = new long[FIRST_ENCODE_THREADS];
    for (int k = 0; k < got.length; k++) {
      long[] box = new long[1];
      Thread th = new Thread(() -> {
        long id = Thread.currentThread().getId();
        long before = mx.getThreadAllocatedBytes(id);
        Object r = t.encode(text);
        long after = mx.getThreadAllocatedBytes(id);
        box[0] = after - before + (r == null ? 1 : 0);
      });
      th.start();
      try {
        th.join();
      } catch (InterruptedException e) {
        Thread.currentThread().interrupt();
        throw new IllegalStateException(e);
      }
      got[k] = box[0];
    }
    Arrays.sort(got);
    return got[got.length / 2];
  }

  /** KiB retained per load-encode-drop cycle of the model in {@code file}. */
  static double reloadRetainedKib(Path file) {
    byte[] model;
    try {
      model = Files.readAllBytes(file);
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    List<String> in = Corpus.bodies().subList(0, RELOAD_BODIES);
    ExecutorService pool = Executors.newFixedThreadPool(2);
    try {
      for (int c = 0; c < RELOAD_WARM; c++) {
        cycle(Tokenizers.load(model), in, pool);
      }
      long before = settledHeap();
      for (int c = 0; c < RELOAD_CYCLES; c++) {
        cycle(Tokenizers.load(model), in, pool);
      }
      long after = settledHeap();
      return (after - before) / 1024.0 / RELOAD_CYCLES;
    } finally {
      pool.shutdownNow();
    }
  }

  private static void cycle(Tokenizer t, List<String> in, ExecutorService pool) {
    List<Future<?>> fs = new ArrayList<>();
    for (int w = 0; w < 2; w++) {
      fs.add(pool.submit(() -> {
        for (String s : in) {
          t.encode(s);
        }
      }));
    }
    try {
      for (Future<?> f : fs) {
        f.get();
      }
    } catch (Exception e) {
      throw new IllegalStateException(e);
    }
  }

  /** Used heap after full collections: the lowest of a few readings. */
  static long settledHeap() {
    long best = Long.MAX_VALUE;
    for (int i = 0; i < 5; i++) {
      System.gc();
      try {
        Thread.sleep(50);
      } catch (InterruptedException e) {
        Thread.currentThread().interrupt();
        break;
      }
      best = Math.min(best, ManagementFactory.getMemoryMXBean().getHeapMemoryUsage().getUsed());
    }
    return best;
  }
}
