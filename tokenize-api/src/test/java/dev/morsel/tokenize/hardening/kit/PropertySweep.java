package dev.morsel.tokenize.hardening.kit;

import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ForkJoinPool;

/**
 * One subject's share of a segmenter property suite: {@code cases} seeded {@link HardText} texts,
 * each checked with every {@link TokenizerProperties} property; the first {@value #BATCH} of them
 * encoded again as one parallel batch that must equal the sequential results; then seeded slices of
 * prose (held-out corpus text), checked the same way, so that schemes with an unknown token get
 * their round trip checked often. Segmenter modules call {@link #run} once per (segmenter, form).
 */
public final class PropertySweep {
  /** The normalization forms every property runs under. */
  public static final List<String> FORMS = List.of("none", "nfc", "nfkc", "nfkc+casefold", "nfd+remove-marks");
  /** Texts per subject re-encoded as one parallel batch (reason: enough to keep a pool busy, cheap to keep). */
  public static final int BATCH = 2_000;
  /** Count name of all generated texts of a suite. */
  public static final String GENERATED = "generated texts (all)";

  private PropertySweep() {}

  /**
   * Runs the sweep.
   *
   * @param baseSeed generated case {@code i} uses {@code Seeds.cases(baseSeed, cases)[i]}; prose case
   *     {@code i} uses {@code Seeds.cases(proseSeed, proseCases)[i]}
   * @param maxUnits longest generated text in UTF-16 units (long-piece runs may add up to 600)
   * @param prose texts to slice (each slice 1..199 units)
   */
  public static void run(Subject s, long baseSeed, int cases, int maxUnits, long proseSeed, List<String> prose,
      int proseCases, Counts counts) {
    long[] seeds = Seeds.cases(baseSeed, cases);
    List<String> texts = new ArrayList<>();
    List<Tokens> results = new ArrayList<>();
    for (long seed : seeds) {
      String text = HardText.next(new SplittableRandom(seed), maxUnits);
      Tokens t = TokenizerProperties.check(s, seed, text, counts);
      counts.add("generated texts, " + s.name());
      counts.add(GENERATED);
      if (texts.size() < BATCH) {
        texts.add(text);
        results.add(t);
      }
    }
    List<Tokens> batch = s.main().encodeAll(texts, Trust.UNTRUSTED, ForkJoinPool.commonPool());
    if (batch.size() != texts.size()) {
      throw new AssertionError(s + ": batch of " + texts.size() + " gave " + batch.size() + " results");
    }
    for (int i = 0; i < texts.size(); i++) {
      if (!batch.get(i).equals(results.get(i))) {
        throw new AssertionError(HardText.replay(s + " batch vs sequential", seeds[i], texts.get(i)));
      }
    }
    counts.add("batch (many threads) equals sequential", texts.size());

    for (long seed : Seeds.cases(proseSeed, proseCases)) {
      SplittableRandom rnd = new SplittableRandom(seed);
      String body = prose.get(rnd.nextInt(prose.size()));
      int from = rnd.nextInt(body.length());
      String text = body.substring(from, Math.min(body.length(), from + rnd.nextInt(1, 200)));
      TokenizerProperties.check(s, seed, text, counts);
      counts.add("prose slices, " + s.name());
    }
  }
}
