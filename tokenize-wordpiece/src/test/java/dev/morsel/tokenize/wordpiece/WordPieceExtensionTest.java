package dev.morsel.tokenize.wordpiece;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.train.ExtensionSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.testkit.ExtensionChecks;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSegmenter;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** WordPiece vocabulary extension: units by likelihood gain on the new corpus, every base id kept. */
class WordPieceExtensionTest {

  /**
   * Oracle for the first new unit, computed naively here from the criterion's definition: write each
   * new piece with the base by greedy longest match ({@link TestSupport.NaiveGreedy}), count units
   * and adjacent pairs, score every pair by {@code count(ab) * ln(count(ab) * N / (count(a) * count(b)))}
   * and take the best whose unit the base lacks (ties: higher count, then the spellings). The new
   * alphabet is the base's, so the first new id is that unit. Then the extended model encodes every
   * new piece as naive greedy longest match over its own tokens.
   */
  @ParameterizedTest
  @ValueSource(longs = {1, 2, 3, 4, 5})
  void firstNewUnitHasTheBestGain(long seed) {
    SplittableRandom r = new SplittableRandom(seed);
    String alphabet = "aeiklmnorst";
    Map<String, Long> old = ExtensionChecks.randomWords(r, alphabet, 300);
    old.put(alphabet, 1L); // every letter in both forms
    old.put("t" + new StringBuilder(alphabet).reverse(), 1L);
    Map<String, Long> fresh = ExtensionChecks.randomWords(r, "aeiost", 300);
    Tokenizer base = WordPieceLearner.builder().vocabularySize(70).build().train(PieceCounts.of(old));
    Tokenizer ext = WordPieceLearner.extender().addedIds(20).build().extend(base, PieceCounts.of(fresh));
    ExtensionChecks.assertExtends(base, ext, 20);
    WordPieceSegmenter b = (WordPieceSegmenter) Tokenizers.segmenterOf(base);
    WordPieceSegmenter e = (WordPieceSegmenter) Tokenizers.segmenterOf(ext);
    String marker = b.settings().marker();
    TestSupport.NaiveGreedy greedy = new TestSupport.NaiveGreedy(b.tokens(), b.reservedCount(), marker, 1 << 20);
    Map<Integer, Long> unit = new HashMap<>();
    Map<List<Integer>, Long> pair = new HashMap<>();
    long total = 0;
    for (Map.Entry<String, Long> w : fresh.entrySet()) {
      int[] ids = greedy.segment(w.getKey());
      for (int i = 0; i < ids.length; i++) {
        unit.merge(ids[i], w.getValue(), Long::sum);
        total += w.getValue();
        if (i + 1 < ids.length) {
          pair.merge(List.of(ids[i], ids[i + 1]), w.getValue(), Long::sum);
        }
      }
    }
    String best = null;
    double bestScore = Double.NEGATIVE_INFINITY;
    long bestCount = 0;
    String bestA = null;
    String bestB = null;
    for (Map.Entry<List<Integer>, Long> p : pair.entrySet()) {
      String a = b.token(p.getKey().get(0));
      String bb = b.token(p.getKey().get(1));
      String made = a + bb.substring(marker.length());
      if (b.id(made) >= 0) {
        continue;
      }
      long cab = p.getValue();
      double score = cab * Math.log((double) cab * total / ((double) unit.get(p.getKey().get(0)) * unit.get(p.getKey().get(1))));
      boolean better = score > bestScore || score == bestScore && (cab > bestCount || cab == bestCount
          && (a.compareTo(bestA) < 0 || a.equals(bestA) && bb.compareTo(bestB) < 0));
      if (better) {
        best = made;
        bestScore = score;
        bestCount = cab;
        bestA = a;
        bestB = bb;
      }
    }
    assertEquals(best, ext.token(base.vocabularySize()), "the first new unit");
    TestSupport.NaiveGreedy extGreedy = new TestSupport.NaiveGreedy(e.tokens(), e.reservedCount(), marker, e.pieceLimit());
    for (String p : fresh.keySet()) {
      assertArrayEquals(extGreedy.segment(p), TestSupport.segmentOne(e, p, 0, p.length()).ids.toIntArray(), p);
    }
    assertTrue(ExtensionChecks.assertSingleTokenPiecesKeepIds(base, ext, PieceCounts.of(old), seed) > 10);
  }

