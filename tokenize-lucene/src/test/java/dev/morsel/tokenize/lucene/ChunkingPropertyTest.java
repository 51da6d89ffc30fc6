package dev.morsel.tokenize.lucene;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Limits;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import java.io.IOException;
import java.io.Reader;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.RepetitionInfo;
import org.junit.jupiter.api.RepeatedTest;
import org.junit.jupiter.api.Test;

/**
 * Reading in chunks changes nothing: on random text built to hit every cut rule and its traps
 * (spaces next to marks, controls, default-ignorables, compatibility characters that decompose to
 * a space, line breaks, surrogate pairs), the stream with a tiny chunk length and a reader that
 * returns random short reads equals {@code encode} of the whole text, for every normalization
 * option and every splitting mode. The segmenter is the api test-kit's byte segmenter, which
 * segments nothing, so a difference can come only from where pieces and normalization chunks
 * fall; one trained model per scheme runs as well.
 */
class ChunkingPropertyTest {
  private static final String[] NORMALIZATIONS = {
      "none", "nfc", "nfd", "nfkc", "nfkd", "nfkc+casefold", "nfc+casefold+remove-marks",
      "nfkc+casefold+remove-marks+drop-controls+collapse-spaces", "none+remove-marks+collapse-spaces",
      "nfkd+drop-controls+collapse-spaces"};
  private static final Splitting[] SPLITTINGS = {
      Splitting.runs(), Splitting.runs(Splitting.Space.NEXT, 1), Splitting.words(), Splitting.whitespace()};

  /** Fragments the random text is built from; each targets a rule of the cut or of a step. */
  private static final String[] FRAGMENTS = {
      "a", "Z", "7", "0", "ferry", "Oskevik", "12345", ".", "'", "-", "\u00a8", "\u00b4", "\u02d8", // ¨ ´ ˘ decompose to a space and a mark
      " ", " ", " ", "  ", "\t", "\u00a0", "\u3000", "\n", "\r\n", "\r", "\u2028", "\u0085",
      "\u0301", "\u0308", "\u200d", "\u200b", "\u00ad", "\u0001", "\u007f", "\u3164", // marks, ZWJ, ZWSP, SHY, controls, Hangul filler
      "\ufb01", "\uff21", "\uff10", "\u2460", "\u00bd", "\u0130", "\u00df", "\u1e9e", "\u212b", // compatibility and case traps
      "\u6e21", "\u8239", "\u306f", "\u0e01\u0e32\u0e23", "\u1100\u1161", "\u11a8", // CJK, kana, Thai, Hangul jamo
      "\ud83d\udc4d", "\ud83c\udffd", "\ud83d\udc68\u200d\ud83d\udc69", "\ud83c\uddf3\ud83c\uddf4", // emoji, modifier, ZWJ, flag
      "\ud800", "\udc00", "\ufffd", "\u27e8dock\u27e9"};

  static String randomText(SplittableRandom r, int fragments) {
    StringBuilder sb = new StringBuilder();
    for (int i = 0; i < fragments; i++) {
      sb.append(FRAGMENTS[r.nextInt(FRAGMENTS.length)]);
    }
    return sb.toString();
  }

  /** A reader over a string that returns 1..7 chars per call. */
  static Reader choppy(String text, SplittableRandom r) {
    return new Reader() {
      private int at;

      @Override
      public int read(char[] cbuf, int off, int len) {
        if (at == text.length()) {
          return -1;
        }
        int n = Math.min(Math.min(len, 1 + r.nextInt(7)), text.length() - at);
        text.getChars(at, at + n, cbuf, off);
        at += n;
        return n;
      }

      @Override
      public void close() {}
    };
  }

  static void assertStreamEqualsEncode(Tokenizer morsel, String text, int chunkLength, SplittableRandom r, String where)
      throws IOException {
    EuroparlStreamTest.StreamedTokens s = new EuroparlStreamTest.StreamedTokens(
        new SubwordTokenizer(morsel, SubwordSettings.builder().chunkLength(chunkLength).build()));
    s.run(choppy(text, r));
    Tokens expected = EuroparlStreamTest.content(morsel.encode(text));
    String msg = where + " chunkLength=" + chunkLength + " text=" + escape(text);
    assertArrayEquals(expected.ids(), s.ids(), msg);
    assertArrayEquals(expected.starts(), s.starts(), msg);
    assertArrayEquals(expected.ends(), s.ends(), msg);
    assertEquals(text.length(), s.finalOffset, msg);
  }

