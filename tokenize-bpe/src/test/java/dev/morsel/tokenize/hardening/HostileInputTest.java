package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Decoding;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.bpe.BpeSegmenter;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import dev.morsel.tokenize.wordpiece.WordPieceSegmenter;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

/**
 * The hostile inputs of the hardening issue, for each segmenter: each finishes and gives the
 * correct result, checked against the offset rules, the round trip, and where feasible an oracle
 * ({@link Oracles}) or the same text encoded in parts. Speed is not measured here (JMH benchmarks
 * in tokenize-bench hold the time ratios).
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class HostileInputTest {
  static final int MIB = 1 << 20;

  private final Counts counts = new Counts("hostile inputs");

  /** Content tokens (between the framing markers) of a single-text result. */
  static int[] content(Tokens t) {
    return Arrays.copyOfRange(t.ids(), 1, t.size() - 1);
  }

  /** Offsets, and for a lossless result the round trip; returns the result. */
  private Tokens encodeChecked(Tokenizer tk, String what, String text) {
    Tokens t = tk.encode(text);
    OffsetInvariants.check(t, text);
    assertEquals(0, t.start(0));
    assertEquals(text.length(), t.end(t.size() - 1));
    boolean unknown = false;
    for (int i = 0; i < t.size(); i++) {
      unknown |= t.id(i) == tk.unknownId();
    }
    if (!unknown) {
      String normalized = tk.pipeline().normalization().apply(text).text();
      assertTrue(normalized.equals(tk.decode(t.ids(), true, Decoding.STRICT)), what + ": round trip differs");
      counts.add("round trips of hostile inputs");
    }
    counts.add(what);
    return t;
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void tenMebibytesInOneLineEqualsItsParts(Models.Kind kind) {
    Tokenizer tk = Models.tokenizer(kind, "nfc");
    StringBuilder sb = new StringBuilder(10 * MIB + 4096);
    List<String> prose = Models.heldOut(400, 100_000);
    for (int i = 0; sb.length() < 10 * MIB; i++) {
      sb.append(prose.get(i % prose.size()).replace('\n', ' ')).append(' ');
    }
    sb.setLength(10 * MIB);
    sb.setCharAt(sb.length() - 1, 'x');
    String text = sb.toString();
    Tokens whole = encodeChecked(tk, "10 MiB in one line", text);
    // cut before a space that follows a letter and precedes a letter: a piece boundary under rule
    // splitting and a normalization boundary (UAX #15: ASCII is always a boundary), so the parts
    // must encode to the whole
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
          throw new AssertionError(kind + ": token " + k + " of the whole differs from token " + i + " of part " + p);
        }
      }
    }
    assertEquals(whole.size() - 1, k, "token count of the parts");
    counts.add("10 MiB line equals its 10 parts, token by token");
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void oneMebibyteWithoutSpaces(Models.Kind kind) {
    Tokenizer tk = Models.tokenizer(kind, "nfc");
    SplittableRandom rnd = new SplittableRandom(0x5BACE5L);
    StringBuilder sb = new StringBuilder(MIB);
    while (sb.length() < MIB) {
      char c = rnd.nextInt(6) == 0 ? (char) rnd.nextInt(0xE0, 0x100) : (char) rnd.nextInt('a', 'z' + 1);
      sb.append(c == '\u00F7' ? 'o' : c); // U+00F7 is a symbol (Sm), every other of U+00E0..U+00FF a letter
    }
    String text = sb.toString(); // letters only: one piece
    Tokens t = encodeChecked(tk, "1 MiB without spaces", text);
    String lower = lowercase(rnd, 64 * 1024);
    if (kind == Models.Kind.BPE) {
      BpeSegmenter bpe = (BpeSegmenter) Models.segmenter(kind);
      assertArrayEquals(Oracles.textbookBpe(bpe, text.substring(0, 64 * 1024)),
          content(tk.encode(text.substring(0, 64 * 1024))), "64 KiB prefix vs textbook BPE");
      assertArrayEquals(Oracles.textbookBpe(bpe, lower), content(tk.encode(lower)), "64 KiB a-z vs textbook BPE");
      counts.add("long pieces agree with textbook BPE", 2);
    } else {
      assertArrayEquals(new int[] {tk.unknownId()}, content(t), "a piece over the WordPiece limit is one unknown");
      WordPieceSegmenter w = (WordPieceSegmenter) Models.segmenter(kind);
      WordPieceSegmenter wide = WordPieceSegmenter.of(w.tokens(), w.controlCount(), w.settings().withMaxPieceLength(MIB));
      Tokenizer wtk = Models.tokenizer(kind, "nfc", wide);
      encodeChecked(wtk, "1 MiB without spaces, WordPiece piece limit 1 MiB", text);
      int[] got = content(encodeChecked(wtk, "64 KiB a-z, WordPiece piece limit 1 MiB", lower));
      assertArrayEquals(Oracles.greedyWordPiece(wide, lower), got, "64 KiB a-z vs naive greedy");
      assertTrue(got.length > 1000, "a-z is covered by the vocabulary: " + got.length + " tokens");
      counts.add("long pieces agree with naive greedy WordPiece");
    }
  }

  static String lowercase(SplittableRandom rnd, int n) {
    StringBuilder sb = new StringBuilder(n);
    for (int i = 0; i < n; i++) {
      sb.append((char) rnd.nextInt('a', 'z' + 1));
    }
    return sb.toString();
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void oneMebibyteOfOneCharacter(Models.Kind kind) {
    Tokenizer tk = Models.tokenizer(kind, "nfc");
    String as = "a".repeat(MIB);
    Tokens t = encodeChecked(tk, "1 MiB of one character", as);
    encodeChecked(tk, "1 MiB of one character", "\u00E9".repeat(MIB));
    encodeChecked(tk, "1 MiB of one character", "\uD83E\uDDED".repeat(MIB / 2)); // U+1F9ED, a surrogate pair
    if (kind == Models.Kind.BPE) {
      assertArrayEquals(Oracles.textbookBpe((BpeSegmenter) Models.segmenter(kind), as), content(t),
          "1 MiB of 'a' vs textbook BPE");
      counts.add("long pieces agree with textbook BPE");
    } else {
      assertArrayEquals(new int[] {tk.unknownId()}, content(t));
      WordPieceSegmenter w = (WordPieceSegmenter) Models.segmenter(kind);
      WordPieceSegmenter wide = WordPieceSegmenter.of(w.tokens(), w.controlCount(), w.settings().withMaxPieceLength(MIB));
      String quarter = as.substring(0, MIB / 4);
      assertArrayEquals(Oracles.greedyWordPiece(wide, quarter),
          content(encodeChecked(Models.tokenizer(kind, "nfc", wide), "256 KiB of 'a', piece limit 1 MiB", quarter)));
      counts.add("long pieces agree with naive greedy WordPiece");
    }
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void hundredThousandCombiningMarksOnOneBase(Models.Kind kind) {
    String one = "a" + "\u0301".repeat(100_000);
    StringBuilder mixed = new StringBuilder("e");
    SplittableRandom rnd = new SplittableRandom(0xACCE27L);
    for (int i = 0; i < 100_000; i++) {
      mixed.append((char) rnd.nextInt(0x300, 0x370)); // marks of many combining classes: reordering work
    }
    for (String form : Models.FORMS) {
      Tokenizer tk = Models.tokenizer(kind, form);
      encodeChecked(tk, "100k combining marks on one base", one);
      encodeChecked(tk, "100k combining marks on one base", mixed.toString());
    }
    Tokens stripped = Models.tokenizer(kind, "nfd+remove-marks").encode(one);
    assertEquals(3, stripped.size(), "remove-marks leaves the base letter alone: " + stripped);
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void controlTokenLookAlikesAndPrefixes(Models.Kind kind) {
    Tokenizer tk = Models.tokenizer(kind, "nfkc+casefold");
    StringBuilder sb = new StringBuilder(MIB + 64);
    SplittableRandom rnd = new SplittableRandom(0x100C_A1E5L);
    while (sb.length() < MIB) {
      String spelling = Spellings.ALL.get(rnd.nextInt(Spellings.ALL.size()));
      List<String> like = ControlTokenInjectionTest.lookAlikes(spelling);
      sb.append(rnd.nextInt(50) == 0 ? spelling : like.get(rnd.nextInt(like.size())));
    }
    String text = sb.toString();
    Tokens u = encodeChecked(tk, "1 MiB of control-token look-alikes and prefixes", text);
    for (int i = 1; i < u.size() - 1; i++) {
      assertTrue(!u.isControl(i) && !tk.controlTokens().isControl(u.id(i)), "untrusted control token at " + i);
    }
    Tokens t = tk.encode(text, Trust.TRUSTED);
    OffsetInvariants.check(t, text);
    List<int[]> expected = ControlTokenInjectionTest.exactOccurrences(text, tk.controlTokens());
    int found = 0;
    for (int i = 1; i < t.size() - 1; i++) {
      if (t.isControl(i)) {
        int[] e = expected.get(found++);
        assertArrayEquals(e, new int[] {t.start(i), t.end(i), t.id(i)});
      }
    }
    assertEquals(expected.size(), found);
    assertTrue(found > 100, "exact spellings in the text: " + found);
    counts.add("exact control spellings among 1 MiB of look-alikes, found in trusted mode", found);
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void textOfLoneSurrogates(Models.Kind kind) {
    SplittableRandom rnd = new SplittableRandom(0x5A22L);
    StringBuilder sb = new StringBuilder(MIB);
    while (sb.length() < MIB) {
      // a high surrogate is never followed by a low one here: every one is lone
      sb.append(rnd.nextBoolean() ? (char) rnd.nextInt(0xDC00, 0xE000) : (char) rnd.nextInt(0xD800, 0xDC00));
      if (sb.length() > 1 && Character.isHighSurrogate(sb.charAt(sb.length() - 2))
          && Character.isLowSurrogate(sb.charAt(sb.length() - 1))) {
        sb.setLength(sb.length() - 1);
      }
    }
    String text = sb.toString();
    for (String form : Models.FORMS) {
      Tokenizer tk = Models.tokenizer(kind, form);
      Tokens t = encodeChecked(tk, "1 MiB of lone surrogates", text);
      if (kind == Models.Kind.BPE) {
        assertEquals("\uFFFD".repeat(text.length()), tk.decode(t.ids(), true, Decoding.REPLACE));
      }
    }
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void aMillionOneCharacterLinesInABatch(Models.Kind kind) {
    Tokenizer tk = Models.tokenizer(kind, "nfkc");
    String[] pool = {"a", "Z", "7", " ", "\t", "\n", "é", "ß", "Ω", "ж", "中", "ㄱ", "\u0301", "\uD83D\uDEA2", "\uD800",
        "\uDFFF", "\u0000", "\u007F", "\u200D", "\uFB01", "\uFF21", "{", "~", "}", "\uFFFD", "\uFEFF"};
    Map<String, Tokens> oracle = new HashMap<>();
    for (String s : pool) {
      oracle.put(s, tk.encode(s));
    }
    int n = 1_000_000;
    SplittableRandom rnd = new SplittableRandom(0x1_000_000L);
    List<String> lines = new ArrayList<>(n);
    for (int i = 0; i < n; i++) {
      lines.add(pool[rnd.nextInt(pool.length)]);
    }
    List<Tokens> out = tk.encodeAll(lines);
    assertEquals(n, out.size());
    for (int i = 0; i < n; i++) {
      if (!out.get(i).equals(oracle.get(lines.get(i)))) {
        throw new AssertionError(kind + ": line " + i + " \"" + HardText.escape(lines.get(i), 10) + "\" encoded as "
            + out.get(i) + ", alone as " + oracle.get(lines.get(i)));
      }
    }
    counts.add("one-character lines in one batch equal to their single encodes", n);
  }

  @AfterAll
  void report() {
    counts.print();
  }
}
