package dev.morsel.tokenize.train;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * {@link Learners}, {@link LearnerSettings} and {@link LearnerOptions}, with the test provider of
 * this module ({@link TestByteLearnerProvider}, found through {@link java.util.ServiceLoader} like
 * the segmenter modules' providers).
 */
class LearnersTest {
  private static final String AGENT = "\u27e8agent\u27e9";
  private static final String PAUSE = "\u27e8pause\u27e9";

  @Test
  void findsTheRegisteredProviderByScheme() {
    assertEquals(List.of(ByteSegmenter.SCHEME), Learners.schemes(), "only the test provider is on this module's path");
    assertEquals(ByteSegmenter.SCHEME, Learners.provider(ByteSegmenter.SCHEME).scheme());
    assertEquals(1, Learners.providers().size());
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Learners.provider("bpe"));
    assertTrue(e.getMessage().contains("'bpe'") && e.getMessage().contains(ByteSegmenter.SCHEME), e.getMessage());
  }

  @Test
  void theLearnedTokenizerEncodesWithTheCountedPipeline() {
    Pipeline folded = Pipeline.of(Normalization.parse("nfkc+casefold"), Splitting.whitespace());
    PieceCounts counts = PieceCounter.builder().pipeline(folded).threads(1).build().count(List.of("Oskevik FERRY"));
    Tokenizer t = Learners.learner(ByteSegmenter.SCHEME, LearnerSettings.of(258).withReservedTokens(List.of(AGENT, PAUSE)))
        .train(counts);
    assertEquals(folded, t.pipeline());
    assertEquals("oskevik ferry", t.decode(t.encode("OSKEVIK Ferry").ids()), "casefolded as counted");
    assertEquals(256, t.reservedTokens().id(AGENT));
    assertEquals(257, t.reservedTokens().id(PAUSE));
  }

  @Test
  void optionsAreGivenAsNameValueAndChecked() {
    LearnerSettings s = LearnerSettings.of(260);
    assertEquals(260, Learners.learner(ByteSegmenter.SCHEME, s, "spare-ids=4").train(PieceCounts.empty()).vocabularySize());
    assertEquals(260, Learners.learner(ByteSegmenter.SCHEME, s, Map.of("spare-ids", "4")).train(PieceCounts.empty())
        .vocabularySize());
    // the provider checks the combination when the learner is made, naming the settings
    IllegalArgumentException size = assertThrows(IllegalArgumentException.class, () -> Learners.learner(ByteSegmenter.SCHEME, s));
    assertTrue(size.getMessage().contains("vocabularySize=260") && size.getMessage().contains("spare-ids=0"), size.getMessage());
    IllegalArgumentException unknown = assertThrows(IllegalArgumentException.class,
        () -> Learners.learner(ByteSegmenter.SCHEME, s, "spare=4"));
    assertEquals("test-bytes has no option 'spare'; its options: spare-ids", unknown.getMessage());
    IllegalArgumentException value = assertThrows(IllegalArgumentException.class,
        () -> Learners.learner(ByteSegmenter.SCHEME, s, "spare-ids=four"));
    assertEquals("test-bytes option spare-ids=four is not an integer", value.getMessage());
    IllegalArgumentException range = assertThrows(IllegalArgumentException.class,
        () -> Learners.learner(ByteSegmenter.SCHEME, s, "spare-ids=-1"));
    assertEquals("test-bytes option spare-ids=-1 is outside [0, 65536]", range.getMessage());
    IllegalArgumentException form = assertThrows(IllegalArgumentException.class,
        () -> Learners.learner(ByteSegmenter.SCHEME, s, "spare-ids=4", "four"));
    assertEquals("options[1] 'four' is not name=value", form.getMessage());
  }

  @Test
  void parsingKeepsOrderAndTheLastValueOfAName() {
    Map<String, String> want = new LinkedHashMap<>();
    want.put("b", "2");
    want.put("a", "x=y");
    assertEquals(want, LearnerOptions.parse(List.of("b=1", "a=x=y", "b=2")));
    assertEquals(Map.of("a", ""), LearnerOptions.parse(List.of("a=")));
    NullPointerException n = assertThrows(NullPointerException.class, () -> LearnerOptions.parse(Arrays.asList("a=1", null)));
    assertEquals("options[1] is null", n.getMessage());
    assertThrows(IllegalArgumentException.class, () -> LearnerOptions.parse(List.of("=1")));
  }

  @Test
  void typedReadersNameTheOptionAndTheRange() {
    List<LearnerOption> declared = List.of(LearnerOption.of("share", "0.5", "a fraction"),
        LearnerOption.of("flag", "true", "a switch"), LearnerOption.of("rule", "gain", "a choice"));
    LearnerOptions o = LearnerOptions.of("demo", declared, Map.of("flag", "FALSE"));
    assertEquals(0.5, o.doubleValue("share", 0, 1, false));
    assertEquals(false, o.booleanValue("flag"));
    assertEquals("gain", o.choice("rule", List.of("gain", "ratio")));
    assertEquals(List.of("share", "flag", "rule"), List.copyOf(o.values().keySet()), "declaration order");
    LearnerOptions bad = LearnerOptions.of("demo", declared, Map.of("share", "1", "flag", "yes", "rule", "best"));
    assertEquals("demo option share=1 is outside (0.0, 1.0)",
        assertThrows(IllegalArgumentException.class, () -> bad.doubleValue("share", 0, 1, false)).getMessage());
    assertEquals(1.0, bad.doubleValue("share", 0, 1, true));
    assertEquals("demo option flag=yes is not true or false",
        assertThrows(IllegalArgumentException.class, () -> bad.booleanValue("flag")).getMessage());
    assertEquals("demo option rule=best is not one of gain, ratio",
        assertThrows(IllegalArgumentException.class, () -> bad.choice("rule", List.of("gain", "ratio"))).getMessage());
    assertEquals("demo option share=NaN is outside [0.0, 1.0]", assertThrows(IllegalArgumentException.class,
        () -> LearnerOptions.of("demo", declared, Map.of("share", "NaN")).doubleValue("share", 0, 1, true)).getMessage());
    assertThrows(IllegalArgumentException.class, () -> LearnerOption.of("Max_Size", "1", "not our style of name"));
    assertThrows(IllegalArgumentException.class,
        () -> LearnerOptions.of("demo", List.of(declared.get(0), declared.get(0)), Map.of()), "declared twice");
  }

  @Test
  void settingsCheckEveryValueAndNameIt() {
    LearnerSettings s = LearnerSettings.of(8000);
    assertEquals(8000, s.vocabularySize());
    assertEquals(LearnerSettings.DEFAULT_MIN_COUNT, s.minCount());
    assertEquals(List.of(), s.reservedTokens());
    assertTrue(s.threads() >= 1);
    assertEquals("vocabularySize=0 must be at least 1",
        assertThrows(IllegalArgumentException.class, () -> LearnerSettings.of(0)).getMessage());
    assertEquals("minCount=0 must be at least 1",
        assertThrows(IllegalArgumentException.class, () -> s.withMinCount(0)).getMessage());
    assertEquals("threads=0 must be at least 1",
        assertThrows(IllegalArgumentException.class, () -> s.withThreads(0)).getMessage());
    assertThrows(NullPointerException.class, () -> s.withListener(null));
    assertEquals(s.withMinCount(3), s.withMinCount(3));
  }

  /** Reserved spellings are checked when the settings are made, each refusal naming the index. */
  @Test
  void reservedTokensAreCheckedWhenSet() {
    LearnerSettings s = LearnerSettings.of(8000);
    assertEquals(List.of(AGENT, PAUSE), s.withReservedTokens(List.of(AGENT, PAUSE)).reservedTokens());
    assertEquals("reservedTokens[1] is null",
        assertThrows(NullPointerException.class, () -> s.withReservedTokens(Arrays.asList(AGENT, null))).getMessage());
    String empty = assertThrows(IllegalArgumentException.class, () -> s.withReservedTokens(List.of(AGENT, ""))).getMessage();
    assertTrue(empty.startsWith("reservedTokens[1]: ") && empty.contains("empty"), empty);
    String twice = assertThrows(IllegalArgumentException.class, () -> s.withReservedTokens(List.of(AGENT, AGENT))).getMessage();
    assertTrue(twice.startsWith("reservedTokens[1]: ") && twice.contains("twice"), twice);
    String lone = assertThrows(IllegalArgumentException.class, () -> s.withReservedTokens(List.of("\u27e8a\ud800\u27e9")))
        .getMessage();
    assertTrue(lone.startsWith("reservedTokens[0]: ") && lone.contains("surrogate"), lone);
    String contains = assertThrows(IllegalArgumentException.class,
        () -> s.withReservedTokens(List.of(AGENT, "\u27e8agent\u27e9\u27e9"))).getMessage();
    assertTrue(contains.contains("contains"), contains);
    String overlap = assertThrows(IllegalArgumentException.class,
        () -> s.withReservedTokens(List.of("\u27e8ab", "ab\u27e9"))).getMessage();
    assertTrue(overlap.contains("overlap"), overlap);
    String longer = assertThrows(IllegalArgumentException.class,
        () -> s.withReservedTokens(List.of("\u27e8" + "a".repeat(dev.morsel.tokenize.ReservedTokens.MAX_SPELLING_LENGTH) + "\u27e9")))
        .getMessage();
    assertTrue(longer.startsWith("reservedTokens[0]: ") && longer.contains("MAX_SPELLING_LENGTH"), longer);
  }
}
