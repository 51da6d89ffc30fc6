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

  /**
   * A model of random merges over the UTF-8 bytes of {@code alphabet}: operands drawn from all tokens
   * so far, half the time from the 16 newest, so tokens grow deep and merges of late ranks reach across
   * many earlier ones (the shape that makes one part of a piece decide another far away). Tokens may
   * hold parts of characters.
   */
  static BpeSegmenter randomMerges(SplittableRandom rnd, String alphabet) {
    byte[] letters = alphabet.getBytes(StandardCharsets.UTF_8);
    List<byte[]> bytesOf = new ArrayList<>();
    for (int b = 0; b < 256; b++) {
      bytesOf.add(new byte[] {(byte) b});
    }
    List<Integer> usable = new ArrayList<>();
    java.util.Set<Integer> seenLetters = new java.util.HashSet<>();
    for (byte b : letters) {
      if (seenLetters.add(b & 0xFF)) {
        usable.add(b & 0xFF);
      }
    }
    java.util.Set<String> spelled = new java.util.HashSet<>();
    java.util.Set<Long> pairs = new java.util.HashSet<>();
    for (int u : usable) {
      spelled.add(new String(bytesOf.get(u), StandardCharsets.ISO_8859_1));
    }
    int target = 20 + rnd.nextInt(400);
    List<Integer> left = new ArrayList<>();
    List<Integer> right = new ArrayList<>();
    for (int tries = 0; tries < 40 * target && left.size() < target; tries++) {
      int a = pick(rnd, usable);
      int b = pick(rnd, usable);
      byte[] x = bytesOf.get(a);
      byte[] y = bytesOf.get(b);
      byte[] joined = Arrays.copyOf(x, x.length + y.length);
      System.arraycopy(y, 0, joined, x.length, y.length);
      String key = new String(joined, StandardCharsets.ISO_8859_1);
      if (joined.length > 24 || spelled.contains(key) || !pairs.add(((long) a << 32) | b)) {
        continue;
      }
      spelled.add(key);
      left.add(a);
      right.add(b);
      bytesOf.add(joined);
      usable.add(255 + left.size());
    }
    return BpeSegmenter.of(List.of(), left.stream().mapToInt(Integer::intValue).toArray(),
        right.stream().mapToInt(Integer::intValue).toArray());
  }

  private static int pick(SplittableRandom rnd, List<Integer> ids) {
    int n = ids.size();
    return rnd.nextBoolean() ? ids.get(rnd.nextInt(n)) : ids.get(n - 1 - rnd.nextInt(Math.min(16, n)));
  }

  private static String lettersOf(SplittableRandom rnd, String alphabet, int length) {
    int[] cps = alphabet.codePoints().toArray();
    StringBuilder sb = new StringBuilder(length + 1);
    while (sb.length() < length) {
      sb.appendCodePoint(cps[rnd.nextInt(cps.length)]);
    }
    return sb.toString();
  }

  static Stream<Long> windowSeeds() {
    return IntStream.range(0, 100).mapToObj(i -> 0x3D0L * 1000 + i);
  }

  /**
   * The windowed path of long pieces equals one rank-bucket run over the whole piece (itself checked
   * against the textbook encoder above), for windows from 2 units (nearly every window must grow) to
   * the default, on the Europarl model, trained random models and random merge models.
   */
  @ParameterizedTest
  @MethodSource("windowSeeds")
  void windowedPathEqualsOneRunOverTheWholePiece(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    BpeSegmenter seg;
    String text;
    int length = 3_000 + rnd.nextInt(20_000);
    switch ((int) (seed % 5)) {
      case 0:
        seg = Fixtures.europarlModel();
        StringBuilder sb = new StringBuilder();
        List<String> bodies = Fixtures.europarlBodies();
        while (sb.length() < length) {
          sb.append(bodies.get(rnd.nextInt(bodies.size())).replace(" ", ""));
        }
        text = sb.toString();
        break;
      case 1:
        seg = randomModel(rnd);
        StringBuilder r = new StringBuilder();
        while (r.length() < length) {
          r.append(randomText(rnd, 200));
        }
        text = r.toString();
        break;
      case 2:
        seg = randomMerges(rnd, "ab");
        text = lettersOf(rnd, "ab", length);
        break;
      case 3:
        seg = randomMerges(rnd, "abcd");
        text = rnd.nextBoolean() ? lettersOf(rnd, "abcd", length) : "a".repeat(length / 2) + lettersOf(rnd, "abcd", length / 2);
        break;
      default:
        String alphabet = "ae\u00e9\u0301\u4e2d\ud83d\udea2"; // Latin, a combining mark, Han, a ship (4 bytes)
        seg = randomMerges(rnd, alphabet);
        text = lettersOf(rnd, alphabet, length);
        break;
    }
    int[] whole = new int[3 * text.length() + 1];
    int nw = seg.encoder().segmentBucketPath(text, whole);
    int[] expected = Arrays.copyOf(whole, nw);
    String input = "seed=" + seed + " length=" + text.length() + " merges=" + seg.mergeCount();
    int[] got = new int[3 * text.length() + 1];
    for (int window : new int[] {2, 7, 64, 500, dev.morsel.tokenize.bpe.internal.Encoder.WINDOW_CHARS}) {
      int n = seg.encoder().segmentWindowed(text, window, got);
      assertArrayEquals(expected, Arrays.copyOf(got, n), input + " window=" + window);
    }
    Fixtures.Collected c = Fixtures.segment(seg.withCacheEntries(0), text, 0, text.length());
    assertArrayEquals(expected, c.ids(), input + " public path");
    assertNull(Fixtures.spanProblem(seg, text, 0, text.length(), c), input);
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
