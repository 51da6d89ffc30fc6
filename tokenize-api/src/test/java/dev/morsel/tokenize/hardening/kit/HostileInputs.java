package dev.morsel.tokenize.hardening.kit;

import dev.morsel.tokenize.Decoding;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.function.Function;

/**
 * The hostile inputs of the hardening suite, for any tokenizer framed by {@link Spellings#template()}:
 * each finishes and is checked for correctness (offsets always, the round trip whenever the result
 * holds no unknown token). Segmenter modules add their own oracle checks on top (textbook BPE, naive
 * greedy longest-match, brute-force Viterbi...). Speed is not measured here (JMH benchmarks in
 * tokenize-bench hold the time ratios).
 */
public final class HostileInputs {
  /** One mebibyte, in UTF-16 units. */
  public static final int MIB = 1 << 20;

  private final Counts counts;

  /** Checks that count into {@code counts}. */
  public HostileInputs(Counts counts) {
    this.counts = counts;
  }

  /** Content tokens (between the framing markers) of a single-text result. */
  public static int[] content(Tokens t) {
    return Arrays.copyOfRange(t.ids(), 1, t.size() - 1);
  }

  /** Offsets, the whole text covered, and without an unknown token the strict round trip; counted under {@code what}. */
  public Tokens encodeChecked(Tokenizer tk, String what, String text) {
    Tokens t = tk.encode(text);
    OffsetInvariants.check(t, text);
    if (t.start(0) != 0 || t.end(t.size() - 1) != text.length()) {
      throw new AssertionError(what + ": result does not cover [0, " + text.length() + ")");
    }
    boolean unknown = false;
    for (int i = 0; i < t.size(); i++) {
      unknown |= t.id(i) == tk.unknownId();
    }
    if (!unknown) {
      String normalized = tk.pipeline().normalization().apply(text).text();
      if (!normalized.equals(tk.decode(t.ids(), true, Decoding.STRICT))) {
        throw new AssertionError(what + ": round trip differs");
      }
      counts.add("round trips of hostile inputs");
    }
    counts.add(what);
    return t;
  }

  /**
   * 10 MiB of prose in one line must equal, token by token with offsets, the same text encoded in
   * ten parts cut before a space between two letters: a piece boundary under rule splitting and a
   * normalization boundary (UAX #15: ASCII is always a boundary).
   */
  public void tenMebibytesEqualsItsParts(Tokenizer tk, List<String> prose, String label) {
    StringBuilder sb = new StringBuilder(10 * MIB + 4096);
    for (int i = 0; sb.length() < 10 * MIB; i++) {
      sb.append(prose.get(i % prose.size()).replace('\n', ' ')).append(' ');
    }
    sb.setLength(10 * MIB);
    sb.setCharAt(sb.length() - 1, 'x');
    String text = sb.toString();
    Tokens whole = encodeChecked(tk, "10 MiB in one line", text);
    List<Integer> cuts = new ArrayList<>();
    cuts.add(0);
    for (int at = MIB; at < text.length(); at += MIB) {
      int c = at;
      while (!(text.charAt(c) == ' ' && Character.isLetter(text.charAt(c - 1)) && Character.isLetter(text.charAt(c + 1)))) {
        c++;
      }
      cuts.add(c);
    }
    cuts.add(text.length());
    int k = 1;
    for (int p = 0; p + 1 < cuts.size(); p++) {
      int from = cuts.get(p);
      Tokens part = tk.encode(text.substring(from, cuts.get(p + 1)));
      for (int i = 1; i < part.size() - 1; i++, k++) {
        if (whole.id(k) != part.id(i) || whole.start(k) != part.start(i) + from || whole.end(k) != part.end(i) + from) {
          throw new AssertionError(label + ": token " + k + " of the whole differs from token " + i + " of part " + p);
        }
      }
    }
    if (k != whole.size() - 1) {
      throw new AssertionError(label + ": the parts hold " + (k - 1) + " tokens, the whole " + (whole.size() - 2));
    }
    counts.add("10 MiB line equals its 10 parts, token by token");
  }

  /** {@code n} seeded letters a-z and U+00E0..U+00FF (U+00F7, a symbol, replaced): one piece. */
  public static String lettersWithoutSpaces(long seed, int n) {
    SplittableRandom rnd = new SplittableRandom(seed);
    StringBuilder sb = new StringBuilder(n);
    while (sb.length() < n) {
      char c = rnd.nextInt(6) == 0 ? (char) rnd.nextInt(0xE0, 0x100) : (char) rnd.nextInt('a', 'z' + 1);
      sb.append(c == '\u00F7' ? 'o' : c); // U+00F7 is Sm, every other of U+00E0..U+00FF a letter
    }
    return sb.toString();
  }

  /** The kinds of {@link #withoutSpaces(String, long, int)}. */
  public static final List<String> SCRIPT_KINDS = List.of("marks", "emoji", "mixed");

