package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * {@value #THREADS} threads share one unigram tokenizer for {@value #ROUNDS} rounds over mixed
 * inputs (held-out prose, hostile generated text, long pieces that bypass the piece cache); every
 * result must equal the sequential result computed beforehand on a separate instance (the model
 * saved and loaded, so nothing is shared with the one under test). Each thread decodes with its own
 * stream decoder (per-caller state). Then {@code encodeAll} on an 8-thread pool must agree too.
 */
class SharedTokenizerConcurrencyTest {
  static final int THREADS = 8;
  static final int ROUNDS = 4;

  @Test
  void eightThreadsGetTheSequentialResults() throws Exception {
    Counts counts = new Counts("concurrency");
    List<String> inputs = new ArrayList<>(Models.heldOut(300, 600));
    SplittableRandom rnd = new SplittableRandom(0xC0C0_0011L);
    for (int i = 0; i < 300; i++) {
      inputs.add(HardText.next(rnd, 120));
    }
    Tokenizer shared = Models.tokenizer("nfkc");
    Tokenizer reference = Tokenizers.load(shared.toBytes());
    SharedUse.againstReference(shared, reference, inputs, THREADS, ROUNDS, 0xBEEF_0010L, counts, "UNIGRAM");
    counts.print();
    assertTrue(counts.get("UNIGRAM shared encodes equal to sequential") == (long) THREADS * ROUNDS * inputs.size());
    assertTrue(counts.get("UNIGRAM per-thread stream decodes equal to batch decode") > 0);
  }
}
