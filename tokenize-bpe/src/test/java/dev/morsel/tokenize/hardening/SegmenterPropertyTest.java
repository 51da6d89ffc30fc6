package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ForkJoinPool;
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
 * fresh instance, saved and loaded), round trip, no control token from untrusted text, lenient and
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
    long[] seeds = Seeds.cases(BASE_SEED + kind.ordinal() * 0x1_0000_0000L + form.hashCode() * 65_537L, CASES);
    List<String> texts = new ArrayList<>();
    List<Tokens> results = new ArrayList<>();
    for (long seed : seeds) {
      String text = HardText.next(new SplittableRandom(seed), MAX_UNITS);
      Tokens t = TokenizerProperties.check(s, seed, text, counts);
      counts.add("generated texts, " + s.name());
      counts.add("generated texts (all)");
      if (texts.size() < 2_000) {
        texts.add(text);
        results.add(t);
      }
    }
    List<Tokens> batch = s.main().encodeAll(texts, Trust.UNTRUSTED, ForkJoinPool.commonPool());
    for (int i = 0; i < texts.size(); i++) {
      if (!batch.get(i).equals(results.get(i))) {
        throw new AssertionError(HardText.replay(s + " batch vs sequential", seeds[i], texts.get(i)));
      }
    }
    counts.add("batch (many threads) equals sequential", texts.size());
    assertEquals(texts.size(), batch.size());

    // prose: seeded slices of held-out Europarl bodies, where WordPiece rarely needs its unknown
    // token, so that its round trip is checked as often as BPE's
    List<String> prose = Models.heldOut(500, 4000);
    long[] proseSeeds = Seeds.cases(~BASE_SEED + kind.ordinal() * 0x1_0000_0000L + form.hashCode() * 65_537L,
        PROSE_CASES);
    for (long seed : proseSeeds) {
      SplittableRandom rnd = new SplittableRandom(seed);
      String body = prose.get(rnd.nextInt(prose.size()));
      int from = rnd.nextInt(body.length());
      String text = body.substring(from, Math.min(body.length(), from + rnd.nextInt(1, 200)));
      TokenizerProperties.check(s, seed, text, counts);
      counts.add("prose slices, " + s.name());
    }
  }

  @AfterAll
  void report() {
    counts.print();
    if (!Seeds.replaying()) {
      assertTrue(counts.get("generated texts (all)") >= 100_000L, "generated: " + counts.get("generated texts (all)"));
    }
  }
}
