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
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

/**
 * The encode context: per-call state is drawn from a pool the tokenizer owns, never kept per
 * thread. So (1) threads that live for a few encodes get the sequential results; (2) a tokenizer
 * loaded, used on several long-lived threads and dropped, 200 times over, leaves the heap less than
 * {@value #BOUND_MIB} MiB larger after a full collection; (3) the same for 5,000 rounds of
 * {@code withLimits} and {@code withTemplate} copies.
 */
class EncodeContextTest {
  static final int BOUND_MIB = 8;

  private static List<String> inputs(Models.Kind kind, int prose, int hostile) {
    List<String> in = new ArrayList<>(Models.heldOut(prose, 400));
    SplittableRandom rnd = new SplittableRandom(0xF4E5_0001L + kind.ordinal());
    for (int i = 0; i < hostile; i++) {
      in.add(HardText.next(rnd, 120));
    }
    return in;
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void shortLivedThreadsGetTheSequentialResults(Models.Kind kind) throws Exception {
    List<String> in = inputs(kind, 150, 150);
    Tokenizer shared = Models.tokenizer(kind, "nfkc");
    Tokenizer reference = Tokenizers.load(shared.toBytes());
    List<Tokens> expected = new ArrayList<>();
    for (String s : in) {
      expected.add(reference.encode(s));
    }
    long n = SharedUse.freshThreads(shared, in, expected, 400, 5, 4, 0x5EED_0100L + kind.ordinal());
    assertEquals(400L * 5, n);
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void droppedTokenizersAreGarbage(Models.Kind kind) throws Exception {
    byte[] model = Models.tokenizer(kind, "nfkc").toBytes();
    long growth = Retention.reloadGrowth(model, inputs(kind, 10, 10), 3, 200);
    assertTrue(growth < BOUND_MIB << 20, kind + ": 200 load-encode-drop cycles left the heap " + (growth >> 10)
        + " KiB larger after a full collection (bound " + BOUND_MIB + " MiB)");
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void droppedCopiesAreGarbage(Models.Kind kind) throws Exception {
    Tokenizer base = Models.tokenizer(kind, "nfkc");
    long growth = Retention.copyGrowth(base, inputs(kind, 3, 2), 3, 5_000);
    assertTrue(growth < BOUND_MIB << 20, kind + ": 5,000 rounds of withLimits/withTemplate copies left the heap "
        + (growth >> 10) + " KiB larger after a full collection (bound " + BOUND_MIB + " MiB)");
  }
}
