package dev.morsel.tokenize.bpe;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.List;
import java.util.function.Supplier;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The public shape of the BPE module: {@link BpeLearner} checks every setting when it is built and
 * returns a tokenizer bound to the counted pipeline; {@link Bpe} reaches a learned or loaded
 * tokenizer's merges, cache and BPE-dropout (Provilkov et al. 2020) without casts, dropout going
 * through normalization and splitting with offsets into the original text.
 */
class BpeApiTest {
  private static final Pipeline FOLDED = Pipeline.of(Normalization.parse("nfkc+casefold"), Splitting.runs());
  private static final String BELL = "\u27e8bell\u27e9";
  private static Tokenizer learned;
  private static Tokenizer loaded;
  private static List<String> heldOut;

  @BeforeAll
  static void learn() {
    List<String> bodies = Europarl.bodies();
    PieceCounts counts = PieceCounter.builder().pipeline(FOLDED).threads(2).build().count(bodies.subList(0, 1000));
    learned = BpeLearner.builder().vocabularySize(1500).threads(2).reservedTokens(List.of(BELL)).build().train(counts);
    loaded = Tokenizers.load(learned.toBytes());
    heldOut = bodies.subList(1000, 1200);
  }

  @Test
  void theLearnedTokenizerEncodesWithTheCountedPipeline() {
    assertEquals(FOLDED, learned.pipeline());
    assertEquals(FOLDED, loaded.pipeline());
    assertEquals(Bpe.SCHEME, loaded.scheme());
    assertEquals(0, loaded.reservedTokens().id(BELL));
    assertArrayEquals(loaded.encode("the harbour").ids(), loaded.encode("THE HARBOUR").ids());
  }

  /** Every bad setting is refused by {@code build()}, not by its setter and not later, naming it. */
  @Test
  void buildRefusesEveryBadSettingByName() {
    refused("vocabularySize=255", () -> BpeLearner.builder().vocabularySize(255));
    refused("minPairCount=0", () -> BpeLearner.builder().minPairCount(0));
    refused("maxTokenBytes=1", () -> BpeLearner.builder().maxTokenBytes(1));
    refused("minCount=0", () -> BpeLearner.builder().minCount(0));
    refused("maxPieceBytes=1", () -> BpeLearner.builder().maxPieceBytes(1));
    refused("threads=0", () -> BpeLearner.builder().threads(0));
    refused("reservedTokens[1]", () -> BpeLearner.builder().reservedTokens(List.of(BELL, BELL)));
    refused("overlap", () -> BpeLearner.builder().reservedTokens(List.of("\u27e8ab", "ab\u27e9")));
    refused("contains", () -> BpeLearner.builder().reservedTokens(List.of(BELL, "x" + BELL)));
    refused("surrogate", () -> BpeLearner.builder().reservedTokens(List.of("\u27e8\ud800\u27e9")));
    refused("reservedTokens[0]", () -> BpeLearner.builder().reservedTokens(List.of("a")));
    assertEquals("reservedTokens[1] is null", assertThrows(NullPointerException.class,
        () -> BpeLearner.builder().reservedTokens(Arrays.asList(BELL, null)).build()).getMessage());
  }

