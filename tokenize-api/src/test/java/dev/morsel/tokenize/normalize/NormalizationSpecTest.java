package dev.morsel.tokenize.normalize;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.normalize.Normalization.Form;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import org.junit.jupiter.params.provider.ValueSource;

/** Spec strings, equality, and rejection of bad input (common.md: clear exceptions, never a wrong answer). */
class NormalizationSpecTest {

  @ParameterizedTest
  @MethodSource("dev.morsel.tokenize.normalize.AlignmentPropertyTest#settings")
  void specRoundTrips(Normalization n) {
    Normalization back = Normalization.parse(n.spec());
    assertEquals(n, back);
    assertEquals(n.hashCode(), back.hashCode());
    assertEquals(n.spec(), back.spec());
    assertEquals(n.spec(), Normalization.parse(n.spec().toUpperCase(java.util.Locale.ROOT)).spec());
  }

  @Test
  void canonicalSpellingAndOrder() {
    Normalization all = Normalization.builder().form(Form.NFKC).collapseSpaces(true).dropControls(true)
        .removeMarks(true).caseFold(true).build();
    assertEquals("nfkc+casefold+remove-marks+drop-controls+collapse-spaces", all.spec());
    assertEquals("none", Normalization.none().spec());
    assertEquals("nfd", Normalization.of(Form.NFD).spec());
    assertEquals("none+casefold", Normalization.builder().caseFold(true).build().spec());
    assertEquals(all, Normalization.parse("Collapse-Spaces+DROP-controls+remove-marks+casefold+NfKc"));
    assertSame(Normalization.none(), Normalization.parse("none"));
    assertNotEquals(Normalization.of(Form.NFC), Normalization.of(Form.NFD));
    assertEquals("nfc", Normalization.of(Form.NFC).toString());
  }

  @ParameterizedTest
  @ValueSource(strings = {"nfkc+lowercase", "nfc+", "", "+nfc", "nfkc casefold", "nfc,casefold", "nfe"})
  void unknownPartsAreRejectedByName(String spec) {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Normalization.parse(spec));
    assertTrue(e.getMessage().contains("unknown part"), e.getMessage());
    assertTrue(e.getMessage().contains("remove-marks") && e.getMessage().contains("nfkd"), "lists valid names: " + e.getMessage());
  }

  @Test
  void repeatedPartsAreRejected() {
    IllegalArgumentException twoForms = assertThrows(IllegalArgumentException.class, () -> Normalization.parse("nfc+nfd"));
    assertTrue(twoForms.getMessage().contains("'nfd'"), twoForms.getMessage());
    IllegalArgumentException twice = assertThrows(IllegalArgumentException.class,
        () -> Normalization.parse("nfc+casefold+CASEFOLD"));
    assertTrue(twice.getMessage().contains("'CASEFOLD'"), twice.getMessage());
  }

  @Test
  void nullsNameTheArgument() {
    assertEquals("spec", assertThrows(NullPointerException.class, () -> Normalization.parse(null)).getMessage());
    Normalization n = Normalization.of(Form.NFC);
    assertEquals("text", assertThrows(NullPointerException.class, () -> n.apply(null)).getMessage());
    assertEquals("text", assertThrows(NullPointerException.class, () -> n.apply(null, 0, 0)).getMessage());
    assertEquals("form", assertThrows(NullPointerException.class, () -> Normalization.of(null)).getMessage());
    assertEquals("form", assertThrows(NullPointerException.class, () -> Normalization.builder().form(null)).getMessage());
  }

  @Test
  void badRangesAreRejected() {
    Normalization n = Normalization.of(Form.NFKC);
    String msg = "Tender 3";
    assertThrows(IndexOutOfBoundsException.class, () -> n.apply(msg, -1, 2));
    assertThrows(IndexOutOfBoundsException.class, () -> n.apply(msg, 0, msg.length() + 1));
    assertThrows(IndexOutOfBoundsException.class, () -> n.apply(msg, 5, 4));
    assertEquals("", n.apply(msg, 4, 4).text());
    assertEquals(4, n.apply(msg, 4, 4).spanStart(0));
  }

  @Test
  void badNormalizedIndicesAreRejected() {
    NormalizedText nt = Normalization.of(Form.NFKC).apply("\uFB01sh");
    assertThrows(IndexOutOfBoundsException.class, () -> nt.originalStart(-1));
    assertThrows(IndexOutOfBoundsException.class, () -> nt.originalStart(nt.length()));
    assertThrows(IndexOutOfBoundsException.class, () -> nt.originalEnd(nt.length()));
    assertThrows(IndexOutOfBoundsException.class, () -> nt.spanStart(nt.length() + 1));
    assertThrows(IndexOutOfBoundsException.class, () -> nt.spanEnd(-1));
    assertThrows(IndexOutOfBoundsException.class, () -> nt.spanEnd(nt.length() + 1));
  }

  @Test
  void rangeThatCutsAPairTreatsTheHalfAsLone() {
    String msg = "a\uD83D\uDEA2b";
    NormalizedText nt = Normalization.none().apply(msg, 0, 2);
    assertEquals("a\uFFFD", nt.text());
    assertEquals(1, nt.originalStart(1));
    assertEquals(2, nt.originalEnd(1));
  }
}
