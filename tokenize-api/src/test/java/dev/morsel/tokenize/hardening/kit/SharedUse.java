package dev.morsel.tokenize.hardening.kit;

import dev.morsel.tokenize.Decoding;
import dev.morsel.tokenize.StreamDecoder;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.atomic.AtomicReference;

/**
 * Many threads sharing one tokenizer: every thread encodes the same inputs in its own seeded order
 * for a bounded number of rounds, starting together behind a latch so that caches are contended,
 * and every result must equal the sequential result. Each thread also decodes its results with its
 * <em>own</em> {@link StreamDecoder} (the streaming decoder is per-caller state, see its Javadoc),
 * one id at a time, and must get the sequential batch decode.
 */
public final class SharedUse {
  private SharedUse() {}

  /** What one run checked. */
  public static final class Outcome {
    /** Encode results compared with the sequential ones. */
    public final long encodes;
    /** Stream decodes compared with the sequential batch decode. */
    public final long streamDecodes;

    Outcome(long encodes, long streamDecodes) {
      this.encodes = encodes;
      this.streamDecodes = streamDecodes;
    }
  }

  /**
   * Runs the check.
   *
   * @param shared the tokenizer all threads use
   * @param inputs the texts
   * @param expected sequential results (computed beforehand, ideally on another instance)
   * @param decoded sequential {@code decode(ids, true, REPLACE)} of each expected result
   */
  public static Outcome run(Tokenizer shared, List<String> inputs, List<Tokens> expected, List<String> decoded,
      int threads, int rounds, long seed) throws Exception {
    ExecutorService pool = Executors.newFixedThreadPool(threads);
    CountDownLatch start = new CountDownLatch(1);
    AtomicReference<String> failure = new AtomicReference<>();
    AtomicLong encodes = new AtomicLong();
    AtomicLong streams = new AtomicLong();
    List<Future<?>> futures = new ArrayList<>();
    try {
      for (int w = 0; w < threads; w++) {
        long threadSeed = Seeds.mix(seed + w);
        futures.add(pool.submit(() -> {
          start.await();
          SplittableRandom rnd = new SplittableRandom(threadSeed);
          int n = inputs.size();
          int[] order = new int[n];
          for (int r = 0; r < rounds && failure.get() == null; r++) {
            for (int i = 0; i < n; i++) {
              order[i] = i;
            }
            for (int i = n - 1; i > 0; i--) { // Fisher-Yates
              int j = rnd.nextInt(i + 1);
              int tmp = order[i];
              order[i] = order[j];
              order[j] = tmp;
            }
            for (int k = 0; k < n && failure.get() == null; k++) {
              int i = order[k];
              Tokens got = shared.encode(inputs.get(i));
              if (!got.equals(expected.get(i))) {
                failure.compareAndSet(null, "thread seed 0x" + Long.toHexString(threadSeed) + ", round " + r + ": "
                    + HardText.replay("shared encode", threadSeed, inputs.get(i)) + ": got " + got + ", expected "
                    + expected.get(i));
              }
              encodes.incrementAndGet();
              if ((k & 3) == 0) {
                StreamDecoder sd = shared.streamDecoder(true, Decoding.REPLACE);
                StringBuilder sb = new StringBuilder();
                for (int j = 0; j < got.size(); j++) {
                  sb.append(sd.accept(got.id(j)));
                }
                sb.append(sd.flush());
                if (!decoded.get(i).contentEquals(sb)) {
                  failure.compareAndSet(null, HardText.replay("per-thread stream decode", threadSeed, inputs.get(i)));
                }
                streams.incrementAndGet();
              }
            }
          }
          return null;
        }));
      }
      start.countDown();
      for (Future<?> f : futures) {
        f.get(10, TimeUnit.MINUTES); // hang guard only, never reached in a passing run
      }
    } finally {
      pool.shutdownNow();
    }
    if (failure.get() != null) {
      throw new AssertionError(failure.get());
    }
    return new Outcome(encodes.get(), streams.get());
  }