  private static void refused(String named, Supplier<BpeLearner.Builder> builder) {
    BpeLearner.Builder b = builder.get(); // the setter accepts anything ...
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, b::build); // ... build() checks
    assertTrue(e.getMessage().contains(named), e.getMessage());
  }

  /**
   * BPE-dropout on held-out Europarl bodies (Koehn 2005): offsets keep the rules, every draw decodes
   * to the text {@code encode} decodes to, p = 0 is {@code encode}, p = 1 is one token per byte,
   * equal seeds give equal draws and other seeds other ones.
   */
  @Test
  void dropoutGoesThroughThePipelineOnHeldOutEuroparlBodies() {
    int differ = 0;
    for (int i = 0; i < heldOut.size(); i++) {
      String body = heldOut.get(i);
      Tokens encoded = loaded.encode(body);
      String decoded = loaded.decode(encoded.ids());
      Tokens drawn = Bpe.dropout(loaded, body, 0.1, i);
      OffsetInvariants.check(drawn, body);
      assertEquals(decoded, loaded.decode(drawn.ids()), body);
      assertTrue(drawn.size() >= encoded.size(), "dropout never merges more than encode: " + body);
      assertEquals(drawn, Bpe.dropout(loaded, body, 0.1, i), "same seed, same draw");
      if (!drawn.equals(Bpe.dropout(loaded, body, 0.1, i + 7_919L))) {
        differ++;
      }
      assertEquals(encoded, Bpe.dropout(loaded, body, 0.0, i), "p = 0 is encode");
      Tokens bytes = Bpe.dropout(loaded, body, 1.0, i);
      assertEquals(decoded.getBytes(StandardCharsets.UTF_8).length, bytes.size(), "p = 1 gives one token per byte");
    }
    assertTrue(differ > heldOut.size() / 2, "draws vary with the seed: " + differ);
    Tokens trusted = Bpe.dropout(loaded.withTemplate(Template.of(List.of(BELL), List.of(), List.of())), "ring the " + BELL,
        0.5, 1, Trust.TRUSTED);
    assertEquals(0, trusted.id(0));
    assertEquals(0, trusted.id(trusted.size() - 1), "the trusted spelling is its reserved id");
  }

  @Test
  void theCacheIsASettingOfTheTokenizerNotOfTheModel() {
    Tokenizer off = Bpe.withCacheEntries(loaded, 0);
    assertEquals(0, Bpe.cacheEntries(off));
    assertEquals(Bpe.DEFAULT_CACHE_ENTRIES, Bpe.cacheEntries(loaded));
    assertEquals(loaded.fingerprint(), off.fingerprint());
    for (String body : heldOut) {
      assertEquals(loaded.encode(body), off.encode(body));
    }
    assertThrows(IllegalArgumentException.class, () -> Bpe.withCacheEntries(loaded, -1));
  }

  /** The merges, read back, rebuild every merged token's bytes from its two halves. */
  @Test
  void mergesAreReachableInRankOrder() {
    int k = loaded.reservedTokens().size();
    assertEquals(loaded.vocabularySize() - k - 256, Bpe.mergeCount(loaded));
    for (int r = 0; r < Bpe.mergeCount(loaded); r++) {
      int[] m = Bpe.merge(loaded, r);
      assertTrue(m[0] < k + 256 + r && m[1] < k + 256 + r, "a merge joins earlier tokens");
      byte[] a = loaded.tokenBytes(m[0]);
      byte[] b = loaded.tokenBytes(m[1]);
      byte[] joined = Arrays.copyOf(a, a.length + b.length);
      System.arraycopy(b, 0, joined, a.length, b.length);
      assertArrayEquals(joined, loaded.tokenBytes(k + 256 + r), "merge " + r);
    }
  }

  @Test
  void otherKindsAndBadArgumentsAreRefusedByName() {
    Tokenizer bytes = Tokenizers.of(Pipeline.defaults(), new ByteSegmenter(0));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Bpe.dropout(bytes, "ferry", 0.1, 1));
    assertEquals("Bpe.dropout needs a tokenizer of scheme 'bpe'; this one is of scheme 'test-bytes'", e.getMessage());
    for (double p : new double[] {-0.1, 1.1, Double.NaN}) {
      assertTrue(assertThrows(IllegalArgumentException.class, () -> Bpe.dropout(loaded, "ferry", p, 1)).getMessage()
          .contains("p="));
    }
    assertThrows(IndexOutOfBoundsException.class, () -> Bpe.merge(loaded, Bpe.mergeCount(loaded)));
    assertNotEquals(0, Bpe.mergeCount(loaded));
  }
}
