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
import dev.morsel.tokenize.wordpiece.WordPiece;
import java.util.SplittableRandom;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.TestInstance;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

/**
 * The hostile inputs of the hardening issue ({@link HostileInputs}), for each segmenter: each
 * finishes and gives the correct result, checked against the offset rules, the round trip, and
 * where feasible an oracle ({@link Oracles}) or the same text encoded in parts. Speed is not
 * measured here (JMH benchmarks in tokenize-bench hold the time ratios).
 */
@TestInstance(TestInstance.Lifecycle.PER_CLASS)
class HostileInputTest {
  private final Counts counts = new Counts("hostile inputs");
  private final HostileInputs hostile = new HostileInputs(counts);

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void tenMebibytesInOneLineEqualsItsParts(Models.Kind kind) {
    hostile.tenMebibytesEqualsItsParts(Models.tokenizer(kind, "nfc"), Models.heldOut(400, 100_000), kind.toString());
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void oneMebibyteWithoutSpaces(Models.Kind kind) {
    Tokenizer tk = Models.tokenizer(kind, "nfc");
    String text = HostileInputs.lettersWithoutSpaces(0x5BACE5L, MIB);
    Tokens t = hostile.encodeChecked(tk, "1 MiB without spaces", text);
    String lower = HostileInputs.lowercase(new SplittableRandom(0x5BACE6L), 64 * 1024);
    if (kind == Models.Kind.BPE) {
      Tokenizer bpe = Models.trained(kind);
      assertArrayEquals(Oracles.textbookBpe(bpe, text.substring(0, 64 * 1024)),
          content(tk.encode(text.substring(0, 64 * 1024))), "64 KiB prefix vs textbook BPE");
      assertArrayEquals(Oracles.textbookBpe(bpe, lower), content(tk.encode(lower)), "64 KiB a-z vs textbook BPE");
      counts.add("long pieces agree with textbook BPE", 2);
    } else {
      assertArrayEquals(new int[] {tk.unknownId()}, content(t), "a piece over the WordPiece limit is one unknown");
      Tokenizer wtk = WordPiece.withMaxPieceLength(tk, MIB);
      hostile.encodeChecked(wtk, "1 MiB without spaces, WordPiece piece limit 1 MiB", text);
      int[] got = content(hostile.encodeChecked(wtk, "64 KiB a-z, WordPiece piece limit 1 MiB", lower));
      assertArrayEquals(Oracles.greedyWordPiece(wtk, lower), got, "64 KiB a-z vs naive greedy");
      assertTrue(got.length > 1000, "a-z is covered by the vocabulary: " + got.length + " tokens");
      counts.add("long pieces agree with naive greedy WordPiece");
    }
  }

  /**
   * 256 KiB each of combining-mark runs, emoji sequences and mixed scripts without spaces
   * ({@link HostileInputs#withoutSpaces}), with rule splitting and as one piece (normalization and
   * splitting off); a 32 Ki-unit prefix of the one piece against textbook BPE or naive greedy
   * WordPiece.
   */
  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void marksEmojiAndMixedScriptsWithoutSpaces(Models.Kind kind) {
    Tokenizer tk = Models.tokenizer(kind, "nfc");
    Tokenizer trained = Models.trained(kind);
    Tokenizer onePiece = Tokenizers.of(Pipeline.of(Normalization.none(), Splitting.none()),
        Tokenizers.segmenterOf(kind == Models.Kind.BPE ? trained : WordPiece.withMaxPieceLength(trained, MIB)),
        trained.reservedTokens(), Spellings.template());
    for (String k : HostileInputs.SCRIPT_KINDS) {
      String text = HostileInputs.withoutSpaces(k, 0x5C217L, 256 * 1024);
      hostile.encodeChecked(tk, "256 KiB of " + k + " without spaces", text);
      hostile.encodeChecked(onePiece, "256 KiB of " + k + " as one piece", text);
      String prefix = HostileInputs.withoutSpaces(k, 0x5C217L, 32 * 1024);
      int[] expected = kind == Models.Kind.BPE ? Oracles.textbookBpe(trained, prefix)
          : Oracles.greedyWordPiece(WordPiece.withMaxPieceLength(trained, MIB), prefix);
      assertArrayEquals(expected, content(onePiece.encode(prefix)), k + ": 32 Ki units as one piece vs the oracle");
      counts.add("one piece of marks, emoji or mixed scripts agrees with the oracle");
    }
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void oneMebibyteOfOneCharacter(Models.Kind kind) {
    Tokenizer tk = Models.tokenizer(kind, "nfc");
    Tokens t = hostile.oneMebibyteOfOneCharacter(tk);
    String as = "a".repeat(MIB);
    if (kind == Models.Kind.BPE) {
      assertArrayEquals(Oracles.textbookBpe(Models.trained(kind), as), content(t),
          "1 MiB of 'a' vs textbook BPE");
      counts.add("long pieces agree with textbook BPE");
    } else {
      assertArrayEquals(new int[] {tk.unknownId()}, content(t));
      Tokenizer wide = WordPiece.withMaxPieceLength(tk, MIB);
      String quarter = as.substring(0, MIB / 4);
      assertArrayEquals(Oracles.greedyWordPiece(wide, quarter), content(hostile.encodeChecked(
          wide, "256 KiB of 'a', piece limit 1 MiB", quarter)));
      counts.add("long pieces agree with naive greedy WordPiece");
    }
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void hundredThousandCombiningMarksOnOneBase(Models.Kind kind) {
    hostile.hundredThousandCombiningMarks(form -> Models.tokenizer(kind, form));
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void reservedTokenLookAlikesAndPrefixes(Models.Kind kind) {
    hostile.reservedLookAlikesAndPrefixes(Models.tokenizer(kind, "nfkc+casefold"));
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void textOfLoneSurrogates(Models.Kind kind) {
    hostile.loneSurrogatesInEveryForm(form -> Models.tokenizer(kind, form), kind == Models.Kind.BPE);
  }

  @ParameterizedTest
  @EnumSource(Models.Kind.class)
  void aMillionOneCharacterLinesInABatch(Models.Kind kind) {
    hostile.aMillionOneCharacterLines(Models.tokenizer(kind, "nfkc"), kind.toString());
  }

  @AfterAll
  void report() {
    counts.print();
  }
}
