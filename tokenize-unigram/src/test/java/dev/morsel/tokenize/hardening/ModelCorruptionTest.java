package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The saved unigram model damaged every way {@link ModelCorruption} knows: every other value of
 * every header and section-table byte, {@value #PER_SECTION} seeded changes in every section, every
 * truncation up to the end of the table and {@value #TRUNCATIONS} beyond, section lengths forged up
 * to 2^31 - 1, and damage with valid checksums inside every section (the unigram section reader:
 * counts, string lengths and scores forged). Each is rejected with a {@code ModelFormatException}
 * naming the section, or (valid checksums only) loads a model that encodes and decodes.
 */
class ModelCorruptionTest {
  static final int PER_SECTION = 300;
  static final int TRUNCATIONS = 300;
  static final int FORGED_PER_SECTION = 200;
  /** Bytes allocated per model byte while building and then rejecting a forged model (BPE observed under 64). */
  static final long FORGED_ALLOCATION_FACTOR = 128;

  @Test
  void everyDamagedModelIsRejectedNamingTheSection() {
    Counts counts = new Counts("model corruption");
    byte[] model = Models.tokenizer("nfkc+casefold").toBytes();
    List<String> samples = List.of("Skarvøy ferry delayed: ＦＥＲＲＹ ﬁn 🧑‍🚒 \uD800 {~final-call~}", "Überfahrt nach Ålesund");
    ModelCorruption c = ModelCorruption.everyDamage("UNIGRAM", model, samples, counts, 0xC0FFEE10L, PER_SECTION,
        TRUNCATIONS, FORGED_PER_SECTION, FORGED_ALLOCATION_FACTOR);
    counts.print();
    assertTrue(c.tags().contains("UNST") && c.tags().contains("UNVO"), "unigram sections: " + c.tags());
    int n = c.tags().size();
    assertEquals((long) c.tableEnd() * 255, counts.get("UNIGRAM header/table single-byte changes rejected"));
    assertEquals(c.tableEnd() + 1L + TRUNCATIONS, counts.get("UNIGRAM truncations rejected"));
    assertTrue(counts.get("UNIGRAM payload changes rejected (section named)") >= (long) (n - 1) * PER_SECTION);
    assertTrue(counts.get("UNIGRAM forged section lengths rejected") >= 10L * n);
    assertTrue(counts.get("UNIGRAM forged payloads (valid checksums) rejected") > 0);
  }
}
