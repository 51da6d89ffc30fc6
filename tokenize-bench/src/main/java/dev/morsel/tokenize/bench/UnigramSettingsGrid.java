package dev.morsel.tokenize.bench;

import com.sun.management.GarbageCollectionNotificationInfo;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.unigram.UnigramLearner;
import java.io.IOException;
import java.io.PrintStream;
import java.io.UncheckedIOException;
import java.lang.management.GarbageCollectorMXBean;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.lang.management.MemoryUsage;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.Paths;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.atomic.AtomicLong;
import java.util.function.UnaryOperator;
import javax.management.NotificationEmitter;
import javax.management.NotificationListener;
import javax.management.openmbean.CompositeData;

/**
 * The measurement that chose the defaults of the unigram learner's seed and pruning settings
 * ({@code candidateMultiple}, {@code keepShare}, {@code emPasses}, {@code maxTokenCodePoints},
 * {@code seedTableLimit}): trains unigram models on the Europarl sample ({@link Corpus}) and
 * measures each on held-out lines. One setting at a time is varied while the others stay at the
 * grid's centre; the learner's own defaults are measured last as one more row (values in the
 * order candidateMultiple, keepShare, emPasses, maxTokenCodePoints, seedTableLimit).
 *
 * <p>Usage, from the repository root (about 15 minutes on 2 cores):
 *
 * <pre>
 * ./mvnw -B -q -pl tokenize-bench -am package -DskipTests
 * java -Xmx4g -cp tokenize-bench/target/morsel-bench.jar dev.morsel.tokenize.bench.UnigramSettingsGrid \
 *     [--lines 6000] [--held-out-every 10] [--size 8000] [--threads 2] [--repeat 2] [--only SETTING] [--out FILE]
 * </pre>
 *
 * <p>Data: the first {@code --lines} bodies of the corpus; of those, body {@code i} (0-based) is
 * held out when {@code i % every == every - 1}, the rest train. Pipeline: {@link Models#pipeline()}.
 *
 * <p>Figures per row:
 * <ul>
 *   <li><b>tokens/word</b>: tokens of the held-out bodies divided by their whitespace-separated
 *       words. Training is deterministic, so this figure has no run-to-run noise.
 *   <li><b>train ms</b>: wall time of {@code train(counts)} alone (piece counting is done once).
 *       The shortest of {@code --repeat} runs (the machine is shared); the centre row measured again
 *       at the end shows the timing noise that remains.
 *   <li><b>CPU ms</b>: CPU time of the whole process during {@code train(counts)} (all threads,
 *       the collector's and the compiler's included), the shortest of the runs: the cost figure,
 *       since unlike wall time it hardly moves with the load from other processes.
 *   <li><b>peak MB</b>: the largest heap in use right after any collection during training
 *       (garbage-collection notifications, the used size of all heap pools after the collection),
 *       which is the live set at that moment, less the heap in use after the collection just before
 *       the run (the corpus and counts the tool itself holds); a lower bound of the training's
 *       own peak, since a collection may miss the moment of the largest live set. {@code pool peak MB} is the sum of the heap
 *       pools' peak usage ({@link MemoryPoolMXBean#getPeakUsage()}, reset before each run), which
 *       includes garbage not yet collected and so depends on the collector's timing (the same
 *       heap before the run is subtracted); an upper bound.
 *   <li><b>load</b>: the machine's one-minute load average after the row's runs (the highest of
 *       them), so that a slow time can be read against what else was running.
 * </ul>
 */
public final class UnigramSettingsGrid {

  /** One point of the grid: a label and the settings applied on top of the builder. */
  record Point(String setting, String value, UnaryOperator<UnigramLearner.Builder> apply) {}

  /** One measured row. */
  record Row(String setting, String value, double tokensPerWord, long trainMillis, long cpuMillis, long peakLiveMb,
      long poolPeakMb, int vocabularySize, double load) {}

  // centre of the grid: each setting is varied around this point while the others keep these values
  static final int CENTRE_MULTIPLE = 8;
  static final double CENTRE_KEEP = 0.7;
  static final int CENTRE_PASSES = 2;
  static final int CENTRE_CODE_POINTS = 16;
  static final int CENTRE_TABLE = 1_000_000;

