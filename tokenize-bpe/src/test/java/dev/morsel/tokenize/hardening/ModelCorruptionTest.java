package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import dev.morsel.tokenize.Tokenizer;
import java.util.List;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

/**
 * A saved model of each kind, damaged every way {@link ModelCorruption} knows: every other value of
 * every header and section-table byte, {@value #PER_SECTION} seeded changes in every section,
 * every truncation up to the end of the table and {@value #TRUNCATIONS} beyond, section lengths
 * forged up to 2^31 - 1, and damage with valid checksums inside every section (the segmenter's own
 * parser). Counts per kind of damage, and the largest allocation seen while rejecting, are printed.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class ModelCorruptionTest {
  static final int PER_SECTION = 300;
  static final int TRUNCATIONS = 300;
  static final int FORGED_PER_SECTION = 200;
  /** Bytes allocated per model byte while building and then rejecting a forged model (observed: under 64). */
  static final long FORGED_ALLOCATION_FACTOR = 128;

  private final Counts counts = new Counts("model corruption");

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void everyDamagedModelIsRejectedNamingTheSection(Models.Kind kind) {
    Tokenizer t = Models.tokenizer(kind, "nfkc+casefold");
    byte[] model = t.toBytes();
    List<String> samples = List.of("Skarvøy ferry delayed: ＦＥＲＲＹ ﬁn 🧑‍🚒 \uD800 {~final-call~}", "Überfahrt nach Ålesund");
    ModelCorruption.everyDamage(kind.name(), model, samples, counts, 0xC0FFEE00L + kind.ordinal(), PER_SECTION,
        TRUNCATIONS, FORGED_PER_SECTION, FORGED_ALLOCATION_FACTOR);
  }

  @AfterAll
  void report() {
    counts.print();
  }
}
