package dev.morsel.tokenize.unigram;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.function.Consumer;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/** Learner settings, determinism and bad input, on invented passenger messages to a ferry operator. */
class UnigramLearnerTest {
  private static final String[] PHRASES = {
      "the morning ferry to Skerryholm is delayed by forty minutes",
      "can I bring my bicycle on the evening sailing",
      "our cabin on deck four has no hot water",
      "the quay at Brannick was closed because of the storm",
      "please refund my tickets for the cancelled sailing",
      "is there a vehicle deck on the small ferry",
      "the harbour master says the crossing will resume at noon",
      "we missed the last ferry and need a cabin for tonight",
      "d\u00e9j\u00e0 vu: the sailing was cancelled again \u26f4",
  };

  /** A seeded corpus of messages assembled from the phrases. */
  private static PieceCounts corpus(long seed, int messages) {
    SplittableRandom r = new SplittableRandom(seed);
    List<String> texts = new ArrayList<>();
    for (int i = 0; i < messages; i++) {
      texts.add(PHRASES[r.nextInt(PHRASES.length)] + " " + PHRASES[r.nextInt(PHRASES.length)]);
    }
    return LocalSplit.count(texts);
  }

  private static UnigramLearner.Builder small() {
    return UnigramLearner.builder().vocabularySize(120).candidateMultiple(4).maxTokenCodePoints(10).byteSpelling(false);
  }

  @Test
  void resultDoesNotDependOnTheThreadCount() {
    PieceCounts c = corpus(11, 400);
    UnigramSegmenter one = UnigramSegmenter.of(small().threads(1).build().train(c));
    UnigramSegmenter two = UnigramSegmenter.of(small().threads(3).build().train(c));
    assertEquals(one.vocabularySize(), two.vocabularySize());
    for (int id = 0; id < one.vocabularySize(); id++) {
      assertEquals(one.token(id), two.token(id), "id " + id);
      assertEquals(Double.doubleToLongBits(one.score(id)), Double.doubleToLongBits(two.score(id)), "id " + id);
    }
  }

  @Test
  void reachesTheVocabularySizeAndLearnsFrequentWords() {
    UnigramSegmenter m = UnigramSegmenter.of(small().reservedTokens(List.of("\u00a7aboard")).build().train(corpus(3, 500)));
    assertEquals(120, m.vocabularySize());
    assertEquals(0, m.id("\u00a7aboard"));
    assertEquals(1, m.unknownId());
    assertEquals(-1, m.firstByteId());
    // " ferry" and " sailing" occur in most messages; a 120-token model keeps them whole
    assertTrue(m.id(" ferry") >= m.firstPieceId(), "' ferry' missing");
    assertTrue(m.id(" sailing") >= m.firstPieceId(), "' sailing' missing");
    // every character of the corpus stays a piece
    for (String p : PHRASES) {
      p.codePoints().forEach(cp -> assertTrue(m.id(Character.toString(cp)) >= m.firstPieceId(),
          "character U+" + Integer.toHexString(cp) + " missing"));
    }
    double sum = 0;
    for (int id = m.firstPieceId(); id < m.vocabularySize(); id++) {
      sum += Math.exp(m.score(id));
    }
    assertEquals(1.0, sum, 1e-6, "piece probabilities sum to one");
  }

  @Test
  void segmentsTrainingTextIntoFewTokens() {
    UnigramSegmenter m = UnigramSegmenter.of(small().vocabularySize(300).build().train(corpus(5, 600)));
    String text = " ferry";
    List<Integer> ids = new ArrayList<>();
    m.segment(text, 0, text.length(), (id, s, e) -> ids.add(id));
    assertEquals(List.of(m.id(" ferry")), ids);
  }

