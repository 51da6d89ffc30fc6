package dev.morsel.tokenize.review;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.unigram.UnigramLearner;
import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import java.io.BufferedReader;
import java.io.StringReader;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Review text export then import gives a unigram model with the same fingerprint: with reserved
 * tokens, with and without byte tokens, with characters outside the BMP and tabs, line breaks and
 * backslashes inside pieces, and with scores that only an exact decimal form keeps.
 */
class UnigramReviewRoundTripTest {
  private static final String AGENT = "\u27E8agent\u27E9";
  private static final String SHIP = "\uD83D\uDEA2"; // U+1F6A2 SHIP, outside the BMP

  private static String review(Tokenizer t) {
    StringBuilder sb = new StringBuilder();
    t.writeReview(sb);
    return sb.toString();
  }

  private static byte[] importText(String text) {
    return Tokenizers.modelFromReview(new BufferedReader(new StringReader(text)), "ferry.tsv");
  }

  private static void assertRoundTrip(Tokenizer t, List<String> texts) {
    String text = review(t);
    byte[] back = importText(text);
    assertEquals(t.fingerprint(), ModelFile.read(back).fingerprint(), "fingerprint after export and import");
    assertArrayEquals(t.toBytes(), back, "the same model file, byte for byte");
    Tokenizer u = Tokenizers.load(back);
    for (String s : texts) {
      assertArrayEquals(t.encode(s).ids(), u.encode(s).ids(), s);
    }
    assertEquals(text, review(u));
  }

  @ParameterizedTest
  @ValueSource(booleans = {false, true})
  void trainedModelRoundTrips(boolean byteSpelling) {
    List<String> texts = new ArrayList<>();
    for (int i = 0; i < 30; i++) {
      texts.add("Oskevik\tquay " + i + "\nHarrowmere " + SHIP + " C:\\berth\\7 " + SHIP + SHIP);
    }
    texts.addAll(Europarl.bodies().subList(0, 300));
    Pipeline p = Pipeline.of(Normalization.parse("nfkc"), Splitting.whitespace());
    Tokenizer t = UnigramLearner.builder().vocabularySize(900).byteSpelling(byteSpelling).reservedTokens(List.of(AGENT))
        .threads(1).build().train(PieceCounter.builder().pipeline(p).threads(1).build().count(texts))
        .withTemplate(Template.of(List.of(AGENT), List.of(), List.of()));
    String text = review(t);
    assertTrue(text.contains("\u00A7 vocabulary\tid\tkind\ttoken\tscore\n0\treserved\t" + AGENT + "\t\n"), text);
    assertEquals(byteSpelling, text.contains("\n1\tbyte\t\\{U+0000}\t\n"), "byte rows exactly when bytes are on");
    assertRoundTrip(t, texts.subList(0, 80));
  }

  @Test
  void awkwardPiecesAndExactScoresRoundTrip() {
    List<String> pieces = List.of("a\tb", "\r\n", "C:\\berth", SHIP, "q", "u", "a", "y", "\u00A7", "quay");
    double[] scores = {-0.1, -1e-300, -Double.MIN_VALUE, -0.0, -3.2188758248682006, -1.0 / 3, -7e22, -2.5,
        -Math.PI, -12.000000000000002};
    UnigramSegmenter m = UnigramSegmenter.create(List.of(AGENT), true, "\u2983?\u2984", pieces, scores);
    Tokenizer t = Tokenizers.of(Pipeline.defaults(), m);
    String text = review(t);
    assertTrue(text.contains("\ta\\tb\t-0.1\n") && text.contains("\t\\r\\n\t-1.0E-300\n")
        && text.contains("\tC:\\\\berth\t-4.9E-324\n") && text.contains("\t" + SHIP + "\t-0.0\n")
        && text.contains("\t\\{U+00A7}\t-3.141592653589793\n") && text.contains("\tquay\t-12.000000000000002\n"), text);
    assertRoundTrip(t, List.of("quay a\tb C:\\berth " + SHIP + "\r\n", "\u00A7 x"));
    UnigramSegmenter back = (UnigramSegmenter) Tokenizers.segmenterOf(ModelFile.read(importText(text)));
    for (int i = 0; i < pieces.size(); i++) {
      assertEquals(Double.doubleToRawLongBits(scores[i]), Double.doubleToRawLongBits(back.score(back.firstPieceId() + i)),
          "score of " + pieces.get(i) + " bit for bit");
    }
  }

