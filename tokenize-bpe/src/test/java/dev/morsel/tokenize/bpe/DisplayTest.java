package dev.morsel.tokenize.bpe;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** Display spellings: our escape convention, uniqueness, inversion. */
class DisplayTest {

  @Test
  void singleBytesFollowTheEscapeConvention() {
    BpeSegmenter s = BpeSegmenter.of(List.of("«dock»"), new int[0], new int[0]);
    assertEquals("«dock»", s.token(0));
    assertEquals("A", s.token(1 + 'A'));
    assertEquals("\\s", s.token(1 + ' '));
    assertEquals("\\\\", s.token(1 + '\\'));
    assertEquals("\\n", s.token(1 + '\n'));
    assertEquals("\\{U+0000}", s.token(1));
    assertEquals("\\{U+007F}", s.token(1 + 0x7F));
    // RFC 3629 section 4: bytes 0x80..0xFF alone are never a complete UTF-8 character.
    for (int b = 0x80; b < 0x100; b++) {
      assertEquals(String.format("\\{%02X}", b), s.token(1 + b));
    }
    assertThrows(IndexOutOfBoundsException.class, () -> s.token(257));
    assertThrows(IndexOutOfBoundsException.class, () -> s.decodeToken(-1, (b, o, l) -> {}));
  }

  @Test
  void spellingsAreUniqueAndInvertibleOnTheEuroparlModel() {
    BpeSegmenter s = Fixtures.europarlModel();
    Set<String> seen = new HashSet<>();
    for (int id = 0; id < s.vocabularySize(); id++) {
      String t = s.token(id);
      assertTrue(seen.add(t), "spelling '" + t + "' repeats at id " + id);
      assertEquals(id, s.id(t), t);
    }
    assertEquals(-1, s.id("\\{41}")); // not canonical: 'A' is spelled A
    assertEquals(-1, s.id("no such ferry token at all"));
    assertEquals(-1, s.id(null));
  }

  /**
   * Against the JDK's strict UTF-8 decoder (java.nio.charset, REPORT on malformed input) and the
   * JDK's own general categories (java.lang.Character): a byte string that decodes strictly and holds
   * no backslash, space, control, format, private-use, unassigned or separator character is displayed
   * as exactly the decoded text; any other string has an escape in its display.
   */
  @Test
  void wellFormedTokensDisplayAsTheirTextAgainstTheJdkDecoder() {
    SplittableRandom rnd = new SplittableRandom(3);
    int[] pool = {'a', 'z', 0xE9, 0x20AC, 0x1F6A2};
    for (int t = 0; t < 2000; t++) {
      byte[] b;
      if (rnd.nextBoolean()) {
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < 1 + rnd.nextInt(3); i++) {
          sb.appendCodePoint(pool[rnd.nextInt(pool.length)]);
        }
        b = sb.toString().getBytes(StandardCharsets.UTF_8);
        if (rnd.nextInt(3) == 0 && b.length > 2) {
          b = java.util.Arrays.copyOf(b, b.length - 1); // may cut a character
        }
      } else {
        b = new byte[2 + rnd.nextInt(4)];
        for (int i = 0; i < b.length; i++) {
          b[i] = (byte) rnd.nextInt(256);
        }
      }
      BpeSegmenter s = chainOf(b);
      String shown = s.token(b.length == 1 ? b[0] & 0xFF : s.vocabularySize() - 1);
      String strict = strictDecode(b);
      boolean plain = strict != null && strict.codePoints().noneMatch(DisplayTest::escaped);
      if (plain) {
        assertEquals(strict, shown, java.util.Arrays.toString(b));
      } else {
        assertTrue(shown.contains("\\"), java.util.Arrays.toString(b) + " shown as " + shown);
      }
      assertArrayEquals(b, s.tokenBytes(s.id(shown)));
    }
  }

  private static boolean escaped(int cp) {
    switch (Character.getType(cp)) {
      case Character.CONTROL: case Character.FORMAT: case Character.PRIVATE_USE: case Character.UNASSIGNED:
      case Character.SPACE_SEPARATOR: case Character.LINE_SEPARATOR: case Character.PARAGRAPH_SEPARATOR:
      case Character.SURROGATE:
        return true;
      default:
        return cp == '\\';
    }
  }

  /** A segmenter whose last token is {@code b}, built by merging left to right. */
  private static BpeSegmenter chainOf(byte[] b) {
    int[] left = new int[b.length - 1];
    int[] right = new int[b.length - 1];
    for (int i = 0; i + 1 < b.length; i++) {
      left[i] = i == 0 ? (b[0] & 0xFF) : 256 + i - 1;
      right[i] = b[i + 1] & 0xFF;
    }
    return BpeSegmenter.of(List.of(), left, right);
  }

  private static String strictDecode(byte[] b) {
    try {
      return StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
          .onUnmappableCharacter(CodingErrorAction.REPORT).decode(java.nio.ByteBuffer.wrap(b)).toString();
    } catch (java.nio.charset.CharacterCodingException e) {
      return null;
    }
  }
}
