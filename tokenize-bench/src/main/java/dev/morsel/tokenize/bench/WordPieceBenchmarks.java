package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.wordpiece.WordPiece;
import dev.morsel.tokenize.wordpiece.WordPieceLearner;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
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
import org.openjdk.jmh.infra.Blackhole;

/**
 * WordPiece: the 30k vocabulary trained on the whole Europarl body corpus ({@link Models}) on every
 * body and on 1 MiB of prose, the same model on 1 MiB of letters without spaces (splitting off), and
 * the near-miss case where greedy longest-match backs off at every position: a vocabulary holding
 * {@code a^k b} for k = 1..64 (word-initial and continuation) and an input of only {@code a}s, 1 MiB
 * and 100 KiB, for LinMaxMatch and for the naive greedy encoder (try the longest candidate first,
 * shrink; O(n · L²) for longest token L, since every candidate is hashed).
 *
 * <p>Run with {@code tokenize-bench/summary.sh}, or alone with
 * {@code java -jar tokenize-bench/target/morsel-bench.jar --jmh WordPieceBenchmarks}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Fork(value = 1, jvmArgsAppend = {"-Xms2g", "-Xmx2g"})
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 3, time = 1)
public class WordPieceBenchmarks {
  /** Longest near-miss token {@code a^k b}. */
  static final int NEAR_MISS = 64;

  List<String> bodies;
  Tokenizer trained;
  Tokenizer trainedUnsplit;
  Tokenizer nearMiss;
  Naive naive;
  String prose1m;
  String adversarial1m;
  String as1m;
  String as100k;

  @Setup
  public void setup() {
    bodies = Corpus.bodies();
    Tokenizer wordpiece = Models.wordpiece();
    trained = Models.with(Models.pipeline(), wordpiece);
    trainedUnsplit = Models.with(Models.unsplit(),
        WordPiece.withMaxPieceLength(wordpiece, WordPieceLearner.MAX_MAX_PIECE_LENGTH));
    List<String> tokens = new ArrayList<>();
    String m = WordPieceLearner.DEFAULT_MARKER;
    tokens.add(WordPieceLearner.DEFAULT_UNKNOWN_TOKEN);
    tokens.add("a");
    tokens.add(m + "a");
    for (int k = 1; k <= NEAR_MISS; k++) {
      tokens.add("a".repeat(k) + "b");
      tokens.add(m + "a".repeat(k) + "b");
    }
    nearMiss = WordPiece.withMaxPieceLength(WordPiece.fromTokens(Models.unsplit(), tokens, 0, m,
        WordPieceLearner.DEFAULT_UNKNOWN_TOKEN), WordPieceLearner.MAX_MAX_PIECE_LENGTH);
    naive = new Naive(tokens, m);
    prose1m = Corpus.prose(1 << 20);
    adversarial1m = Corpus.adversarial(1 << 20, 1);
    as1m = "a".repeat(1 << 20);
    as100k = "a".repeat(100 << 10);
  }

  /** {@code wordpiece_encode}: every body. */
  @Benchmark
  public void encode(Blackhole bh) {
    for (String s : bodies) {
      bh.consume(trained.encode(s));
    }
  }

  /** 1 MiB of prose as one text, splitting on. */
  @Benchmark
  public Object prose1m() {
    return trained.encode(prose1m);
  }

  /** 1 MiB of letters, no spaces, splitting off, trained vocabulary. */
  @Benchmark
  public Object adversarial1m() {
    return trainedUnsplit.encode(adversarial1m);
  }

  /** LinMaxMatch, near-miss vocabulary, 1 MiB of a's. */
  @Benchmark
  public Object nearMiss1m() {
    return nearMiss.encode(as1m);
  }

  /** LinMaxMatch, near-miss vocabulary, 100 KiB of a's. */
  @Benchmark
  public Object nearMiss100k() {
    return nearMiss.encode(as100k);
  }

  /** Naive greedy, near-miss vocabulary, 1 MiB of a's. */
  @Benchmark
  public int naive1m() {
    return naive.count(as1m);
  }

  /** Naive greedy, near-miss vocabulary, 100 KiB of a's. */
  @Benchmark
  public int naive100k() {
    return naive.count(as100k);
  }

  /** The naive greedy longest-match-first encoder: longest candidate first, shrink by one char. */
  static final class Naive {
    final Set<String> initial = new HashSet<>();
    final Set<String> continuation = new HashSet<>();
    final int longest;

    Naive(List<String> tokens, String marker) {
      int l = 0;
      for (String t : tokens) {
        if (t.startsWith(marker) && t.length() > marker.length()) {
          continuation.add(t.substring(marker.length()));
        } else {
          initial.add(t);
        }
        l = Math.max(l, t.length());
      }
      longest = l;
    }

    /** Number of tokens for one piece (-1 for unknown). */
    int count(String piece) {
      int i = 0;
      int n = 0;
      while (i < piece.length()) {
        Set<String> vocab = i == 0 ? initial : continuation;
        int len = Math.min(longest, piece.length() - i);
        while (len > 0 && !vocab.contains(piece.substring(i, i + len))) {
          len--;
        }
        if (len == 0) {
          return -1;
        }
        i += len;
        n++;
      }
      return n;
    }
  }
}
