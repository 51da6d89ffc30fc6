package dev.morsel.tokenize.train;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.PieceSink;
import dev.morsel.tokenize.split.Splitting;
import it.unimi.dsi.fastutil.objects.Object2LongMap;
import it.unimi.dsi.fastutil.objects.Object2LongOpenHashMap;
import it.unimi.dsi.fastutil.objects.ObjectIterator;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collection;
import java.util.Iterator;
import java.util.List;
import java.util.Objects;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.stream.Stream;

/**
 * Counts pieces for training: normalizes and splits texts exactly as encoding does
 * ({@code pipeline.normalization().apply(text).text()}, then {@code pipeline.splitting()}), in
 * parallel, within a memory budget. The counts record the pipeline ({@link PieceCounts#pipeline()}),
 * so the tokenizer a learner makes from them encodes with it. Immutable and thread-safe; each call is independent.
 *
 * <h2>Parallelism and determinism</h2>
 * Texts are read in order by the calling thread and dealt out in fixed batches of
 * {@value #BATCH} texts: within each round of {@code threads × BATCH} texts, worker {@code w} gets
 * batch {@code w}. Each worker counts into its own map; the maps are added together at the end.
 * Without pruning the counts are exact and do not depend on the thread count. With pruning they
 * are deterministic for a given thread count and input order, but <b>do depend on the thread
 * count</b>, because each worker prunes its own map.
 *
 * <h2>Memory budget</h2>
 * {@code maxDistinctPieces} (default {@value #DEFAULT_MAX_DISTINCT_PIECES}) bounds each worker's
 * map and the merged map. When a map grows past it, the rarest pieces are dropped: the smallest
 * count floor is found such that removing every piece with a count at or below it leaves at most
 * three quarters of the budget, and those pieces are removed (ties go together, so the result does
 * not depend on hash order). A piece seen again later starts from zero, so after pruning the counts
 * are <b>approximate lower bounds</b>; {@link CountReport} tells how many entries and occurrences
 * were dropped. Peak memory is about {@code (threads + 1) × maxDistinctPieces} map entries plus
 * the pieces' strings.
 *
 * <h2>Files</h2>
 * {@link #countFiles} reads one text per line (LF or CRLF), strictly as UTF-8; a name ending in
 * {@code .gz} is gunzipped. Bytes that are not UTF-8 raise a {@link CorpusException} naming the
 * file, byte offset and line.
 *
 * <h2>Progress</h2>
 * The listener hears {@code ("count", textsDone, total or -1, detail)} from the calling thread after
 * every round and once at the end; {@code total} is known for a {@link Collection} of texts only.
 *
 * @since 0.1.0
 */
public final class PieceCounter {
  // ---------------------------------------------------------------- configuration

  /** Default bound on distinct pieces per map: 4,000,000 entries, roughly 0.5 GB with the strings. */
  public static final int DEFAULT_MAX_DISTINCT_PIECES = 4_000_000;
  /** Texts per batch handed to one worker; large enough that hand-off costs vanish per text. */
  static final int BATCH = 256;
  /** Upper limit of {@code threads}: far beyond any core count, catches unit mix-ups. */
  static final int MAX_THREADS = 4096;

  private final Pipeline pipeline; // null: Pipeline.defaults(), resolved per call
  private final int threads;
  private final int maxDistinctPieces;
  private final TrainingListener listener;

  // ---------------------------------------------------------------- life-cycle

  private PieceCounter(Builder b) {
    this.pipeline = b.pipeline;
    this.threads = b.threads;
    this.maxDistinctPieces = b.maxDistinctPieces;
    this.listener = b.listener;
  }

  /** A builder with the default pipeline, all cores, and the default budget. */
  public static Builder builder() {
    return new Builder();
  }

  // ---------------------------------------------------------------- API

  /** Counts the pieces of every text. */
  public PieceCounts count(Iterable<? extends CharSequence> texts) {
    return tally(texts).counts();
  }

  /** Counts the pieces of every text of the stream (the stream is consumed and closed). */
  public PieceCounts count(Stream<? extends CharSequence> texts) {
    Objects.requireNonNull(texts, "texts");
    try (texts) {
      return run(texts.iterator(), -1).counts();
    }
  }

  /**
   * Counts the pieces of every line of every file (UTF-8, {@code .gz} by name).
   *
   * @throws CorpusException for bytes that are not UTF-8, naming file, byte offset and line
   * @throws java.io.UncheckedIOException if a file cannot be read
   */
  public PieceCounts countFiles(Collection<Path> files) {
    return tallyFiles(files).counts();
  }

  /**
   * Like {@link #count(Iterable)}, with the number of texts and what pruning dropped.
   *
   * @since 0.1.0
   */
  public CountReport tally(Iterable<? extends CharSequence> texts) {
    Objects.requireNonNull(texts, "texts");
    long total = texts instanceof Collection ? ((Collection<?>) texts).size() : -1;
    return run(texts.iterator(), total);
  }

