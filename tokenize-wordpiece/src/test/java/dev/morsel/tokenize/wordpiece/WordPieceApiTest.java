package dev.morsel.tokenize.wordpiece;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.Arrays;
import java.util.List;
import java.util.function.Supplier;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The public shape of the WordPiece module: {@link WordPieceLearner} checks every setting when it is
 * built and returns a tokenizer bound to the counted pipeline; {@link WordPiece} reaches a learned or
 * loaded tokenizer's WordPiece features without casts.
 */
class WordPieceApiTest {
  private static final Pipeline FOLDED = Pipeline.of(Normalization.parse("nfkc+casefold"), Splitting.runs());
  private static PieceCounts counts;
  private static Tokenizer learned;

  @BeforeAll
  static void learn() {
    counts = PieceCounter.builder().pipeline(FOLDED).threads(2).build().count(Europarl.bodies().subList(0, 800));
    learned = WordPieceLearner.builder().vocabularySize(2000).build().train(counts);
  }

  @Test
  void theLearnedTokenizerEncodesWithTheCountedPipeline() {
    assertEquals(FOLDED, learned.pipeline());
    assertEquals(WordPiece.SCHEME, learned.scheme());
    assertArrayEquals(learned.encode("the harbour").ids(), learned.encode("THE HARBOUR").ids());
    assertEquals(learned.fingerprint(), Tokenizers.load(learned.toBytes()).fingerprint());
  }

  /** Every bad setting is refused by {@code build()}, not by its setter and not later, naming the setting. */
  @Test
  void buildRefusesEveryBadSettingByName() {
    refused("vocabularySize=1", () -> WordPieceLearner.builder().vocabularySize(1));
    refused("minCount=0", () -> WordPieceLearner.builder().minCount(0));
    IllegalArgumentException cap = assertThrows(IllegalArgumentException.class, () -> AlphabetPolicy.of(1.0, -1));
    assertTrue(cap.getMessage().contains("maxSize=-1"), cap.getMessage()); // a value type refuses at once
    refused("minPairCount=0", () -> WordPieceLearner.builder().minPairCount(0));
    refused("maxPieceLength=-1", () -> WordPieceLearner.builder().maxPieceLength(-1));
    refused("marker", () -> WordPieceLearner.builder().marker(""));
    refused("whitespace", () -> WordPieceLearner.builder().marker("+ "));
    refused("unknownToken", () -> WordPieceLearner.builder().unknownToken(""));
    refused("reservedTokens[1]", () -> WordPieceLearner.builder().reservedTokens(List.of("\u27e8a\u27e9", "")));
    refused("overlap", () -> WordPieceLearner.builder().reservedTokens(List.of("\u27e8ab", "ab\u27e9")));
    refused("reservedTokens[0]", () -> WordPieceLearner.builder()
        .reservedTokens(List.of(WordPieceLearner.DEFAULT_UNKNOWN_TOKEN)));
    NullPointerException n = assertThrows(NullPointerException.class,
        () -> WordPieceLearner.builder().reservedTokens(Arrays.asList("\u27e8a\u27e9", null)).build());
    assertEquals("reservedTokens[1] is null", n.getMessage());
  }

