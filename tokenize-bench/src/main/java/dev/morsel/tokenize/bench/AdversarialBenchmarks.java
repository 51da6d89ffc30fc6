package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.wordpiece.WordPiece;
import dev.morsel.tokenize.wordpiece.WordPieceLearner;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Adversarial text of several kinds ({@link Corpus#adversarial(String, int, long)}: long runs of
 * combining marks, emoji sequences, mixed scripts; all without spaces) for every scheme, with
 * normalization and splitting off so that each text is one piece: 1 MiB and 100 KiB of UTF-8 each,
 * for the {@code <scheme>_adversarial_<kind>_scale} ratios (time for 1 MiB over time for 100 KiB;
 * linear work gives 10.24). WordPiece runs with its largest piece limit, so that the whole text is
 * segmented instead of being one unknown token.
 *
 * <p>Run with {@code tokenize-bench/summary.sh --only '.*_adversarial_.*'}, or alone with
 * {@code java -jar tokenize-bench/target/morsel-bench.jar --jmh AdversarialBenchmarks}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgsAppend = {"-Xms2g", "-Xmx2g"})
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
public class AdversarialBenchmarks {
  /** The scheme: {@code bpe}, {@code wordpiece} or {@code unigram}. */
  @Param({"bpe", "wordpiece", "unigram"})
  public String scheme;

  /** The kind of text, one of {@link Corpus#ADVERSARIAL_KINDS}. */
  @Param({"marks", "emoji", "mixed"})
  public String kind;

  Tokenizer tokenizer;
  String mib1;
  String kib100;

  @Setup
  public void setup() {
    Tokenizer t;
    switch (scheme) {
      case "bpe":
        t = Models.bpe();
        break;
      case "wordpiece":
        t = WordPiece.withMaxPieceLength(Models.wordpiece(), WordPieceLearner.MAX_MAX_PIECE_LENGTH);
        break;
      case "unigram":
        t = Models.unigram();
        break;
      default:
        throw new IllegalArgumentException("scheme '" + scheme + "' is not bpe, wordpiece or unigram");
    }
    tokenizer = Models.with(Models.unsplit(), t);
    mib1 = Corpus.adversarial(kind, 1 << 20, 0xAD7L);
    kib100 = Corpus.adversarial(kind, 100 << 10, 0xAD7L);
  }

  /** 1 MiB of the kind, one piece. */
  @Benchmark
  public Object mib1() {
    return tokenizer.encode(mib1);
  }

  /** 100 KiB of the kind, one piece. */
  @Benchmark
  public Object kib100() {
    return tokenizer.encode(kib100);
  }
}
