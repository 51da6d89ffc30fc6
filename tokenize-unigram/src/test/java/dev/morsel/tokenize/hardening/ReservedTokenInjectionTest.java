package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.FieldSource;

/**
 * Untrusted text never yields a reserved id from the unigram tokenizer, however it spells a reserved
 * token; trusted text yields one exactly at the exact spellings ({@link ReservedInjection} lists the
 * look-alikes and their sources), under every normalization form.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class ReservedTokenInjectionTest {
  static final int CASES = 1_000;
  static final java.util.List<String> FORMS = PropertySweep.FORMS;

  private final Counts counts = new Counts("reserved-token injection");
  private final ReservedInjection injection = new ReservedInjection(counts);

  @ParameterizedTest(name = "unigram {0}")
  @FieldSource("FORMS")
  void untrustedNeverTrustedOnlyExact(String form) {
    injection.generated(Models.tokenizer(form), 0x1A1EC7_0010L + form.hashCode(), CASES);
  }

  @ParameterizedTest(name = "unigram {0}")
  @FieldSource("FORMS")
  void everyLookAlikeAloneIsOrdinaryText(String form) {
    injection.everyLookAlike(Models.tokenizer(form));
  }

  @AfterAll
  void report() {
    counts.print();
    if (!Seeds.replaying()) {
      assertTrue(counts.get(ReservedInjection.UNTRUSTED) >= 5L * CASES);
      assertTrue(counts.get(ReservedInjection.FOUND) > 500);
    }
  }
}
