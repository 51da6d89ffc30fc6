package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.bpe.Bpe;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
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
      shared = Bpe.withCacheEntries(Models.tokenizer(kind, "nfkc"), 64);
      reference = Bpe.withCacheEntries(Models.tokenizer(kind, "nfkc"), 0);
    } else {
      shared = Models.tokenizer(kind, "nfkc");
      reference = dev.morsel.tokenize.Tokenizers.load(shared.toBytes());
    }
    SharedUse.againstReference(shared, reference, inputs, THREADS, ROUNDS, 0xBEEF_0000L + kind.ordinal(), counts,
        kind.toString());
  }

  @AfterAll
  void report() {
    counts.print();
    assertTrue(counts.total() > 0);
  }
}
