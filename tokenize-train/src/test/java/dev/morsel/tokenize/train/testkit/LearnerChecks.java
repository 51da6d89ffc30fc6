package dev.morsel.tokenize.train.testkit;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerOption;
import dev.morsel.tokenize.train.LearnerProvider;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Checks every segmenter module runs on its learner provider, found by scheme name through
 * {@link Learners} as the command-line tool finds it: the learned tokenizer is bound to the pipeline
 * the pieces were counted with and to the reserved tokens, survives a save and load, is
 * deterministic, its declared option defaults are the defaults it uses, and wrong options are
 * refused with a message naming them.
 */
public final class LearnerChecks {
  /** A pipeline that changes almost every Europarl body (docs/pipeline.md): NFKC and case folding. */
  public static final Pipeline FOLDED = Pipeline.of(Normalization.parse("nfkc+casefold"), Splitting.runs());
  /** The reserved spelling the checks learn with. */
  public static final String AGENT = "\u27e8agent\u27e9";
  /** Bodies counted: enough for every scheme to reach {@link #SIZE} ids. */
  public static final int BODIES = 600;
  /** Vocabulary size the checks learn. */
  public static final int SIZE = 1000;

  private static volatile PieceCounts folded;

  private LearnerChecks() {}

  /** The first {@link #BODIES} Europarl bodies counted through {@link #FOLDED}. */
  public static PieceCounts foldedCounts() {
    PieceCounts c = folded;
    if (c == null) {
      c = PieceCounter.builder().pipeline(FOLDED).threads(2).build().count(Europarl.bodies().subList(0, BODIES));
      folded = c;
    }
    return c;
  }

  /** Runs every check on {@code scheme}. */
  public static void assertLearnsThroughTheSpi(String scheme) {
    assertTrue(Learners.schemes().contains(scheme), "schemes found: " + Learners.schemes());
    LearnerProvider provider = Learners.provider(scheme);
    assertEquals(scheme, provider.scheme());
    assertTrue(!provider.description().isBlank(), "a description for listings");
    assertTrue(Tokenizers.schemes().contains(scheme), "the scheme loads through the segmenter of the same name: "
        + Tokenizers.schemes());

    LearnerSettings settings = LearnerSettings.of(SIZE).withThreads(2).withReservedTokens(List.of(AGENT));
    Learner learner = Learners.learner(scheme, settings);
    assertEquals(scheme, learner.scheme());
    PieceCounts counts = foldedCounts();
    Tokenizer t = learner.train(counts);
    assertBoundTo(t, counts, scheme);

    // deterministic, and the declared defaults are the defaults
    assertEquals(t.fingerprint(), learner.train(counts).fingerprint(), "learning twice gives the same model");
    Map<String, String> defaults = new HashMap<>();
    for (LearnerOption o : provider.options()) {
      defaults.put(o.name(), o.defaultValue());
    }
    assertEquals(t.fingerprint(), Learners.learner(scheme, settings, defaults).train(counts).fingerprint(),
        "every declared default, given explicitly, learns the same model: " + defaults);

    // the learned tokenizer survives save and load, pipeline included
    Tokenizer loaded = Tokenizers.load(t.toBytes());
    assertEquals(t.fingerprint(), loaded.fingerprint());
    assertEquals(FOLDED, loaded.pipeline(), "the loaded model encodes with the counted pipeline");

    assertRefusesWrongOptions(scheme, provider, settings);
  }

  /**
   * {@code t} was learned from {@code counts}: it encodes with their pipeline (so ﬁ, FERRY and ferry
   * give the ids of their folded forms, checked against the pieces the counter produced), and holds
   * {@link #AGENT} as reserved id 0.
   */
  public static void assertBoundTo(Tokenizer t, PieceCounts counts, String scheme) {
    assertEquals(scheme, t.scheme());
    assertEquals(counts.pipeline(), t.pipeline(), "the learned tokenizer encodes with the pipeline the pieces were counted with");
    assertNotEquals(Pipeline.defaults(), t.pipeline());
    assertEquals(0, t.reservedTokens().id(AGENT), "reserved tokens: " + t.reservedTokens());
    // NFKC + case folding, as counted: the ligature and the capitals encode as their folded forms
    assertArrayEquals(t.encode("first FERRY").ids(), t.encode("\ufb01rst ferry").ids());
    assertArrayEquals(t.encode("harrowmere").ids(), t.encode("HARROWMERE").ids());
    Tokens trusted = t.encode("ferry " + AGENT, Trust.TRUSTED);
    assertEquals(0, trusted.id(trusted.size() - 1), "a trusted reserved spelling is its reserved id");
    // offsets still point into the original text, through the normalization
    Tokens f = t.encode("\ufb01rst");
    assertEquals(0, f.start(0));
    assertEquals(4, f.end(f.size() - 1), "the last token ends at the end of the original text, 4 chars");
  }

  private static void assertRefusesWrongOptions(String scheme, LearnerProvider provider, LearnerSettings settings) {
    IllegalArgumentException unknown = assertThrows(IllegalArgumentException.class,
        () -> Learners.learner(scheme, settings, "no-such-option=1"));
    assertTrue(unknown.getMessage().contains("no-such-option") && unknown.getMessage().contains(scheme), unknown.getMessage());
    for (LearnerOption o : provider.options()) {
      assertTrue(unknown.getMessage().contains(o.name()), "the message lists the options: " + unknown.getMessage());
    }
    IllegalArgumentException malformed = assertThrows(IllegalArgumentException.class,
        () -> Learners.learner(scheme, settings, "just-a-word"));
    assertTrue(malformed.getMessage().contains("just-a-word"), malformed.getMessage());
    List<String> numeric = new ArrayList<>();
    for (LearnerOption o : provider.options()) {
      if (o.defaultValue().matches("-?[0-9][0-9_.]*") || o.defaultValue().matches("true|false")) {
        numeric.add(o.name());
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
            () -> Learners.learner(scheme, settings, o.name() + "=seven"), o.name() + "=seven");
        assertTrue(e.getMessage().contains(o.name() + "=seven"), e.getMessage());
      }
    }
    assertTrue(!numeric.isEmpty() || provider.options().isEmpty(), "some option values are checked");
  }
}
