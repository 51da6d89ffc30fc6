package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.ReservedTokens;
import dev.morsel.tokenize.Limits;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import java.nio.ByteBuffer;
import java.util.Collections;
import java.util.List;
import java.util.concurrent.ForkJoinPool;
import org.junit.jupiter.api.Test;

/**
 * Every limit a caller can hit: the message names the limit ({@code name=value}) and the setting
 * that changes it, and a raised limit lets the same input through. Uses the test-kit's byte
 * segmenter so that only the api's checks are exercised.
 */
class LimitsViolationTest {
  private static final Tokenizer BYTES = Tokenizers.of(Pipeline.defaults(), new ByteSegmenter(0), ReservedTokens.none(),
      Template.none());

  private static void assertNames(IllegalArgumentException e, String limit, String setting) {
    assertTrue(e.getMessage().contains(limit), e.getMessage());
    assertTrue(e.getMessage().contains(setting), e.getMessage());
  }

  @Test
  void defaultsAreDocumentedValues() {
    Limits d = Limits.defaults();
    assertEquals(1 << 26, d.maxInputLength());
    assertEquals(1 << 24, d.maxBatchSize());
    assertEquals(Limits.DEFAULT_MAX_INPUT_LENGTH, d.maxPieceLength());
    assertEquals(d, BYTES.limits());
    assertEquals("Limits[maxInputLength=67108864, maxPieceLength=67108864, maxBatchSize=16777216]", d.toString());
    assertEquals(d.withMaxPieceLength(5), Limits.defaults().withMaxPieceLength(5));
    assertTrue(!d.equals(d.withMaxPieceLength(5)));
  }

  @Test
  void inputLengthNamesTheLimitAndSetting() {
    Tokenizer t = BYTES.withLimits(Limits.defaults().withMaxInputLength(10));
    String text = "ferry at 9"; // 10 chars: at the limit
    assertEquals(10, t.encode(text).size());
    String over = "ferry at 10";
    assertNames(assertThrows(IllegalArgumentException.class, () -> t.encode(over)), "maxInputLength=10",
        "Limits.withMaxInputLength");
    assertNames(assertThrows(IllegalArgumentException.class, () -> t.encodePair("ok", over)), "maxInputLength=10",
        "withMaxInputLength");
    assertNames(assertThrows(IllegalArgumentException.class, () -> t.encodeWindows(over, 4, 2)), "maxInputLength=10",
        "withMaxInputLength");
    assertNames(assertThrows(IllegalArgumentException.class, () -> t.explain(over)), "maxInputLength=10",
        "withMaxInputLength");
    assertEquals(BYTES.encode(over), t.withLimits(t.limits().withMaxInputLength(11)).encode(over));
  }

  @Test
  void batchSizeNamesTheLimitAndSetting() {
    Tokenizer t = BYTES.withLimits(Limits.defaults().withMaxBatchSize(3));
    List<String> four = Collections.nCopies(4, "quay");
    assertNames(assertThrows(IllegalArgumentException.class, () -> t.encodeAll(four)), "maxBatchSize=3",
        "Limits.withMaxBatchSize");
    List<Tokens> three = t.encodeAll(four.subList(0, 3), dev.morsel.tokenize.Trust.UNTRUSTED, ForkJoinPool.commonPool());
    assertEquals(3, three.size());
  }

  @Test
  void pieceLengthNamesTheLimitSettingAndSpan() {
    Tokenizer t = BYTES.withLimits(Limits.defaults().withMaxPieceLength(8));
    // class runs: "the", " overcrowded" (12 chars, from original index 3), " ferry"
    String text = "the overcrowded ferry";
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> t.encode(text));
    assertNames(e, "maxPieceLength=8", "Limits.withMaxPieceLength");
    assertTrue(e.getMessage().contains("piece of 12 chars (original text [3, 15))"), e.getMessage());
    // a piece exactly at the limit passes, and raising the limit gives the unlimited result
    assertEquals(BYTES.encode("the ferry"), t.encode("the ferry"));
    assertEquals(BYTES.encode(text), t.withLimits(t.limits().withMaxPieceLength(12)).encode(text));
    // the span is in original units: NFC composes "e + U+0301" (2 units) into one
    Tokenizer t3 = BYTES.withLimits(Limits.defaults().withMaxPieceLength(3));
    assertEquals(BYTES.encode("cafe\u0301"), t3.withLimits(t3.limits().withMaxPieceLength(4)).encode("cafe\u0301"));
    IllegalArgumentException e3 = assertThrows(IllegalArgumentException.class, () -> t3.encode("cafe\u0301"));
    assertTrue(e3.getMessage().contains("piece of 4 chars (original text [0, 5))"), e3.getMessage());
  }

  @Test
  void nonPositiveLimitsAreRejectedNamingTheSetting() {
    assertNames(assertThrows(IllegalArgumentException.class, () -> Limits.defaults().withMaxInputLength(0)),
        "maxInputLength=0", "at least 1");
    assertNames(assertThrows(IllegalArgumentException.class, () -> Limits.defaults().withMaxBatchSize(-1)),
        "maxBatchSize=-1", "at least 1");
    assertNames(assertThrows(IllegalArgumentException.class, () -> Limits.defaults().withMaxPieceLength(0)),
        "maxPieceLength=0", "at least 1");
  }

  @Test
  void modelFileLimitsNameTheSetting() {
    byte[] model = BYTES.toBytes();
    ModelFormatException big = assertThrows(ModelFormatException.class,
        () -> ModelFile.read(ByteBuffer.wrap(model), ModelLimits.defaults().withMaxModelBytes(model.length - 1)));
    assertTrue(big.getMessage().contains("maxModelBytes=" + (model.length - 1)), big.getMessage());
    ModelFormatException many = assertThrows(ModelFormatException.class,
        () -> ModelFile.read(ByteBuffer.wrap(model), ModelLimits.defaults().withMaxSections(2)));
    assertTrue(many.getMessage().contains("maxSections=2"), many.getMessage());
    assertEquals("header", many.section());
    ModelFile.read(ByteBuffer.wrap(model), ModelLimits.defaults().withMaxModelBytes(model.length));
  }
}