  /** Code points the base lacks are added in both forms, so new pieces that held them encode. */
  @Test
  void addsCodePointsTheBaseLacks() {
    Tokenizer base = WordPieceLearner.builder().vocabularySize(60).build().train(PieceCounts.of(Map.of(
        "ferry", 20L, "quay", 5L, "Oskevik", 4L)));
    assertEquals(base.unknownId(), base.encode("{}").id(0));
    Tokenizer ext = WordPieceLearner.extender().addedIds(40).build().extend(base, PieceCounts.of(Map.of(
        "{}", 30L, "ferry{}", 10L, "\u00e5", 2L)));
    ExtensionChecks.assertExtends(base, ext, 40);
    assertTrue(ext.id("{") >= base.vocabularySize() && ext.id("\u00e5") >= base.vocabularySize());
    for (String text : List.of("{}", "ferry{}", "\u00e5")) {
      for (int id : ext.encode(text).ids()) {
        assertTrue(id != ext.unknownId(), "no unknown token in " + text);
      }
    }
  }

  @Test
  void refusesWrongInputs() {
    Tokenizer base = WordPieceLearner.builder().vocabularySize(60).build().train(PieceCounts.of(Map.of(
        "ferry", 20L, "Oskevik", 4L)));
    ExtensionChecks.assertRefusesWrongInputs(WordPiece.SCHEME, base, n -> WordPieceLearner.extender().addedIds(n).build());
    IllegalArgumentException marker = assertThrows(IllegalArgumentException.class,
        () -> Learners.extender("wordpiece", ExtensionSettings.of(5), "marker=~").extend(base,
            PieceCounts.of(Map.of("deck", 3L))));
    assertTrue(marker.getMessage().contains("marker=~"), marker.getMessage());
    IllegalArgumentException nothing = assertThrows(IllegalArgumentException.class,
        () -> WordPieceLearner.extender().addedIds(5).build().extend(base, PieceCounts.of(Map.of("ferry", 3L))));
    assertTrue(nothing.getMessage().contains("no new unit"), nothing.getMessage());
  }

  /** See {@code BpeExtensionTest.measuredOnSourceCode}: the same corpora, sizes and goals. */
  @Test
  void measuredOnSourceCode() {
    ExtensionChecks.Corpora c = ExtensionChecks.corpora();
    ExtensionChecks.Measured m = ExtensionChecks.measure(WordPiece.SCHEME,
        size -> counts -> WordPieceLearner.builder().vocabularySize(size).build().train(counts),
        base -> WordPieceLearner.extender().addedIds(ExtensionChecks.ADDED_IDS).build().extend(base, c.code()));
    assertTrue(m.baseCode() > m.extendedCode(), "the extension shortens code: " + m.table());
    assertTrue(m.codeVsScratch() <= 1.10, "within 10 % of scratch on code: " + m.table());
    assertTrue(m.europarlVsBase() <= 1.02, "at most 2 % worse on Europarl: " + m.table());
    // every Europarl body round-trips through the extended model; one-token pieces keep their ids
    int unknown = ExtensionChecks.assertEuroparlRoundTrip(m.extended());
    assertTrue(unknown < 17_597 / 2, unknown + " bodies hold an unknown token");
    int checked = ExtensionChecks.assertSingleTokenPiecesKeepIds(m.base(), m.extended(), c.europarl(), 17);
    assertTrue(checked > 1000, checked + " one-token pieces and texts checked");
  }
}
