package dev.morsel.tokenize.bpe;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import dev.morsel.tokenize.bpe.internal.BpeTraining;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.stream.IntStream;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/** Segmenter: textbook oracle, both merge paths, spans, round trip, adversarial pieces. */
class EncoderTest {
  /** Code points for random text: ASCII, Latin-1, Greek, CJK, supplementary, combining marks. */
  private static final int[] POOL = {'a', 'b', 'e', 'r', 'y', ' ', 'f', 0xE9, 0xF8, 0x3B1, 0x3C0, 0x6E2F,
      0x1F6A2, 0x1F30A, 0x301, 0x308, 0x20AC, 0x10348};

  private static String randomText(SplittableRandom rnd, int maxLen) {
    StringBuilder sb = new StringBuilder();
    int len = rnd.nextInt(maxLen + 1);
    for (int i = 0; i < len; i++) {
      sb.appendCodePoint(POOL[rnd.nextInt(rnd.nextBoolean() ? 6 : POOL.length)]);
    }
    return sb.toString();
  }

  private static BpeSegmenter randomModel(SplittableRandom rnd) {
    List<String> corpus = new ArrayList<>();
    for (int i = 0; i < 60; i++) {
      corpus.add(randomText(rnd, 30));
    }
    corpus.add("ferry");
    return BpeTraining.builder().vocabularySize(256 + 20 + rnd.nextInt(200)).minPairCount(1).threads(1).build().segmenter(Fixtures.countPieces(corpus));
  }

