package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.FieldSource;

/**
 * The {@link TokenizerProperties} for the unigram segmenter (byte fallback on, so lossless) under
 * every normalization form, run by {@link PropertySweep}: {@value #CASES} generated texts and
 * {@value #PROSE_CASES} Europarl slices per form, each checked for offsets, bytes inside spans,
 * cold/warm and variant agreement (fresh instance with cold caches, saved and loaded), round trip,
 * no reserved token from untrusted text, lenient and streaming decode; plus a parallel batch against
 * the sequential results. Counts per property are printed after the class and asserted. A failure
 * prints the seed; replay it with {@code -Dmorsel.replay=0x...} (see {@link Seeds}).
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class SegmenterPropertyTest {
  /** Generated texts per normalization form. */
  static final int CASES = 10_000;
  /** Europarl slices per normalization form. */
  static final int PROSE_CASES = 2_000;
  /** Longest generated text, in UTF-16 units (long-piece runs may add up to 600). */
  static final int MAX_UNITS = 60;
  static final long BASE_SEED = 0x0A1_6000_0000L;

  static final java.util.List<String> FORMS = PropertySweep.FORMS;

  private final Counts counts = new Counts("unigram properties");

  @ParameterizedTest(name = "unigram {0}")
  @FieldSource("FORMS")
  void everyPropertyHolds(String form) {
    long salt = form.hashCode() * 65_537L;
    PropertySweep.run(Models.subject(form), BASE_SEED + salt, CASES, MAX_UNITS, ~BASE_SEED + salt,
        Models.heldOut(500, 4000), PROSE_CASES, counts);
  }

  @AfterAll
  void report() {
    counts.print();
    if (!Seeds.replaying()) {
      long forms = FORMS.size();
      assertEquals(forms * CASES, counts.get(PropertySweep.GENERATED));
      long all = forms * (CASES + PROSE_CASES);
      assertEquals(all, counts.get(TokenizerProperties.OFFSETS));
      // byte fallback: no unknown token, so every case checks the round trip
      assertEquals(all, counts.get(TokenizerProperties.ROUND_TRIP));
      assertEquals(all, counts.get(TokenizerProperties.VARIANT + "saved and loaded"));
      assertTrue(counts.get("batch (many threads) equals sequential") >= forms * PropertySweep.BATCH);
    }
  }
}
