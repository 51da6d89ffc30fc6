package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static dev.morsel.tokenize.hardening.kit.HostileInputs.MIB;
import static dev.morsel.tokenize.hardening.kit.HostileInputs.content;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestInstance;

/**
 * The hostile inputs of the hardening issue ({@link HostileInputs}) for the unigram tokenizer (byte
 * fallback on): each finishes and gives the correct result, checked against the offset rules, the
 * round trip, and for long pieces against {@link #viterbiOracle}, a dynamic program over a hash map
 * of the pieces written from Kudo (2018), section 3.1, that shares no code with the segmenter.
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class HostileInputTest {
  private final Counts counts = new Counts("unigram hostile inputs");
  private final HostileInputs hostile = new HostileInputs(counts);

  /**
   * The best segmentation of {@code piece} under {@code m}: for every end position the highest sum
   * of log-probabilities, over edges that are pieces (looked up by string) or, where a code point is
   * not a piece, one code point scored as the documented unknown penalty
   * ({@code min(0, lowest piece score) - 10}) and emitted as its UTF-8 bytes (a lone surrogate as
   * U+FFFD's). Ties keep the earlier start (the documented rule: first relaxation wins).
   */
  static int[] viterbiOracle(UnigramSegmenter m, String piece) {
    Map<String, Integer> ids = new HashMap<>();
    double lowest = 0;
    int longest = 1;
    for (int id = m.firstPieceId(); id < m.vocabularySize(); id++) {
      ids.put(m.token(id), id);
      lowest = Math.min(lowest, m.score(id));
      longest = Math.max(longest, m.token(id).length());
    }
    double unknown = lowest - 10;
    int n = piece.length();
    double[] best = new double[n + 1];
    int[] from = new int[n + 1];
    int[] via = new int[n + 1];
    java.util.Arrays.fill(best, Double.NEGATIVE_INFINITY);
    best[0] = 0;
    for (int i = 0; i < n; i++) {
      if (best[i] == Double.NEGATIVE_INFINITY) {
        continue;
      }
      int cpEnd = i + Character.charCount(piece.codePointAt(i));
      for (int e = i + 1; e <= Math.min(n, i + longest); e++) {
        Integer id = ids.get(piece.substring(i, e));
        if (id != null && best[i] + m.score(id) > best[e]) {
          best[e] = best[i] + m.score(id);
          from[e] = i;
          via[e] = id;
        }
      }
      if (!ids.containsKey(piece.substring(i, cpEnd)) && best[i] + unknown > best[cpEnd]) {
        best[cpEnd] = best[i] + unknown;
        from[cpEnd] = i;
        via[cpEnd] = -1;
      }
    }
    java.util.ArrayDeque<int[]> path = new java.util.ArrayDeque<>();
    for (int e = n; e > 0; e = from[e]) {
      if (via[e] >= 0) {
        path.push(new int[] {via[e]});
      } else {
        String ch = piece.substring(from[e], e);
        byte[] b = (Character.isSurrogate(ch.charAt(0)) && ch.length() == 1 ? "\uFFFD" : ch)
            .getBytes(StandardCharsets.UTF_8);
        int[] bytes = new int[b.length];
        for (int k = 0; k < b.length; k++) {
          bytes[k] = m.firstByteId() + (b[k] & 0xFF);
        }
        path.push(bytes);
      }
    }
    return path.stream().flatMapToInt(java.util.Arrays::stream).toArray();
  }

  @Test
  void tenMebibytesInOneLineEqualsItsParts() {
    hostile.tenMebibytesEqualsItsParts(Models.tokenizer("nfc"), Models.heldOut(400, 100_000), "UNIGRAM");
  }

  @Test
  void oneMebibyteWithoutSpaces() {
    Tokenizer tk = Models.tokenizer("nfc");
    String text = HostileInputs.lettersWithoutSpaces(0x5BACE5L, MIB);
    Tokens t = hostile.encodeChecked(tk, "1 MiB without spaces", text);
    assertTrue(t.size() > 100_000, "one MiB of letters gives " + t.size() + " tokens");
    String prefix = text.substring(0, 64 * 1024);
    assertArrayEquals(viterbiOracle(Models.model(), prefix), content(tk.encode(prefix)), "64 KiB prefix vs oracle");
    String lower = HostileInputs.lowercase(new SplittableRandom(0x5BACE6L), 64 * 1024);
    assertArrayEquals(viterbiOracle(Models.model(), lower), content(tk.encode(lower)), "64 KiB a-z vs oracle");
    // a piece of symbols the model never saw: every one falls back to its bytes
    String uncovered = "\u2654\u2655\u2656".repeat(MIB / 3);
    int[] got = content(hostile.encodeChecked(tk, "1 MiB without spaces, uncovered symbols", uncovered));
    assertArrayEquals(viterbiOracle(Models.model(), uncovered.substring(0, 30_000)),
        content(tk.encode(uncovered.substring(0, 30_000))), "uncovered symbols vs oracle");
    assertTrue(got.length >= uncovered.length(), "byte tokens: " + got.length);
    counts.add("long pieces agree with the Viterbi oracle", 3);
  }

  /**
   * 256 KiB each of combining-mark runs, emoji sequences and mixed scripts without spaces
   * ({@link HostileInputs#withoutSpaces}), with rule splitting and as one piece (normalization and
   * splitting off); a 32 Ki-unit prefix of the one piece against {@link #viterbiOracle}.
   */
  @Test
  void marksEmojiAndMixedScriptsWithoutSpaces() {
    Tokenizer tk = Models.tokenizer("nfc");
    Tokenizer onePiece = Tokenizers.of(Pipeline.of(Normalization.none(), Splitting.none()), Tokenizers.segmenterOf(tk),
        tk.reservedTokens(), Spellings.template());
    for (String k : HostileInputs.SCRIPT_KINDS) {
      String text = HostileInputs.withoutSpaces(k, 0x5C217L, 256 * 1024);
      hostile.encodeChecked(tk, "256 KiB of " + k + " without spaces", text);
      hostile.encodeChecked(onePiece, "256 KiB of " + k + " as one piece", text);
      String prefix = HostileInputs.withoutSpaces(k, 0x5C217L, 32 * 1024);
      assertArrayEquals(viterbiOracle(Models.model(), prefix), content(onePiece.encode(prefix)),
          k + ": 32 Ki units as one piece vs oracle");
      counts.add("one piece of marks, emoji or mixed scripts agrees with the Viterbi oracle");
    }
  }

  @Test
  void oneMebibyteOfOneCharacter() {
    Tokens t = hostile.oneMebibyteOfOneCharacter(Models.tokenizer("nfc"));
    assertArrayEquals(viterbiOracle(Models.model(), "a".repeat(MIB)), content(t), "1 MiB of 'a' vs oracle");
    String emoji = "\uD83E\uDDED".repeat(1 << 14);
    assertArrayEquals(viterbiOracle(Models.model(), emoji), content(Models.tokenizer("nfc").encode(emoji)),
        "16 Ki U+1F9ED vs oracle");
    counts.add("long pieces agree with the Viterbi oracle", 2);
  }

  @Test
  void hundredThousandCombiningMarksOnOneBase() {
    hostile.hundredThousandCombiningMarks(Models::tokenizer);
  }

  @Test
  void reservedTokenLookAlikesAndPrefixes() {
    hostile.reservedLookAlikesAndPrefixes(Models.tokenizer("nfkc+casefold"));
  }

  @Test
  void textOfLoneSurrogates() {
    // byte fallback encodes a lone surrogate as U+FFFD's bytes (UnigramSegmenter's contract)
    hostile.loneSurrogatesInEveryForm(Models::tokenizer, true);
  }

  @Test
  void aMillionOneCharacterLinesInABatch() {
    hostile.aMillionOneCharacterLines(Models.tokenizer("nfkc"), "UNIGRAM");
  }

  @AfterAll
  void report() {
    counts.print();
  }
}
