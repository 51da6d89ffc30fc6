package dev.morsel.tokenize.lucene;

import dev.morsel.tokenize.Tokenizer;
import java.io.Reader;
import java.io.StringReader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.atomic.AtomicInteger;
import org.apache.lucene.analysis.Analyzer;
import org.apache.lucene.analysis.AnalyzerWrapper;
import org.apache.lucene.analysis.custom.CustomAnalyzer;
import org.apache.lucene.tests.analysis.BaseTokenStreamTestCase;

/**
 * Conformance to Lucene's own token-stream contract, checked by Lucene's own test suite:
 * {@code org.apache.lucene.tests.analysis.BaseTokenStreamTestCase} of lucene-test-framework 9.12.3
 * (JUnit 4, run here through the JUnit Platform's vintage engine).
 *
 * <p>{@code assertAnalyzesTo} and {@code assertTokenStreamContents} compare terms, offsets, types,
 * position increments and the final offset with values worked out by hand, and on the way check
 * Lucene's contract (clearAttributes before each token, offsets not going back, reset/end/close in
 * order, a second run equal to the first). {@code checkRandomData} feeds random Unicode text
 * through every scheme, with and without Lucene's mock char filter and through readers that return
 * short reads or fail mid-stream, from several threads at once, and checks offsets, the
 * reset/close contract and that every run gives the same tokens; it also indexes the text.
 *
 * <p>The hand-checked texts run through {@link TestModels#handMade()}, a WordPiece vocabulary
 * written in the test under NFKC and rule-based splitting; each expected token is derived in the
 * comment above its assertion.
 */
// "exports": the test framework is an automatic module whose base class javac reports as not exported
@SuppressWarnings("exports")
public class LuceneConformanceTest extends BaseTokenStreamTestCase {
  private static final String LETTERS = PieceClass.LETTERS.type();
  private static final String DIGITS = PieceClass.DIGITS.type();
  private static final String IDEOGRAPH = PieceClass.IDEOGRAPH.type();
  private static final String PUNCTUATION = PieceClass.PUNCTUATION.type();
  private static final String SYMBOL = PieceClass.SYMBOL.type();
  /** Random texts per scheme; the bar is 1,000. */
  private static final int ITERATIONS = 1000;
  /** Longest random "word" for the chunking runs, in chars (reason: several 16-char chunks per text). */
  private static final int LONG_WORDS = 100;

  /** JUnit 4 creates the suite through this constructor. */
  public LuceneConformanceTest() {}

  private static Analyzer analyzer(Tokenizer morsel, SubwordSettings settings) {
    return SubwordAnalyzer.of(morsel, settings);
  }

  private static Analyzer handMade() {
    return SubwordAnalyzer.of(TestModels.handMade());
  }

  // ------------------------------------------------------------------ hand-checked

  public void testLigatureSplitsIntoTokensThatShareTheLigaturesStart() throws Exception {
    // "ﬁnal ferry": NFKC turns U+FB01 into "fi", so the normalized pieces are "final" and " ferry".
    // Greedy longest match on "final": "f" (the vocabulary has no "fi"), then the continuation
    // "∘inal". "f" comes from the ligature alone: [0, 1). "∘inal" starts inside the ligature's
    // chunk, so its span starts where the ligature starts: [0, 4). " ferry" is [4, 10).
    try (Analyzer a = handMade()) {
      assertAnalyzesTo(a, "\ufb01nal ferry",
          new String[] {"f", "\u2218inal", " ferry"},
          new int[] {0, 0, 4}, new int[] {1, 4, 10},
          new String[] {LETTERS, LETTERS, LETTERS},
          new int[] {1, 1, 1});
    }
  }

  public void testFullWidthLettersAndDigitsKeepOneOffsetPerCharacter() throws Exception {
    // "Ｏｓｋｅｖｉｋ ０７:４０" (13 chars): NFKC maps each full-width char to one ASCII char, one chunk
    // each, so offsets stay one to one. Pieces "Oskevik", " 07" (the space moves to the digits),
    // ":", "40"; "Oskevik" is "Osk" + "∘evik". The type of " 07" is that of its first non-space
    // character, a digit.
    try (Analyzer a = handMade()) {
      assertAnalyzesTo(a, "\uff2f\uff53\uff4b\uff45\uff56\uff49\uff4b \uff10\uff17:\uff14\uff10",
          new String[] {"Osk", "\u2218evik", " 07", ":", "40"},
          new int[] {0, 3, 7, 10, 11}, new int[] {3, 7, 10, 11, 13},
          new String[] {LETTERS, LETTERS, DIGITS, PUNCTUATION, DIGITS},
          new int[] {1, 1, 1, 1, 1});
    }
  }