  @Test
  void badInputIsRejected() {
    assertThrows(IllegalArgumentException.class, () -> small().build().train(PieceCounts.empty()));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> UnigramLearner.builder().vocabularySize(10).byteSpelling(false).alphabet(AlphabetPolicy.of(1.0, 100))
            .build().train(corpus(1, 50)));
    assertTrue(e.getMessage().contains("vocabularySize=10") && e.getMessage().contains("alphabet"), e.getMessage());
    e = assertThrows(IllegalArgumentException.class,
        () -> UnigramLearner.builder().vocabularySize(200).byteSpelling(true).build());
    assertTrue(e.getMessage().contains("256 byte tokens"), "refused when built, before any learning: " + e.getMessage());
    e = assertThrows(IllegalArgumentException.class,
        () -> UnigramLearner.builder().vocabularySize(262).alphabet(AlphabetPolicy.of(1.0, 100)).build()
            .train(corpus(1, 50)));
    assertTrue(e.getMessage().contains("256 byte tokens") && e.getMessage().contains("alphabet"), e.getMessage());
    assertThrows(IllegalArgumentException.class, () -> UnigramLearner.builder().keepShare(1.0).build());
    assertThrows(IllegalArgumentException.class, () -> UnigramLearner.builder().keepShare(0).build());
    assertThrows(IllegalArgumentException.class, () -> UnigramLearner.builder().vocabularySize(0).build());
    assertThrows(IllegalArgumentException.class, () -> UnigramLearner.builder().maxTokenCodePoints(0).build());
    assertThrows(IllegalArgumentException.class, () -> UnigramLearner.builder().emPasses(0).build());
    assertThrows(IllegalArgumentException.class, () -> UnigramLearner.builder().threads(0).build());
    assertThrows(IllegalArgumentException.class, () -> UnigramLearner.builder().reservedTokens(List.of("a", "a")).build());
    assertThrows(IllegalArgumentException.class, () -> UnigramLearner.builder().unknownToken("").build());
  }

  /** Each seed and pruning setting, a value just outside its documented range, and the message's setting name. */
  static Stream<Arguments> outOfRange() {
    return Stream.of(
        Arguments.of("candidateMultiple", "0", (Consumer<UnigramLearner.Builder>) b -> b.candidateMultiple(0)),
        Arguments.of("candidateMultiple", "1001", (Consumer<UnigramLearner.Builder>) b -> b.candidateMultiple(1001)),
        Arguments.of("keepShare", "0.0", (Consumer<UnigramLearner.Builder>) b -> b.keepShare(0)),
        Arguments.of("keepShare", "1.0", (Consumer<UnigramLearner.Builder>) b -> b.keepShare(1)),
        Arguments.of("keepShare", "0.995", (Consumer<UnigramLearner.Builder>) b -> b.keepShare(0.995)),
        Arguments.of("keepShare", "NaN", (Consumer<UnigramLearner.Builder>) b -> b.keepShare(Double.NaN)),
        Arguments.of("keepShare", "-0.5", (Consumer<UnigramLearner.Builder>) b -> b.keepShare(-0.5)),
        Arguments.of("emPasses", "0", (Consumer<UnigramLearner.Builder>) b -> b.emPasses(0)),
        Arguments.of("emPasses", "101", (Consumer<UnigramLearner.Builder>) b -> b.emPasses(101)),
        Arguments.of("maxTokenCodePoints", "0", (Consumer<UnigramLearner.Builder>) b -> b.maxTokenCodePoints(0)),
        Arguments.of("maxTokenCodePoints", "65", (Consumer<UnigramLearner.Builder>) b -> b.maxTokenCodePoints(65)),
        Arguments.of("seedTableLimit", "999", (Consumer<UnigramLearner.Builder>) b -> b.seedTableLimit(999)));
  }

  @ParameterizedTest(name = "{0}={1}")
  @MethodSource("outOfRange")
  void outOfRangeSettingIsRejectedByName(String setting, String value, Consumer<UnigramLearner.Builder> set) {
    UnigramLearner.Builder b = UnigramLearner.builder();
    set.accept(b); // the setter takes any value; build() checks every setting
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, b::build);
    assertTrue(e.getMessage().startsWith(setting + "=" + value + " is outside "), e.getMessage());
    // a value back in range, and the learner learns
    assertEquals(120, small().build().train(corpus(2, 100)).vocabularySize());
  }

  @Test
  void boundaryValuesOfEachSettingAreAccepted() {
    PieceCounts c = corpus(4, 150);
    for (UnigramLearner.Builder b : List.of(small().candidateMultiple(1), small().candidateMultiple(1000),
        small().keepShare(Double.MIN_VALUE), small().keepShare(0.99), small().emPasses(1), small().emPasses(100),
        small().maxTokenCodePoints(64))) {
      assertEquals(120, b.build().train(c).vocabularySize());
    }
  }

  @Test
  void maxTokenCodePointsBoundsEveryLearnedPiece() {
    PieceCounts c = corpus(4, 150);
    for (int limit : new int[] {1, 2, 5}) {
      UnigramSegmenter m = UnigramSegmenter.of(small().vocabularySize(300).maxTokenCodePoints(limit).build().train(c));
      int longest = 0;
      for (int id = m.firstPieceId(); id < m.vocabularySize(); id++) {
        longest = Math.max(longest, m.token(id).codePointCount(0, m.token(id).length()));
      }
      assertEquals(limit, longest, "longest piece with maxTokenCodePoints=" + limit);
    }
    // with single characters only, the model is the alphabet: fewer ids than asked for
    UnigramSegmenter singles = UnigramSegmenter.of(small().maxTokenCodePoints(1).build().train(c));
    assertTrue(singles.vocabularySize() < 120, "size " + singles.vocabularySize());
  }

  @Test
  void byteSpellingModelHasByteTokensAfterReservedTokens() {
    UnigramSegmenter m = UnigramSegmenter.of(small().vocabularySize(400).byteSpelling(true)
        .reservedTokens(List.of("\u00a7a", "\u00a7b")).build().train(corpus(8, 200)));
    assertEquals(400, m.vocabularySize());
    assertEquals(2, m.firstByteId());
    assertEquals(2 + 256, m.unknownId());
    String text = " ferry \u00f8";
    java.io.ByteArrayOutputStream out = new java.io.ByteArrayOutputStream();
    m.segment(text, 0, text.length(), (id, s, e) -> m.decodeToken(id, out::write));
    assertArrayEquals(text.getBytes(java.nio.charset.StandardCharsets.UTF_8), out.toByteArray());
  }

  @Test
  void seedTableLimitBoundsMemoryAndStillTrains() {
    UnigramSegmenter m = UnigramSegmenter.of(small().seedTableLimit(1000).build().train(corpus(4, 300)));
    assertEquals(120, m.vocabularySize());
  }
}