  /**
   * Like {@link #countFiles(Collection)}, with the number of lines and what pruning dropped.
   *
   * @since 0.1.0
   */
  public CountReport tallyFiles(Collection<Path> files) {
    Objects.requireNonNull(files, "files");
    List<Path> list = new ArrayList<>(files);
    for (int i = 0; i < list.size(); i++) {
      Objects.requireNonNull(list.get(i), "files[" + i + "]");
    }
    try (Utf8Lines lines = new Utf8Lines(list)) {
      return run(lines, -1);
    }
  }

  /** The pipeline used, {@link Pipeline#defaults()} unless set. */
  public Pipeline pipeline() {
    return pipeline != null ? pipeline : Pipeline.defaults();
  }

  /** The number of worker threads. */
  public int threads() {
    return threads;
  }

  /** The bound on distinct pieces per map. */
  public int maxDistinctPieces() {
    return maxDistinctPieces;
  }

  // ---------------------------------------------------------------- internals

  private CountReport run(Iterator<? extends CharSequence> texts, long total) {
    Pipeline p = pipeline();
    Worker[] workers = new Worker[threads];
    for (int w = 0; w < threads; w++) {
      workers[w] = new Worker(p.normalization(), p.splitting(), maxDistinctPieces);
    }
    long done = threads == 1 ? runInline(texts, workers[0], total) : runParallel(texts, workers, total);
    Worker merged = workers[0];
    for (int w = 1; w < threads; w++) {
      merged.absorb(workers[w]);
      workers[w] = null;
    }
    merged.pruneIfOver();
    listener.progress("count", done, total, detail(merged));
    return new CountReport(toCounts(p, merged.map), done, merged.droppedPieces, merged.droppedOccurrences);
  }

  private long runInline(Iterator<? extends CharSequence> texts, Worker worker, long total) {
    long done = 0;
    while (texts.hasNext()) {
      worker.add(requireText(texts.next(), done));
      if (++done % BATCH == 0) {
        listener.progress("count", done, total, "");
      }
    }
    return done;
  }

  private long runParallel(Iterator<? extends CharSequence> texts, Worker[] workers, long total) {
    ExecutorService pool = Executors.newFixedThreadPool(workers.length, r -> {
      Thread t = new Thread(r, "morsel-piece-counter");
      t.setDaemon(true);
      return t;
    });
    try {
      long done = 0;
      List<CharSequence> round = readRound(texts, workers.length, done);
      List<Future<?>> running = new ArrayList<>(workers.length);
      while (!round.isEmpty()) {
        running.clear();
        for (int w = 0; w < workers.length; w++) {
          int from = w * BATCH;
          if (from >= round.size()) {
            break;
          }
          List<CharSequence> batch = round.subList(from, Math.min(round.size(), from + BATCH));
          Worker worker = workers[w];
          running.add(pool.submit(() -> worker.addAll(batch)));
        }
        long next = done + round.size();
        List<CharSequence> following = readRound(texts, workers.length, next); // overlaps the work
        awaitAll(running);
        done = next;
        listener.progress("count", done, total, dropDetail(workers));
        round = following;
      }
      return done;
    } finally {
      pool.shutdownNow();
    }
  }

  private static List<CharSequence> readRound(Iterator<? extends CharSequence> texts, int workers, long done) {
    int size = workers * BATCH;
    List<CharSequence> round = new ArrayList<>(size);
    while (round.size() < size && texts.hasNext()) {
      round.add(requireText(texts.next(), done + round.size()));
    }
    return round;
  }

  private static void awaitAll(List<Future<?>> running) {
    RuntimeException failure = null;
    for (Future<?> f : running) {
      try {
        f.get();
      } catch (ExecutionException e) {
        Throwable c = e.getCause();
        if (c instanceof Error) {
          throw (Error) c;
        }
        if (failure == null) {
          failure = c instanceof RuntimeException ? (RuntimeException) c : new IllegalStateException(c);
        }
      } catch (InterruptedException e) {
        Thread.currentThread().interrupt();
        throw new IllegalStateException("interrupted while counting pieces", e);
      }
    }
    if (failure != null) {
      throw failure;
    }
  }

  private static CharSequence requireText(CharSequence text, long index) {
    if (text == null) {
      throwNullText(index);
    }
    return text;
  }

  private static void throwNullText(long index) {
    throw new NullPointerException("text " + index + " is null");
  }

  private static String detail(Worker w) {
    return w.droppedPieces == 0 ? "" : "pruned: dropped " + w.droppedPieces + " pieces, " + w.droppedOccurrences + " occurrences";
  }

  private static String dropDetail(Worker[] workers) {
    long pieces = 0;
    for (Worker w : workers) {
      pieces += w.droppedPieces;
    }
    return pieces == 0 ? "" : "pruned: dropped " + pieces + " pieces so far";
  }

