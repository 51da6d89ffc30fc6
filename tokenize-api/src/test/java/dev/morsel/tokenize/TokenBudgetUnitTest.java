package dev.morsel.tokenize;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.hardening.kit.TokenBudgets;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** {@link Tokenizer#count} and {@link Tokenizer#cutToFit} on the byte segmenter (one token per UTF-8 byte). */
class TokenBudgetUnitTest {
  private static Tokenizer bytes(Normalization.Form form) {
    return Tokenizers.of(Pipeline.of(Normalization.of(form), Splitting.runs()), new ByteSegmenter(0));
  }

  @Test
  void aCutNeverSeparatesTokensOfOneSourceChunk() {
    // NFKC expands U+FB01 LATIN SMALL LIGATURE FI to "fi" (UAX #15; its compatibility decomposition
    // in UnicodeData.txt): both byte tokens map to the one source character [0, 1).
    Tokenizer t = bytes(Normalization.Form.NFKC);
    String text = "\ufb01ne";
    assertEquals(4, t.count(text));
    assertEquals(0, t.cutToFit(text, 1), "one token would split the ligature: nothing fits");
    assertEquals(1, t.cutToFit(text, 2));
    assertEquals(2, t.cutToFit(text, 3));
    assertEquals(3, t.cutToFit(text, 4));
    assertEquals(3, t.cutToFit(text, 400));
  }

  @Test
  void bytesOfOneCharacterStayTogether() {
    Tokenizer t = bytes(Normalization.Form.NFC);
    String text = "\u00e9\ud83d\udea2x"; // é = 2 UTF-8 bytes, the ship = 4
    assertEquals(7, t.count(text));
    assertEquals(0, t.cutToFit(text, 1));
    assertEquals(1, t.cutToFit(text, 2));
    assertEquals(1, t.cutToFit(text, 5));
    assertEquals(3, t.cutToFit(text, 6));
    assertEquals(4, t.cutToFit(text, 7));
  }

  @Test
  void framingMarkersCountAgainstTheBudget() {
    ReservedTokens r = ReservedTokens.builder().add("\u27e6go\u27e7", 256).add("\u27e6halt\u27e7", 257).build();
    Tokenizer t = Tokenizers.of(Pipeline.of(Normalization.none(), Splitting.runs()), new ByteSegmenter(2), r,
        Template.of(List.of("\u27e6go\u27e7"), List.of(), List.of("\u27e6halt\u27e7")));
    assertEquals(7, t.count("ferry"));
    assertEquals(3, t.cutToFit("ferry", 5));
    assertEquals(0, t.cutToFit("ferry", 2));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> t.cutToFit("ferry", 1));
    assertTrue(e.getMessage().contains("budget=1"), e.getMessage());
  }

  @Test
  void randomTextsAgreeWithEncode() {
    SplittableRandom r = new SplittableRandom(11);
    List<String> texts = new ArrayList<>();
    for (int i = 0; i < 600; i++) {
      texts.add(TokenizerTest.randomText(r, 30));
    }
    for (Normalization.Form form : Normalization.Form.values()) {
      assertTrue(TokenBudgets.check(bytes(form), texts, form.name()) > 300);
    }
  }
}