  private UnigramSettingsGrid() {}

  /** The grid, in report order: one setting at a time around the centre, then a few combinations. */
  static List<Point> grid() {
    List<Point> g = new ArrayList<>();
    g.add(new Point("centre", "", b -> b));
    for (int v : new int[] {2, 4, 12, 16, 24}) {
      g.add(new Point("candidateMultiple", Integer.toString(v), b -> b.candidateMultiple(v)));
    }
    for (double v : new double[] {0.5, 0.6, 0.8, 0.9}) {
      g.add(new Point("keepShare", Double.toString(v), b -> b.keepShare(v)));
    }
    for (int v : new int[] {1, 3, 4}) {
      g.add(new Point("emPasses", Integer.toString(v), b -> b.emPasses(v)));
    }
    for (int v : new int[] {8, 10, 12, 24}) {
      g.add(new Point("maxTokenCodePoints", Integer.toString(v), b -> b.maxTokenCodePoints(v)));
    }
    for (int v : new int[] {250_000, 500_000, 750_000, 2_000_000}) {
      g.add(new Point("seedTableLimit", Integer.toString(v), b -> b.seedTableLimit(v)));
    }
    // combinations of the values that did best one at a time (candidateMultiple, keepShare, emPasses,
    // maxTokenCodePoints; seedTableLimit 2,000,000): gains measured one at a time need not add up
    int[][] ints = {{12, 3, 12}, {12, 3, 24}, {8, 3, 24}, {12, 4, 24}, {12, 3, 24}};
    double[] shares = {0.7, 0.7, 0.7, 0.7, 0.8};
    for (int i = 0; i < ints.length; i++) {
      int m = ints[i][0];
      int passes = ints[i][1];
      int cps = ints[i][2];
      double share = shares[i];
      g.add(new Point("combined", String.format(Locale.ROOT, "%d, %s, %d, %d, 2,000,000", m, share, passes, cps),
          b -> b.candidateMultiple(m).keepShare(share).emPasses(passes).maxTokenCodePoints(cps).seedTableLimit(2_000_000)));
    }
    g.add(new Point("centre", "(repeat)", b -> b));
    return g;
  }

  static UnigramLearner.Builder centre(int size, int threads) {
    // byte spelling off and every character in the alphabet, as when the grid was measured (docs/unigram.md)
    return UnigramLearner.builder().vocabularySize(size).threads(threads).byteSpelling(false)
        .alphabet(dev.morsel.tokenize.train.AlphabetPolicy.of(1.0, Integer.MAX_VALUE)).candidateMultiple(CENTRE_MULTIPLE)
        .keepShare(CENTRE_KEEP).emPasses(CENTRE_PASSES).maxTokenCodePoints(CENTRE_CODE_POINTS)
        .seedTableLimit(CENTRE_TABLE);
  }

