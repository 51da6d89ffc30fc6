package dev.morsel.tokenize.split;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.IntStream;
import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Property tests over seeded random texts. A failure message carries the seed and the input (as
 * escaped code units) so the case can be replayed.
 */
class SplittingPropertyTest {
  private static final int CASES_PER_MODE = 300;

  /** Code points chosen to hit every class and every joining rule. */
  private static final int[] ALPHABET = {
      'f', 'e', 'r', 'y', 'K', 'Z', '0', '4', '7', ' ', ' ', ' ', '\t', '\n', '\r', '\'', '.', ',', '!', '-',
      '$', '+', '~', 0x01, 0x7F,
      0x00E9, 0x00F8, 0x0301, 0x0308, 0x200D, 0x200C, 0xFE0F, 0x1F3FD, 0x1F6A2, 0x26F4, 0x1F469,
      0x6E2F, 0x6E21, 0x20000, 0x306E, 0x30D5, 0x0663, 0x0967, 0xFFFD, 0x00A0, 0x3000, 0x2028, 0x0085,
      0xE000, 0x00AD, 0xFEFF, 0x0E01, 0x0E33, 0x2162, 0x00B2, 0x20AC, 0x00BF, 0x1F1F3, 0x1F1F4,
      0xD800, 0xDC00, // lone surrogates, on purpose
  };

  private static final Splitting[] MODES = {
      Splitting.runs(), Splitting.runs(Splitting.Space.NEXT, 1), Splitting.runs(Splitting.Space.NEXT, 3),
      Splitting.runs(Splitting.Space.OWN, 2), Splitting.runs(Splitting.Space.OWN, Splitting.WHOLE_DIGIT_RUNS),
      Splitting.runs(Splitting.Space.PREVIOUS, 3), Splitting.runs(Splitting.Space.PREVIOUS, 64),
      Splitting.words(), Splitting.whitespace(), Splitting.none()};

  static String randomText(SplittableRandom r, int[] alphabet, int maxLen) {
    int len = r.nextInt(maxLen + 1);
    StringBuilder b = new StringBuilder();
    while (b.length() < len) {
      b.appendCodePoint(alphabet[r.nextInt(alphabet.length)]);
    }
    return b.toString();
  }

  static String escape(String s) {
    StringBuilder b = new StringBuilder();
    for (int i = 0; i < s.length(); i++) {
      char c = s.charAt(i);
      if (c >= 0x21 && c < 0x7F) {
        b.append(c);
      } else {
        b.append(String.format("\\u%04X", (int) c));
      }
    }
    return b.toString();
  }

  static Stream<Arguments> seedsAndModes() {
    return Stream.of(MODES).flatMap(m -> IntStream.range(0, 4).mapToObj(k -> Arguments.of(m.spec(), 0x5EEDL * 31 + k)));
  }

  /** Pieces as [start, end) pairs of a sub-range. */
  static List<int[]> split(Splitting s, String text, int start, int end) {
    List<int[]> out = new ArrayList<>();
    s.split(text, start, end, (a, b) -> out.add(new int[] {a, b}));
    return out;
  }

  @ParameterizedTest(name = "{0} seed {1}")
  @MethodSource("seedsAndModes")
  void losslessNonEmptyOrderedAndSurrogateSafe(String spec, long seed) {
    Splitting s = Splitting.parse(spec);
    SplittableRandom r = new SplittableRandom(seed);
    for (int n = 0; n < CASES_PER_MODE; n++) {
      String text = randomText(r, ALPHABET, 40);
      int start = text.isEmpty() ? 0 : r.nextInt(text.length() + 1);
      int end = start + r.nextInt(text.length() - start + 1);
      String where = spec + " seed " + seed + " case " + n + " range [" + start + "," + end + ") text \"" + escape(text) + "\"";
      List<int[]> pieces = split(s, text, start, end);
      int at = start;
      StringBuilder joined = new StringBuilder();
      for (int[] p : pieces) {
        assertEquals(at, p[0], () -> "gap or overlap: " + where);
        assertTrue(p[1] > p[0], () -> "empty piece: " + where);
        if (p[0] > start && p[0] < end) {
          boolean cutsPair = Character.isHighSurrogate(text.charAt(p[0] - 1)) && Character.isLowSurrogate(text.charAt(p[0]));
          assertTrue(!cutsPair, () -> "surrogate pair cut at " + p[0] + ": " + where);
        }
        joined.append(text, p[0], p[1]);
        at = p[1];
      }
      assertEquals(end, at, () -> "does not reach the end: " + where);
      assertEquals(text.substring(start, end), joined.toString(), () -> "not lossless: " + where);
      if (s.mode() == Splitting.Mode.NONE) {
        assertEquals(start == end ? 0 : 1, pieces.size(), where);
      }
    }
  }

