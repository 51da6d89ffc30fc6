package dev.morsel.tokenize.wordpiece;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.morsel.tokenize.testkit.OffsetInvariants;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.stream.LongStream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Property check: on seeded random vocabularies and inputs over small alphabets (so greedy matching
 * backs off often and many pieces are unknown), LinMaxMatch [3] gives exactly the tokens of the naive
 * greedy longest-match-first encoder [2] written in {@link TestSupport.NaiveGreedy}.
 */
class NaiveGreedyAgreementTest {
  static LongStream seeds() {
    return LongStream.range(0, 400).map(i -> 0x5EED_0000L + i * 7919);
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void agreesWithNaiveGreedy(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    String marker = rnd.nextBoolean() ? WordPieceSettings.DEFAULT_MARKER : "%~";
    // small alphabets; sometimes a supplementary character
    String[] alphabet = rnd.nextInt(4) == 0
        ? new String[] {"a", "b", new String(Character.toChars(0x1F6A2))}
        : Arrays.copyOf(new String[] {"a", "b", "c", "d"}, 2 + rnd.nextInt(3));
    Set<String> vocab = new LinkedHashSet<>();
    int reserved = rnd.nextInt(3);
    for (int i = 0; i < reserved; i++) {
      vocab.add("gangway-" + i);
    }
    vocab.add(WordPieceSettings.DEFAULT_UNKNOWN);
    int size = 1 + rnd.nextInt(30);
    for (int i = 0; i < size; i++) {
      String body = randomWord(rnd, alphabet, 1 + rnd.nextInt(6));
      vocab.add(rnd.nextInt(3) == 0 ? body : marker + body);
    }
    List<String> tokens = new ArrayList<>(vocab);
    int maxLen = 4 + rnd.nextInt(20);
    WordPieceSettings st = WordPieceSettings.defaults().withMarker(marker).withMaxPieceLength(maxLen);
    WordPieceSegmenter s = WordPieceSegmenter.of(tokens, reserved, st);
    TestSupport.NaiveGreedy naive = new TestSupport.NaiveGreedy(tokens, reserved, marker, maxLen);
    for (int k = 0; k < 25; k++) {
      String input = randomWord(rnd, alphabet, rnd.nextInt(24));
      String text = "#" + input + "#";
      TestSupport.Encoded e = TestSupport.segmentOne(s, text, 1, 1 + input.length());
      String where = "seed " + seed + ", input '" + input + "', vocabulary " + tokens;
      assertArrayEquals(naive.segment(input), e.ids.toIntArray(), where);
      OffsetInvariants.check(e.tokens(), text);
      // spans tile the piece
      int pos = 1;
      for (int i = 0; i < e.ids.size(); i++) {
        assertEquals(pos, e.starts.getInt(i), where);
        pos = e.ends.getInt(i);
      }
      assertEquals(1 + input.length(), input.isEmpty() ? 1 + input.length() : pos, where);
    }
  }

  static String randomWord(SplittableRandom rnd, String[] alphabet, int len) {
    StringBuilder sb = new StringBuilder();
    for (int i = 0; i < len; i++) {
      sb.append(alphabet[rnd.nextInt(alphabet.length)]);
    }
    return sb.toString();
  }
}
