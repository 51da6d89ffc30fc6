package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.hardening.kit.*;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.bpe.Bpe;
import dev.morsel.tokenize.bpe.BpeLearner;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.CorpusException;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.wordpiece.WordPieceLearner;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * Learners fed what nobody should feed them: each gives a clear error naming the setting or the
 * input, or the documented behaviour, and never hangs. The class-level {@link Timeout} is a hang
 * guard only (ten times what a run needs on a slow machine), not a speed check.
 */
@Timeout(600)
class LearnerAbuseTest {
  @TempDir
  Path dir;

  static BpeLearner bpe(int vocabularySize) {
    return BpeLearner.builder().vocabularySize(vocabularySize).threads(2).build();
  }

  static WordPieceLearner wordPiece(int vocabularySize) {
    // without byte spelling: these checks count the ids of the bare scheme (ByteSpellingTest covers the bytes)
    return WordPieceLearner.builder().vocabularySize(vocabularySize).byteSpelling(false).build();
  }

  /** The learned tokenizer itself: learners bind it to the counts' pipeline (here the default one). */
  static Tokenizer tokenizer(Tokenizer t) {
    assertEquals(Pipeline.defaults(), t.pipeline());
    return t;
  }

  static java.util.List<String> tokens(Tokenizer t) {
    java.util.List<String> out = new java.util.ArrayList<>();
    for (int id = 0; id < t.vocabularySize(); id++) {
      out.add(t.token(id));
    }
    return out;
  }

  @Test
  void emptyCorpusIsAClearError() throws IOException {
    IllegalArgumentException b = assertThrows(IllegalArgumentException.class, () -> bpe(300).train(PieceCounts.empty()));
    assertTrue(b.getMessage().contains("empty"), b.getMessage());
    IllegalArgumentException w = assertThrows(IllegalArgumentException.class,
        () -> wordPiece(300).train(PieceCounts.empty()));
    assertTrue(w.getMessage().contains("minCount") || w.getMessage().contains("empty"), w.getMessage());
    // an empty file and a file of empty lines count to nothing, which the learners then refuse
    Path empty = Files.write(dir.resolve("empty.txt"), new byte[0]);
    Path blank = Files.write(dir.resolve("blank.txt"), "\n\n\r\n".getBytes(StandardCharsets.US_ASCII));
    PieceCounts none = PieceCounter.builder().threads(2).build().countFiles(List.of(empty, blank));
    assertTrue(none.isEmpty());
    assertThrows(IllegalArgumentException.class, () -> bpe(300).train(none));
    assertThrows(IllegalArgumentException.class, () -> wordPiece(300).train(none));
  }

  @Test
  void oneDistinctPieceGivesWhatItCan() {
    PieceCounts one = PieceCounts.of(Map.of("ferry", 1000L));
    Tokenizer b = bpe(32_000).train(one);
    // f e r r y: four merges join it into one token, and then no pair is left
    assertEquals(4, Bpe.mergeCount(b));
    assertEquals(256 + 4, b.vocabularySize());
    assertEquals(1, tokenizer(b).encode("ferry").size());
    Tokenizer w = wordPiece(32_000).train(one);
    assertEquals(1, tokenizer(w).encode("ferry").size());
    assertTrue(w.vocabularySize() < 32_000);
    // a single one-character piece: no merge at all
    assertEquals(0, Bpe.mergeCount(bpe(300).train(PieceCounts.of(Map.of("a", 5L)))));
    // unknown + "a" + its continuation form: every kept character is encodable in either position
    assertEquals(3, wordPiece(300).train(PieceCounts.of(Map.of("a", 5L))).vocabularySize());
  }

  @Test
  void vocabularySmallerThanTheAlphabetIsAClearError() {
    IllegalArgumentException b = assertThrows(IllegalArgumentException.class,
        () -> BpeLearner.builder().vocabularySize(255).build());
    assertTrue(b.getMessage().contains("vocabularySize=255"), b.getMessage());
    PieceCounts letters = PieceCounts.of(Map.of("abcdefghij", 3L, "klmnop", 2L));
    IllegalArgumentException w = assertThrows(IllegalArgumentException.class, () -> wordPiece(5).train(letters));
    assertTrue(w.getMessage().contains("vocabularySize"), w.getMessage());
  }

