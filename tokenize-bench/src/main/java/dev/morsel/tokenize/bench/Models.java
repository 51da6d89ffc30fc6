package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.ReservedTokens;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.Paths;
import java.util.function.Supplier;

/**
 * The benchmark models, trained once on the whole Europarl body corpus and kept as model files in
 * {@code tokenize-bench/target/bench-models} (system property {@code morsel.bench.models}), so that
 * every JMH fork loads instead of retraining. All use {@link #pipeline()}: normalization off and the
 * class-run splitter, the same steps as the {@code split} floor, so that a segmenter's ratio to
 * {@code split} measures segmentation alone.
 */
public final class Models {
  /** BPE vocabulary size. */
  public static final int BPE_SIZE = 32_000;
  /** WordPiece vocabulary size. */
  public static final int WORDPIECE_SIZE = 30_000;
  /** Unigram vocabulary size. */
  public static final int UNIGRAM_SIZE = 32_000;

  private static volatile PieceCounts counts;

  private Models() {}

  /** Normalization off, class-run splitting. */
  public static Pipeline pipeline() {
    return Pipeline.of(Normalization.none(), Splitting.runs());
  }

  /** The same pipeline with splitting off: the adversarial inputs stay one piece. */
  public static Pipeline unsplit() {
    return Pipeline.of(Normalization.none(), Splitting.none());
  }

  /** Piece counts of the whole corpus with {@link #pipeline()}. */
  public static PieceCounts counts() {
    PieceCounts c = counts;
    if (c == null) {
      synchronized (Models.class) {
        c = counts;
        if (c == null) {
          c = PieceCounter.builder().pipeline(pipeline()).build().count(Corpus.bodies());
          counts = c;
        }
      }
    }
    return c;
  }

  /** The 32k BPE model file, trained on first use. */
  public static Path bpeFile() {
    return cached("bpe-32k.morsel", () -> {
      return Learners.learner("bpe", LearnerSettings.of(BPE_SIZE)).train(counts());
    });
  }

  /** The 32k BPE tokenizer. */
  public static Tokenizer bpe() {
    return Tokenizers.load(bpeFile());
  }


  /** The 30k WordPiece model file, trained on first use. */
  public static Path wordpieceFile() {
    return cached("wordpiece-30k.morsel", () -> {
      return Learners.learner("wordpiece", LearnerSettings.of(WORDPIECE_SIZE)).train(counts());
    });
  }

  /** The 30k WordPiece tokenizer. */
  public static Tokenizer wordpiece() {
    return Tokenizers.load(wordpieceFile());
  }


  /** The 32k unigram model file (byte spelling on), trained on first use. */
  public static Path unigramFile() {
    return cached("unigram-32k.morsel", () -> {
      long t0 = System.nanoTime();
      Tokenizer t = Learners.learner("unigram", LearnerSettings.of(UNIGRAM_SIZE), "byte-spelling=true").train(counts());
      System.err.printf(java.util.Locale.ROOT, "trained unigram %d in %.1f s, peak heap %d MB%n", UNIGRAM_SIZE,
          (System.nanoTime() - t0) / 1e9, peakHeapBytes() >> 20);
      return t;
    });
  }

  /** The 32k unigram tokenizer. */
  public static Tokenizer unigram() {
    return Tokenizers.load(unigramFile());
  }

  /** The sum of the heap memory pools' peak usage since the JVM started, in bytes. */
  static long peakHeapBytes() {
    long sum = 0;
    for (java.lang.management.MemoryPoolMXBean p : java.lang.management.ManagementFactory.getMemoryPoolMXBeans()) {
      if (p.getType() == java.lang.management.MemoryType.HEAP && p.getPeakUsage() != null) {
        sum += p.getPeakUsage().getUsed();
      }
    }
    return sum;
  }

  /** {@code t}'s model assembled with another pipeline, no reserved tokens and no framing. */
  public static Tokenizer with(Pipeline p, Tokenizer t) {
    return Tokenizers.of(p, Tokenizers.segmenterOf(t), ReservedTokens.none(), Template.none());
  }

  private static synchronized Path cached(String name, Supplier<Tokenizer> train) {
    Path dir = Paths.get(System.getProperty("morsel.bench.models", "tokenize-bench/target/bench-models"));
    Path file = dir.resolve(name);
    if (Files.isRegularFile(file)) {
      return file;
    }
    Tokenizer t = train.get();
    try {
      Files.createDirectories(dir);
      Path tmp = Files.createTempFile(dir, name, ".tmp");
      t.save(tmp);
      Files.move(tmp, file, java.nio.file.StandardCopyOption.REPLACE_EXISTING, java.nio.file.StandardCopyOption.ATOMIC_MOVE);
    } catch (IOException e) {
      throw new UncheckedIOException("cannot write benchmark model " + file, e);
    }
    return file;
  }
}
