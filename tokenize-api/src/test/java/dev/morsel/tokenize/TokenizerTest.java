package dev.morsel.tokenize;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The pipeline around any segmenter, tested with the lossless {@link ByteSegmenter}: offsets,
 * reserved tokens and the trusted flag, framing, truncation, padding, windows, decoding, batch,
 * save and load.
 */
class TokenizerTest {
  private static final String OPEN = "\u27e6go\u27e7"; // our own reserved spellings for the tests
  private static final String CLOSE = "\u27e6halt\u27e7";
  private static final String JOIN = "\u27e6then\u27e7";

  private static Tokenizer tokenizer(Normalization n) {
    ReservedTokens c = ReservedTokens.builder().add(OPEN, 256).add(CLOSE, 257).add(JOIN, 258).build();
    return Tokenizers.of(Pipeline.of(n, Splitting.runs()), new ByteSegmenter(3), c, Template.none());
  }

  private static Tokenizer framed() {
    return tokenizer(Normalization.of(Normalization.Form.NFC))
        .withTemplate(Template.of(List.of(OPEN), List.of(JOIN), List.of(CLOSE)));
  }

  // ------------------------------------------------------------------ generators

  /** Random text mixing ASCII, accents, Greek, CJK, emoji, combining marks, compatibility chars, lone surrogates. */
  static String randomText(SplittableRandom r, int maxLen) {
    String[] parts = {"a", "Z", " ", "  ", "\n", "7", "ferry", "é", "e\u0301", "\u03a9", "\u4e2d", "\ud83d\udea2",
        "\ud83d\udc4b\ud83c\udffd", "\ufb01", "\u2460", "\uff21", "\ud800", "\udc00", "\u1100\u1161", "\uac00", ",", "!?",
        "\u0000", "\t", "\u00a0"};
    StringBuilder sb = new StringBuilder();
    int n = r.nextInt(maxLen + 1);
    for (int i = 0; i < n; i++) {
      sb.append(parts[r.nextInt(parts.length)]);
    }
    return sb.toString();
  }

  // ------------------------------------------------------------------ round trip and offsets

  @ParameterizedTest
  @ValueSource(strings = {"none", "nfc", "nfkc", "nfkc+casefold", "nfd+remove-marks", "nfc+drop-controls+collapse-spaces"})
  void roundTripAndOffsetsOnRandomText(String spec) {
    Normalization n = Normalization.parse(spec);
    Tokenizer t = tokenizer(n);
    SplittableRandom r = new SplittableRandom(spec.hashCode());
    for (int k = 0; k < 500; k++) {
      String text = randomText(r, 30);
      Tokens tokens = t.encode(text);
      String expected = n.apply(text).text();
      assertEquals(expected, t.decode(tokens.ids()), () -> "spec " + spec + ", text " + escape(text));
      OffsetInvariants.check(tokens, text);
      // each token's span holds the character whose byte it is (identity chunks) or its whole chunk
      for (int i = 0; i < tokens.size(); i++) {
        assertTrue(tokens.end(i) > tokens.start(i), "content tokens have non-empty spans");
      }
    }
  }