  @Test
  void malformedRowsAreRefusedNamingLineAndColumn() {
    UnigramSegmenter m = UnigramSegmenter.create(List.of(AGENT), false, "\u2983?\u2984", List.of("quay", "q"), new double[] {-1, -2});
    String text = review(Tokenizers.of(Pipeline.defaults(), m));
    String[] lines = text.split("\n");
    int quay = List.of(lines).indexOf("2\tpiece\tquay\t-1.0") + 1;
    assertTrue(quay > 0, text);
    String[][] cases = {
        {"2\tpiece\tquay\tNaN", "column 4 (score): 'NaN' is not a decimal number"},
        {"2\tpiece\tquay\t1e400", "column 4 (score): '1e400' is not a decimal number"},
        {"2\tpiece\tquay\t1.0E400", "column 4 (score): '1.0E400' is outside the range of a double"},
        {"2\tpiece\tquay\t", "column 4 (score): '' is not a decimal number"},
        {"2\tpiece\tq\t-1.0", "column 3 (token): 'q' duplicates the spelling of id 2", "+1"},
        {"2\tbyte\tquay\t-1.0", "column 2 (kind): id 2 follows the unknown row, so it must be a piece"},
        {"2\tpiece\tquay", "the row has 3 columns, section vocabulary has 4"},
        {"2\tpiece\tqu ay\t-1.0", "column 3 (token): character 3: character U+0020 must be written as an escape"},
        // ED A0 80 would encode the surrogate U+D800 (Unicode 15.0, Table 3-7: ED is followed by 80..9F)
        {"2\tpiece\tqu\\{ED}\\{A0}\\{80}ay\t-1.0", "column 3 (token): the bytes qu\\{ED}\\{A0}\\{80}ay are not well-formed"},
        {"2\tpiece\tqu\\{D800}ay\t-1.0", "column 3 (token): character 3: \\{..} needs two hex digits"},
        {"2\tpiece\tqu\\{U+D800}ay\t-1.0", "column 3 (token): character 3: U+D800 is not a Unicode scalar value"},
        {"7\tpiece\tquay\t-1.0", "column 1 (id): 7 is outside [0, 3]"},
    };
    for (String[] c : cases) {
      String[] copy = lines.clone();
      copy[quay - 1] = c[0];
      ModelFormatException e = assertThrows(ModelFormatException.class, () -> importText(String.join("\n", copy) + "\n"),
          c[0]);
      // a repeated spelling is reported at the later of the two rows
      assertEquals("ferry.tsv:" + (quay + (c.length > 2 ? 1 : 0)), e.section(), e.getMessage());
      assertTrue(e.getMessage().contains(c[1]), "'" + e.getMessage() + "' lacks '" + c[1] + "'");
    }
  }

  /** Scores in random bit patterns survive the decimal column exactly (Double.toString round trip). */
  @ParameterizedTest
  @ValueSource(longs = {3, 1789, 20260301})
  void randomScoresSurviveBitForBit(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    List<String> pieces = new ArrayList<>();
    double[] scores = new double[200];
    for (int i = 0; i < scores.length; i++) {
      pieces.add("p" + i);
      double v;
      do {
        v = -Math.abs(Double.longBitsToDouble(rnd.nextLong()));
      } while (!Double.isFinite(v));
      scores[i] = v;
    }
    UnigramSegmenter m = UnigramSegmenter.create(List.of(), false, "\u2983?\u2984", pieces, scores);
    assertRoundTrip(Tokenizers.of(Pipeline.defaults(), m), List.of("p1 p22 p199"));
  }
}
