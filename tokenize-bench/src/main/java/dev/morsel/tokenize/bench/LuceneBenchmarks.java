package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.lucene.SubwordAnalyzer;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.apache.lucene.analysis.Analyzer;
import org.apache.lucene.analysis.TokenStream;
import org.apache.lucene.analysis.tokenattributes.OffsetAttribute;
import org.apache.lucene.analysis.tokenattributes.PositionIncrementAttribute;
import org.apache.lucene.analysis.tokenattributes.TermToBytesRefAttribute;
import org.apache.lucene.util.BytesRef;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.TearDown;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Lucene analysis through {@link SubwordAnalyzer} over the same BPE tokenizer as
 * {@code bpe_encode} ({@link Models}, 32k vocabulary, cache on): every Europarl body as one field
 * value, the stream consumed as Lucene's indexing chain consumes it (the term's UTF-8 bytes from
 * {@link TermToBytesRefAttribute}, the position increment and both offsets of each token, then
 * {@code end()} and {@code close()}), one thread, the analyzer's per-thread tokenizer reused.
 * The summary reports it as {@code lucene_analyze} and divides it by {@code bpe_encode}
 * ({@code lucene_vs_bpe}).
 *
 * <p>Run with {@code tokenize-bench/summary.sh}, or alone with
 * {@code java -jar tokenize-bench/target/morsel-bench.jar --jmh LuceneBenchmarks}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgsAppend = {"-Xms2g", "-Xmx2g"})
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
public class LuceneBenchmarks {
  List<String> bodies;
  Analyzer analyzer;

  @Setup
  public void setup() {
    bodies = Corpus.bodies();
    analyzer = SubwordAnalyzer.of(Models.with(Models.pipeline(), Models.bpe()));
  }

  @TearDown
  public void tearDown() {
    analyzer.close();
  }

  /** {@code lucene_analyze}: every body through the analyzer, consumed as indexing does. */
  @Benchmark
  public long analyze() {
    long sum = 0;
    try {
      for (String body : bodies) {
        try (TokenStream ts = analyzer.tokenStream("body", body)) {
          TermToBytesRefAttribute term = ts.addAttribute(TermToBytesRefAttribute.class);
          PositionIncrementAttribute inc = ts.addAttribute(PositionIncrementAttribute.class);
          OffsetAttribute off = ts.addAttribute(OffsetAttribute.class);
          ts.reset();
          while (ts.incrementToken()) {
            BytesRef bytes = term.getBytesRef();
            sum += bytes.length + inc.getPositionIncrement() + off.startOffset() + off.endOffset();
          }
          ts.end();
          sum += off.endOffset();
        }
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return sum;
  }
}