  private static PieceCounts toCounts(Pipeline pipeline, Object2LongOpenHashMap<String> map) {
    String[] pieces = new String[map.size()];
    long[] counts = new long[pieces.length];
    int i = 0;
    for (ObjectIterator<Object2LongMap.Entry<String>> it = map.object2LongEntrySet().fastIterator(); it.hasNext(); ) {
      Object2LongMap.Entry<String> e = it.next();
      pieces[i] = e.getKey();
      counts[i++] = e.getLongValue();
    }
    return PieceCounts.of(pipeline, pieces, counts);
  }

  /** One worker's counts; used by one thread at a time. */
  static final class Worker implements PieceSink {
    /** Fraction of the budget kept after a pruning pass, as numerator/denominator: 3/4 leaves room
     *  for a quarter of the budget before the next pass, so passes amortize to O(1) per piece. */
    private static final int KEEP_NUM = 3;
    private static final int KEEP_DEN = 4;

    final Object2LongOpenHashMap<String> map = new Object2LongOpenHashMap<>();
    private final Normalization normalization;
    private final Splitting splitting;
    private final int max;
    private String text;
    long droppedPieces;
    long droppedOccurrences;

    Worker(Normalization normalization, Splitting splitting, int max) {
      this.normalization = normalization;
      this.splitting = splitting;
      this.max = max;
    }

    void addAll(List<CharSequence> texts) {
      for (CharSequence t : texts) {
        add(t);
      }
    }

    void add(CharSequence raw) {
      String t = normalization.apply(raw).text();
      text = t;
      splitting.split(t, 0, t.length(), this);
      text = null;
    }

    @Override
    public void piece(int start, int end) {
      map.addTo(text.substring(start, end), 1);
      if (map.size() > max) {
        prune();
      }
    }

    void absorb(Worker other) {
      for (ObjectIterator<Object2LongMap.Entry<String>> it = other.map.object2LongEntrySet().fastIterator(); it.hasNext(); ) {
        Object2LongMap.Entry<String> e = it.next();
        map.addTo(e.getKey(), e.getLongValue());
      }
      droppedPieces += other.droppedPieces;
      droppedOccurrences += other.droppedOccurrences;
    }

    void pruneIfOver() {
      if (map.size() > max) {
        prune();
      }
    }

    /** Removes every piece whose count is at or below the smallest floor that gets to 3/4 of the budget. */
    private void prune() {
      int n = map.size();
      int keep = (int) ((long) max * KEEP_NUM / KEEP_DEN);
      long[] counts = new long[n];
      int i = 0;
      for (ObjectIterator<Object2LongMap.Entry<String>> it = map.object2LongEntrySet().fastIterator(); it.hasNext(); ) {
        counts[i++] = it.next().getLongValue();
      }
      Arrays.sort(counts);
      long floor = counts[n - keep - 1];
      for (ObjectIterator<Object2LongMap.Entry<String>> it = map.object2LongEntrySet().fastIterator(); it.hasNext(); ) {
        long c = it.next().getLongValue();
        if (c <= floor) {
          it.remove();
          droppedPieces++;
          droppedOccurrences += c;
        }
      }
      map.trim();
    }
  }

  // ---------------------------------------------------------------- builder

  /** Builder; not thread-safe. Defaults: {@link Pipeline#defaults()}, all available processors,
   *  {@value #DEFAULT_MAX_DISTINCT_PIECES} distinct pieces, no listener.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private Pipeline pipeline;
    private int threads = Runtime.getRuntime().availableProcessors();
    private int maxDistinctPieces = DEFAULT_MAX_DISTINCT_PIECES;
    private TrainingListener listener = TrainingListener.NONE;

    private Builder() {}

    /** The normalization and splitting to count with; default {@link Pipeline#defaults()}. */
    public Builder pipeline(Pipeline pipeline) {
      this.pipeline = Objects.requireNonNull(pipeline, "pipeline");
      return this;
    }

    /**
     * Worker threads, 1..4096; default the number of available processors. With 1, counting runs
     * in the calling thread.
     *
     * @throws IllegalArgumentException outside 1..4096, naming {@code threads}
     */
    public Builder threads(int threads) {
      if (threads < 1 || threads > MAX_THREADS) {
        throw new IllegalArgumentException("threads=" + threads + " is outside 1.." + MAX_THREADS);
      }
      this.threads = threads;
      return this;
    }

    /**
     * Bound on distinct pieces per map, at least 1; default {@value #DEFAULT_MAX_DISTINCT_PIECES}.
     * Past it the rarest pieces are dropped and counts become lower bounds.
     *
     * @throws IllegalArgumentException if below 1, naming {@code maxDistinctPieces}
     */
    public Builder maxDistinctPieces(int max) {
      if (max < 1) {
        throw new IllegalArgumentException("maxDistinctPieces=" + max + " must be at least 1");
      }
      this.maxDistinctPieces = max;
      return this;
    }

    /** Progress listener; default {@link TrainingListener#NONE}. */
    public Builder listener(TrainingListener listener) {
      this.listener = Objects.requireNonNull(listener, "listener");
      return this;
    }

    /** A counter with these settings. */
    public PieceCounter build() {
      return new PieceCounter(this);
    }
  }
}
