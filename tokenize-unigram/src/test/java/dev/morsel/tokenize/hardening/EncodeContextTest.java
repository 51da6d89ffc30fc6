package dev.morsel.tokenize.hardening;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.hardening.kit.HardText;
import dev.morsel.tokenize.hardening.kit.Retention;
import dev.morsel.tokenize.hardening.kit.SharedUse;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The encode context of a unigram tokenizer: per-call state is drawn from a pool the tokenizer owns, never kept per
 * thread. So (1) threads that live for a few encodes get the sequential results; (2) a tokenizer
 * loaded, used on several long-lived threads and dropped, 200 times over, leaves the heap less than
 * {@value #BOUND_MIB} MiB larger after a full collection; (3) the same for 5,000 rounds of
 * {@code withLimits} and {@code withTemplate} copies.
 */
class EncodeContextTest {
  static final int BOUND_MIB = 8;

  private static List<String> inputs(int prose, int hostile) {
    List<String> in = new ArrayList<>(Models.heldOut(prose, 400));
    SplittableRandom rnd = new SplittableRandom(0xF4E5_0001L);
    for (int i = 0; i < hostile; i++) {
      in.add(HardText.next(rnd, 120));
    }
    return in;
  }

  @Test
  void shortLivedThreadsGetTheSequentialResults() throws Exception {
    List<String> in = inputs(150, 150);
    Tokenizer shared = Models.tokenizer("nfkc");
    Tokenizer reference = Tokenizers.load(shared.toBytes());
    List<Tokens> expected = new ArrayList<>();
    for (String s : in) {
      expected.add(reference.encode(s));
    }
    long n = SharedUse.freshThreads(shared, in, expected, 400, 5, 4, 0x5EED_0100L);
    assertEquals(400L * 5, n);
  }

  @Test
  void droppedTokenizersAreGarbage() throws Exception {
    byte[] model = Models.tokenizer("nfkc").toBytes();
    long growth = Retention.reloadGrowth(model, inputs(10, 10), 3, 200);
    assertTrue(growth < BOUND_MIB << 20, "unigram: 200 load-encode-drop cycles left the heap " + (growth >> 10)
        + " KiB larger after a full collection (bound " + BOUND_MIB + " MiB)");
  }

  @Test
  void droppedCopiesAreGarbage() throws Exception {
    Tokenizer base = Models.tokenizer("nfkc");
    long growth = Retention.copyGrowth(base, inputs(3, 2), 3, 5_000);
    assertTrue(growth < BOUND_MIB << 20, "unigram: 5,000 rounds of withLimits/withTemplate copies left the heap "
        + (growth >> 10) + " KiB larger after a full collection (bound " + BOUND_MIB + " MiB)");
  }
}