  @RepeatedTest(100)
  void chunkedEqualsWholeForEveryPipeline(RepetitionInfo info) throws IOException {
    SplittableRandom r = new SplittableRandom(0x4C55C3L + info.getCurrentRepetition());
    for (String form : NORMALIZATIONS) {
      for (Splitting splitting : SPLITTINGS) {
        Tokenizer morsel = Tokenizers.of(Pipeline.of(Normalization.parse(form), splitting), new ByteSegmenter(0));
        String text = randomText(r, 10 + r.nextInt(120));
        assertStreamEqualsEncode(morsel, text, SubwordSettings.MIN_CHUNK_LENGTH + r.nextInt(24), r,
            form + " " + splitting.spec());
      }
    }
  }

  @RepeatedTest(20)
  void chunkedEqualsWholeForTheTrainedModels(RepetitionInfo info) throws IOException {
    SplittableRandom r = new SplittableRandom(0x7E11L + info.getCurrentRepetition());
    for (String scheme : TestModels.schemes()) {
      String text = randomText(r, 20 + r.nextInt(200));
      assertStreamEqualsEncode(TestModels.tokenizer(scheme), text, SubwordSettings.MIN_CHUNK_LENGTH + r.nextInt(40), r, scheme);
    }
  }

  @Test
  void aLongFieldIsEncodedInChunksFarBelowTheInputLimit() throws IOException {
    // every encode call checks its text against maxInputLength, so a 2 MiB field streaming through a
    // tokenizer limited to 20,000 chars proves the chunks stay bounded
    Tokenizer limited = TestModels.tokenizer("bpe").withLimits(Limits.defaults().withMaxInputLength(20_000));
    StringBuilder sb = new StringBuilder();
    SplittableRandom r = new SplittableRandom(16);
    List<String> bodies = dev.morsel.tokenize.testkit.Europarl.bodies();
    while (sb.length() < 2 << 20) {
      sb.append(bodies.get(r.nextInt(bodies.size()))).append(' ');
    }
    String text = sb.toString();
    assertThrows(IllegalArgumentException.class, () -> limited.encode(text));
    EuroparlStreamTest.StreamedTokens s = new EuroparlStreamTest.StreamedTokens(new SubwordTokenizer(limited));
    s.run(text);
    assertEquals(text.length(), s.finalOffset);
    int[] ends = s.ends();
    assertEquals(text.length(), ends[ends.length - 1]);
    // and the tokens are those of the unlimited tokenizer on the whole text
    Tokens expected = EuroparlStreamTest.content(TestModels.tokenizer("bpe").encode(text));
    assertArrayEquals(expected.ids(), s.ids());
    assertArrayEquals(expected.starts(), s.starts());
  }

  @Test
  void aStretchWithoutACutPastTheInputLimitFailsNamingTheOffset() {
    Tokenizer limited = TestModels.tokenizer("bpe").withLimits(Limits.defaults().withMaxInputLength(1000));
    String text = "ferry " + "x".repeat(5000);
    EuroparlStreamTest.StreamedTokens s = new EuroparlStreamTest.StreamedTokens(
        new SubwordTokenizer(limited, SubwordSettings.builder().chunkLength(64).build()));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> s.run(text));
    assertTrue(e.getMessage().contains("from offset 5") && e.getMessage().contains("maxInputLength=1000"), e.getMessage());
  }

  @Test
  void splittingNoneReadsTheWholeInputAsOneChunk() throws IOException {
    Tokenizer none = Tokenizers.of(Pipeline.of(Normalization.of(Normalization.Form.NFKC), Splitting.none()), new ByteSegmenter(0));
    String text = "ferry to Oskevik\nat 07:40 ".repeat(50);
    assertStreamEqualsEncode(none, text, SubwordSettings.MIN_CHUNK_LENGTH, new SplittableRandom(3), "none");
  }

  private static String escape(String s) {
    StringBuilder sb = new StringBuilder();
    for (int i = 0; i < s.length(); i++) {
      char c = s.charAt(i);
      if (c >= 0x20 && c < 0x7F) {
        sb.append(c);
      } else {
        sb.append(String.format("\\u%04x", (int) c));
      }
    }
    return sb.toString();
  }
}