  @Test
  void vocabularyLargerThanTheCorpusCanGiveStopsEarly() {
    PieceCounts small = PieceCounter.builder().threads(2).build().count(Europarl.bodies().subList(0, 20));
    Tokenizer b = bpe(1_000_000).train(small);
    assertTrue(b.vocabularySize() < 1_000_000, "vocabulary " + b.vocabularySize());
    assertTrue(Bpe.mergeCount(b) > 100);
    Tokenizer w = wordPiece(1_000_000).train(small);
    assertTrue(w.vocabularySize() < 1_000_000, "vocabulary " + w.vocabularySize());
    // what was learned still encodes the corpus losslessly
    String text = Europarl.bodies().get(3);
    Tokenizer t = tokenizer(b);
    assertEquals(t.pipeline().normalization().apply(text).text(), t.decode(t.encode(text).ids()));
  }

  @Test
  void invalidUtf8NamesFileAndByteOffset() throws IOException {
    byte[][] bad = {
        {(byte) 0xC3, 0x28}, // lead byte without its continuation
        {(byte) 0xED, (byte) 0xA0, (byte) 0x80}, // a surrogate encoded in UTF-8 (RFC 3629 section 3: invalid)
        {(byte) 0xC0, (byte) 0xAF}, // overlong '/' (RFC 3629 section 3)
        {(byte) 0xF4, (byte) 0x90, (byte) 0x80, (byte) 0x80}, // above U+10FFFF
        {(byte) 0xFF},
    };
    byte[] head = "ferry to Skarvøy\nbad ".getBytes(StandardCharsets.UTF_8); // ø is two bytes: offset 22
    for (int k = 0; k < bad.length; k++) {
      Path f = dir.resolve("corpus-" + k + ".txt");
      try (OutputStream out = Files.newOutputStream(f)) {
        out.write(head);
        out.write(bad[k]);
        out.write(" quay\n".getBytes(StandardCharsets.US_ASCII));
      }
      CorpusException e = assertThrows(CorpusException.class,
          () -> PieceCounter.builder().threads(2).build().countFiles(List.of(f)));
      assertEquals(f, e.file());
      assertEquals(head.length, e.byteOffset(), e.getMessage());
      assertEquals(2, e.line());
      assertTrue(e.getMessage().contains(f.toString()) && e.getMessage().contains(String.valueOf(head.length)),
          e.getMessage());
    }
  }

  @Test
  void hundredMegabyteSingleLine() throws IOException {
    Path f = dir.resolve("one-line.txt");
    byte[] phrase = "the evening ferry to Skarvøy left the north quay late again ".getBytes(StandardCharsets.UTF_8);
    long target = 100_000_000L;
    long written = 0;
    try (OutputStream out = new java.io.BufferedOutputStream(Files.newOutputStream(f), 1 << 20)) {
      while (written + phrase.length <= target) {
        out.write(phrase);
        written += phrase.length;
      }
    }
    long repeats = written / phrase.length;
    PieceCounts counts = PieceCounter.builder().threads(2).build().countFiles(List.of(f));
    // rule splitting: "the", " evening", " ferry", " to", " Skarvøy", " left", " the", " north", ...
    assertEquals(1, counts.count("the")); // only at the start of the line; every later one is " the"
    assertEquals(2 * repeats - 1, counts.count(" the"));
    assertEquals(repeats, counts.count(" Skarvøy"));
    Tokenizer b = bpe(400).train(counts);
    assertEquals(1, tokenizer(b).encode(" Skarvøy").size());
    Tokenizer w = wordPiece(400).train(counts);
    assertEquals(1, tokenizer(w).encode(" Skarvøy").size());
  }

  @Test
  void countsBeyondIntGiveTheSameModelAsScaledDownCounts() {
    // scaling every count by 2^32 keeps every comparison the learners make: BPE compares weighted
    // pair counts; WordPiece's score count(ab) / (count(a) count(b)) scales by 2^-32, exactly in
    // binary floating point, and its tie-break compares count(ab)
    PieceCounts small = PieceCounter.builder().threads(2).build().count(Europarl.bodies().subList(0, 200));
    Map<String, Long> scaled = new TreeMap<>();
    small.forEach((piece, count) -> scaled.put(piece, count << 32));
    PieceCounts big = PieceCounts.of(scaled);
    assertTrue(big.count(0) > Integer.MAX_VALUE);
    Tokenizer b1 = bpe(800).train(small);
    Tokenizer b2 = bpe(800).train(big);
    assertEquals(Bpe.mergeCount(b1), Bpe.mergeCount(b2));
    for (int r = 0; r < Bpe.mergeCount(b1); r++) {
      assertEquals(Bpe.merge(b1, r)[0], Bpe.merge(b2, r)[0], "merge " + r);
      assertEquals(Bpe.merge(b1, r)[1], Bpe.merge(b2, r)[1], "merge " + r);
    }
    assertEquals(tokens(wordPiece(800).train(small)), tokens(wordPiece(800).train(big)));
  }

