package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.ReservedTokens;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.unigram.UnigramLearner;
import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import java.util.Map;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;

/**
 * The unigram learner fed what nobody should feed it: each case gives a clear error naming the
 * setting or the input, or the documented behaviour, and never hangs. The class-level
 * {@link Timeout} is a hang guard only (far above what a run needs), not a speed check. Invalid
 * UTF-8 in a corpus file is the piece counter's concern, shared by every learner and tested with
 * the BPE and WordPiece learners.
 */
@Timeout(300)
class LearnerAbuseTest {
  /** Every character in the alphabet, whatever the vocabulary size. */
  static final AlphabetPolicy EVERY = AlphabetPolicy.of(1.0, Integer.MAX_VALUE);
  static UnigramLearner unigram(int vocabularySize) {
    return UnigramLearner.builder().vocabularySize(vocabularySize).byteSpelling(true).threads(2).build();
  }

  static Tokenizer tokenizer(UnigramSegmenter m) {
    return Tokenizers.of(Pipeline.defaults(), m, ReservedTokens.none(), Template.none());
  }

  /** Ids reserved by a byte-spelling model without reserved tokens: 256 bytes and the unknown token. */
  static final int RESERVED = 257;

  @Test
  void emptyCountsAreAClearError() {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> unigram(1000).train(PieceCounts.empty()));
    assertTrue(e.getMessage().contains("empty"), e.getMessage());
    // pieces that all hold an unpaired surrogate leave nothing to learn from
    IllegalArgumentException s = assertThrows(IllegalArgumentException.class,
        () -> unigram(1000).train(PieceCounts.of(Map.of("\uD800ferry", 4L))));
    assertTrue(s.getMessage().contains("surrogate"), s.getMessage());
  }

  @Test
  void oneDistinctPieceGivesWhatItCan() {
    UnigramSegmenter m = UnigramSegmenter.of(unigram(32_000).train(PieceCounts.of(Map.of("ferry", 1000L))));
    // the seed is every substring of "ferry": 4 distinct characters and 10 distinct longer ones;
    // there is nothing to prune towards 32,000, so the model keeps at most those 14 pieces
    int pieces = m.vocabularySize() - m.firstPieceId();
    assertTrue(pieces >= 4 && pieces <= 14, "pieces: " + pieces);
    assertEquals(1, tokenizer(m).encode("ferry").size(), "the whole piece is the likeliest path");
    Tokenizer t = tokenizer(m);
    String other = "Skarvøy quay";
    assertEquals(t.pipeline().normalization().apply(other).text(), t.decode(t.encode(other).ids()));
    // a single one-character piece
    UnigramSegmenter a = UnigramSegmenter.of(unigram(300).train(PieceCounts.of(Map.of("a", 5L))));
    assertEquals(RESERVED + 1, a.vocabularySize());
  }

  @Test
  void vocabularySmallerThanTheAlphabetIsAClearError() {
    PieceCounts letters = PieceCounts.of(Map.of("abcdefghij", 3L, "klmnop", 2L)); // 16 characters
    // an explicit cap that asks for all 16: refused, naming the size and the alphabet
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> UnigramLearner.builder()
        .vocabularySize(RESERVED + 15).byteSpelling(true).alphabet(EVERY).threads(2).build().train(letters));
    assertTrue(e.getMessage().contains("vocabularySize=" + (RESERVED + 15)) && e.getMessage().contains("16"),
        e.getMessage());
    // exactly the alphabet fits: single characters only
    UnigramSegmenter m = UnigramSegmenter.of(UnigramLearner.builder().vocabularySize(RESERVED + 16).byteSpelling(true)
        .alphabet(EVERY).threads(2).build().train(letters));
    assertEquals(RESERVED + 16, m.vocabularySize());
    // the derived cap (half the free ids) leaves the rarest characters to byte spelling instead
    UnigramSegmenter capped = UnigramSegmenter.of(unigram(RESERVED + 15).train(letters));
    assertEquals("klmnop", tokenizer(capped).decode(tokenizer(capped).encode("klmnop").ids()));
    IllegalArgumentException b = assertThrows(IllegalArgumentException.class,
        () -> UnigramLearner.builder().vocabularySize(0).build());
    assertTrue(b.getMessage().contains("vocabularySize=0"), b.getMessage());
  }

  @Test
  void vocabularyLargerThanTheCorpusCanGiveStopsEarly() {
    PieceCounts small = PieceCounter.builder().threads(2).build().count(Europarl.bodies().subList(0, 20));
    UnigramSegmenter m = UnigramSegmenter.of(UnigramLearner.builder().vocabularySize(1_000_000).byteSpelling(true).threads(2).build().train(small));
    assertTrue(m.vocabularySize() < 1_000_000, "vocabulary " + m.vocabularySize());
    assertTrue(m.vocabularySize() > RESERVED + 100, "vocabulary " + m.vocabularySize());
    Tokenizer t = tokenizer(m);
    String text = Europarl.bodies().get(3);
    assertEquals(t.pipeline().normalization().apply(text).text(), t.decode(t.encode(text).ids()));
  }

  /**
   * Every count times 2^32 trains without overflow into a model of the same size that still encodes
   * losslessly. Documented behaviour, found here: the model is not scale-invariant. EM floors an
   * expected count at 1e-12 occurrences (an absolute unit), so a token that is almost never used
   * (a single character always covered by longer tokens) scores {@code log(1e-12) - log(total)},
   * which moves with the scale. The pieces learned are the same (443 of 443 in one run); only such
   * scores differ.
   */
  @Test
  void countsBeyondIntTrainWithoutOverflow() {
    PieceCounts small = PieceCounter.builder().threads(2).build().count(Europarl.bodies().subList(0, 100));
    Map<String, Long> scaled = new TreeMap<>();
    small.forEach((piece, count) -> scaled.put(piece, count << 32));
    PieceCounts big = PieceCounts.of(scaled);
    assertTrue(big.count(0) > Integer.MAX_VALUE);
    UnigramSegmenter a = UnigramSegmenter.of(unigram(700).train(small));
    UnigramSegmenter b = UnigramSegmenter.of(unigram(700).train(big));
    assertEquals(a.vocabularySize(), b.vocabularySize());
    int same = 0;
    for (int id = a.firstPieceId(); id < a.vocabularySize(); id++) {
      same += b.id(a.token(id)) >= 0 ? 1 : 0;
      assertTrue(Double.isFinite(b.score(id)), "score of id " + id);
    }
    int pieces = a.vocabularySize() - a.firstPieceId();
    System.out.println("[unigram learner abuse] counts x 2^32: " + same + " of " + pieces + " pieces in common");
    assertEquals(pieces, same, "pieces in common");
    Tokenizer t = tokenizer(b);
    String text = Europarl.bodies().get(150);
    assertEquals(t.pipeline().normalization().apply(text).text(), t.decode(t.encode(text).ids()));
  }

  @Test
  void countsWhoseTotalOverflowsALongAreRefused() {
    Map<String, Long> m = new TreeMap<>();
    m.put("ferry", Long.MAX_VALUE / 2 + 1);
    m.put("quay", Long.MAX_VALUE / 2 + 1);
    assertThrows(ArithmeticException.class, () -> PieceCounts.of(m));
  }

  /** Regression: substring counts of the seed stage wrapped around a long and gave NaN scores. */
  @Test
  void seedCountsThatWouldOverflowALongAreRefused() {
    // the total fits a long, but "a" occurs 8 times in the piece: 8 * 2^61 does not
    PieceCounts heavy = PieceCounts.of(Map.of("aaaaaaaa", 1L << 61, "ferry", 3L));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> unigram(400).train(heavy));
    assertTrue(e.getMessage().contains("overflow"), e.getMessage());
    // just below the bound it trains
    PieceCounts fits = PieceCounts.of(Map.of("aaaaaaaa", Long.MAX_VALUE / 8 - 1));
    UnigramSegmenter m = UnigramSegmenter.of(unigram(400).train(fits));
    assertEquals("aaaaaaaa", tokenizer(m).decode(tokenizer(m).encode("aaaaaaaa").ids()));
  }

  /**
   * Regression: one giant piece (a 32 MiB line without a break) made the seed stage cut every
   * substring of up to 16 code points at every position and EM allocate lattices as long as the
   * piece: effectively a hang. Such pieces are now left out of training, as documented.
   */
  @Test
  void aGiantSinglePieceIsLeftOutOfTraining() {
    String giant = HostileInputs.lowercase(new java.util.SplittableRandom(0x61A47L), 32 << 20);
    PieceCounts alone = PieceCounts.of(new String[] {giant}, new long[] {1});
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> unigram(400).train(alone));
    assertTrue(e.getMessage().contains("maxPieceLength=" + UnigramLearner.DEFAULT_MAX_PIECE_LENGTH), e.getMessage());
    PieceCounts mixed = PieceCounts.of(new String[] {giant, " ferry", " quay", "the"}, new long[] {1, 40, 30, 20});
    UnigramSegmenter m = UnigramSegmenter.of(unigram(400).train(mixed));
    assertEquals(1, tokenizer(m).encode(" ferry").size());
    assertTrue(m.vocabularySize() < 400, "only the short pieces were learned from: " + m.vocabularySize());
    IllegalArgumentException b = assertThrows(IllegalArgumentException.class,
        () -> UnigramLearner.builder().maxPieceLength(0).build());
    assertTrue(b.getMessage().contains("maxPieceLength=0"), b.getMessage());
  }
}