  public void testCombiningAccentMapsToTheBaseLetterAndItsMark() throws Exception {
    // "Cafe\u0301 à Harrowmere" (18 chars): NFKC composes e + U+0301 (chars 3..4) into "é". Pieces
    // "Café", " à", " Harrowmere"; "Café" is "Caf" + "∘é", and "∘é" spans the whole source of "é",
    // [3, 5). " à" is [5, 7); " Harrowmere" is " Harrow" [7, 14) + "∘mere" [14, 18).
    try (Analyzer a = handMade()) {
      assertAnalyzesTo(a, "Cafe\u0301 \u00e0 Harrowmere",
          new String[] {"Caf", "\u2218\u00e9", " \u00e0", " Harrow", "\u2218mere"},
          new int[] {0, 3, 5, 7, 14}, new int[] {3, 5, 7, 14, 18},
          new String[] {LETTERS, LETTERS, LETTERS, LETTERS, LETTERS},
          new int[] {1, 1, 1, 1, 1});
    }
  }

  public void testEmojiWithSkinToneIsOnePieceAndOneUnknownToken() throws Exception {
    // "Osk 👍🏽 ok" (11 chars): U+1F44D then the modifier U+1F3FD, two surrogate pairs at 4..7. The
    // modifier is a mark, so " 👍🏽" is one piece [3, 8); no word-initial token begins it, so it is
    // one unknown token ⍰ over the whole piece. Its type is that of U+1F44D, a symbol (So).
    try (Analyzer a = handMade()) {
      assertAnalyzesTo(a, "Osk \ud83d\udc4d\ud83c\udffd ok",
          new String[] {"Osk", "\u2370", " ok"},
          new int[] {0, 3, 8}, new int[] {3, 8, 11},
          new String[] {LETTERS, SYMBOL, LETTERS},
          new int[] {1, 1, 1});
    }
  }

  public void testIdeographsAreOneTokenEachAndKanaIsLetters() throws Exception {
    // "渡船は7時": each Unified_Ideograph is a piece alone; Hiragana は is a letter run, 7 a digit.
    try (Analyzer a = handMade()) {
      assertAnalyzesTo(a, "\u6e21\u8239\u306f7\u6642",
          new String[] {"\u6e21", "\u8239", "\u306f", "7", "\u6642"},
          new int[] {0, 1, 2, 3, 4}, new int[] {1, 2, 3, 4, 5},
          new String[] {IDEOGRAPH, IDEOGRAPH, LETTERS, DIGITS, IDEOGRAPH},
          new int[] {1, 1, 1, 1, 1});
    }
  }

  public void testPositionsPerPieceGiveAWordOnePosition() throws Exception {
    // the accent text again: pieces start at original offsets 0 ("Café"), 5 (" à"), 7 ("
    // Harrowmere"); the continuation tokens "∘é" and "∘mere" stand at their piece's position.
    // Tokens at one position then start at different offsets, so Lucene's graph-offset check
    // (graphOffsetsAreCorrect) is off for this setting.
    SubwordSettings perPiece = SubwordSettings.builder().positions(SubwordSettings.Positions.PER_PIECE).build();
    try (Analyzer a = analyzer(TestModels.handMade(), perPiece)) {
      assertAnalyzesTo(a, "Cafe\u0301 \u00e0 Harrowmere",
          new String[] {"Caf", "\u2218\u00e9", " \u00e0", " Harrow", "\u2218mere"},
          new int[] {0, 3, 5, 7, 14}, new int[] {3, 5, 7, 14, 18},
          new String[] {LETTERS, LETTERS, LETTERS, LETTERS, LETTERS},
          new int[] {1, 0, 1, 1, 0}, null, false);
      // the ligature: "f" and "∘inal" both come from the piece that starts at 0
      assertAnalyzesTo(a, "\ufb01nal ferry", new String[] {"f", "\u2218inal", " ferry"},
          new int[] {0, 0, 4}, new int[] {1, 4, 10}, null, new int[] {1, 0, 1}, null, false);
    }
  }

  public void testOriginalTermTextIsTheSpanOfTheOriginal() throws Exception {
    // the same tokens as the ligature test, with the original characters as terms
    SubwordSettings original = SubwordSettings.builder().termText(SubwordSettings.TermText.ORIGINAL).build();
    try (Analyzer a = analyzer(TestModels.handMade(), original)) {
      assertAnalyzesTo(a, "\ufb01nal ferry", new String[] {"\ufb01", "\ufb01nal", " ferry"},
          new int[] {0, 0, 4}, new int[] {1, 4, 10});
    }
  }