  // ------------------------------------------------------------ class-run properties

  private static boolean isIdeograph(int cp) {
    return cp == 0x6E2F || cp == 0x6E21 || cp == 0x20000; // the ideographs of ALPHABET
  }

  private static boolean isJoining(int cp) {
    // the marks and joiners of ALPHABET: combining acute/diaeresis, ZWJ, ZWNJ, VS16, skin tone, Thai SARA AM
    return cp == 0x0301 || cp == 0x0308 || cp == 0x200D || cp == 0x200C || cp == 0xFE0F || cp == 0x1F3FD || cp == 0x0E33;
  }

  private static boolean isWs(int cp) {
    // Unicode White_Space members of ALPHABET (PropList.txt)
    return cp == ' ' || cp == '\t' || cp == '\n' || cp == '\r' || cp == 0x00A0 || cp == 0x3000 || cp == 0x2028 || cp == 0x0085;
  }

  /** Every space policy with digit groups 1, 2, 3, 7 and whole runs (0), three seeds each. */
  static Stream<Arguments> runsSeeds() {
    return Stream.of(Splitting.Space.values()).flatMap(sp -> Stream.of(1, 2, 3, 7, 0).flatMap(d -> IntStream.range(0, 3)
        .mapToObj(k -> Arguments.of(sp, d, 0xFE11AL + 97L * d + 7919L * sp.ordinal() + k))));
  }

  /** The piece without the one U+0020 its space policy may have added to it. */
  private static String withoutLentSpace(Splitting.Space space, String piece) {
    if (space == Splitting.Space.NEXT && piece.startsWith(" ")) {
      return piece.substring(1);
    }
    if (space == Splitting.Space.PREVIOUS && piece.endsWith(" ")) {
      return piece.substring(0, piece.length() - 1);
    }
    return piece;
  }

  @ParameterizedTest(name = "space={0} digits={1} seed {2}")
  @MethodSource("runsSeeds")
  void runsDigitGroupsIdeographsAndSpaces(Splitting.Space space, int digitGroup, long seed) {
    Splitting s = Splitting.runs(space, digitGroup);
    int longestGroup = digitGroup == Splitting.WHOLE_DIGIT_RUNS ? Integer.MAX_VALUE : digitGroup;
    SplittableRandom r = new SplittableRandom(seed);
    for (int n = 0; n < CASES_PER_MODE; n++) {
      String text = randomText(r, ALPHABET, 40);
      String where = s.spec() + " seed " + seed + " case " + n + " text \"" + escape(text) + "\"";
      List<int[]> pieces = split(s, text, 0, text.length());
      for (int[] p : pieces) {
        String piece = text.substring(p[0], p[1]);
        long digits = piece.codePoints().filter(Character::isDigit).count();
        assertTrue(digits <= longestGroup, () -> "digit group '" + escape(piece) + "' too long: " + where);
        boolean hasIdeograph = piece.codePoints().anyMatch(SplittingPropertyTest::isIdeograph);
        if (hasIdeograph) {
          String rest = withoutLentSpace(space, piece);
          int first = rest.codePointAt(0);
          assertTrue(isIdeograph(first) && rest.codePoints().skip(1).allMatch(SplittingPropertyTest::isJoining),
              () -> "ideograph not alone in '" + escape(piece) + "': " + where);
        }
        // whitespace never mixes with other text, except the one U+0020 the policy lends
        boolean allWs = piece.codePoints().allMatch(SplittingPropertyTest::isWs);
        if (!allWs) {
          String rest = withoutLentSpace(space, piece);
          assertTrue(rest.codePoints().noneMatch(SplittingPropertyTest::isWs),
              () -> "whitespace inside '" + escape(piece) + "': " + where);
        }
      }
      for (int k = 1; k < pieces.size(); k++) {
        int b = pieces.get(k)[0];
        int after = text.codePointAt(b);
        int before = text.codePointBefore(b);
        if (space == Splitting.Space.NEXT) {
          assertTrue(!(before == ' ' && !isWs(after)), () -> "space left before non-space at " + b + ": " + where);
        } else if (space == Splitting.Space.PREVIOUS) {
          assertTrue(!(!isWs(before) && after == ' '), () -> "space left after non-space at " + b + ": " + where);
        }
        assertTrue(!(isJoining(after) && !isWs(before)), () -> "mark cut from its base at " + b + ": " + where);
      }
    }
  }