  /**
   * {@code n} UTF-16 units (cut at a code point) of seeded text with no spaces, of one kind:
   * {@code marks}, letters of three scripts each carrying a run of 1 to 200 combining marks
   * (U+0300..U+036F, U+0483..U+0487); {@code emoji}, ZWJ sequences of two to four people
   * (U+1F466..U+1F469, some with a skin-tone modifier U+1F3FB..U+1F3FF), flags (two regional
   * indicators U+1F1E6..U+1F1FF) and U+2764 U+FE0F; {@code mixed}, runs of 1 to 8 Latin letters, Han
   * ideographs (U+4E00..U+9FFF), Cyrillic letters and digits.
   */
  public static String withoutSpaces(String kind, long seed, int n) {
    SplittableRandom r = new SplittableRandom(seed);
    StringBuilder sb = new StringBuilder(n + 256);
    if (!SCRIPT_KINDS.contains(kind)) {
      throw new IllegalArgumentException("kind '" + kind + "' is not one of " + SCRIPT_KINDS);
    }
    while (sb.length() < n) {
      appendUnit(kind, r, sb);
    }
    int cut = n;
    if (Character.isLowSurrogate(sb.charAt(cut)) && Character.isHighSurrogate(sb.charAt(cut - 1))) {
      cut--;
    }
    return sb.substring(0, cut);
  }

  /**
   * Appends one unit of the kind to {@code sb}, drawn from {@code r}: a letter with its marks, one
   * emoji sequence, or one run of a script (see {@link #withoutSpaces}); the benchmarks build their
   * adversarial texts from the same units.
   */
  public static void appendUnit(String kind, SplittableRandom r, StringBuilder sb) {
    switch (kind) {
      case "marks":
        String bases = "aeoiu\u03B1\u03B5\u03BF\u0438\u0435\u0436";
        sb.append(bases.charAt(r.nextInt(bases.length())));
        for (int k = 1 + r.nextInt(200); k > 0; k--) {
          sb.append(r.nextInt(8) == 0 ? (char) r.nextInt(0x483, 0x488) : (char) r.nextInt(0x300, 0x370));
        }
        break;
      case "emoji":
        int what = r.nextInt(3);
        if (what == 0) {
          for (int k = 2 + r.nextInt(3); k > 0; k--) {
            sb.appendCodePoint(r.nextInt(0x1F466, 0x1F46A));
            if (r.nextInt(3) == 0) {
              sb.appendCodePoint(r.nextInt(0x1F3FB, 0x1F400));
            }
            if (k > 1) {
              sb.append('\u200D');
            }
          }
        } else if (what == 1) {
          sb.appendCodePoint(r.nextInt(0x1F1E6, 0x1F200)).appendCodePoint(r.nextInt(0x1F1E6, 0x1F200));
        } else {
          sb.append('\u2764').append('\uFE0F');
        }
        break;
      case "mixed":
        int script = r.nextInt(4);
        for (int k = 1 + r.nextInt(8); k > 0; k--) {
          sb.append(script == 0 ? (char) r.nextInt('a', 'z' + 1) : script == 1 ? (char) r.nextInt(0x4E00, 0xA000)
              : script == 2 ? (char) r.nextInt(0x430, 0x450) : (char) r.nextInt('0', '9' + 1));
        }
        break;
      default:
        throw new IllegalArgumentException("kind '" + kind + "' is not one of " + SCRIPT_KINDS);
    }
  }

  /** {@code n} seeded letters a-z. */
  public static String lowercase(SplittableRandom rnd, int n) {
    StringBuilder sb = new StringBuilder(n);
    for (int i = 0; i < n; i++) {
      sb.append((char) rnd.nextInt('a', 'z' + 1));
    }
    return sb.toString();
  }

  /** 1 MiB each of {@code a}, {@code é} and U+1F9ED (surrogate pairs); returns the result for {@code a}. */
  public Tokens oneMebibyteOfOneCharacter(Tokenizer tk) {
    Tokens t = encodeChecked(tk, "1 MiB of one character", "a".repeat(MIB));
    encodeChecked(tk, "1 MiB of one character", "\u00E9".repeat(MIB));
    encodeChecked(tk, "1 MiB of one character", "\uD83E\uDDED".repeat(MIB / 2));
    return t;
  }

  /**
   * 100,000 marks of one class (U+0301) and of many classes (reordering work) on one base, under
   * every form; with {@code nfd+remove-marks} the first leaves {@code a} alone (one content token).
   */
  public void hundredThousandCombiningMarks(Function<String, Tokenizer> byForm) {
    String one = "a" + "\u0301".repeat(100_000);
    StringBuilder mixed = new StringBuilder("e");
    SplittableRandom rnd = new SplittableRandom(0xACCE27L);
    for (int i = 0; i < 100_000; i++) {
      mixed.append((char) rnd.nextInt(0x300, 0x370));
    }
    for (String form : PropertySweep.FORMS) {
      Tokenizer tk = byForm.apply(form);
      encodeChecked(tk, "100k combining marks on one base", one);
      encodeChecked(tk, "100k combining marks on one base", mixed.toString());
    }
    Tokens stripped = byForm.apply("nfd+remove-marks").encode(one);
    if (stripped.size() != 3) {
      throw new AssertionError("remove-marks should leave the base letter alone: " + stripped);
    }
  }

