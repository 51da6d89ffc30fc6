package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** Long pieces without spaces, uncovered characters and lone surrogates: lossless, no gaps, valid spans. */
class AdversarialTest {
  private static final int MIB = 1 << 20;

  private static UnigramSegmenter ferryModel(boolean bytes) {
    List<String> pieces = List.of("a", "b", "o", "r", "t", "s", "ab", "boat", "oar", "star", "tar", "ta", "at", "\u00e9",
        "\u26f4");
    double[] scores = new double[pieces.size()];
    for (int i = 0; i < scores.length; i++) {
      scores[i] = -1.0 - 0.25 * i;
    }
    return UnigramSegmenter.create(List.of(), bytes, "\u2983?\u2984", pieces, scores);
  }

  /** One MiB of random characters from the vocabulary's alphabet, uncovered letters and an astral symbol. */
  private static String adversarial(long seed) {
    SplittableRandom r = new SplittableRandom(seed);
    int[] alphabet = {'a', 'b', 'o', 'r', 't', 's', 'x', '\u00e9', '\u26f4', 0x1F6A2};
    StringBuilder sb = new StringBuilder(MIB + 2);
    while (sb.length() < MIB) {
      sb.appendCodePoint(alphabet[r.nextInt(alphabet.length)]);
    }
    return sb.toString();
  }

  private static void checkLossless(UnigramSegmenter m, String text, boolean sample) {
    IntArrayList ids = new IntArrayList();
    IntArrayList starts = new IntArrayList();
    IntArrayList ends = new IntArrayList();
    ByteArrayOutputStream out = new ByteArrayOutputStream();
    int[] at = {0};
    dev.morsel.tokenize.spi.TokenSink sink = (id, s, e) -> {
      assertTrue(s == at[0] || (starts.size() > 0 && s == starts.getInt(starts.size() - 1) && e == ends.getInt(ends.size() - 1)),
          "gap or overlap at token " + ids.size() + " [" + s + ", " + e + ")");
      at[0] = e;
      ids.add(id);
      starts.add(s);
      ends.add(e);
      m.decodeToken(id, out::write);
    };
    if (sample) {
      m.sample(text, 0, text.length(), 0.3, new SplittableRandom(5), sink);
    } else {
      m.segment(text, 0, text.length(), sink);
    }
    assertEquals(text.length(), at[0]);
    assertArrayEquals(text.getBytes(StandardCharsets.UTF_8), out.toByteArray());
    int n = ids.size();
    OffsetInvariants.check(Tokens.of(ids.toIntArray(), starts.toIntArray(), ends.toIntArray(), new byte[n], new byte[n]),
        text);
  }

  @Test
  void oneMebibytePieceEncodesLosslesslyWithByteSpelling() {
    String text = adversarial(1);
    checkLossless(ferryModel(true), text, false);
  }

  @Test
  void oneMebibytePieceSamplesLosslesslyWithByteSpelling() {
    checkLossless(ferryModel(true), adversarial(2), true);
  }

  @Test
  void oneMebibyteOfARepeatedLetterEncodesLosslessly() {
    checkLossless(ferryModel(true), "t".repeat(MIB), false);
  }

  @Test
  void uncoveredCharactersBecomeOneUnknownTokenEachWithoutByteSpelling() {
    UnigramSegmenter m = ferryModel(false);
    String text = "boat\uD83D\uDEA2x\u26f4";
    IntArrayList ids = new IntArrayList();
    IntArrayList spans = new IntArrayList();
    m.segment(text, 0, text.length(), (id, s, e) -> {
      ids.add(id);
      spans.add(s);
      spans.add(e);
    });
    assertEquals(List.of(m.id("boat"), m.unknownId(), m.unknownId(), m.id("\u26f4")), ids);
    // the unknown token for the ship symbol spans its whole surrogate pair
    assertEquals(List.of(0, 4, 4, 6, 6, 7, 7, 8), spans);
  }

  @Test
  void loneSurrogatesBecomeReplacementCharacterBytes() {
    UnigramSegmenter m = ferryModel(true);
    String text = "a\uD83Db\uDEA2";
    ByteArrayOutputStream out = new ByteArrayOutputStream();
    IntArrayList spans = new IntArrayList();
    m.segment(text, 0, text.length(), (id, s, e) -> {
      m.decodeToken(id, out::write);
      spans.add(s);
      spans.add(e);
    });
    // U+FFFD in UTF-8 is EF BF BD (Unicode Standard, section 3.9, Table 3-6)
    byte[] want = {'a', (byte) 0xEF, (byte) 0xBF, (byte) 0xBD, 'b', (byte) 0xEF, (byte) 0xBF, (byte) 0xBD};
    assertArrayEquals(want, out.toByteArray());
    assertEquals(List.of(0, 1, 1, 2, 1, 2, 1, 2, 2, 3, 3, 4, 3, 4, 3, 4), spans);
  }

  @Test
  void subrangeSpansAreAbsolute() {
    UnigramSegmenter m = ferryModel(false);
    String text = "xx boat star";
    IntArrayList spans = new IntArrayList();
    m.segment(text, 8, 12, (id, s, e) -> {
      spans.add(s);
      spans.add(e);
    });
    assertEquals(List.of(8, 12), spans);
  }
}