  /**
   * Runs the grid.
   *
   * @param args {@code [--lines N] [--held-out-every N] [--size N] [--threads N] [--repeat N] [--only SETTING]
   *     [--out FILE]}; {@code --only} runs the centre and one setting's rows ({@code combined}: the
   *     combinations; a name of no setting: the centre alone); the learner's defaults always come last
   */
  public static void main(String[] args) {
    int lines = 6000;
    int every = 10;
    int size = 8000;
    int threads = 2;
    int repeat = 2;
    String only = null;
    Path out = null;
    for (int i = 0; i < args.length; i++) {
      String a = args[i];
      if (i + 1 >= args.length) {
        throw new IllegalArgumentException("option " + a + " needs a value");
      }
      String v = args[++i];
      switch (a) {
        case "--lines" -> lines = Integer.parseInt(v);
        case "--held-out-every" -> every = Integer.parseInt(v);
        case "--size" -> size = Integer.parseInt(v);
        case "--threads" -> threads = Integer.parseInt(v);
        case "--repeat" -> repeat = Integer.parseInt(v);
        case "--only" -> only = v;
        case "--out" -> out = Paths.get(v);
        default -> throw new IllegalArgumentException("unknown option " + a);
      }
    }
    List<String> bodies = Corpus.bodies();
    lines = Math.min(lines, bodies.size());
    List<String> train = new ArrayList<>();
    List<String> held = new ArrayList<>();
    for (int i = 0; i < lines; i++) {
      (i % every == every - 1 ? held : train).add(bodies.get(i));
    }
    Pipeline pipeline = Models.pipeline();
    PieceCounts counts = PieceCounter.builder().pipeline(pipeline).threads(threads).build().count(train);
    long words = 0;
    for (String s : held) {
      words += words(s);
    }
    System.err.printf(Locale.ROOT, "%d bodies: %d train (%d distinct pieces), %d held out (%d words, %d bytes)%n", lines,
        train.size(), counts.size(), held.size(), words, Corpus.utf8Bytes(held));

    PeakLive peak = new PeakLive();
    // warm-up, not reported: compiles the training and encoding paths before the first timed run
    measure(new Point("warm-up", "", b -> b), centre(Math.max(1000, size / 4), threads), counts, pipeline, held, words,
        peak, 1);
    List<Row> rows = new ArrayList<>();
    for (Point p : grid()) {
      if (only != null && !p.setting().equals("centre") && !p.setting().equals(only)) {
        continue;
      }
      Row r = measure(p, p.apply().apply(centre(size, threads)), counts, pipeline, held, words, peak, repeat);
      rows.add(r);
      System.err.printf(Locale.ROOT, "%-20s %-26s %.4f tokens/word, %d ms, %d CPU ms, %d MB%n", r.setting(), r.value(),
          r.tokensPerWord(), r.trainMillis(), r.cpuMillis(), r.peakLiveMb());
    }
    rows.add(measure(new Point("learner defaults", defaultsLabel(), b -> b),
        UnigramLearner.builder().vocabularySize(size).threads(threads).byteSpelling(false), counts, pipeline, held, words, peak,
        repeat));

    StringBuilder md = new StringBuilder();
    md.append(String.format(Locale.ROOT, "Europarl sample, first %d bodies: %d train (%d distinct pieces), %d held out"
        + " (every %d-th, %d words); vocabulary %d ids; %d threads; best of %d runs; Java %s, %d MB max heap%n%n", lines,
        train.size(), counts.size(), held.size(), every, words, size, threads, repeat, System.getProperty("java.version"),
        Runtime.getRuntime().maxMemory() >> 20));
    md.append("| setting | value | held-out tokens/word | vs centre | train ms | CPU ms | peak MB (live) | pool peak MB"
        + " | load |\n");
    md.append("|---|---|---|---|---|---|---|---|---|\n");
    double base = rows.get(0).tokensPerWord();
    for (Row r : rows) {
      md.append(String.format(Locale.ROOT, "| %s | %s | %.4f | %+.2f %% | %,d | %,d | %,d | %,d | %.1f |%n", r.setting(),
          r.value().isEmpty() && r.setting().equals("centre") ? centreLabel() : r.value(), r.tokensPerWord(),
          100 * (r.tokensPerWord() / base - 1), r.trainMillis(), r.cpuMillis(), r.peakLiveMb(), r.poolPeakMb(),
          r.load()));
    }
    System.out.print(md);
    if (out != null) {
      try {
        Files.writeString(out, md, StandardCharsets.UTF_8);
      } catch (IOException e) {
        throw new UncheckedIOException("cannot write " + out, e);
      }
    }
  }

  private static String defaultsLabel() {
    return String.format(Locale.ROOT, "%d, %s, %d, %d, %,d", UnigramLearner.DEFAULT_CANDIDATE_MULTIPLE,
        UnigramLearner.DEFAULT_KEEP_SHARE, UnigramLearner.DEFAULT_EM_PASSES, UnigramLearner.DEFAULT_MAX_TOKEN_CODE_POINTS,
        UnigramLearner.DEFAULT_SEED_TABLE_LIMIT);
  }

  private static String centreLabel() {
    return String.format(Locale.ROOT, "%d, %s, %d, %d, %,d", CENTRE_MULTIPLE, CENTRE_KEEP, CENTRE_PASSES,
        CENTRE_CODE_POINTS, CENTRE_TABLE);
  }