  @Test
  void countsWhoseTotalOverflowsALongAreRefused() {
    Map<String, Long> m = new TreeMap<>();
    m.put("ferry", Long.MAX_VALUE / 2 + 1);
    m.put("quay", Long.MAX_VALUE / 2 + 1);
    assertThrows(ArithmeticException.class, () -> PieceCounts.of(m));
  }

  /** Regression: a pair count that overflowed a long wrapped around, and BPE silently learned no merge. */
  @Test
  void bpeLearnerRefusesPairCountsThatWouldOverflowALong() {
    // the total fits a long, but the pair (a, a) occurs 7 times in the piece: 7 * 2^61 does not
    PieceCounts heavy = PieceCounts.of(Map.of("aaaaaaaa", 1L << 61, "ferry", 3L));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> bpe(300).train(heavy));
    assertTrue(e.getMessage().contains("overflow"), e.getMessage());
    // just below the bound it trains, and learns the merges the counts ask for
    PieceCounts fits = PieceCounts.of(Map.of("aaaaaaaa", Long.MAX_VALUE / 7 - 1));
    assertEquals(1, tokenizer(bpe(300).train(fits)).encode("aaaaaaaa").size());
  }

  /** Regression: unit and pair counts of WordPiece training wrapped around silently. */
  @Test
  void wordPieceLearnerRefusesCountsThatWouldOverflowALong() {
    PieceCounts heavy = PieceCounts.of(Map.of("aaaaaaaa", 1L << 61, "ferry", 3L));
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> wordPiece(300).train(heavy));
    assertTrue(e.getMessage().contains("overflow"), e.getMessage());
    PieceCounts fits = PieceCounts.of(Map.of("aaaaaaaa", Long.MAX_VALUE / 8));
    assertEquals(1, tokenizer(wordPiece(300).train(fits)).encode("aaaaaaaa").size());
  }

  /**
   * Regression: one 100 MB line without a break is one piece, and training on it took time that
   * grows with its length times the merges (a 10 MB piece: 40 s for BPE, 277 s for WordPiece, for
   * 400 ids) — a hang at 100 MB. Both learners now leave such pieces out, as documented.
   */
  @Test
  void hundredMegabyteLineWithoutABreakIsLeftOutOfTraining() throws IOException {
    Path f = dir.resolve("no-break.txt");
    java.util.SplittableRandom rnd = new java.util.SplittableRandom(0x100_000_000L);
    byte[] block = new byte[1 << 20];
    try (OutputStream out = new java.io.BufferedOutputStream(Files.newOutputStream(f), 1 << 20)) {
      for (int mb = 0; mb < 100; mb++) {
        for (int i = 0; i < block.length; i++) {
          block[i] = (byte) rnd.nextInt('a', 'z' + 1);
        }
        out.write(block);
      }
      out.write("\nthe ferry to Skarvøy\nthe ferry back\n".getBytes(StandardCharsets.UTF_8));
    }
    PieceCounts counts = PieceCounter.builder().threads(2).build().countFiles(List.of(f));
    assertEquals(2, counts.count(" ferry"));
    // alone, the long piece is nothing to train on: a clear error naming the setting
    String[] one = {null};
    counts.forEach((p, c) -> {
      if (p.length() > 1000) {
        one[0] = p;
      }
    });
    assertEquals(100 << 20, one[0].length());
    PieceCounts single = PieceCounts.of(new String[] {one[0]}, new long[] {1});
    IllegalArgumentException b = assertThrows(IllegalArgumentException.class, () -> bpe(400).train(single));
    assertTrue(b.getMessage().contains("maxPieceBytes=4096"), b.getMessage());
    IllegalArgumentException w = assertThrows(IllegalArgumentException.class, () -> wordPiece(400).train(single));
    assertTrue(w.getMessage().contains("maxPieceLength derived from vocabularySize=400"), w.getMessage());
    // with the short lines, both train on those and give the documented result
    Tokenizer bs = bpe(400).train(counts);
    assertEquals(1, tokenizer(bs).encode(" ferry").size());
    Tokenizer ws = wordPiece(400).train(counts);
    assertEquals(1, tokenizer(ws).encode(" ferry").size());
  }

  @Test
  void maxPieceBytesIsASetting() {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> BpeLearner.builder().maxPieceBytes(1).build());
    assertTrue(e.getMessage().contains("maxPieceBytes=1"), e.getMessage());
    PieceCounts c = PieceCounts.of(Map.of("ferry", 5L, "ferryboat", 5L));
    // pieces over 5 bytes are left out: only "ferry" is learned from
    assertEquals(4, Bpe.mergeCount(BpeLearner.builder().vocabularySize(300).maxPieceBytes(5).threads(1).build().train(c)));
  }
}
