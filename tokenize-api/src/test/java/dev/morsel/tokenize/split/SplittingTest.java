package dev.morsel.tokenize.split;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;

/** Worked examples of each mode, set in the passenger messages of a fictional island ferry line. */
class SplittingTest {

  static List<String> pieces(Splitting s, String text) {
    List<String> out = new ArrayList<>();
    s.split(text, 0, text.length(), (a, b) -> out.add(text.substring(a, b)));
    return out;
  }

  private static void assertRules(String text, String... expected) {
    assertEquals(List.of(expected), pieces(Splitting.rules(), text), () -> "rules:3 of '" + text + "'");
  }

  @Test
  void lettersTakeOneLeadingSpace() {
    assertRules("The ferry to Skarvoy leaves", "The", " ferry", " to", " Skarvoy", " leaves");
  }

  @Test
  void severalSpacesGiveTheLastOneToTheWord() {
    assertRules("gate   B", "gate", "  ", " B");
    assertRules("gate\t B", "gate", "\t", " B");
    assertRules("gate \tB", "gate", " \t", "B");
  }

  @Test
  void trailingAndLeadingSpaceRuns() {
    assertRules("delayed  ", "delayed", "  ");
    assertRules(" delayed", " delayed");
    assertRules("   ", "   ");
  }

  @Test
  void newlinesFormTheirOwnPiecesAndDoNotLendSpace() {
    assertRules("Pier 4\n\nBoarding now", "Pier", " 4", "\n\n", "Boarding", " now");
    assertRules("Pier\r\n ferry", "Pier", "\r\n", " ferry");
    assertRules("a\u2028b", "a", "\u2028", "b");
  }

  @Test
  void digitsGroupFromTheStartOfTheRun() {
    assertRules("ticket 1234567", "ticket", " 123", "456", "7");
    assertRules("07:45", "07", ":", "45");
    assertEquals(List.of("12", "34", "5"), pieces(Splitting.rules(2), "12345"));
    assertEquals(List.of("1", "2"), pieces(Splitting.rules(1), "12"));
    // Arabic-Indic digits are Nd too (U+0661..U+0663)
    assertRules("\u0661\u0662\u0663\u0661", "\u0661\u0662\u0663", "\u0661");
    assertRules("deck2", "deck", "2");
  }

  @Test
  void apostropheIsPunctuationEvenInsideAWord() {
    assertRules("captain's log", "captain", "'", "s", " log");
    assertRules("Stop!!! Now...", "Stop", "!!!", " Now", "...");
  }

  @Test
  void symbolsAndEmojiSequencesStayWhole() {
    // U+26F4 FERRY, U+FE0F VS16; U+1F44D THUMBS UP + U+1F3FD skin tone; man+ZWJ+woman+ZWJ+girl
    assertRules("ok \u26F4\uFE0F", "ok", " \u26F4\uFE0F");
    assertRules("ok\uD83D\uDC4D\uD83C\uDFFD", "ok", "\uD83D\uDC4D\uD83C\uDFFD");
    String family = "\uD83D\uDC68\u200D\uD83D\uDC69\u200D\uD83D\uDC67";
    assertRules("we " + family + "!", "we", " " + family, "!");
    assertRules("\u20AC12+3", "\u20AC", "12", "+", "3");
    // UAX #29 GB11: ZWJ joins a pictograph only after a pictograph (U+203C is punctuation and
    // Extended_Pictographic); after a letter or an ideograph the ZWJ stays behind as a mark
    assertRules("\u203C\u200D\uD83D\uDEA2", "\u203C\u200D\uD83D\uDEA2");
    assertRules("\uD83D\uDEA2\u0301\u200D\uD83D\uDEA2", "\uD83D\uDEA2\u0301\u200D\uD83D\uDEA2");
    assertRules("a\u200D\uD83D\uDEA2", "a\u200D", "\uD83D\uDEA2");
    assertRules("\u6E2F\u200D\uD83D\uDEA2", "\u6E2F\u200D", "\uD83D\uDEA2");
  }

  @Test
  void marksStayWithTheirBase() {
    assertRules("cafe\u0301 open", "cafe\u0301", " open");
    assertRules("\u0301\u0301x", "\u0301\u0301", "x");
    assertRules("a \u0301", "a", " \u0301");
    assertRules("7\uFE0F\u20E3 deck", "7\uFE0F\u20E3", " deck");
  }

  @Test
  void eachIdeographAloneKanaRunsAreLetters() {
    assertRules("\u6E2F\u53E3 \u6E21\u8239", "\u6E2F", "\u53E3", " \u6E21", "\u8239");
    assertRules("\u306E\u308A\u3070\u6E2F", "\u306E\u308A\u3070", "\u6E2F");
    // supplementary ideograph U+20000 stays one piece of two chars
    assertRules("\uD840\uDC00\uD840\uDC00", "\uD840\uDC00", "\uD840\uDC00");
  }

