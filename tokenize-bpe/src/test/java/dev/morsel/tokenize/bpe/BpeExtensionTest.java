package dev.morsel.tokenize.bpe;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import dev.morsel.tokenize.train.ExtensionSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.testkit.ExtensionChecks;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** BPE vocabulary extension: continued merges, every base id kept, measured on source code. */
class BpeExtensionTest {
  private static final String AGENT = "\u27e8agent\u27e9";

  /**
   * Oracle: the textbook continuation ({@link TextbookBpe#extend}: its own encoder writes each new
   * piece in the base's merges, then it recounts every pair after every merge) learns exactly the
   * new merges, in the same order; the base's merges come first, unchanged.
   */
  @ParameterizedTest
  @ValueSource(longs = {1, 2, 3, 4, 5, 6})
  void newMergesAreTheTextbookContinuation(long seed) {
    SplittableRandom r = new SplittableRandom(seed);
    Map<String, Long> old = ExtensionChecks.randomWords(r, "aeiklmnorst", 300);
    Map<String, Long> fresh = ExtensionChecks.randomWords(r, "aeio{}();=xyz_", 300);
    Tokenizer base = BpeLearner.builder().vocabularySize(256 + 40).threads(1).build().train(PieceCounts.of(old));
    Tokenizer ext = BpeLearner.extender().addedIds(60).threads(1).build().extend(base, PieceCounts.of(fresh));
    ExtensionChecks.assertExtends(base, ext, 60);
    BpeSegmenter b = (BpeSegmenter) Tokenizers.segmenterOf(base);
    BpeSegmenter e = (BpeSegmenter) Tokenizers.segmenterOf(ext);
    int[][] want = TextbookBpe.extend(b, fresh, 60, BpeLearner.DEFAULT_MIN_PAIR_COUNT, BpeLearner.DEFAULT_MAX_TOKEN_BYTES);
    assertEquals(b.mergeCount() + want[0].length, e.mergeCount(), "merge count");
    for (int rank = 0; rank < e.mergeCount(); rank++) {
      int[] got = {e.mergeLeft(rank), e.mergeRight(rank)};
      int[] exp = rank < b.mergeCount() ? new int[] {b.mergeLeft(rank), b.mergeRight(rank)}
          : new int[] {want[0][rank - b.mergeCount()], want[1][rank - b.mergeCount()]};
      assertArrayEquals(exp, got, "merge of rank " + rank);
    }
    // the textbook encoder with the extended ranks agrees with the extended segmenter on every piece
    for (String p : fresh.keySet()) {
      assertArrayEquals(TextbookBpe.encode(p.getBytes(java.nio.charset.StandardCharsets.UTF_8), 0, TextbookBpe.ranks(e)),
          Fixtures.segment(e, p, 0, p.length()).ids(), p);
    }
    assertTrue(ExtensionChecks.assertSingleTokenPiecesKeepIds(base, ext, PieceCounts.of(old), seed) > 10);
  }

  /** Reserved tokens and framing are the base's; no new merge spells a reserved token. */
  @Test
  void carriesReservedTokensAndFraming() {
    Map<String, Long> old = Map.of("ferry", 40L, "Oskevik", 12L, "quay", 9L);
    Tokenizer base = BpeLearner.builder().vocabularySize(270).reservedTokens(List.of(AGENT)).threads(1).build()
        .train(PieceCounts.of(old)).withTemplate(Template.of(List.of(AGENT), List.of(), List.of()));
    Tokenizer ext = BpeLearner.extender().addedIds(30).threads(1).build().extend(base,
        PieceCounts.of(Map.of("Harrowmere", 30L, "\u27e8agent", 50L, "deck", 7L)));
    ExtensionChecks.assertExtends(base, ext, 30);
    assertEquals(AGENT, ext.token(0));
    assertEquals(List.of(0), java.util.stream.IntStream.of(ext.encode("").ids()).boxed().toList(), "framing kept");
    for (int id = base.vocabularySize(); id < ext.vocabularySize(); id++) {
      assertTrue(ext.reservedTokens().id(ext.token(id)) < 0, "new id " + id + " '" + ext.token(id) + "'");
    }
  }

  @Test
  void refusesWrongInputs() {
    Tokenizer base = BpeLearner.builder().vocabularySize(300).threads(1).build()
        .train(PieceCounts.of(Map.of("ferry", 40L, "Oskevik", 12L)));
    ExtensionChecks.assertRefusesWrongInputs(Bpe.SCHEME, base, n -> BpeLearner.extender().addedIds(n).build());
    IllegalArgumentException unset = assertThrows(IllegalArgumentException.class, () -> BpeLearner.extender().build());
    assertTrue(unset.getMessage().contains("addedIds"), unset.getMessage());
    IllegalArgumentException option = assertThrows(IllegalArgumentException.class,
        () -> Learners.extender("bpe", ExtensionSettings.of(5), "max-token-bytes=1"));
    assertTrue(option.getMessage().contains("max-token-bytes=1"), option.getMessage());
    // nothing to learn: every new piece is already one token of the base
    IllegalArgumentException nothing = assertThrows(IllegalArgumentException.class,
        () -> BpeLearner.extender().addedIds(5).build().extend(base, PieceCounts.of(Map.of("ferry", 3L))));
    assertTrue(nothing.getMessage().contains("no new merge"), nothing.getMessage());
    assertEquals(java.util.Optional.empty(), base.lineage(), "a model learned from scratch records no base");
    assertEquals(java.util.Optional.empty(), Tokenizers.load(base.toBytes()).lineage(), "a file without the record loads");
  }

  /**
   * Measured on open data (docs/adapting.md): a 4,000-id model of Europarl extended with 2,000 ids
   * of Java source (fastutil-core's sources jar) against a 6,000-id model learned from scratch on
   * both. Goals: the extension within 10 % of scratch on held-out code, and no more than 2 % worse
   * than the base on held-out Europarl. Measured: see the table in docs/adapting.md.
   */
  @Test
  void measuredOnSourceCode() {
    ExtensionChecks.Corpora c = ExtensionChecks.corpora();
    ExtensionChecks.Measured m = ExtensionChecks.measure(Bpe.SCHEME,
        size -> counts -> BpeLearner.builder().vocabularySize(size).threads(2).build().train(counts),
        base -> BpeLearner.extender().addedIds(ExtensionChecks.ADDED_IDS).threads(2).build().extend(base, c.code()));
    assertTrue(m.baseCode() > m.extendedCode(), "the extension shortens code: " + m.table());
    assertTrue(m.codeVsScratch() <= 1.10, "within 10 % of scratch on code: " + m.table());
    assertTrue(m.europarlVsBase() <= 1.02, "at most 2 % worse on Europarl: " + m.table());
    // every Europarl body round-trips through the extended model; one-token pieces keep their ids
    assertEquals(0, ExtensionChecks.assertEuroparlRoundTrip(m.extended()), "no unknown token");
    int checked = ExtensionChecks.assertSingleTokenPiecesKeepIds(m.base(), m.extended(), c.europarl(), 17);
    assertTrue(checked > 1000, checked + " one-token pieces and texts checked");
  }
}
