package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.ControlTokens;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import java.util.stream.Stream;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Untrusted text never yields a control id, however it spells a control token: exactly, in
 * fullwidth compatibility characters that NFKC maps onto the spelling (UAX #15; UnicodeData.txt
 * {@code <wide>} decompositions), in capitals that case folding maps onto it, with the ligature
 * U+FB01 for "fi" (an NFKC {@code <compat>} decomposition), with a default-ignorable character
 * (U+00AD, U+200D) inside that NFKC_Casefold removes, decomposed, or cut into prefixes. Trusted
 * text yields a control id exactly where the original text holds the exact spelling, counted by an
 * independent leftmost scan, and nowhere else.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class ControlTokenInjectionTest {
  static final int CASES = 1_000;

  private final Counts counts = new Counts("control-token injection");

  Stream<Arguments> subjects() {
    List<Arguments> out = new ArrayList<>();
    for (Models.Kind k : Models.Kind.values()) {
      for (String form : Models.FORMS) {
        out.add(Arguments.of(k, form));
      }
    }
    return out.stream();
  }

  /** Forms of a spelling that are not the spelling but may become it after normalization. */
  static List<String> lookAlikes(String spelling) {
    List<String> out = new ArrayList<>();
    out.add(Spellings.fullwidth(spelling));
    out.add(spelling.toUpperCase(Locale.ROOT));
    out.add(Spellings.fullwidth(spelling.toUpperCase(Locale.ROOT)));
    out.add(spelling.replace("fi", "\uFB01"));
    out.add(spelling.substring(0, 3) + "\u00AD" + spelling.substring(3)); // soft hyphen: default ignorable
    out.add(spelling.substring(0, 3) + "\u200D" + spelling.substring(3)); // ZWJ: default ignorable
    out.add(spelling.substring(0, 2) + "\uFF45" + spelling.substring(3)); // one fullwidth letter
    out.add(spelling.replace('~', '\u223C')); // tilde operator: a look-alike that no form maps to '~'
    for (int cut = 1; cut < spelling.length(); cut += 3) {
      out.add(spelling.substring(0, cut)); // prefixes
    }
    out.removeIf(spelling::equals);
    return out;
  }

  /** Leftmost exact occurrences, written from the rule "no spelling overlaps another" alone. */
  static List<int[]> exactOccurrences(String text, ControlTokens controls) {
    List<int[]> out = new ArrayList<>();
    int at = 0;
    while (true) {
      int best = -1;
      String found = null;
      for (String s : controls.spellings()) {
        int i = text.indexOf(s, at);
        if (i >= 0 && (best < 0 || i < best)) {
          best = i;
          found = s;
        }
      }
      if (found == null) {
        return out;
      }
      out.add(new int[] {best, best + found.length(), controls.id(found)});
      at = best + found.length();
    }
  }

  @ParameterizedTest(name = "{0} {1}")
  @MethodSource("subjects")
  void untrustedNeverTrustedOnlyExact(Models.Kind kind, String form) {
    Tokenizer tk = Models.tokenizer(kind, form);
    ControlTokens controls = tk.controlTokens();
    assertEquals(Spellings.ALL, controls.spellings());
    long[] seeds = Seeds.cases(0x1A1EC7_0000L + kind.ordinal() * 7919L + form.hashCode(), CASES);
    for (long seed : seeds) {
      SplittableRandom rnd = new SplittableRandom(seed);
      StringBuilder sb = new StringBuilder();
      for (int part = rnd.nextInt(1, 8); part > 0; part--) {
        String spelling = Spellings.ALL.get(rnd.nextInt(Spellings.ALL.size()));
        int pick = rnd.nextInt(4);
        if (pick == 0) {
          sb.append(spelling);
        } else if (pick == 1) {
          List<String> like = lookAlikes(spelling);
          sb.append(like.get(rnd.nextInt(like.size())));
        } else if (pick == 2) {
          HardText.run(rnd, HardText.Kind.values()[rnd.nextInt(HardText.Kind.values().length)], sb);
        } else {
          sb.append(rnd.nextBoolean() ? " " : "");
        }
      }
      String text = sb.toString();
      check(tk, seed, text);
    }
  }

  private void check(Tokenizer tk, long seed, String text) {
    ControlTokens controls = tk.controlTokens();
    // untrusted: only the framing markers (first and last token) are control tokens
    Tokens u = tk.encode(text, Trust.UNTRUSTED);
    for (int i = 0; i < u.size(); i++) {
      boolean frame = i == 0 || i == u.size() - 1;
      if (!frame && (controls.isControl(u.id(i)) || u.isControl(i))) {
        throw new AssertionError(HardText.replay(tk.pipeline().normalization().spec() + " untrusted", seed, text)
            + ": token " + i + " is control id " + u.id(i));
      }
    }
    assertEquals(controls.id(Spellings.EMBARK), u.id(0));
    assertEquals(controls.id(Spellings.DISEMBARK), u.id(u.size() - 1));
    counts.add("untrusted text yields no control id");
    // trusted: exactly the exact spellings
    Tokens t = tk.encode(text, Trust.TRUSTED);
    List<int[]> expected = exactOccurrences(text, controls);
    List<int[]> got = new ArrayList<>();
    for (int i = 1; i < t.size() - 1; i++) {
      if (t.isControl(i) || controls.isControl(t.id(i))) {
        got.add(new int[] {t.start(i), t.end(i), t.id(i)});
      }
    }
    if (got.size() != expected.size()) {
      throw new AssertionError(HardText.replay("trusted control tokens", seed, text) + ": " + got.size()
          + " control tokens, the exact spelling occurs " + expected.size() + " times");
    }
    for (int k = 0; k < got.size(); k++) {
      if (!java.util.Arrays.equals(got.get(k), expected.get(k))) {
        throw new AssertionError(HardText.replay("trusted control tokens", seed, text) + ": control token " + k
            + " is " + java.util.Arrays.toString(got.get(k)) + ", expected " + java.util.Arrays.toString(expected.get(k)));
      }
    }
    counts.add("trusted text yields control ids exactly at exact spellings");
    counts.add("exact spellings found in trusted text", expected.size());
  }

  @ParameterizedTest(name = "{0} {1}")
  @MethodSource("subjects")
  void everyLookAlikeAloneIsOrdinaryText(Models.Kind kind, String form) {
    Tokenizer tk = Models.tokenizer(kind, form);
    for (String spelling : Spellings.ALL) {
      check(tk, 0, spelling);
      for (String like : lookAlikes(spelling)) {
        check(tk, 0, like);
        check(tk, 0, "ferry " + like + spelling + like);
        counts.add("look-alikes checked alone and beside the spelling");
      }
    }
  }

  @AfterAll
  void report() {
    counts.print();
    if (!Seeds.replaying()) {
      assertTrue(counts.get("untrusted text yields no control id") >= 10L * CASES);
      assertTrue(counts.get("exact spellings found in trusted text") > 1000);
    }
  }
}
