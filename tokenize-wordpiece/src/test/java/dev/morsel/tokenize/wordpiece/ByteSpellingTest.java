package dev.morsel.tokenize.wordpiece;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSettings;
import dev.morsel.tokenize.wordpiece.internal.WordPieceTraining;
import java.io.BufferedReader;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.RepeatedTest;
import org.junit.jupiter.api.RepetitionInfo;
import org.junit.jupiter.api.Test;

/**
 * WordPiece with byte spelling: characters outside the alphabet are spelled with byte tokens (their
 * UTF-8, checked against {@link String#getBytes}) and the rest of their piece is still matched, so
 * every piece decodes to itself; without it the piece becomes the unknown token.
 */
class ByteSpellingTest {
  static final WordPieceSegmenter MODEL = train(true);

  static WordPieceSegmenter train(boolean bytes) {
    // 'z', 'Ω' and the ship (outside the BMP) are rare: a cap of 8 characters leaves them out
    PieceCounts counts = PieceCounts.of(Map.of("ferry", 40L, "Oskevik", 30L, "Harrowmere", 20L, "fez", 1L, "Ω", 1L,
        "\uD83D\uDEA2", 1L));
    return WordPieceTraining.builder().vocabularySize(400).alphabet(AlphabetPolicy.of(1.0, 12))
        .settings(WordPieceSettings.defaults().withByteSpelling(bytes)).build().segmenter(counts);
  }

  @Test
  void aLeftOutCharacterIsSpelledWithItsBytesAndTheRestOfThePieceIsMatched() {
    assertTrue(MODEL.byteSpelling());
    assertEquals(MODEL.unknownId() + 1, MODEL.id(WordPieceSettings.byteTokenText(0)), "byte tokens follow the unknown token");
    String piece = "feΩz";
    TestSupport.Encoded e = TestSupport.segmentOne(MODEL, piece, 0, piece.length());
    assertFalse(e.ids.contains(MODEL.unknownId()), e.ids.toString());
    assertEquals(piece, new String(TestSupport.decode(MODEL, e.ids.toIntArray()), StandardCharsets.UTF_8));
    // 'Ω' is U+03A9, UTF-8 CE A9: two byte tokens, each spanning the whole character [2, 3)
    int at = -1;
    for (int i = 0; i < e.ids.size(); i++) {
      if (e.ids.getInt(i) == MODEL.id(WordPieceSettings.byteTokenText(0xCE))) {
        at = i;
      }
    }
    assertTrue(at >= 0, e.ids.toString());
    assertEquals(MODEL.id(WordPieceSettings.byteTokenText(0xA9)), e.ids.getInt(at + 1));
    assertEquals(2, e.starts.getInt(at));
    assertEquals(3, e.ends.getInt(at));
    assertEquals(2, e.starts.getInt(at + 1));
    assertEquals(3, e.ends.getInt(at + 1));

    WordPieceSegmenter off = train(false);
    assertArrayEquals(new int[] {off.unknownId()}, TestSupport.segmentOne(off, piece, 0, piece.length()).ids.toIntArray());
  }

  @RepeatedTest(30)
  void everyPieceDecodesToItself(RepetitionInfo info) {
    SplittableRandom rnd = new SplittableRandom(0xB7E5L + info.getCurrentRepetition());
    String alphabet = "ferryOskvihaHmwz\u03A9\u00F8\u4E2D";
    StringBuilder b = new StringBuilder();
    int n = 1 + rnd.nextInt(40);
    for (int i = 0; i < n; i++) {
      int pick = rnd.nextInt(alphabet.length() + 1);
      if (pick == alphabet.length()) {
        b.append("\uD83D\uDEA2");
      } else {
        b.append(alphabet.charAt(pick));
      }
    }
    String piece = b.toString();
    TestSupport.Encoded e = TestSupport.segmentOne(MODEL, piece, 0, piece.length());
    assertFalse(e.ids.contains(MODEL.unknownId()), piece);
    // an independent check of the bytes: the JDK's UTF-8 encoder
    assertArrayEquals(piece.getBytes(StandardCharsets.UTF_8), TestSupport.decode(MODEL, e.ids.toIntArray()), piece);
    int prevEnd = 0;
    for (int i = 0; i < e.ids.size(); i++) {
      assertTrue(e.starts.getInt(i) <= e.ends.getInt(i) && e.starts.getInt(i) >= 0 && e.ends.getInt(i) <= piece.length());
      assertTrue(e.starts.getInt(i) >= prevEnd || e.starts.getInt(i) == e.starts.getInt(i - 1), "monotone spans");
      assertFalse(Character.isLowSurrogate(piece.charAt(e.starts.getInt(i))), "never starts inside a pair");
      prevEnd = e.ends.getInt(i);
    }
  }

  @Test
  void theModelFileAndTheReviewTextKeepByteSpelling() {
    Tokenizer t = Tokenizers.of(Pipeline.defaults(), MODEL);
    byte[] file = t.toBytes();
    WordPieceSegmenter back = (WordPieceSegmenter) Tokenizers.segmenterOf(ModelFile.read(file));
    assertTrue(back.byteSpelling());
    assertEquals(MODEL.tokens(), back.tokens());
    StringBuilder review = new StringBuilder();
    t.writeReview(review);
    assertTrue(review.toString().contains("\nbyte-spelling\ttrue\n"), review.toString());
    assertTrue(review.toString().contains("\tbyte\t" + WordPieceSettings.byteTokenText(0xCE) + "\n"), review.toString());
    assertArrayEquals(file, Tokenizers.modelFromReview(new BufferedReader(new StringReader(review.toString())), "wp"));
    // a model without byte spelling keeps the version-1 settings layout
    byte[] old = Tokenizers.of(Pipeline.defaults(), train(false)).toBytes();
    assertEquals(1, ModelFile.read(old).reader(WordPieceSegmenter.SETTINGS_TAG).getInt("version"));
    assertEquals(2, ModelFile.read(file).reader(WordPieceSegmenter.SETTINGS_TAG).getInt("version"));
  }
}
