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

  /** The default class runs ({@code runs:space=next,digits=whole}). */
  private static void assertRuns(String text, String... expected) {
    assertEquals(List.of(expected), pieces(Splitting.runs(), text), () -> Splitting.runs().spec() + " of '" + text + "'");
  }

  private static void assertRuns(Splitting.Space space, int digitGroup, String text, String... expected) {
    Splitting s = Splitting.runs(space, digitGroup);
    assertEquals(List.of(expected), pieces(s, text), () -> s.spec() + " of '" + text + "'");
  }

  @Test
  void lettersTakeOneLeadingSpace() {
    assertRuns("The ferry to Skarvoy leaves", "The", " ferry", " to", " Skarvoy", " leaves");
  }

  @Test
  void severalSpacesGiveTheLastOneToTheWord() {
    assertRuns("gate   B", "gate", "  ", " B");
    assertRuns("gate\t B", "gate", "\t", " B");
    assertRuns("gate \tB", "gate", " \t", "B");
  }

  @Test
  void trailingAndLeadingSpaceRuns() {
    assertRuns("delayed  ", "delayed", "  ");
    assertRuns(" delayed", " delayed");
    assertRuns("   ", "   ");
  }

  @Test
  void newlinesFormTheirOwnPiecesAndDoNotLendSpace() {
    assertRuns("Pier 4\n\nBoarding now", "Pier", " 4", "\n\n", "Boarding", " now");
    assertRuns("Pier\r\n ferry", "Pier", "\r\n", " ferry");
    assertRuns("a\u2028b", "a", "\u2028", "b");
  }

  @Test
  void digitRunsStayWholeByDefault() {
    assertRuns("ticket 1234567", "ticket", " 1234567");
    assertRuns("07:45", "07", ":", "45");
    // Arabic-Indic digits are Nd too (U+0661..U+0663)
    assertRuns("\u0661\u0662\u0663\u0661", "\u0661\u0662\u0663\u0661");
    assertRuns("deck2", "deck", "2");
    assertRuns("x" + "9".repeat(1000) + "y", "x", "9".repeat(1000), "y");
  }

  @Test
  void digitsGroupFromTheStartOfTheRun() {
    assertRuns(Splitting.Space.NEXT, 3, "ticket 1234567", "ticket", " 123", "456", "7");
    assertRuns(Splitting.Space.NEXT, 3, "\u0661\u0662\u0663\u0661", "\u0661\u0662\u0663", "\u0661");
    assertRuns(Splitting.Space.NEXT, 2, "12345", "12", "34", "5");
    assertRuns(Splitting.Space.NEXT, 1, "12", "1", "2");
    assertRuns(Splitting.Space.OWN, 2, "\u20AC12345", "\u20AC", "12", "34", "5");
    // a mark stays in its digit's group and does not count as a digit (U+20E3 keycap)
    assertRuns(Splitting.Space.NEXT, 1, "7\u20E38", "7\u20E3", "8");
  }

  @Test
  void ownSpacePolicyKeepsSpaceRunsApart() {
    assertRuns(Splitting.Space.OWN, 0, "The ferry to Skarvoy", "The", " ", "ferry", " ", "to", " ", "Skarvoy");
    assertRuns(Splitting.Space.OWN, 0, "gate   B", "gate", "   ", "B");
    assertRuns(Splitting.Space.OWN, 0, " delayed ", " ", "delayed", " ");
    assertRuns(Splitting.Space.OWN, 0, "Pier 4\n\nBoarding", "Pier", " ", "4", "\n\n", "Boarding");
    assertRuns(Splitting.Space.OWN, 0, "a \u0301", "a", " ", "\u0301");
  }

  @Test
  void previousSpacePolicyGivesTheFirstSpaceToTheWordBefore() {
    assertRuns(Splitting.Space.PREVIOUS, 0, "The ferry to Skarvoy", "The ", "ferry ", "to ", "Skarvoy");
    assertRuns(Splitting.Space.PREVIOUS, 0, "gate   B", "gate ", "  ", "B");
    assertRuns(Splitting.Space.PREVIOUS, 0, "gate\t B", "gate", "\t ", "B");
    assertRuns(Splitting.Space.PREVIOUS, 0, "gate \tB", "gate ", "\t", "B");
    assertRuns(Splitting.Space.PREVIOUS, 0, " delayed ", " ", "delayed ");
    assertRuns(Splitting.Space.PREVIOUS, 0, "Pier 4 \n ok", "Pier ", "4 ", "\n", " ", "ok");
    assertRuns(Splitting.Space.PREVIOUS, 3, "ticket 1234567 now", "ticket ", "123", "456", "7 ", "now");
    assertRuns(Splitting.Space.PREVIOUS, 0, "\u6E2F\u53E3 \u6E21", "\u6E2F", "\u53E3 ", "\u6E21");
    assertRuns(Splitting.Space.PREVIOUS, 0, "a \u0301", "a ", "\u0301");
  }

  @Test
  void apostropheIsPunctuationEvenInsideAWord() {
    assertRuns("captain's log", "captain", "'", "s", " log");
    assertRuns("Stop!!! Now...", "Stop", "!!!", " Now", "...");
  }

  @Test
  void symbolsAndEmojiSequencesStayWhole() {
    // U+26F4 FERRY, U+FE0F VS16; U+1F44D THUMBS UP + U+1F3FD skin tone; man+ZWJ+woman+ZWJ+girl
    assertRuns("ok \u26F4\uFE0F", "ok", " \u26F4\uFE0F");
    assertRuns("ok\uD83D\uDC4D\uD83C\uDFFD", "ok", "\uD83D\uDC4D\uD83C\uDFFD");
    String family = "\uD83D\uDC68\u200D\uD83D\uDC69\u200D\uD83D\uDC67";
    assertRuns("we " + family + "!", "we", " " + family, "!");
    assertRuns("\u20AC12+3", "\u20AC", "12", "+", "3");
    // UAX #29 GB11: ZWJ joins a pictograph only after a pictograph (U+203C is punctuation and
    // Extended_Pictographic); after a letter or an ideograph the ZWJ stays behind as a mark
    assertRuns("\u203C\u200D\uD83D\uDEA2", "\u203C\u200D\uD83D\uDEA2");
    assertRuns("\uD83D\uDEA2\u0301\u200D\uD83D\uDEA2", "\uD83D\uDEA2\u0301\u200D\uD83D\uDEA2");
    assertRuns("a\u200D\uD83D\uDEA2", "a\u200D", "\uD83D\uDEA2");
    assertRuns("\u6E2F\u200D\uD83D\uDEA2", "\u6E2F\u200D", "\uD83D\uDEA2");
  }

  @Test
  void marksStayWithTheirBase() {
    assertRuns("cafe\u0301 open", "cafe\u0301", " open");
    assertRuns("\u0301\u0301x", "\u0301\u0301", "x");
    assertRuns("a \u0301", "a", " \u0301");
    assertRuns("7\uFE0F\u20E3 deck", "7\uFE0F\u20E3", " deck");
  }

  @Test
  void eachIdeographAloneKanaRunsAreLetters() {
    assertRuns("\u6E2F\u53E3 \u6E21\u8239", "\u6E2F", "\u53E3", " \u6E21", "\u8239");
    assertRuns("\u306E\u308A\u3070\u6E2F", "\u306E\u308A\u3070", "\u6E2F");
    // supplementary ideograph U+20000 stays one piece of two chars
    assertRuns("\uD840\uDC00\uD840\uDC00", "\uD840\uDC00", "\uD840\uDC00");
  }

  @Test
  void otherCategoriesAndDamageRunAlone() {
    assertRuns("x\uFFFD\uFFFD?", "x", "\uFFFD\uFFFD", "?");
    assertRuns("a\uD800b", "a", "\uD800", "b");
    assertRuns("a\uDC00\uDC00b", "a", "\uDC00\uDC00", "b");
    assertRuns("ab\u00ADcd", "ab", "\u00AD", "cd");
    assertRuns("\uE000\uE001z", "\uE000\uE001", "z");
    assertRuns("x\u0001\u0002y", "x", "\u0001\u0002", "y");
    assertRuns("Deck \u2162", "Deck", " \u2162");
  }

  @Test
  void subRangeUsesAbsoluteIndices() {
    String text = "xx ferry yy";
    List<int[]> got = new ArrayList<>();
    Splitting.runs().split(text, 2, 8, (a, b) -> got.add(new int[] {a, b}));
    assertEquals(1, got.size());
    assertEquals(2, got.get(0)[0]);
    assertEquals(8, got.get(0)[1]);
    // a pair cut by the range end is treated as an unpaired surrogate, never read past the end
    String ship = "a\uD83D\uDEA2";
    List<String> cut = new ArrayList<>();
    Splitting.runs().split(ship, 0, 2, (a, b) -> cut.add(ship.substring(a, b)));
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
    for (Splitting s : List.of(Splitting.runs(), Splitting.words(), Splitting.whitespace(), Splitting.none())) {
      assertEquals(List.of(), pieces(s, ""), s.spec());
    }
  }

  @Test
  void specsRoundTrip() {
    for (Splitting s : List.of(Splitting.runs(), Splitting.runs(Splitting.Space.NEXT, 1),
        Splitting.runs(Splitting.Space.OWN, 64), Splitting.runs(Splitting.Space.PREVIOUS, Splitting.WHOLE_DIGIT_RUNS),
        Splitting.words(), Splitting.whitespace(), Splitting.none())) {
      Splitting back = Splitting.parse(s.spec());
      assertEquals(s, back);
      assertEquals(s.hashCode(), back.hashCode());
      assertEquals(s.mode(), back.mode());
    }
    assertEquals("runs:space=next,digits=whole", Splitting.runs().spec());
    assertEquals(Splitting.WHOLE_DIGIT_RUNS, Splitting.runs().digitGroup());
    assertEquals(Splitting.Space.NEXT, Splitting.runs().space());
    assertEquals(Splitting.Mode.RUNS, Splitting.runs().mode());
    assertEquals("runs:space=own,digits=3", Splitting.runs(Splitting.Space.OWN, 3).spec());
    assertEquals("runs:space=previous,digits=64", Splitting.runs(Splitting.Space.PREVIOUS, 64).spec());
    Splitting parsed = Splitting.parse("runs:space=previous,digits=2");
    assertEquals(Splitting.Space.PREVIOUS, parsed.space());
    assertEquals(2, parsed.digitGroup());
    assertEquals(Splitting.Space.OWN, Splitting.words().space());
    assertEquals(Splitting.WHOLE_DIGIT_RUNS, Splitting.whitespace().digitGroup());
    assertEquals(Splitting.Mode.WORDS, Splitting.parse("words").mode());
    assertSame(Splitting.none(), Splitting.parse("none"));
    assertNotEquals(Splitting.runs(Splitting.Space.NEXT, 2), Splitting.runs(Splitting.Space.NEXT, 3));
    assertNotEquals(Splitting.runs(Splitting.Space.NEXT, 2), Splitting.runs(Splitting.Space.OWN, 2));
  }

  @ParameterizedTest
  @ValueSource(strings = {"", "runs", "runs:", "runs:space=next", "runs:space=next,digits=",
      "runs:space=next,digits=0", "runs:space=next,digits=65", "runs:space=next,digits=03",
      "runs:space=next,digits=+3", "runs:space=next,digits=x", "runs:space=next,digits=Whole",
      "runs:space=next,digits=whole ", "runs:space=,digits=3", "runs:space=before,digits=3",
      "runs:space=NEXT,digits=3", "runs:digits=3,space=next", "runs:space=next;digits=3",
      "runs:space=next,digits=3,", "runs:space=next,digits=3,digits=3", "Words", " words", "whitespace ",
      "run:space=next,digits=3", "nones"})
  void parseRejectsOtherSpecs(String spec) {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Splitting.parse(spec));
    assertTrue(e.getMessage().contains("'" + spec + "'"), e.getMessage());
    assertTrue(e.getMessage().contains("runs:space=own|next|previous,digits=whole|1..64"), e.getMessage());
  }

  @Test
  void parseSaysWhatIsWrong() {
    assertTrue(message("runs:space=before,digits=3").contains("space policy 'before'"));
    assertTrue(message("runs:space=next,digits=65").contains("digit group '65'"));
    assertTrue(message("runs:space=next").contains("missing ',digits='"));
    assertTrue(message("ruins").contains("unknown mode"));
  }

  private static String message(String spec) {
    return assertThrows(IllegalArgumentException.class, () -> Splitting.parse(spec)).getMessage();
  }

  @Test
  void digitGroupIsChecked() {
    for (int bad : new int[] {-1, 65, Integer.MIN_VALUE, Integer.MAX_VALUE}) {
      IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Splitting.runs(Splitting.Space.NEXT, bad));
      assertTrue(e.getMessage().contains("digitGroup=" + bad), e.getMessage());
    }
    assertThrows(NullPointerException.class, () -> Splitting.runs(null, 3));
  }

  @Test
  void badRangesAreRejected() {
    PieceSink sink = (a, b) -> {};
    assertThrows(IndexOutOfBoundsException.class, () -> Splitting.runs().split("ferry", -1, 2, sink));
    assertThrows(IndexOutOfBoundsException.class, () -> Splitting.runs().split("ferry", 3, 2, sink));
    assertThrows(IndexOutOfBoundsException.class, () -> Splitting.words().split("ferry", 0, 6, sink));
    assertThrows(NullPointerException.class, () -> Splitting.runs().split(null, 0, 0, sink));
  }

  @Test
  void longLetterRunIsOnePiece() {
    String run = "a".repeat(1 << 20);
    assertEquals(1, pieces(Splitting.runs(), run).size());
  }
}
