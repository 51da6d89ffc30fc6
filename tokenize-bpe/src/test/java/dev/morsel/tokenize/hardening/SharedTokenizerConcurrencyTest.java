package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Decoding;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.bpe.BpeSegmenter;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

/**
 * {@value #THREADS} threads share one tokenizer per segmenter for {@value #ROUNDS} rounds over mixed
 * inputs (held-out prose, hostile generated text, long pieces); for BPE the shared instance has a
 * 64-entry cache, so entries are overwritten under the readers' feet all the time. Every result must
 * equal the sequential result computed beforehand on a separate, cache-less instance. Each thread
 * decodes with its own stream decoder (per-caller state). Then an 8-thread {@code encodeAll} of
 * all inputs must give the sequential results too.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class SharedTokenizerConcurrencyTest {
  static final int THREADS = 8;
  static final int ROUNDS = 4;

  private final Counts counts = new Counts("concurrency");

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void eightThreadsGetTheSequentialResults(Models.Kind kind) throws Exception {
    List<String> inputs = new ArrayList<>(Models.heldOut(300, 600));
    SplittableRandom rnd = new SplittableRandom(0xC0C0_0001L + kind.ordinal());
    for (int i = 0; i < 300; i++) {
      inputs.add(HardText.next(rnd, 120));
    }
    Tokenizer shared;
    Tokenizer reference;
    if (kind == Models.Kind.BPE) {
      BpeSegmenter b = (BpeSegmenter) Models.segmenter(kind);
      shared = Models.tokenizer(kind, "nfkc", b.withCacheEntries(64));
      reference = Models.tokenizer(kind, "nfkc", b.withCacheEntries(0));
    } else {
      shared = Models.tokenizer(kind, "nfkc");
      reference = dev.morsel.tokenize.Tokenizers.load(shared.toBytes());
    }
    List<Tokens> expected = new ArrayList<>();
    List<String> decoded = new ArrayList<>();
    for (String s : inputs) {
      Tokens t = reference.encode(s);
      expected.add(t);
      decoded.add(reference.decode(t.ids(), true, Decoding.REPLACE));
    }
    SharedUse.Outcome o = SharedUse.run(shared, inputs, expected, decoded, THREADS, ROUNDS, 0xBEEF_0000L + kind.ordinal());
    counts.add(kind + " shared encodes equal to sequential", o.encodes);
    counts.add(kind + " per-thread stream decodes equal to batch decode", o.streamDecodes);
    assertEquals((long) THREADS * ROUNDS * inputs.size(), o.encodes);

    ExecutorService pool = Executors.newFixedThreadPool(THREADS);
    try {
      for (int r = 0; r < ROUNDS; r++) {
        List<Tokens> batch = shared.encodeAll(inputs, Trust.UNTRUSTED, pool);
        for (int i = 0; i < inputs.size(); i++) {
          if (!batch.get(i).equals(expected.get(i))) {
            throw new AssertionError(HardText.replay(kind + " encodeAll on 8 threads", i, inputs.get(i)));
          }
        }
        counts.add(kind + " 8-thread batch results equal to sequential", inputs.size());
      }
    } finally {
      pool.shutdownNow();
    }
  }

  @AfterAll
  void report() {
    counts.print();
    assertTrue(counts.total() > 0);
  }
}