  public void testTokenizerStreamEndsAtTheInputLength() throws Exception {
    // assertTokenStreamContents drives reset/incrementToken/end/close itself and checks the final
    // offset that end() reports: the length of the input, 10
    SubwordTokenizer t = new SubwordTokenizer(TestModels.handMade());
    t.setReader(new StringReader("\ufb01nal ferry"));
    assertTokenStreamContents(t, new String[] {"f", "\u2218inal", " ferry"},
        new int[] {0, 0, 4}, new int[] {1, 4, 10}, new String[] {LETTERS, LETTERS, LETTERS},
        new int[] {1, 1, 1}, 10);
  }

  public void testOffsetsGoThroughACharFilterBeforeTheTokenizer() throws Exception {
    // the HTML strip char filter of lucene-analysis-common decodes the entity "&#xFB01;" (chars
    // 0..7) to U+FB01; corrected offsets point into the raw text: "f" and "∘inal" end where the
    // entity and "nal" end (8, 11), " ferry" is [11, 17), and the final offset is 17
    Path dir = createTempDir();
    Path model = dir.resolve("hand-made.morsel");
    TestModels.handMade().save(model);
    try (Analyzer a = CustomAnalyzer.builder(dir).addCharFilter("htmlStrip")
        .withTokenizer(SubwordTokenizerFactory.NAME, "model", "hand-made.morsel").build()) {
      assertTokenStreamContents(a.tokenStream("body", "&#xFB01;nal ferry"), new String[] {"f", "\u2218inal", " ferry"},
          new int[] {0, 0, 11}, new int[] {8, 11, 17}, new String[] {LETTERS, LETTERS, LETTERS}, new int[] {1, 1, 1}, 17);
    }
    assertTrue(Files.isRegularFile(model));
  }

  // ------------------------------------------------------------------ random data

  public void testRandomDataBpe() throws Exception {
    random(TestModels.tokenizer("bpe"), SubwordSettings.defaults());
  }

  public void testRandomDataWordPiece() throws Exception {
    random(TestModels.tokenizer("wordpiece"), SubwordSettings.defaults());
  }

  public void testRandomDataUnigram() throws Exception {
    random(TestModels.tokenizer("unigram"), SubwordSettings.defaults());
  }

  public void testRandomDataSmallChunksOriginalTermsAndPayloads() throws Exception {
    // chunks of at most 16 chars, so random text crosses chunk edges often
    SubwordSettings s = SubwordSettings.builder().chunkLength(16).termText(SubwordSettings.TermText.ORIGINAL)
        .idPayload(true).build();
    for (String scheme : TestModels.schemes()) {
      try (Analyzer a = analyzer(TestModels.tokenizer(scheme), s)) {
        checkRandomData(random(), a, ITERATIONS / 4, LONG_WORDS);
      }
    }
  }

  public void testRandomDataPositionsPerPiece() throws Exception {
    // tokens of one piece share a position but not their start offsets, so Lucene's check that
    // tokens at one position start together (graphOffsetsAreCorrect) does not apply here
    SubwordSettings s = SubwordSettings.builder().positions(SubwordSettings.Positions.PER_PIECE).chunkLength(32).build();
    for (String scheme : TestModels.schemes()) {
      try (Analyzer a = analyzer(TestModels.tokenizer(scheme), s)) {
        checkRandomData(random(), a, ITERATIONS / 4, 20, false, false);
      }
    }
  }

  private static void random(Tokenizer morsel, SubwordSettings settings) throws Exception {
    try (Analyzer inner = analyzer(morsel, settings); Counting a = new Counting(inner)) {
      checkRandomData(random(), a, ITERATIONS);
      // every random text is analyzed at least once, so the suite really saw ITERATIONS texts
      assertTrue("streams opened: " + a.streams.get(), a.streams.get() >= ITERATIONS);
    }
  }

  /** Counts the token streams Lucene's checks open (one reader each). */
  private static final class Counting extends AnalyzerWrapper {
    final AtomicInteger streams = new AtomicInteger();
    private final Analyzer inner;

    Counting(Analyzer inner) {
      super(Analyzer.PER_FIELD_REUSE_STRATEGY);
      this.inner = inner;
    }

    @Override
    protected Analyzer getWrappedAnalyzer(String fieldName) {
      return inner;
    }

    @Override
    protected Reader wrapReader(String fieldName, Reader reader) {
      streams.incrementAndGet();
      return reader;
    }
  }
}
