package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.ReservedTokens;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ForkJoinPool;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The {@link TokenizerProperties} over the api's own pipeline with the test-kit's lossless byte
 * segmenter, for each normalization form and each splitting mode: isolates normalization,
 * splitting, framing, offsets and decoding from any real segmenter. Cases per form are printed.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class PipelinePropertyTest {
  /** Generated texts per normalization form (each checked for every property). */
  static final int CASES_PER_FORM = 3_000;
  static final long BASE_SEED = 0xB0A7_0001L;

  private final Counts counts = new Counts("pipeline properties");

  static Tokenizer tokenizer(Normalization n, Splitting s) {
    ByteSegmenter seg = new ByteSegmenter(Spellings.ALL.size());
    ReservedTokens.Builder cb = ReservedTokens.builder();
    for (int i = 0; i < Spellings.ALL.size(); i++) {
      cb.add(Spellings.ALL.get(i), 256 + i);
    }
    return Tokenizers.of(Pipeline.of(n, s), seg, cb.build(), Spellings.template());
  }

  @ParameterizedTest
  @ValueSource(strings = {"none", "nfc", "nfkc", "nfkc+casefold", "nfd+remove-marks"})
  void everyPropertyHoldsForEveryForm(String form) {
    Normalization n = Normalization.parse(form);
    Splitting[] splits = {Splitting.runs(), Splitting.words(), Splitting.whitespace(), Splitting.none()};
    long[] seeds = Seeds.cases(BASE_SEED + form.hashCode() * 1_000_003L, CASES_PER_FORM);
    List<String> texts = new ArrayList<>();
    List<Tokens> results = new ArrayList<>();
    Subject[] subjects = new Subject[splits.length];
    for (int k = 0; k < splits.length; k++) {
      subjects[k] = Subject.of("bytes " + form + " " + splits[k].spec(), tokenizer(n, splits[k]), true)
          .variant("fresh instance", tokenizer(n, splits[k]));
    }
    for (int c = 0; c < seeds.length; c++) {
      String text = HardText.next(new SplittableRandom(seeds[c]), 80);
      Subject s = subjects[c % splits.length];
      Tokens t = TokenizerProperties.check(s, seeds[c], text, counts);
      if (c % splits.length == 0) {
        texts.add(text);
        results.add(t);
      }
      counts.add("generated texts");
    }
    // many threads: a batch on the common pool gives the sequential results
    List<Tokens> batch = subjects[0].main().encodeAll(texts, Trust.UNTRUSTED, ForkJoinPool.commonPool());
    assertEquals(results, batch, "batch encode differs from sequential encode");
    counts.add("batch (many threads) equals sequential", texts.size());
  }

  @AfterAll
  void report() {
    counts.print();
    if (!Seeds.replaying()) {
      assertTrue(counts.get("generated texts") >= 5L * CASES_PER_FORM, "cases run: " + counts.get("generated texts"));
    }
  }
}