  /** Trains {@code repeat} times: the shortest time, the largest live peak and the smallest pool peak. */
  private static Row measure(Point p, UnigramLearner.Builder b, PieceCounts counts, Pipeline pipeline, List<String> held,
      long words, PeakLive peak, int repeat) {
    Row best = null;
    for (int i = 0; i < repeat; i++) {
      Row r = measureOnce(p, b, counts, pipeline, held, words, peak);
      best = best == null ? r : new Row(r.setting(), r.value(), r.tokensPerWord(),
          Math.min(best.trainMillis(), r.trainMillis()), Math.min(best.cpuMillis(), r.cpuMillis()),
          Math.max(best.peakLiveMb(), r.peakLiveMb()),
          Math.min(best.poolPeakMb(), r.poolPeakMb()), r.vocabularySize(), Math.max(best.load(), r.load()));
    }
    return best;
  }

  private static Row measureOnce(Point p, UnigramLearner.Builder b, PieceCounts counts, Pipeline pipeline,
      List<String> held, long words, PeakLive peak) {
    UnigramLearner learner = b.build();
    System.gc();
    System.gc();
    for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
      if (pool.getType() == MemoryType.HEAP) {
        pool.resetPeakUsage();
      }
    }
    long before = heapUsed();
    peak.reset();
    long cpu0 = processCpuNanos();
    long t0 = System.nanoTime();
    Tokenizer t = learner.train(counts); // encodes with the counted pipeline
    long millis = (System.nanoTime() - t0) / 1_000_000;
    long cpuMillis = (processCpuNanos() - cpu0) / 1_000_000;
    long live = Math.max(0, peak.get() - before);
    long poolPeak = 0;
    for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
      if (pool.getType() == MemoryType.HEAP && pool.getPeakUsage() != null) {
        poolPeak += pool.getPeakUsage().getUsed();
      }
    }
    poolPeak = Math.max(0, poolPeak - before);
    long tokens = 0;
    for (String s : held) {
      tokens += t.encode(s).size();
    }
    return new Row(p.setting(), p.value(), (double) tokens / words, millis, cpuMillis, live >> 20, poolPeak >> 20,
        t.vocabularySize(), ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage());
  }

  private static long processCpuNanos() {
    return ((com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean()).getProcessCpuTime();
  }

  private static long heapUsed() {
    return ManagementFactory.getMemoryMXBean().getHeapMemoryUsage().getUsed();
  }

  /** Whitespace-separated words (the same rule as the CLI's sweep report). */
  static long words(String s) {
    long n = 0;
    boolean in = false;
    for (int i = 0; i < s.length(); i++) {
      boolean space = Character.isWhitespace(s.charAt(i));
      if (!space && !in) {
        n++;
      }
      in = !space;
    }
    return n;
  }

  /** The largest heap use seen right after a collection since the last {@link #reset}. */
  static final class PeakLive {
    private final AtomicLong max = new AtomicLong();

    PeakLive() {
      NotificationListener l = (n, handback) -> {
        if (!GarbageCollectionNotificationInfo.GARBAGE_COLLECTION_NOTIFICATION.equals(n.getType())) {
          return;
        }
        GarbageCollectionNotificationInfo info = GarbageCollectionNotificationInfo.from((CompositeData) n.getUserData());
        long used = 0;
        for (Map.Entry<String, MemoryUsage> e : info.getGcInfo().getMemoryUsageAfterGc().entrySet()) {
          if (heapPool(e.getKey())) {
            used += e.getValue().getUsed();
          }
        }
        max.accumulateAndGet(used, Math::max);
      };
      for (GarbageCollectorMXBean gc : ManagementFactory.getGarbageCollectorMXBeans()) {
        ((NotificationEmitter) gc).addNotificationListener(l, null, null);
      }
    }

    private static boolean heapPool(String name) {
      for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
        if (pool.getName().equals(name)) {
          return pool.getType() == MemoryType.HEAP;
        }
      }
      return false;
    }

    void reset() {
      max.set(0);
    }

    long get() {
      return max.get();
    }
  }
}
