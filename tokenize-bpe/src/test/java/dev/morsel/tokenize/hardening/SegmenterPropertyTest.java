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
 * The {@link TokenizerProperties} for every segmenter of this module under every normalization
 * form, over seeded {@link HardText}: {@value #CASES} generated texts per (segmenter, form), each
 * checked for offsets, bytes inside spans, cold/warm and variant agreement (cache off, tiny cache,
 * fresh instance, saved and loaded), round trip, no reserved token from untrusted text, lenient and
 * streaming decode; plus a parallel batch of the same texts against the sequential results. Case
 * counts per property are printed after the class and asserted. A failure prints the seed; replay it
 * with {@code -Dmorsel.replay=0x...} (see {@link Seeds}).
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class SegmenterPropertyTest {
  /** Generated texts per (segmenter, normalization form). */
  static final int CASES = 10_000;
  /** Europarl slices per (segmenter, normalization form). */
  static final int PROSE_CASES = 2_000;
  /** Longest generated text, in UTF-16 units (long-piece runs may add up to 600). */
  static final int MAX_UNITS = 60;
  static final long BASE_SEED = 0x5E6_0000_0000L;

  private final Counts counts = new Counts("segmenter properties");

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
  void everyPropertyHolds(Models.Kind kind, String form) {
    Subject s = Models.subject(kind, form);
    long salt = kind.ordinal() * 0x1_0000_0000L + form.hashCode() * 65_537L;
    // prose: seeded slices of held-out Europarl bodies, where WordPiece rarely needs its unknown
    // token, so that its round trip is checked as often as BPE's
    PropertySweep.run(s, BASE_SEED + salt, CASES, MAX_UNITS, ~BASE_SEED + salt, Models.heldOut(500, 4000),
        PROSE_CASES, counts);
  }

  @AfterAll
  void report() {
    counts.print();
    if (!Seeds.replaying()) {
      assertTrue(counts.get(PropertySweep.GENERATED) >= 100_000L, "generated: " + counts.get(PropertySweep.GENERATED));
    }
  }
}