  @Test
  void identityNormalizationMapsEachByteToItsCharacter() {
    Tokenizer t = tokenizer(Normalization.none());
    String text = "Sk\u00e6rg\u00e5rd \ud83d\udea2!";
    Tokens tokens = t.encode(text);
    byte[] utf8 = text.getBytes(StandardCharsets.UTF_8);
    assertEquals(utf8.length, tokens.size());
    // independent oracle: walk code points, each contributes its UTF-8 length in tokens spanning it
    int k = 0;
    for (int i = 0; i < text.length(); ) {
      int cp = text.codePointAt(i);
      int len = Character.charCount(cp);
      int bytes = new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8).length;
      for (int b = 0; b < bytes; b++, k++) {
        assertEquals(utf8[k] & 0xFF, tokens.id(k));
        assertEquals(i, tokens.start(k));
        assertEquals(i + len, tokens.end(k));
      }
      i += len;
    }
  }

  @Test
  void expansionMapsEveryTokenToTheWholeSourceChunk() {
    Tokenizer t = tokenizer(Normalization.of(Normalization.Form.NFKC));
    String text = "x\ufb01";  // U+FB01 LATIN SMALL LIGATURE FI -> "fi" under NFKC (UAX #15)
    Tokens tokens = t.encode(text);
    assertEquals("xfi", t.decode(tokens.ids()));
    assertEquals(3, tokens.size());
    assertEquals(0, tokens.start(0));
    assertEquals(1, tokens.end(0));
    for (int i = 1; i < 3; i++) {
      assertEquals(1, tokens.start(i));
      assertEquals(2, tokens.end(i));
    }
  }

  @Test
  void codePointAndUtf8SpansAgreeWithAnIndependentCount() {
    Tokenizer t = tokenizer(Normalization.none());
    SplittableRandom r = new SplittableRandom(11);
    for (int k = 0; k < 300; k++) {
      String text = randomText(r, 20);
      Tokens tokens = t.encode(text);
      int[][] cps = tokens.codePointSpans(text);
      int[][] utf8 = tokens.utf8Spans(text);
      for (int i = 0; i < tokens.size(); i++) {
        assertEquals(text.codePointCount(0, tokens.start(i)), cps[0][i]);
        assertEquals(text.codePointCount(0, tokens.end(i)), cps[1][i]);
        assertEquals(utf8Length(text.substring(0, tokens.start(i))), utf8[0][i]);
        assertEquals(utf8Length(text.substring(0, tokens.end(i))), utf8[1][i]);
      }
    }
  }

  // ------------------------------------------------------------------ reserved tokens

  @Test
  void untrustedTextNeverYieldsReservedTokens() {
    Tokenizer t = tokenizer(Normalization.of(Normalization.Form.NFC));
    String text = "Cabin 12 " + OPEN + " rebook me " + CLOSE;
    Tokens untrusted = t.encode(text);
    for (int i = 0; i < untrusted.size(); i++) {
      assertFalse(t.reservedTokens().isReserved(untrusted.id(i)), "untrusted text produced a reserved token");
      assertFalse(untrusted.isReserved(i));
    }
    assertEquals(text, t.decode(untrusted.ids()));
    Tokens trusted = t.encode(text, Trust.TRUSTED);
    List<Integer> reserved = new ArrayList<>();
    for (int i = 0; i < trusted.size(); i++) {
      if (trusted.isReserved(i)) {
        reserved.add(trusted.id(i));
        assertEquals(t.reservedTokens().spelling(trusted.id(i)), trusted.text(text, i));
      }
    }
    assertEquals(List.of(256, 257), reserved);
    assertEquals(text, t.decode(trusted.ids()));
    assertEquals("Cabin 12  rebook me ", t.decode(trusted.ids(), true, Decoding.REPLACE));
  }

  @Test
  void compatibilitySpellingIsNotAReservedTokenEvenWhenTrusted() {
    // U+FF47 U+FF4F are fullwidth "go": NFKC maps them to ASCII, but matching runs on the original text
    Tokenizer t = tokenizer(Normalization.of(Normalization.Form.NFKC));
    String text = "\u27e6\uff47\uff4f\u27e7";
    for (Trust trust : Trust.values()) {
      Tokens tokens = t.encode(text, trust);
      for (int i = 0; i < tokens.size(); i++) {
        assertFalse(tokens.isReserved(i), "compatibility spelling became a reserved token under " + trust);
      }
    }
    assertEquals(OPEN, Normalization.of(Normalization.Form.NFKC).apply(text).text());
  }

  @Test
  void overlappingReservedSpellingsAreRejected() {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> ReservedTokens.builder().add("\u27e8\u27e8a", 1).add("a\u27e9\u27e9", 2).add("x\u27e8\u27e8", 3).build());
    assertTrue(e.getMessage().contains("overlap"), e.getMessage());
    e = assertThrows(IllegalArgumentException.class, () -> ReservedTokens.builder().add("@@stop", 1).add("stop", 2).build());
    assertTrue(e.getMessage().contains("contains"), e.getMessage());
    assertThrows(IllegalArgumentException.class, () -> ReservedTokens.builder().add("", 1));
    assertThrows(IllegalArgumentException.class, () -> ReservedTokens.builder().add("a", 1).add("b", 1));
    assertThrows(IllegalArgumentException.class, () -> ReservedTokens.builder().add("a", 1).add("a", 2));
    assertThrows(IllegalArgumentException.class, () -> Tokenizers.of(Pipeline.defaults(), new ByteSegmenter(0),
        ReservedTokens.builder().add("q", 256).build(), Template.none()));
  }

  // ------------------------------------------------------------------ framing and length

  @Test
  void framingAddsMarkersWithEmptySpans() {
    Tokenizer t = framed();
    Tokens one = t.encode("Deck B");
    assertEquals(256, one.id(0));
    assertEquals(257, one.id(one.size() - 1));
    assertEquals(0, one.start(0));
    assertEquals(0, one.end(0));
    assertEquals(6, one.start(one.size() - 1));
    assertEquals(6, one.end(one.size() - 1));
    assertEquals(Tokens.RESERVED | Tokens.FRAME, one.flags(0));
    Tokens pair = t.encodePair("Deck B", "Kai 4");
    OffsetInvariants.check(pair, "Deck B", "Kai 4");
    int sep = 1 + 6;
    assertEquals(258, pair.id(sep));
    assertEquals(0, pair.segment(sep));
    assertEquals(1, pair.segment(sep + 1));
    assertEquals(1, pair.segment(pair.size() - 1));
    assertEquals(OPEN + "Deck B" + JOIN + "Kai 4" + CLOSE, t.decode(pair.ids()));
    assertEquals("Deck BKai 4", t.decode(pair.ids(), true, Decoding.REPLACE));
  }

  @Test
  void templateCountsItsMarkersForOneOrTwoTexts() {
    Template tm = Template.of(List.of(OPEN, JOIN), List.of(JOIN), List.of(CLOSE));
    Tokenizer t = tokenizer(Normalization.of(Normalization.Form.NFC)).withTemplate(tm);
    Tokens bare = tokenizer(Normalization.of(Normalization.Form.NFC)).encode("Deck B");
    Tokens bare2 = tokenizer(Normalization.of(Normalization.Form.NFC)).encode("Kai 4");
    // an independent count: framed size minus unframed size
    assertEquals(3, tm.markers(1));
    assertEquals(t.encode("Deck B").size() - bare.size(), tm.markers(1));
    assertEquals(4, tm.markers(2));
    assertEquals(t.encodePair("Deck B", "Kai 4").size() - bare.size() - bare2.size(), tm.markers(2));
    assertEquals(0, Template.none().markers(1));
    assertEquals(0, Template.none().markers(2));
    for (int bad : new int[] {0, 3, -1}) {
      IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> tm.markers(bad));
      assertTrue(e.getMessage().contains("segments=" + bad), e.getMessage());
    }
  }

  @Test
  void truncationKeepsMarkersAndTakesFromTheLongerTextFirst() {
    Tokenizer t = framed();
    Tokens pair = t.encodePair("abcdefgh", "xyz");   // 1 + 8 + 1 + 3 + 1 = 14
    Tokens cut = pair.truncate(10, Truncation.longerYields());
    assertEquals(10, cut.size());
    assertEquals(OPEN + "abcd" + JOIN + "xyz" + CLOSE, t.decode(cut.ids()));
    Tokens cut2 = pair.truncate(8, Truncation.longerYields());
    // budget 5: the first text shrinks 8 -> 3, then the tie goes to the second text, 3 -> 2
    assertEquals(OPEN + "abc" + JOIN + "xy" + CLOSE, t.decode(cut2.ids()));
    Tokens fromStart = pair.truncate(10, Truncation.longerYields().from(Side.START));
    assertEquals(OPEN + "efgh" + JOIN + "xyz" + CLOSE, t.decode(fromStart.ids()));
    Tokens second = pair.truncate(12, Truncation.of(Truncation.Strategy.SECOND_YIELDS, Side.END));
    assertEquals(OPEN + "abcdefgh" + JOIN + "x" + CLOSE, t.decode(second.ids()));
    assertThrows(IllegalArgumentException.class, () -> pair.truncate(2, Truncation.longerYields()));
    assertThrows(IllegalArgumentException.class,
        () -> pair.truncate(9, Truncation.of(Truncation.Strategy.SECOND_YIELDS, Side.END)));
    assertEquals(pair, pair.truncate(14, Truncation.longerYields()));
  }

  @Test
  void paddingToLongestMasksPadding() {
    Tokenizer t = framed();
    List<Tokens> batch = Tokens.padBatch(t.encodeAll(List.of("a", "abc", "")), 0, Side.END);
    for (Tokens x : batch) {
      assertEquals(5, x.size());
    }
    assertArrayEquals(new int[] {1, 1, 1, 0, 0}, batch.get(0).nonPaddingMask());
    assertArrayEquals(new int[] {1, 1, 0, 0, 0}, batch.get(2).nonPaddingMask());
    Tokens left = t.encode("a").pad(4, 0, Side.START);
    assertArrayEquals(new int[] {0, 256, 'a', 257}, left.ids());
    assertTrue(left.isPadding(0));
    OffsetInvariants.check(left, "a");
  }

  @Test
  void paddingRefusesANegativeIdAndNamesANullMember() {
    Tokenizer t = framed();
    Tokens a = t.encode("a");
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> a.pad(6, -1, Side.END));
    assertTrue(e.getMessage().contains("padId=-1"), e.getMessage());
    // even when nothing would be padded: the id is wrong whatever the length
    assertThrows(IllegalArgumentException.class, () -> a.pad(0, -7, Side.START));
    assertThrows(IllegalArgumentException.class, () -> Tokens.padBatch(List.of(a), -1, Side.END));
    List<Tokens> withNull = new ArrayList<>(List.of(a, a));
    withNull.add(1, null);
    NullPointerException n = assertThrows(NullPointerException.class, () -> Tokens.padBatch(withNull, 0, Side.END));
    assertEquals("batch member 1 is null", n.getMessage());
  }

  @Test
  void windowsStartStepTokensApartAndKeepOffsets() {
    Tokenizer t = framed();
    String text = "Ferry 7 leaves Pier 2 at 06:40";
    Tokens whole = tokenizer(Normalization.of(Normalization.Form.NFC)).encode(text);
    List<Tokens> windows = t.encodeWindows(text, 8, 5);
    int n = whole.size();
    assertEquals((n - 8 + 4) / 5 + 1, windows.size());
    for (int w = 0; w < windows.size(); w++) {
      Tokens win = windows.get(w);
      OffsetInvariants.check(win, text);
      assertEquals(256, win.id(0));
      assertEquals(257, win.id(win.size() - 1));
      for (int i = 1; i < win.size() - 1; i++) {
        int k = w * 5 + i - 1;
        assertEquals(whole.id(k), win.id(i));
        assertEquals(whole.start(k), win.start(i));
        assertEquals(whole.end(k), win.end(i));
      }
    }
    Tokens last = windows.get(windows.size() - 1);
    assertEquals(whole.id(n - 1), last.id(last.size() - 2), "the last window reaches the end");
    assertThrows(IllegalArgumentException.class, () -> t.encodeWindows(text, 4, 5));
    assertThrows(IllegalArgumentException.class, () -> t.encodeWindows(text, 4, 0));
  }

  /** The worked example of {@link Tokenizer#encodeWindows}: 10 content tokens, size 4, step 3. */
  @Test
  void windowsWorkedExampleFromTheJavadoc() {
    Tokenizer t = framed();
    String letters = "TernSkerry"; // ASCII, one byte token per letter: 10 content tokens
    Tokens whole = tokenizer(Normalization.of(Normalization.Form.NFC)).encode(letters);
    assertEquals(10, whole.size(), "the example needs exactly 10 content tokens");
    List<Tokens> windows = t.encodeWindows(letters, 4, 3);
    assertEquals(3, windows.size());
    int[][] expected = {{0, 4}, {3, 7}, {6, 10}};
    for (int w = 0; w < 3; w++) {
      Tokens win = windows.get(w);
      assertEquals(4 + 2, win.size(), "window " + w + ": 4 content tokens and 2 markers");
      assertEquals(Tokens.FRAME, win.flags(0) & Tokens.FRAME, "window " + w + " opens with a marker");
      assertEquals(Tokens.FRAME, win.flags(win.size() - 1) & Tokens.FRAME, "window " + w + " closes with a marker");
      assertEquals(expected[w][0], win.start(1), "window " + w + " starts at content token " + expected[w][0]);
      assertEquals(expected[w][1], win.end(win.size() - 2), "window " + w + " ends at content token " + expected[w][1]);
      assertEquals(letters.substring(expected[w][0], expected[w][1]),
          letters.substring(win.start(1), win.end(win.size() - 2)));
    }
    // neighbours share size - step = 1 token
    assertEquals(windows.get(0).id(4), windows.get(1).id(1));
    assertEquals(windows.get(1).id(4), windows.get(2).id(1));
  }

  // ------------------------------------------------------------------ decoding

  @Test
  void strictDecodingNamesThePosition() {
    Tokenizer t = tokenizer(Normalization.none());
    int[] ids = {'o', 'k', 0xE2, 0x82, 'x'};
    assertEquals("ok\ufffdx", t.decode(ids));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> t.decode(ids, false, Decoding.STRICT));
    assertTrue(e.getMessage().contains("position 2"), e.getMessage());
    IllegalArgumentException bad = assertThrows(IllegalArgumentException.class, () -> t.decode(new int[] {1, 9999}));
    assertTrue(bad.getMessage().contains("position 1"), bad.getMessage());
  }

  @Test
  void replacementFollowsMaximalSubparts() {
    // from memory: Unicode Standard, section 3.9, Table 3-8 ("U+FFFD for maximal subparts"):
    // 61 F1 80 80 E1 80 C2 62 80 63 80 BF 64 -> a, FFFD, FFFD, FFFD, b, FFFD, c, FFFD, FFFD, d
    Tokenizer t = tokenizer(Normalization.none());
    int[] ids = {0x61, 0xF1, 0x80, 0x80, 0xE1, 0x80, 0xC2, 0x62, 0x80, 0x63, 0x80, 0xBF, 0x64};
    assertEquals("a\ufffd\ufffd\ufffdb\ufffdc\ufffd\ufffdd", t.decode(ids));
    // well-formed text decodes exactly as the JDK decodes it (independent reference)
    SplittableRandom r = new SplittableRandom(8);
    for (int k = 0; k < 300; k++) {
      String text = randomText(r, 20).replaceAll("[\ud800-\udfff](?<![\ud800-\udbff][\udc00-\udfff])", "x");
      byte[] utf8 = text.getBytes(StandardCharsets.UTF_8);
      int[] byteIds = new int[utf8.length];
      for (int i = 0; i < utf8.length; i++) {
        byteIds[i] = utf8[i] & 0xFF;
      }
      assertEquals(new String(utf8, StandardCharsets.UTF_8), t.decode(byteIds, false, Decoding.STRICT));
    }
  }

  @Test
  void streamingDecoderEqualsBatchDecodingForEveryCut() {
    Tokenizer t = tokenizer(Normalization.none());
    SplittableRandom r = new SplittableRandom(5);
    int cases = 0;
    for (int k = 0; k < 400; k++) {
      int[] ids;
      if (k % 2 == 0) {
        ids = t.encode(randomText(r, 12)).ids();
      } else {
        ids = new int[r.nextInt(12)];
        int[] interesting = {0x41, 0xC3, 0xA9, 0xE2, 0x82, 0xAC, 0xF0, 0x9F, 0x9A, 0xA2, 0xED, 0xA0, 0x80, 0xC0, 0xFF, 0xF4, 0x90, 256};
        for (int i = 0; i < ids.length; i++) {
          ids[i] = interesting[r.nextInt(interesting.length)];
        }
      }
      String batch = t.decode(ids);
      StreamDecoder d = t.streamDecoder(false, Decoding.REPLACE);
      StringBuilder sb = new StringBuilder();
      for (int id : ids) {
        String part = d.accept(id);
        sb.append(part);
        assertTrue(part.isEmpty() || !Character.isHighSurrogate(part.charAt(part.length() - 1)),
            "a streamed part ends inside a surrogate pair");
      }
      sb.append(d.flush());
      assertEquals(batch, sb.toString(), () -> "ids " + java.util.Arrays.toString(ids));
      cases++;
    }
    assertEquals(400, cases);
  }

  // ------------------------------------------------------------------ batch, save and load

  @Test
  void batchEqualsSequentialOnAnyExecutor() throws Exception {
    Tokenizer t = framed();
    SplittableRandom r = new SplittableRandom(3);
    List<String> texts = new ArrayList<>();
    for (int i = 0; i < 2000; i++) {
      texts.add(randomText(r, 25));
    }
    ExecutorService pool = Executors.newFixedThreadPool(2);
    try {
      List<Tokens> parallel = t.encodeAll(texts, Trust.UNTRUSTED, pool);
      List<Tokens> common = t.encodeAll(texts);
      for (int i = 0; i < texts.size(); i++) {
        Tokens one = t.encode(texts.get(i));
        assertEquals(one, parallel.get(i));
        assertEquals(one, common.get(i));
      }
    } finally {
      pool.shutdown();
    }
    List<String> withNull = new ArrayList<>(List.of("a", "b"));
    withNull.add(null);
    NullPointerException e = assertThrows(NullPointerException.class, () -> t.encodeAll(withNull));
    assertTrue(e.getMessage().contains("text 2"), e.getMessage());
  }

  @Test
  void saveAndLoadKeepTheFingerprintAndTheIds() throws Exception {
    Tokenizer t = framed();
    byte[] model = t.toBytes();
    Tokenizer back = Tokenizers.load(model);
    assertEquals(t.fingerprint(), back.fingerprint());
    assertEquals(64, t.fingerprint().length());
    assertEquals(t.template(), back.template());
    assertEquals(t.reservedTokens(), back.reservedTokens());
    assertEquals(t.pipeline(), back.pipeline());
    String text = "Lost: one blue umbrella, Deck C \ud83c\udf02";
    assertEquals(t.encodePair(text, "Pier 3"), back.encodePair(text, "Pier 3"));
    assertTrue(Tokenizers.schemes().contains(ByteSegmenter.SCHEME));
    java.nio.file.Path file = java.nio.file.Files.createTempFile("morsel", ".model");
    try {
      t.save(file);
      assertEquals(t.fingerprint(), Tokenizers.load(file).fingerprint());
    } finally {
      java.nio.file.Files.deleteIfExists(file);
    }
    Tokenizer other = tokenizer(Normalization.of(Normalization.Form.NFKC));
    assertNotEquals(tokenizer(Normalization.of(Normalization.Form.NFC)).fingerprint(), other.fingerprint());
  }

  // ------------------------------------------------------------------ bad input

  @Test
  void badInputGetsClearErrors() {
    Tokenizer t = framed().withLimits(Limits.defaults().withMaxInputLength(10));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> t.encode("x".repeat(11)));
    assertTrue(e.getMessage().contains("maxInputLength=10"), e.getMessage());
    NullPointerException npe = assertThrows(NullPointerException.class, () -> t.encode(null));
    assertTrue(npe.getMessage().contains("text"));
    assertThrows(NullPointerException.class, () -> t.encodePair("a", null));
    assertThrows(IllegalArgumentException.class, () -> Normalization.parse("nfkc+sparkle"));
    assertThrows(IllegalArgumentException.class, () -> framed().withTemplate(Template.of(List.of("nope"), List.of(), List.of())));
    String text = "unchanged \ufb01";
    StringBuilder mutable = new StringBuilder(text);
    framed().encode(mutable, Trust.TRUSTED);
    assertEquals(text, mutable.toString(), "the caller's text is not changed");
  }

  /** UTF-8 length with each lone surrogate counted as U+FFFD (3 bytes), via the JDK's encoder on a repaired string. */
  private static int utf8Length(String s) {
    StringBuilder repaired = new StringBuilder();
    for (int i = 0; i < s.length(); i++) {
      char c = s.charAt(i);
      if (Character.isHighSurrogate(c) && i + 1 < s.length() && Character.isLowSurrogate(s.charAt(i + 1))) {
        repaired.append(c).append(s.charAt(++i));
      } else {
        repaired.append(Character.isSurrogate(c) ? '\ufffd' : c);
      }
    }
    return repaired.toString().getBytes(StandardCharsets.UTF_8).length;
  }

  static String escape(String s) {
    StringBuilder sb = new StringBuilder();
    for (char c : s.toCharArray()) {
      if (c < 0x20 || c > 0x7e) {
        sb.append(String.format("\\u%04x", (int) c));
      } else {
        sb.append(c);
      }
    }
    return sb.toString();
  }

  /**
   * A vocabulary is never paired with a pipeline by omission: every factory that takes a segmenter
   * takes the pipeline first (learners return tokenizers bound to their counts' pipeline).
   */
  @Test
  void everyFactoryFromASegmenterNamesThePipeline() {
    int factories = 0;
    for (java.lang.reflect.Method m : Tokenizers.class.getMethods()) {
      if (m.getName().equals("of")) {
        factories++;
        assertEquals(Pipeline.class, m.getParameterTypes()[0], m.toString());
      }
    }
    assertEquals(2, factories, "Tokenizers.of(pipeline, segmenter) and of(pipeline, segmenter, reserved, template)");
  }
}