  /**
   * The whole concurrency check of one segmenter: sequential results and decodes from
   * {@code reference} (a separate instance, ideally cache-less), then {@link #run} on {@code shared},
   * then {@code rounds} parallel {@code encodeAll} batches on a {@code threads}-thread pool; all must
   * equal the sequential results. Counts go to {@code counts} under {@code label}.
   */
  public static void againstReference(Tokenizer shared, Tokenizer reference, List<String> inputs, int threads,
      int rounds, long seed, Counts counts, String label) throws Exception {
    List<Tokens> expected = new ArrayList<>();
    List<String> decoded = new ArrayList<>();
    for (String s : inputs) {
      Tokens t = reference.encode(s);
      expected.add(t);
      decoded.add(reference.decode(t.ids(), true, Decoding.REPLACE));
    }
    Outcome o = run(shared, inputs, expected, decoded, threads, rounds, seed);
    if (o.encodes != (long) threads * rounds * inputs.size()) {
      throw new AssertionError(label + ": " + o.encodes + " shared encodes, expected " + (long) threads * rounds * inputs.size());
    }
    counts.add(label + " shared encodes equal to sequential", o.encodes);
    counts.add(label + " per-thread stream decodes equal to batch decode", o.streamDecodes);
    ExecutorService pool = Executors.newFixedThreadPool(threads);
    try {
      for (int r = 0; r < rounds; r++) {
        List<Tokens> batch = shared.encodeAll(inputs, Trust.UNTRUSTED, pool);
        for (int i = 0; i < inputs.size(); i++) {
          if (!batch.get(i).equals(expected.get(i))) {
            throw new AssertionError(HardText.replay(label + " encodeAll on " + threads + " threads", i, inputs.get(i)));
          }
        }
        counts.add(label + " " + threads + "-thread batch results equal to sequential", inputs.size());
      }
    } finally {
      pool.shutdownNow();
    }
  }

  /**
   * Thread-per-request use: {@code threads} platform threads, each started for {@code perThread}
   * inputs and then ended, at most {@code parallel} alive at once, encode the inputs in a seeded
   * order; every result must equal the sequential {@code expected} one. A thread that never
   * encoded before sees the tokenizer for the first time: this checks that nothing a thread keeps
   * (or fails to keep) changes a result. Returns the number of encodes compared.
   */
  public static long freshThreads(Tokenizer shared, List<String> inputs, List<Tokens> expected, int threads,
      int perThread, int parallel, long seed) throws Exception {
    AtomicReference<String> failure = new AtomicReference<>();
    AtomicLong encodes = new AtomicLong();
    SplittableRandom rnd = new SplittableRandom(seed);
    List<Thread> alive = new ArrayList<>();
    for (int w = 0; w < threads && failure.get() == null; w++) {
      int[] picks = new int[perThread];
      for (int k = 0; k < perThread; k++) {
        picks[k] = rnd.nextInt(inputs.size());
      }
      int worker = w;
      Thread t = new Thread(() -> {
        for (int i : picks) {
          Tokens got = shared.encode(inputs.get(i));
          if (!got.equals(expected.get(i))) {
            failure.compareAndSet(null, "short-lived thread " + worker + " (seed 0x" + Long.toHexString(seed) + "): "
                + HardText.replay("fresh-thread encode", seed, inputs.get(i)) + ": got " + got + ", expected "
                + expected.get(i));
          }
          encodes.incrementAndGet();
        }
      }, "fresh-" + w);
      t.start();
      alive.add(t);
      if (alive.size() >= parallel) {
        alive.remove(0).join(TimeUnit.MINUTES.toMillis(5)); // hang guard only
      }
    }
    for (Thread t : alive) {
      t.join(TimeUnit.MINUTES.toMillis(5));
    }
    if (failure.get() != null) {
      throw new AssertionError(failure.get());
    }
    return encodes.get();
  }
}
