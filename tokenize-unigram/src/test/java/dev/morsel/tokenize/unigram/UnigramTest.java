package dev.morsel.tokenize.unigram;

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
import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * {@link Unigram}: n-best lists and sampling reached from a tokenizer, learned or loaded, going
 * through reserved tokens, normalization, splitting and framing like {@link Tokenizer#encode}, with
 * offsets into the original text. Checked against a brute-force oracle on short texts ({@link
 * Oracle}, sharing no code with the segmenter) and against {@code encode} on held-out Europarl bodies
 * (Koehn 2005, the sample in Lucene's test framework).
 */
class UnigramTest {
  private static final String QUAY = "\u27e8quay\u27e9";
  /** NFKC with case folding: nearly every Europarl body changes (docs/pipeline.md), so offsets map back. */
  private static final Pipeline FOLDED = Pipeline.of(Normalization.parse("nfkc+casefold"), Splitting.runs());
  private static final int TRAIN = 1500;
  private static final int HELD_OUT = 300;

  private static Tokenizer learned;
  private static Tokenizer loaded;
  private static List<String> heldOut;

  @BeforeAll
  static void learn() {
    List<String> bodies = Europarl.bodies();
    PieceCounts counts = PieceCounter.builder().pipeline(FOLDED).threads(2).build().count(bodies.subList(0, TRAIN));
    learned = UnigramLearner.builder().vocabularySize(2000).candidateMultiple(4).maxTokenCodePoints(12).threads(2)
        .reservedTokens(List.of(QUAY)).build().train(counts);
    loaded = Tokenizers.load(learned.toBytes());
    heldOut = bodies.subList(TRAIN, TRAIN + HELD_OUT);
  }

  /** The learned tokenizer encodes with the counted pipeline; n-best works on it and on its loaded copy alike. */
  @Test
  void worksOnLearnedAndLoadedTokenizersAlike() {
    assertEquals(FOLDED, learned.pipeline());
    assertEquals(Unigram.SCHEME, loaded.scheme());
    String text = "The FERRY to Harrowmere leaves at 07:40.";
    assertEquals(Unigram.nBest(learned, text, 5), Unigram.nBest(loaded, text, 5));
    assertEquals(Unigram.sample(learned, text, 0.3, 11), Unigram.sample(loaded, text, 0.3, 11));
  }

  /**
   * On every held-out body: the best of the n-best list is {@code encode}'s result (or scores the
   * same, where two paths tie); scores never rise down the list; every candidate keeps the offset
   * rules, decodes to the same text as {@code encode} (every segmentation spells the same text), and
   * no two are equal.
   */
  @Test
  void nBestAgreesWithEncodeOnHeldOutEuroparlBodies() {
    int ties = 0;
    int lists = 0;
    for (String body : heldOut) {
      Tokens encoded = loaded.encode(body);
      String decoded = loaded.decode(encoded.ids());
      List<Segmentation> best = Unigram.nBest(loaded, body, 4);
      assertTrue(!best.isEmpty() && best.size() <= 4);
      Segmentation first = best.get(0);
      if (Arrays.equals(encoded.ids(), first.tokens().ids())) {
        assertArrayEquals(encoded.starts(), first.tokens().starts(), body);
        assertArrayEquals(encoded.ends(), first.tokens().ends(), body);
      } else {
        ties++;
        assertEquals(score(loaded, encoded), first.score(), 1e-9, "a different best path must tie: " + body);
      }
      Set<List<Integer>> seen = new HashSet<>();
      for (int i = 0; i < best.size(); i++) {
        Segmentation s = best.get(i);
        OffsetInvariants.check(s.tokens(), body);
        assertEquals(decoded, loaded.decode(s.tokens().ids()), "candidate " + i + " of " + body);
        assertEquals(score(loaded, s.tokens()), s.score(), 1e-6, "the score is the sum of the tokens' scores");
        if (i > 0) {
          assertTrue(s.score() <= best.get(i - 1).score(), "best first: " + body);
        }
        assertTrue(seen.add(boxed(s.tokens().ids())), "candidates are distinct: " + body);
      }
      lists++;
    }
    assertEquals(HELD_OUT, lists);
    // each piece's list puts encode's own path first among exact ties, so they part only where more
    // than k paths tie; the score check above proved the tie
    assertTrue(ties <= HELD_OUT / 20, "encode and the n-best list part only on exact ties: " + ties);
    System.out.printf("[unigram n-best] %d held-out bodies, %d with a tied best path%n", lists, ties);
  }

  /**
   * Short texts of several pieces against the brute force: every segmentation of every piece
   * enumerated by {@link Oracle}, combined over the pieces, sorted; the n-best scores are the oracle's
   * top scores, and every candidate is one of the oracle's segmentations.
   */
  @Test
  void nBestOfAWholeTextMatchesTheBruteForceOverItsPieces() {
    Map<String, Double> vocab = new LinkedHashMap<>();
    vocab.put("f", -4.0);
    vocab.put("e", -3.0);
    vocab.put("r", -3.2);
    vocab.put("y", -4.1);
    vocab.put("fe", -4.5);
    vocab.put("rr", -5.0);
    vocab.put("ry", -4.4);
    vocab.put("ferry", -6.5);
    vocab.put("err", -5.5);
    vocab.put(" ", -1.0);
    vocab.put("a", -3.3);
    vocab.put("t", -3.6);
    vocab.put("at", -3.9);
    List<String> pieces = new ArrayList<>(vocab.keySet());
    double[] scores = pieces.stream().mapToDouble(vocab::get).toArray();
    UnigramSegmenter model = UnigramSegmenter.create(List.of(), false, UnigramSegmenter.DEFAULT_UNKNOWN, pieces, scores);
    Tokenizer t = Tokenizers.of(Pipeline.of(Normalization.none(), Splitting.whitespace()), model);
    for (String text : List.of("ferry at ferry", "ferry", "at a ferry", "terry fat")) {
      List<Double> all = new ArrayList<>(List.of(0.0));
      List<List<String>> paths = new ArrayList<>(List.of(List.of()));
      for (String piece : text.split("(?<= )|(?= )")) {
        List<Double> nextScores = new ArrayList<>();
        List<List<String>> nextPaths = new ArrayList<>();
        for (Oracle.Path p : Oracle.all(piece, vocab)) {
          for (int i = 0; i < all.size(); i++) {
            nextScores.add(all.get(i) + p.score());
            List<String> joined = new ArrayList<>(paths.get(i));
            for (String e : p.edges()) {
              joined.add(e.substring(e.indexOf(':') + 1));
            }
            nextPaths.add(joined);
          }
        }
        all = nextScores;
        paths = nextPaths;
      }
      List<Double> sorted = new ArrayList<>(all);
      sorted.sort((a, b) -> Double.compare(b, a));
      Set<List<String>> valid = new HashSet<>(paths);
      for (int k : new int[] {1, 3, 10, 40}) {
        List<Segmentation> got = Unigram.nBest(t, text, k);
        assertEquals(Math.min(k, sorted.size()), got.size(), text + " k=" + k);
        for (int i = 0; i < got.size(); i++) {
          assertEquals(sorted.get(i), got.get(i).score(), 1e-9, text + " k=" + k + " rank " + i);
          List<String> spelled = new ArrayList<>();
          for (int j = 0; j < got.get(i).tokens().size(); j++) {
            spelled.add(t.token(got.get(i).tokens().id(j)).equals(UnigramSegmenter.DEFAULT_UNKNOWN) ? "?"
                : t.token(got.get(i).tokens().id(j)));
          }
          assertTrue(valid.contains(spelled), "an oracle segmentation: " + spelled);
        }
      }
    }
  }

  /** Reserved tokens of trusted text and framing markers stand in every candidate, in place. */
  @Test
  void reservedTokensAndFramingAreTheSameInEveryCandidate() {
    Tokenizer framed = loaded.withTemplate(Template.of(List.of(QUAY), List.of(), List.of(QUAY)));
    String text = "Tickets at the " + QUAY + " kiosk";
    int quay = framed.reservedTokens().id(QUAY);
    Tokens encoded = framed.encode(text, Trust.TRUSTED);
    for (Segmentation s : Unigram.nBest(framed, text, 6, Trust.TRUSTED)) {
      Tokens x = s.tokens();
      assertEquals(quay, x.id(0));
      assertEquals(quay, x.id(x.size() - 1));
      int inText = 0;
      for (int i = 1; i < x.size() - 1; i++) {
        if (x.isReserved(i)) {
          inText++;
          assertEquals(text.indexOf(QUAY), x.start(i));
          assertEquals(text.indexOf(QUAY) + QUAY.length(), x.end(i));
        }
      }
      assertEquals(1, inText, "the trusted spelling is its reserved id in every candidate");
      assertEquals(framed.decode(encoded.ids()), framed.decode(x.ids()));
    }
    for (Segmentation s : Unigram.nBest(framed, text, 3)) {
      for (int i = 1; i < s.tokens().size() - 1; i++) {
        assertTrue(!s.tokens().isReserved(i), "untrusted text gives no reserved token");
      }
    }
    Tokens drawn = Unigram.sample(framed, text, 0.1, 5, Trust.TRUSTED);
    assertEquals(quay, drawn.id(0));
    assertEquals(framed.decode(encoded.ids()), framed.decode(drawn.ids()));
  }

  /**
   * Sampling on every held-out body: the offset rules hold, the text decodes as {@code encode}'s,
   * equal seeds give equal draws, draws vary with the seed, and a large alpha gives {@code encode}'s
   * ids on nearly every body (p^alpha concentrates on the best path, Kudo 2018 section 2.2).
   */
  @Test
  void samplingGoesThroughThePipelineOnHeldOutEuroparlBodies() {
    int differ = 0;
    int sharp = 0;
    for (int b = 0; b < heldOut.size(); b++) {
      String body = heldOut.get(b);
      Tokens encoded = loaded.encode(body);
      String decoded = loaded.decode(encoded.ids());
      Tokens a = Unigram.sample(loaded, body, 0.2, b);
      OffsetInvariants.check(a, body);
      assertEquals(decoded, loaded.decode(a.ids()), body);
      assertEquals(a, Unigram.sample(loaded, body, 0.2, b), "same seed, same draw");
      if (!a.equals(Unigram.sample(loaded, body, 0.2, b + 1_000_003L))) {
        differ++;
      }
      if (Arrays.equals(encoded.ids(), Unigram.sample(loaded, body, 500, b).ids())) {
        sharp++;
      }
    }
    assertTrue(differ > HELD_OUT / 2, "draws vary with the seed: " + differ);
    assertTrue(sharp > HELD_OUT * 9 / 10, "alpha 500 is nearly Viterbi: " + sharp);
    // through normalization: capitals and the ligature are folded as counted
    Tokens folded = Unigram.sample(loaded, "\ufb01rst FERRY", 0.5, 3);
    assertEquals("first ferry", loaded.decode(folded.ids()));
    assertEquals(0, folded.start(0));
    assertEquals("\ufb01rst FERRY".length(), folded.end(folded.size() - 1));
  }

  @Test
  void otherKindsAndBadArgumentsAreRefusedByName() {
    Tokenizer bytes = Tokenizers.of(Pipeline.defaults(), new ByteSegmenter(0));
    IllegalArgumentException kind = assertThrows(IllegalArgumentException.class, () -> Unigram.nBest(bytes, "ferry", 2));
    assertEquals("Unigram.nBest needs a tokenizer of scheme 'unigram'; this one is of scheme 'test-bytes'", kind.getMessage());
    assertThrows(IllegalArgumentException.class, () -> Unigram.sample(bytes, "ferry", 0.5, 1));
    assertThrows(IllegalArgumentException.class, () -> Unigram.score(bytes, 0));
    assertTrue(assertThrows(IllegalArgumentException.class, () -> Unigram.nBest(loaded, "ferry", 0)).getMessage()
        .contains("k=0"));
    assertThrows(IllegalArgumentException.class, () -> Unigram.nBest(loaded, "ferry", Unigram.MAX_N_BEST + 1));
    for (double alpha : new double[] {0, -1, Double.NaN, Double.POSITIVE_INFINITY}) {
      assertTrue(assertThrows(IllegalArgumentException.class, () -> Unigram.sample(loaded, "ferry", alpha, 1))
          .getMessage().contains("alpha="));
    }
    assertEquals(1, Unigram.nBest(loaded, "", 3).size(), "the empty text has one, empty, segmentation");
    assertEquals(0, Unigram.nBest(loaded, "", 3).get(0).tokens().size());
    assertTrue(Double.isNaN(Unigram.score(loaded, loaded.reservedTokens().id(QUAY))));
    assertNotEquals(Double.NaN, Unigram.score(loaded, loaded.vocabularySize() - 1));
  }

  /** The sum of the content tokens' scores, an uncovered character's byte tokens counting once with the unknown penalty. */
  private static double score(Tokenizer t, Tokens x) {
    double sum = 0;
    int lastByteStart = -1;
    int lastByteEnd = -1;
    for (int i = 0; i < x.size(); i++) {
      if (x.isReserved(i)) {
        continue;
      }
      double s = Unigram.score(t, x.id(i));
      if (Double.isNaN(s)) { // a byte token: the character it belongs to counts once, as unknown
        if (x.start(i) != lastByteStart || x.end(i) != lastByteEnd) {
          sum += Unigram.score(t, t.unknownId());
          lastByteStart = x.start(i);
          lastByteEnd = x.end(i);
        }
        continue;
      }
      sum += s;
    }
    return sum;
  }

  private static List<Integer> boxed(int[] ids) {
    List<Integer> out = new ArrayList<>(ids.length);
    for (int id : ids) {
      out.add(id);
    }
    return out;
  }
}