  @Test
  void otherCategoriesAndDamageRunAlone() {
    assertRules("x\uFFFD\uFFFD?", "x", "\uFFFD\uFFFD", "?");
    assertRules("a\uD800b", "a", "\uD800", "b");
    assertRules("a\uDC00\uDC00b", "a", "\uDC00\uDC00", "b");
    assertRules("ab\u00ADcd", "ab", "\u00AD", "cd");
    assertRules("\uE000\uE001z", "\uE000\uE001", "z");
    assertRules("x\u0001\u0002y", "x", "\u0001\u0002", "y");
    assertRules("Deck \u2162", "Deck", " \u2162");
  }

  @Test
  void subRangeUsesAbsoluteIndices() {
    String text = "xx ferry yy";
    List<int[]> got = new ArrayList<>();
    Splitting.rules().split(text, 2, 8, (a, b) -> got.add(new int[] {a, b}));
    assertEquals(1, got.size());
    assertEquals(2, got.get(0)[0]);
    assertEquals(8, got.get(0)[1]);
    // a pair cut by the range end is treated as an unpaired surrogate, never read past the end
    String ship = "a\uD83D\uDEA2";
    List<String> cut = new ArrayList<>();
    Splitting.rules().split(ship, 0, 2, (a, b) -> cut.add(ship.substring(a, b)));
    assertEquals(List.of("a", "\uD83D"), cut);
  }

  @Test
  void wordsMode() {
    // UAX #29: WB6/WB7 keep the apostrophe (MidNumLet) inside the word, WB11/WB12 keep "07.45"
    // together, while a colon (MidLetter) between digits is a boundary
    assertEquals(List.of("The", " ", "ferry's", " ", "07.45", " ", "or", " ", "07", ":", "45", "."),
        pieces(Splitting.words(), "The ferry's 07.45 or 07:45."));
  }

  @Test
  void whitespaceMode() {
    assertEquals(List.of("Pier", " \u3000", "4,", "\n", "ok\uD83D\uDEA2"),
        pieces(Splitting.whitespace(), "Pier \u30004,\nok\uD83D\uDEA2"));
  }

  @Test
  void noneMode() {
    assertEquals(List.of("Pier 4, gate B"), pieces(Splitting.none(), "Pier 4, gate B"));
    assertEquals(List.of(), pieces(Splitting.none(), ""));
    for (Splitting s : List.of(Splitting.rules(), Splitting.words(), Splitting.whitespace(), Splitting.none())) {
      assertEquals(List.of(), pieces(s, ""), s.spec());
    }
  }

  @Test
  void specsRoundTrip() {
    for (Splitting s : List.of(Splitting.rules(), Splitting.rules(1), Splitting.rules(64), Splitting.words(),
        Splitting.whitespace(), Splitting.none())) {
      Splitting back = Splitting.parse(s.spec());
      assertEquals(s, back);
      assertEquals(s.hashCode(), back.hashCode());
      assertEquals(s.mode(), back.mode());
    }
    assertEquals("rules:3", Splitting.rules().spec());
    assertEquals(3, Splitting.rules().maxDigits());
    assertEquals(Splitting.Mode.WORDS, Splitting.parse("words").mode());
    assertSame(Splitting.none(), Splitting.parse("none"));
    assertNotEquals(Splitting.rules(2), Splitting.rules(3));
  }

  @ParameterizedTest
  @ValueSource(strings = {"", "rules", "rules:", "rules:0", "rules:65", "rules:03", "rules:+3", "rules:x",
      "Words", " words", "whitespace ", "rule:3", "nones"})
  void parseRejectsOtherSpecs(String spec) {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Splitting.parse(spec));
    assertTrue(e.getMessage().contains("'" + spec + "'"), e.getMessage());
  }

  @Test
  void maxDigitsIsChecked() {
    for (int bad : new int[] {0, -1, 65, Integer.MAX_VALUE}) {
      IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Splitting.rules(bad));
      assertTrue(e.getMessage().contains("maxDigits=" + bad), e.getMessage());
    }
  }

  @Test
  void badRangesAreRejected() {
    PieceSink sink = (a, b) -> {};
    assertThrows(IndexOutOfBoundsException.class, () -> Splitting.rules().split("ferry", -1, 2, sink));
    assertThrows(IndexOutOfBoundsException.class, () -> Splitting.rules().split("ferry", 3, 2, sink));
    assertThrows(IndexOutOfBoundsException.class, () -> Splitting.words().split("ferry", 0, 6, sink));
    assertThrows(NullPointerException.class, () -> Splitting.rules().split(null, 0, 0, sink));
  }

  @Test
  void longLetterRunIsOnePiece() {
    String run = "a".repeat(1 << 20);
    assertEquals(1, pieces(Splitting.rules(), run).size());
  }
}