  /**
   * 1 MiB of reserved-token look-alikes and prefixes with 2% exact spellings, under
   * {@code nfkc+casefold}: untrusted gives no reserved id; trusted finds exactly the spellings the
   * independent scan finds. Returns how many.
   */
  public int reservedLookAlikesAndPrefixes(Tokenizer tk) {
    StringBuilder sb = new StringBuilder(MIB + 64);
    SplittableRandom rnd = new SplittableRandom(0x100C_A1E5L);
    while (sb.length() < MIB) {
      String spelling = Spellings.ALL.get(rnd.nextInt(Spellings.ALL.size()));
      List<String> like = ReservedInjection.lookAlikes(spelling);
      sb.append(rnd.nextInt(50) == 0 ? spelling : like.get(rnd.nextInt(like.size())));
    }
    String text = sb.toString();
    Tokens u = encodeChecked(tk, "1 MiB of reserved-token look-alikes and prefixes", text);
    for (int i = 1; i < u.size() - 1; i++) {
      if (u.isReserved(i) || tk.reservedTokens().isReserved(u.id(i))) {
        throw new AssertionError("untrusted reserved token at " + i);
      }
    }
    Tokens t = tk.encode(text, Trust.TRUSTED);
    OffsetInvariants.check(t, text);
    List<int[]> expected = ReservedInjection.exactOccurrences(text, tk.reservedTokens());
    int found = 0;
    for (int i = 1; i < t.size() - 1; i++) {
      if (t.isReserved(i)) {
        int[] e = expected.get(found++);
        int[] g = {t.start(i), t.end(i), t.id(i)};
        if (!Arrays.equals(e, g)) {
          throw new AssertionError("trusted reserved token " + (found - 1) + " is " + Arrays.toString(g) + ", expected "
              + Arrays.toString(e));
        }
      }
    }
    if (found != expected.size() || found <= 100) {
      throw new AssertionError("trusted found " + found + " reserved tokens, the scan " + expected.size());
    }
    counts.add("exact reserved spellings among 1 MiB of look-alikes, found in trusted mode", found);
    return found;
  }

  /** {@code n} units of lone surrogates (a high one is never followed by a low one). */
  public static String loneSurrogates(long seed, int n) {
    SplittableRandom rnd = new SplittableRandom(seed);
    StringBuilder sb = new StringBuilder(n);
    while (sb.length() < n) {
      sb.append(rnd.nextBoolean() ? (char) rnd.nextInt(0xDC00, 0xE000) : (char) rnd.nextInt(0xD800, 0xDC00));
      if (sb.length() > 1 && Character.isHighSurrogate(sb.charAt(sb.length() - 2))
          && Character.isLowSurrogate(sb.charAt(sb.length() - 1))) {
        sb.setLength(sb.length() - 1);
      }
    }
    return sb.toString();
  }

  /** 1 MiB of lone surrogates under every form; a lossless scheme decodes them to as many U+FFFD. */
  public void loneSurrogatesInEveryForm(Function<String, Tokenizer> byForm, boolean lossless) {
    String text = loneSurrogates(0x5A22L, MIB);
    for (String form : PropertySweep.FORMS) {
      Tokenizer tk = byForm.apply(form);
      Tokens t = encodeChecked(tk, "1 MiB of lone surrogates", text);
      if (lossless && !"\uFFFD".repeat(text.length()).equals(tk.decode(t.ids(), true, Decoding.REPLACE))) {
        throw new AssertionError(form + ": lone surrogates do not decode to U+FFFD each");
      }
    }
  }

  /** 1,000,000 one-character lines in one {@code encodeAll}: each equals that character's single encode. */
  public void aMillionOneCharacterLines(Tokenizer tk, String label) {
    String[] pool = {"a", "Z", "7", " ", "\t", "\n", "é", "ß", "Ω", "ж", "中", "ㄱ", "\u0301", "\uD83D\uDEA2", "\uD800",
        "\uDFFF", "\u0000", "\u007F", "\u200D", "\uFB01", "\uFF21", "{", "~", "}", "\uFFFD", "\uFEFF"};
    Map<String, Tokens> single = new HashMap<>();
    for (String s : pool) {
      single.put(s, tk.encode(s));
    }
    int n = 1_000_000;
    SplittableRandom rnd = new SplittableRandom(0x1_000_000L);
    List<String> lines = new ArrayList<>(n);
    for (int i = 0; i < n; i++) {
      lines.add(pool[rnd.nextInt(pool.length)]);
    }
    List<Tokens> out = tk.encodeAll(lines);
    if (out.size() != n) {
      throw new AssertionError(label + ": " + out.size() + " results for " + n + " lines");
    }
    for (int i = 0; i < n; i++) {
      if (!out.get(i).equals(single.get(lines.get(i)))) {
        throw new AssertionError(label + ": line " + i + " \"" + HardText.escape(lines.get(i), 10) + "\" encoded as "
            + out.get(i) + ", alone as " + single.get(lines.get(i)));
      }
    }
    counts.add("one-character lines in one batch equal to their single encodes", n);
  }
}
