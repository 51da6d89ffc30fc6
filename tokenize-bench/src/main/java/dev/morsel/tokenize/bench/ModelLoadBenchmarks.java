package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.bpe.BpeLearner;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Model loading with a large reserved-token list: {@code load_reserved_64k_ms} is the time, in
 * milliseconds, to load (validate and build) a BPE model whose api section and segmenter section
 * each hold 65,536 reserved tokens ({@code ModelLimits.maxReservedTokens}, the default limit). The
 * containment and overlap rules are checked with an Aho–Corasick automaton, linear in the total
 * length of the spellings; the goal is under 1,000 ms. Single-shot times after five warm-up loads
 * (a service loads a model once, but the JIT then has compiled the readers). A pairwise check of the same rules took 28 s
 * for 16,000 spellings on this machine class, so the figure also guards against a quadratic relapse.
 *
 * <p>Run with {@code tokenize-bench/summary.sh --only load_reserved_64k_ms}, or alone with
 * {@code java -jar tokenize-bench/target/morsel-bench.jar --jmh ModelLoadBenchmarks}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.SingleShotTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgsAppend = {"-Xms1g", "-Xmx2g"})
@Warmup(iterations = 5)
@Measurement(iterations = 10)
public class ModelLoadBenchmarks {
  /** Reserved tokens in the benchmark model. */
  static final int RESERVED = 1 << 16;

  byte[] model;

  /** Spellings {@code ⟨berth-N⟩} with N written in base 26 letters (distinct, none contains or overlaps another). */
  static List<String> spellings(int count) {
    List<String> out = new ArrayList<>(count);
    for (int i = 0; i < count; i++) {
      StringBuilder sb = new StringBuilder("⟨berth-");
      int x = i;
      do {
        sb.append((char) ('a' + x % 26));
        x /= 26;
      } while (x > 0);
      out.add(sb.append('⟩').toString());
    }
    return out;
  }

  @Setup
  public void setup() {
    // 256 byte tokens and the reserved ones, no merge: a one-character corpus has no pair to merge
    model = BpeLearner.builder().vocabularySize(256 + RESERVED).reservedTokens(spellings(RESERVED)).threads(1).build()
        .train(PieceCounts.of(Pipeline.defaults(), java.util.Map.of("a", 1L))).toBytes();
  }

  /** {@code load_reserved_64k_ms}: load the model with 65,536 reserved tokens. */
  @Benchmark
  public Tokenizer loadReserved64k() {
    return Tokenizers.load(model);
  }
}