  private static void refused(String named, Supplier<WordPieceLearner.Builder> builder) {
    WordPieceLearner.Builder b = builder.get(); // the setter accepts anything ...
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, b::build); // ... build() checks
    assertTrue(e.getMessage().contains(named), e.getMessage());
  }

  @Test
  void continuationTokensAndTheMarkerAreReachableFromALoadedTokenizer() {
    Tokenizer loaded = Tokenizers.load(learned.toBytes());
    String marker = WordPiece.marker(loaded);
    assertEquals(WordPieceLearner.DEFAULT_MARKER, marker);
    int continuations = 0;
    for (int id = 0; id < loaded.vocabularySize(); id++) {
      boolean c = WordPiece.isContinuation(loaded, id);
      assertEquals(c, id > loaded.unknownId() && loaded.token(id).startsWith(marker) && loaded.token(id).length() > marker.length(),
          "token " + id + " '" + loaded.token(id) + "'");
      continuations += c ? 1 : 0;
    }
    assertTrue(continuations > 100, "continuations: " + continuations);
  }

  /** Another piece limit is another model: a long run turns from the unknown token into real tokens. */
  @Test
  void anotherPieceLimitIsAnotherModel() {
    String run = "harbour".repeat(40); // 280 units, one piece
    assertTrue(WordPiece.maxPieceLength(learned) >= run.length(), "the derived limit: " + WordPiece.maxPieceLength(learned));
    Tokenizer tight = WordPiece.withMaxPieceLength(learned, 100);
    assertEquals(100, WordPiece.maxPieceLength(tight));
    // below 2,048 ids byte spelling is off by default: the piece over the limit is one unknown token
    Tokens unknown = tight.encode(run);
    assertEquals(1, unknown.size());
    assertEquals(tight.unknownId(), unknown.id(0));
    // with byte spelling the piece is cut into chunks of at most the limit instead
    Tokenizer tightBytes = WordPiece.withMaxPieceLength(
        WordPieceLearner.builder().vocabularySize(2000).byteSpelling(true).build().train(counts), 100);
    Tokens chunked = tightBytes.encode(run);
    assertFalse(Arrays.stream(chunked.ids()).anyMatch(id -> id == tightBytes.unknownId()), chunked.toString());
    assertEquals(run, tightBytes.decode(chunked.ids()));
    Tokenizer wide = WordPiece.withMaxPieceLength(tight, 1000);
    assertEquals(1000, WordPiece.maxPieceLength(wide));
    Tokens segmented = wide.encode(run);
    assertTrue(segmented.size() > 1, segmented.toString());
    assertFalse(Arrays.stream(segmented.ids()).anyMatch(id -> id == learned.unknownId()));
    assertEquals(run, wide.decode(segmented.ids()));
    assertArrayEquals(learned.encode(run).ids(), segmented.ids(), "every limit at or above the piece segments it alike");
    assertNotEquals(tight.fingerprint(), wide.fingerprint());
    assertEquals(learned.pipeline(), wide.pipeline());
    assertEquals(100, WordPiece.maxPieceLength(Tokenizers.load(tight.toBytes())));
    Tokenizer derived = WordPiece.withMaxPieceLength(tight, WordPieceLearner.DERIVED_PIECE_LENGTH);
    assertEquals(learned.fingerprint(), derived.fingerprint(), "back to the derived limit: the learned model again");
  }

  @Test
  void aTokenizerFromAVocabularyList() {
    Tokenizer t = WordPiece.fromTokens(Pipeline.defaults(), List.of("\u27e8dock\u27e9", "?", "ferr", "+y", "+ies", "quay"), 1,
        "+", "?");
    assertArrayEquals(new int[] {2, 3}, t.encode("ferry").ids());
    assertArrayEquals(new int[] {2, 4}, t.encode("ferries").ids());
    assertArrayEquals(new int[] {5}, t.encode("quay").ids());
    assertArrayEquals(new int[] {1}, t.encode("ferrø").ids(), "no match for the rest: the whole piece is unknown");
    assertEquals(1, t.unknownId());
    assertEquals(0, t.reservedTokens().id("\u27e8dock\u27e9"));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> WordPiece.fromTokens(Pipeline.defaults(), List.of("?", "a", "a"), 0, "+", "?"));
    assertTrue(e.getMessage().contains("token 2"), e.getMessage());
  }

  @Test
  void otherKindsAreRefusedNamingTheirKind() {
    Tokenizer bytes = Tokenizers.of(Pipeline.defaults(), new ByteSegmenter(0));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> WordPiece.marker(bytes));
    assertEquals("WordPiece.marker needs a tokenizer of scheme 'wordpiece'; this one is of scheme 'test-bytes'", e.getMessage());
  }
}
