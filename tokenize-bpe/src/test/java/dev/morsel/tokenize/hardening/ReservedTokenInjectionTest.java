package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Untrusted text never yields a reserved id, however it spells a reserved token; trusted text yields
 * one exactly at the exact spellings ({@link ReservedInjection} lists the look-alikes and their
 * sources), for each segmenter of this module and each normalization form.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class ReservedTokenInjectionTest {
  static final int CASES = 1_000;

  private final Counts counts = new Counts("reserved-token injection");
  private final ReservedInjection injection = new ReservedInjection(counts);

  Stream<Arguments> subjects() {
    List<Arguments> out = new ArrayList<>();
    for (Models.Kind k : Models.Kind.values()) {
      for (String form : Models.FORMS) {
        out.add(Arguments.of(k, form));
      }
    }
    return out.stream();
  }

  @ParameterizedTest(name = "{0} {1}")
  @MethodSource("subjects")
  void untrustedNeverTrustedOnlyExact(Models.Kind kind, String form) {
    injection.generated(Models.tokenizer(kind, form), 0x1A1EC7_0000L + kind.ordinal() * 7919L + form.hashCode(), CASES);
  }

  @ParameterizedTest(name = "{0} {1}")
  @MethodSource("subjects")
  void everyLookAlikeAloneIsOrdinaryText(Models.Kind kind, String form) {
    injection.everyLookAlike(Models.tokenizer(kind, form));
  }

  @AfterAll
  void report() {
    counts.print();
    if (!Seeds.replaying()) {
      assertTrue(counts.get(ReservedInjection.UNTRUSTED) >= 10L * CASES);
      assertTrue(counts.get(ReservedInjection.FOUND) > 1000);
    }
  }
}
