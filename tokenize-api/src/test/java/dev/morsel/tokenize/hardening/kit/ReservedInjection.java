package dev.morsel.tokenize.hardening.kit;

import dev.morsel.tokenize.ReservedTokens;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * Reserved-token injection checks for a tokenizer whose reserved tokens are {@link Spellings#ALL}
 * framed by {@link Spellings#template()}. Untrusted text never yields a reserved id, however it
 * spells a reserved token: exactly, in fullwidth compatibility characters that NFKC maps onto the
 * spelling (UAX #15; UnicodeData.txt {@code <wide>} decompositions), in capitals that case folding
 * maps onto it, with the ligature U+FB01 for "fi" (an NFKC {@code <compat>} decomposition), with a
 * default-ignorable character (U+00AD, U+200D) inside that NFKC_Casefold removes, or cut into
 * prefixes. Trusted text yields a reserved id exactly where the original text holds the exact
 * spelling, found by an independent leftmost scan ({@link #exactOccurrences}), and nowhere else.
 */
public final class ReservedInjection {
  /** Count names. */
  public static final String UNTRUSTED = "untrusted text yields no reserved id";
  public static final String TRUSTED = "trusted text yields reserved ids exactly at exact spellings";
  public static final String FOUND = "exact spellings found in trusted text";
  public static final String LOOK_ALIKES = "look-alikes checked alone and beside the spelling";

  private final Counts counts;

  /** Checks that count into {@code counts}. */
  public ReservedInjection(Counts counts) {
    this.counts = counts;
  }

  /** Forms of a spelling that are not the spelling but may become it after normalization. */
  public static List<String> lookAlikes(String spelling) {
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

  /** Leftmost exact occurrences as {start, end, id}, written from the rule "no spelling overlaps another" alone. */
  public static List<int[]> exactOccurrences(String text, ReservedTokens reserved) {
    List<int[]> out = new ArrayList<>();
    int at = 0;
    while (true) {
      int best = -1;
      String found = null;
      for (String s : reserved.spellings()) {
        int i = text.indexOf(s, at);
        if (i >= 0 && (best < 0 || i < best)) {
          best = i;
          found = s;
        }
      }
      if (found == null) {
        return out;
      }
      out.add(new int[] {best, best + found.length(), reserved.id(found)});
      at = best + found.length();
    }
  }

  /** A seeded text mixing exact spellings, look-alikes, {@link HardText} runs and spaces. */
  public static String mixed(SplittableRandom rnd) {
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
    return sb.toString();
  }

  /** {@code cases} seeded {@link #mixed} texts, each {@link #check}ed. */
  public void generated(Tokenizer tk, long baseSeed, int cases) {
    if (!Spellings.ALL.equals(tk.reservedTokens().spellings())) {
      throw new AssertionError("reserved tokens " + tk.reservedTokens().spellings() + ", expected " + Spellings.ALL);
    }
    for (long seed : Seeds.cases(baseSeed, cases)) {
      check(tk, seed, mixed(new SplittableRandom(seed)));
    }
  }

  /** Every look-alike of every spelling alone, and beside the spelling. */
  public void everyLookAlike(Tokenizer tk) {
    for (String spelling : Spellings.ALL) {
      check(tk, 0, spelling);
      for (String like : lookAlikes(spelling)) {
        check(tk, 0, like);
        check(tk, 0, "ferry " + like + spelling + like);
        counts.add(LOOK_ALIKES);
      }
    }
  }

  /** Untrusted: only the framing markers are reserved tokens; trusted: reserved ids exactly at the exact spellings. */
  public void check(Tokenizer tk, long seed, String text) {
    ReservedTokens reserved = tk.reservedTokens();
    String form = tk.pipeline().normalization().spec();
    Tokens u = tk.encode(text, Trust.UNTRUSTED);
    for (int i = 0; i < u.size(); i++) {
      boolean frame = i == 0 || i == u.size() - 1;
      if (!frame && (reserved.isReserved(u.id(i)) || u.isReserved(i))) {
        throw new AssertionError(HardText.replay(form + " untrusted", seed, text) + ": token " + i
            + " is reserved id " + u.id(i));
      }
    }
    if (u.id(0) != reserved.id(Spellings.EMBARK) || u.id(u.size() - 1) != reserved.id(Spellings.DISEMBARK)) {
      throw new AssertionError(HardText.replay(form + " framing", seed, text) + ": " + u);
    }
    counts.add(UNTRUSTED);
    Tokens t = tk.encode(text, Trust.TRUSTED);
    List<int[]> expected = exactOccurrences(text, reserved);
    List<int[]> got = new ArrayList<>();
    for (int i = 1; i < t.size() - 1; i++) {
      if (t.isReserved(i) || reserved.isReserved(t.id(i))) {
        got.add(new int[] {t.start(i), t.end(i), t.id(i)});
      }
    }
    if (got.size() != expected.size()) {
      throw new AssertionError(HardText.replay(form + " trusted reserved tokens", seed, text) + ": " + got.size()
          + " reserved tokens, the exact spelling occurs " + expected.size() + " times");
    }
    for (int k = 0; k < got.size(); k++) {
      if (!Arrays.equals(got.get(k), expected.get(k))) {
        throw new AssertionError(HardText.replay(form + " trusted reserved tokens", seed, text) + ": reserved token "
            + k + " is " + Arrays.toString(got.get(k)) + ", expected " + Arrays.toString(expected.get(k)));
      }
    }
    counts.add(TRUSTED);
    counts.add(FOUND, expected.size());
  }
}