  static Stream<Long> seeds() {
    return IntStream.range(0, 300).mapToObj(i -> 0xFE22L * 1000 + i);
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void equalsTextbookEncoderOnRandomText(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    BpeSegmenter seg = randomModel(rnd);
    BpeSegmenter noCache = seg.withCacheEntries(0);
    Map<List<Integer>, Integer> ranks = TextbookBpe.ranks(seg);
    for (int t = 0; t < 5; t++) {
      String text = randomText(rnd, t == 4 ? 80 : 24); // the last one exceeds the short-piece path
      String input = "seed=" + seed + " text='" + text + "'";
      int[] expected = TextbookBpe.encode(text.getBytes(StandardCharsets.UTF_8), 0, ranks);
      Fixtures.Collected c = Fixtures.segment(seg, text, 0, text.length());
      assertArrayEquals(expected, c.ids(), input);
      assertArrayEquals(expected, Fixtures.segment(noCache, text, 0, text.length()).ids(), input);
      assertArrayEquals(text.getBytes(StandardCharsets.UTF_8), Fixtures.decode(seg, c.ids()), input);
      assertNull(Fixtures.spanProblem(seg, text, 0, text.length(), c), input);
    }
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void shortAndHeapPathsAgreeOnMediumInputs(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    BpeSegmenter seg = seed % 3 == 0 ? Fixtures.europarlModel() : randomModel(rnd);
    String text;
    if (seed % 3 == 0) {
      List<String> bodies = Fixtures.europarlBodies();
      String b = bodies.get(rnd.nextInt(bodies.size()));
      text = b.replace(" ", ""); // one long piece without spaces
    } else {
      text = randomText(rnd, 400);
    }
    int[] a = new int[3 * text.length() + 1];
    int[] h = new int[3 * text.length() + 1];
    int na = seg.encoder().segmentShortPath(text, a);
    int nh = seg.encoder().segmentHeapPath(text, h);
    assertArrayEquals(Arrays.copyOf(a, na), Arrays.copyOf(h, nh), "seed=" + seed + " text='" + text + "'");
  }

  static Stream<Long> bucketSeeds() {
    return IntStream.range(0, 120).mapToObj(i -> 0xB0CL * 1000 + i);
  }

  /** The rank-bucket path (long pieces) equals the textbook encoder and the heap path. */
  @ParameterizedTest
  @MethodSource("bucketSeeds")
  void bucketPathEqualsTextbookAndHeapPath(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    BpeSegmenter seg = seed % 4 == 0 ? Fixtures.europarlModel() : randomModel(rnd);
    String text;
    if (seed % 4 == 0) {
      List<String> bodies = Fixtures.europarlBodies();
      text = bodies.get(rnd.nextInt(bodies.size())).replace(" ", "");
    } else if (seed % 4 == 1) {
      text = "a".repeat(200 + rnd.nextInt(900)) + randomText(rnd, 50); // overlapping runs of one pair
    } else {
      text = randomText(rnd, 600 + rnd.nextInt(1500));
    }
    int[] expected = TextbookBpe.encode(text.getBytes(StandardCharsets.UTF_8), 0, TextbookBpe.ranks(seg));
    int[] b = new int[3 * text.length() + 1];
    int[] h = new int[3 * text.length() + 1];
    int nb = seg.encoder().segmentBucketPath(text, b);
    int nh = seg.encoder().segmentHeapPath(text, h);
    String input = "seed=" + seed + " length=" + text.length();
    assertArrayEquals(expected, Arrays.copyOf(b, nb), input);
    assertArrayEquals(expected, Arrays.copyOf(h, nh), input);
    // and through the public path, which picks the bucket path for pieces this long
    assertArrayEquals(expected, Fixtures.segment(seg.withCacheEntries(0), text, 0, text.length()).ids(), input);
  }

  @Test
  void emojiSplitIntoByteTokensReportsTheWholeCharacter() {
    // RFC 3629 section 3: U+1F6A2 is F0 9F 9A A2 (four bytes), one surrogate pair in UTF-16.
    BpeSegmenter bytesOnly = BpeSegmenter.of(List.of(), new int[0], new int[0]);
    String text = "a\uD83D\uDEA2b";
    Fixtures.Collected c = Fixtures.segment(bytesOnly, text, 0, text.length());
    assertArrayEquals(new int[] {'a', 0xF0, 0x9F, 0x9A, 0xA2, 'b'}, c.ids());
    assertArrayEquals(new int[] {0, 1, 1, 1, 1, 3}, c.starts());
    assertArrayEquals(new int[] {1, 3, 3, 3, 3, 4}, c.ends());
  }

  @Test
  void loneSurrogateIsEncodedAsReplacementCharacter() {
    // Unicode Standard chapter 3 (D91, U+FFFD substitution) — lone surrogates are not encodable; we use EF BF BD.
    BpeSegmenter bytesOnly = BpeSegmenter.of(List.of(), new int[0], new int[0]);
    String text = "x\uD800y\uDC00";
    Fixtures.Collected c = Fixtures.segment(bytesOnly, text, 0, text.length());
    assertArrayEquals(new int[] {'x', 0xEF, 0xBF, 0xBD, 'y', 0xEF, 0xBF, 0xBD}, c.ids());
    assertArrayEquals(new int[] {0, 1, 1, 1, 2, 3, 3, 3}, c.starts());
    assertArrayEquals(new int[] {1, 2, 2, 2, 3, 4, 4, 4}, c.ends());
  }

  @Test
  void spansAreAbsoluteIndicesIntoTheText() {
    BpeSegmenter seg = Fixtures.europarlModel();
    String text = "Passengers for Föhr: the 07:45 sailing is delayed 🚢 by fog.";
    int[] p = Fixtures.pieces(text);
    for (int j = 0; j < p.length; j += 2) {
      Fixtures.Collected c = Fixtures.segment(seg, text, p[j], p[j + 1]);
      assertNull(Fixtures.spanProblem(seg, text, p[j], p[j + 1], c), text.substring(p[j], p[j + 1]));
    }
  }

  @Test
  void randomUnicodeRoundTripsAndKeepsSpans() {
    BpeSegmenter seg = Fixtures.europarlModel();
    SplittableRandom rnd = new SplittableRandom(42);
    for (int t = 0; t < 500; t++) {
      StringBuilder sb = new StringBuilder();
      int len = rnd.nextInt(40);
      for (int i = 0; i < len; i++) {
        int kind = rnd.nextInt(4);
        int cp = kind == 0 ? 0x20 + rnd.nextInt(0x5F) : kind == 1 ? 0xA0 + rnd.nextInt(0x2000)
            : kind == 2 ? 0x10000 + rnd.nextInt(0x2FFFF) : 0x300 + rnd.nextInt(0x70); // combining marks
        if (Character.isSurrogate((char) cp) && cp < 0x10000) {
          cp = 'q';
        }
        sb.appendCodePoint(cp);
      }
      String text = sb.toString();
      Fixtures.Collected all = new Fixtures.Collected();
      int[] p = Fixtures.pieces(text);
      for (int j = 0; j < p.length; j += 2) {
        Fixtures.Collected c = Fixtures.segment(seg, text, p[j], p[j + 1]);
        assertNull(Fixtures.spanProblem(seg, text, p[j], p[j + 1], c), "case " + t + " text '" + text + "'");
        for (int x = 0; x < c.size; x++) {
          all.add(c.ids[x], c.starts[x], c.ends[x]);
        }
      }
      assertArrayEquals(text.getBytes(StandardCharsets.UTF_8), Fixtures.decode(seg, all.ids()), "case " + t);
    }
  }

  @Test
  void oneMebibytePieceOfRandomLettersIsLosslessAndAtAFixpoint() {
    BpeSegmenter seg = Fixtures.europarlModel();
    SplittableRandom rnd = new SplittableRandom(7);
    char[] c = new char[1 << 20];
    for (int i = 0; i < c.length; i++) {
      c[i] = (char) ('a' + rnd.nextInt(26));
    }
    checkHuge(seg, new String(c));
  }

  @Test
  void oneMebibytePieceOfOneRepeatedCharacter() {
    BpeSegmenter seg = Fixtures.europarlModel();
    char repeated = 0;
    for (int r = 0; r < seg.mergeCount() && repeated == 0; r++) { // a letter the model merges with itself
      if (seg.mergeLeft(r) == seg.mergeRight(r) && seg.mergeLeft(r) < 256 && Character.isLetter(seg.mergeLeft(r))) {
        repeated = (char) seg.mergeLeft(r);
      }
    }
    assertTrue(repeated != 0, "the Europarl model has a doubled-letter merge");
    char[] c = new char[1 << 20];
    Arrays.fill(c, repeated);
    checkHuge(seg, new String(c));
  }

  /** Lossless, spans right, and no adjacent pair of the output has a rank (textbook's stopping rule). */
  private static void checkHuge(BpeSegmenter seg, String text) {
    Fixtures.Collected c = Fixtures.segment(seg, text, 0, text.length());
    assertArrayEquals(text.getBytes(StandardCharsets.UTF_8), Fixtures.decode(seg, c.ids()));
    assertNull(Fixtures.spanProblem(seg, text, 0, text.length(), c));
    Map<List<Integer>, Integer> ranks = TextbookBpe.ranks(seg);
    for (int i = 0; i + 1 < c.size; i++) {
      assertTrue(!ranks.containsKey(List.of(c.ids[i], c.ids[i + 1])), "pair at token " + i + " still has a rank");
    }
    assertTrue(c.size < text.length(), "some merges applied");
  }
}