  // ------------------------------------------------------------ independent ASCII oracle

  /**
   * Class runs on ASCII written again as one regular expression per space policy, sharing no code
   * with Splitting. ASCII general categories (UnicodeData.txt): letters A-Z a-z; digits 0-9;
   * punctuation {@code !"#%&'()*,-./:;?@[\]_{}}; symbols {@code $+<=>^`|~}; controls other than
   * TAB..CR.
   */
  static Pattern asciiOracle(Splitting.Space space, int digitGroup) {
    String ws = " \\t\\n\\x0B\\f\\r";
    String digits = digitGroup == Splitting.WHOLE_DIGIT_RUNS ? "[0-9]+" : "[0-9]{1," + digitGroup + "}";
    String word = "(?:[A-Za-z]+|" + digits + "|[!\"#%&'()*,\\-./:;?@\\[\\\\\\]_{}]+|[$+<=>^`|~]+"
        + "|[\\x00-\\x08\\x0E-\\x1F\\x7F]+)";
    String newlines = "[\\n\\x0B\\f\\r]+";
    switch (space) {
      case OWN:
        return Pattern.compile(newlines + "|[ \\t]+|" + word);
      case PREVIOUS:
        return Pattern.compile(newlines + "|[ \\t]+|" + word + " ?");
      default:
        return Pattern.compile(
            newlines                                     // newline runs
            + "|[ \\t]++(?![^" + ws + "])"               // a space run before a newline or the end
            + "|[ \\t]*\\t(?=[^" + ws + "])"             // a space run ending in TAB before text: whole
            + "|[ \\t]*[ \\t](?= [^" + ws + "])"         // the part of a run before its last U+0020
            + "| ?" + word);
    }
  }

  static List<String> oracle(Pattern p, String text) {
    List<String> out = new ArrayList<>();
    Matcher m = p.matcher(text);
    int at = 0;
    while (at < text.length()) {
      if (!m.find(at) || m.start() != at || m.end() == at) {
        fail("oracle stuck at " + at + " in \"" + escape(text) + "\"");
      }
      out.add(m.group());
      at = m.end();
    }
    return out;
  }

  @ParameterizedTest(name = "space={0} digits={1} seed {2}")
  @MethodSource("runsSeeds")
  void runsAgreeWithAsciiOracle(Splitting.Space space, int digitGroup, long seed) {
    Splitting s = Splitting.runs(space, digitGroup);
    Pattern p = asciiOracle(space, digitGroup);
    String asciiAlphabet = "ferryFERRY0123456789       \t\t\n\r\u000B\f.,'!?-_()$+<=>^`|~#%&@\u0001\u001F\u007F";
    int[] alphabet = asciiAlphabet.chars().toArray();
    SplittableRandom r = new SplittableRandom(seed);
    for (int n = 0; n < CASES_PER_MODE * 3; n++) {
      String text = randomText(r, alphabet, 30);
      List<String> got = SplittingTest.pieces(s, text);
      List<String> want = oracle(p, text);
      int caseNo = n;
      assertEquals(want, got, () -> s.spec() + " seed " + seed + " case " + caseNo + " text \"" + escape(text) + "\"");
    }
  }
}
