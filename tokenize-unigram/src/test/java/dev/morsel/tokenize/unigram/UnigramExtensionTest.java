package dev.morsel.tokenize.unigram;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.train.ExtensionSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.testkit.ExtensionChecks;
import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** Unigram vocabulary extension: EM over old and new pieces, pruning among the new, every base id kept. */
class UnigramExtensionTest {
  /** Seed candidates per wanted piece in the measurement. */
  static final int CANDIDATES = 4;

  /**
   * Brute-force oracle ({@link Oracle}: every segmentation enumerated) over the extended model's
   * pieces and scores: for every new piece of at most 8 chars the model's path has the best score;
   * and every base piece that was one token of the base is still the best path of its own text.
   */
  @ParameterizedTest
  @ValueSource(longs = {1, 2, 3, 4})
  void pathsAreBestOverOldAndNewPieces(long seed) {
    SplittableRandom r = new SplittableRandom(seed);
    Map<String, Long> old = ExtensionChecks.randomWords(r, "aeiklmnorst", 400);
    Map<String, Long> fresh = ExtensionChecks.randomWords(r, "aeio{}();=xy", 400);
    Tokenizer base = UnigramLearner.builder().vocabularySize(256 + 1 + 60).threads(1).build().train(PieceCounts.of(old));
    Tokenizer ext = UnigramLearner.extender().addedIds(40).threads(1).build().extend(base, PieceCounts.of(fresh));
    ExtensionChecks.assertExtends(base, ext, 40);
    UnigramSegmenter b = UnigramSegmenter.of(base);
    UnigramSegmenter e = UnigramSegmenter.of(ext);
    Map<String, Double> vocab = new HashMap<>();
    for (int id = e.firstPieceId(); id < e.vocabularySize(); id++) {
      vocab.put(e.token(id), e.score(id));
    }
    for (String p : fresh.keySet()) {
      if (p.length() > 8) {
        continue;
      }
      double best = Oracle.all(p, vocab).stream().mapToDouble(Oracle.Path::score).max().orElseThrow();
      double got = 0;
      List<Integer> ids = new ArrayList<>();
      e.segment(p, 0, p.length(), (id, s, x) -> ids.add(id));
      for (int id : ids) {
        got += id == e.unknownId() ? Oracle.unknownScore(vocab) : e.score(id);
      }
      assertEquals(best, got, 1e-9, "piece '" + p + "' as " + ids);
    }
    for (int id = b.firstPieceId(); id < b.vocabularySize(); id++) {
      String p = b.token(id);
      Tokens was = base.encode(p);
      if (was.size() == 1 && was.id(0) == id) {
        List<Oracle.Path> all = new ArrayList<>(Oracle.all(p, vocab));
        all.sort(Comparator.comparingDouble(Oracle.Path::score).reversed());
        assertEquals(List.of("0-" + p.length() + ":" + p), all.get(0).edges(), "base piece '" + p + "' is still its best path");
      }
    }
    assertTrue(ExtensionChecks.assertSingleTokenPiecesKeepIds(base, ext, PieceCounts.of(old), seed) > 10);
    for (int id = b.firstPieceId(); id < e.vocabularySize(); id++) {
      assertTrue(Double.isFinite(e.score(id)), "score of id " + id);
    }
  }

  @Test
  void refusesWrongInputs() {
    Tokenizer base = UnigramLearner.builder().vocabularySize(300).threads(1).build().train(PieceCounts.of(Map.of(
        "ferry", 20L, "Oskevik", 4L)));
    ExtensionChecks.assertRefusesWrongInputs(Unigram.SCHEME, base, n -> UnigramLearner.extender().addedIds(n).build());
    IllegalArgumentException option = assertThrows(IllegalArgumentException.class,
        () -> Learners.extender("unigram", ExtensionSettings.of(5), "keep-share=2"));
    assertTrue(option.getMessage().contains("keep-share=2"), option.getMessage());
  }

  /**
   * See {@code BpeExtensionTest.measuredOnSourceCode}: the same corpora, sizes and goals. All three
   * models seed {@value #CANDIDATES} candidates per wanted piece instead of the default 8 (reason: the
   * seed and pruning rounds dominate the run time; the same setting for base, extension and scratch
   * keeps the comparison fair).
   */
  @Test
  void measuredOnSourceCode() {
    ExtensionChecks.Corpora c = ExtensionChecks.corpora();
    ExtensionChecks.Measured m = ExtensionChecks.measure(Unigram.SCHEME,
        size -> counts -> UnigramLearner.builder().vocabularySize(size).candidateMultiple(CANDIDATES).threads(2).build()
            .train(counts),
        base -> UnigramLearner.extender().addedIds(ExtensionChecks.ADDED_IDS).candidateMultiple(CANDIDATES).threads(2)
            .build().extend(base, c.code()));
    assertTrue(m.baseCode() > m.extendedCode(), "the extension shortens code: " + m.table());
    assertTrue(m.codeVsScratch() <= 1.10, "within 10 % of scratch on code: " + m.table());
    assertTrue(m.europarlVsBase() <= 1.02, "at most 2 % worse on Europarl: " + m.table());
    // every Europarl body round-trips through the extended model; one-token pieces keep their ids
    assertEquals(0, ExtensionChecks.assertEuroparlRoundTrip(m.extended()), "no unknown token");
    int checked = ExtensionChecks.assertSingleTokenPiecesKeepIds(m.base(), m.extended(), c.europarl(), 17);
    assertTrue(checked > 1000, checked + " one-token pieces and texts checked");
  }
}
