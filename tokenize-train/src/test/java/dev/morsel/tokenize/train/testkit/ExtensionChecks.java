package dev.morsel.tokenize.train.testkit;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Lineage;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import dev.morsel.tokenize.train.Extender;
import dev.morsel.tokenize.train.ExtensionSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.BufferedReader;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.text.Normalizer;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import java.util.function.Function;
import java.util.function.IntFunction;

/**
 * The checks every scheme's extender runs (docs/adapting.md): the extended model keeps every base
 * id byte for byte, text pieces that were one base token encode to the same ids, the lineage
 * survives save/load and the review text, every Europarl body round-trips, wrong inputs are refused
 * with a message naming them; and the measurement of what an extension buys on source code and
 * costs on Europarl, against a model learned from scratch on both corpora.
 */
public final class ExtensionChecks {
  /** Ids of the base model of the measurement. */
  public static final int BASE_IDS = 4000;
  /** Ids added by the extension in the measurement. */
  public static final int ADDED_IDS = 2000;
  /** Europarl bodies the measurement uses: body {@code i} held out when {@code i % 10 == 9}. */
  public static final int EUROPARL_BODIES = 5000;

  private ExtensionChecks() {}

  // ------------------------------------------------------------------ corpora

  /** The measurement's corpora, counted through {@link Pipeline#defaults()}. */
  public record Corpora(List<String> europarlTrain, List<String> europarlHeld, List<String> codeTrain,
      List<String> codeHeld, PieceCounts europarl, PieceCounts code) {
    /** Both training corpora counted together. */
    public PieceCounts both() {
      return europarl.plus(code);
    }
  }

  private static volatile Corpora corpora;

  /** The corpora, made once per test JVM. */
  public static Corpora corpora() {
    Corpora c = corpora;
    if (c == null) {
      List<String> train = new ArrayList<>();
      List<String> held = new ArrayList<>();
      List<String> bodies = Europarl.bodies();
      for (int i = 0; i < EUROPARL_BODIES; i++) {
        (i % 10 == 9 ? held : train).add(bodies.get(i));
      }
      PieceCounter counter = PieceCounter.builder().pipeline(Pipeline.defaults()).threads(2).build();
      c = new Corpora(train, held, CodeCorpus.train(), CodeCorpus.heldOut(), counter.count(train),
          counter.count(CodeCorpus.train()));
      corpora = c;
    }
    return c;
  }

  /**
   * {@code n} random words of 1 to 7 characters of {@code alphabet}, with counts that fall with the
   * draw index (a rough Zipf shape), for the schemes' small seeded corpora; repeats add up.
   */
  public static java.util.Map<String, Long> randomWords(SplittableRandom r, String alphabet, int n) {
    java.util.Map<String, Long> m = new java.util.HashMap<>();
    for (int i = 0; i < n; i++) {
      StringBuilder sb = new StringBuilder();
      int len = 1 + r.nextInt(7);
      for (int j = 0; j < len; j++) {
        sb.append(alphabet.charAt(r.nextInt(alphabet.length())));
      }
      m.merge(sb.toString(), 1L + r.nextInt(50) / (1 + i % 7), Long::sum);
    }
    return m;
  }

  // ------------------------------------------------------------------ invariants

  /**
   * {@code extended} extends {@code base} by at most {@code addedIds} ids: every base id has the
   * same display spelling and bytes, the reserved tokens, framing and pipeline are the base's, and
   * the lineage names the base and survives save/load and the review text.
   */
  public static void assertExtends(Tokenizer base, Tokenizer extended, int addedIds) {
    assertEquals(base.scheme(), extended.scheme());
    int n = base.vocabularySize();
    assertTrue(extended.vocabularySize() > n && extended.vocabularySize() <= n + addedIds,
        "base " + n + " ids, extended " + extended.vocabularySize() + ", at most " + addedIds + " added");
    for (int id = 0; id < n; id++) {
      assertEquals(base.token(id), extended.token(id), "spelling of id " + id);
      assertArrayEquals(base.tokenBytes(id), extended.tokenBytes(id), "bytes of id " + id);
      assertEquals(id, extended.id(base.token(id)), "id of the spelling of id " + id);
    }
    assertEquals(base.reservedTokens(), extended.reservedTokens());
    assertEquals(base.template(), extended.template());
    assertEquals(base.pipeline(), extended.pipeline());
    assertEquals(base.unknownId(), extended.unknownId());
    Lineage lineage = extended.lineage().orElseThrow(() -> new AssertionError("no lineage recorded"));
    assertEquals(Lineage.of(base.fingerprint(), n), lineage);
    assertTrue(lineage.isBase(base));
    assertTrue(Extender.keepsIds(base, extended));
    assertTrue(!Extender.keepsIds(extended, base), "the base does not extend its extension");

    Tokenizer loaded = Tokenizers.load(extended.toBytes());
    assertEquals(extended.fingerprint(), loaded.fingerprint());
    assertEquals(extended.lineage(), loaded.lineage(), "save and load keep the lineage");
    StringBuilder review = new StringBuilder();
    extended.writeReview(review);
    assertTrue(review.toString().contains(base.fingerprint()), "the review text names the base");
    byte[] file = Tokenizers.modelFromReview(new BufferedReader(new StringReader(review.toString())), "review");
    Tokenizer fromReview = Tokenizers.load(file);
    assertEquals(extended.fingerprint(), fromReview.fingerprint(), "the review text gives back the same model");
    assertEquals(extended.lineage(), fromReview.lineage(), "the review text keeps the lineage");
    assertEquals(extended.lineage(), extended.withLimits(extended.limits()).lineage());
  }

  /**
   * Every piece of {@code pieces} that {@code base} encodes as one token encodes to that same id with
   * {@code extended}; and 300 seeded random texts of 2 to 12 such pieces joined by single spaces
   * encode to the same ids with both whenever every piece the pipeline cuts from the text (counted
   * by {@link PieceCounter} with the base's pipeline) is one token of the base, so the text is made
   * only of pieces that were single tokens. A piece the base wrote as one byte token (byte
   * spelling of a character it had no token for, shown as something other than the piece) is not
   * counted as a single token: the extension may give that character a token of its own, and the
   * byte token's id keeps its meaning.
   *
   * @return how many pieces and texts were checked (the caller asserts it is not trivial)
   */
  public static int assertSingleTokenPiecesKeepIds(Tokenizer base, Tokenizer extended, PieceCounts pieces, long seed) {
    List<String> singles = new ArrayList<>();
    for (int i = 0; i < pieces.size(); i++) {
      String p = pieces.piece(i);
      Tokens b = base.encode(p);
      if (b.size() == 1 && b.id(0) != base.unknownId() && !spelledAsAByte(base, b.id(0), p)) {
        singles.add(p);
        assertArrayEquals(b.ids(), extended.encode(p).ids(), "piece '" + p + "'");
      }
    }
    java.util.Set<String> single = new java.util.HashSet<>(singles);
    SplittableRandom random = new SplittableRandom(seed);
    PieceCounter counter = PieceCounter.builder().pipeline(base.pipeline()).threads(1).build();
    int texts = 0;
    for (int k = 0; k < 300 && !singles.isEmpty(); k++) {
      int n = 2 + random.nextInt(11);
      StringBuilder sb = new StringBuilder();
      for (int i = 0; i < n; i++) {
        sb.append(i == 0 ? "" : " ").append(singles.get(random.nextInt(singles.size())));
      }
      String text = sb.toString();
      PieceCounts cut = counter.count(List.of(text));
      boolean allSingle = true;
      for (int i = 0; i < cut.size() && allSingle; i++) {
        Tokens one = base.encode(cut.piece(i));
        allSingle = single.contains(cut.piece(i)) || one.size() == 1 && one.id(0) != base.unknownId()
            && !spelledAsAByte(base, one.id(0), cut.piece(i));
      }
      Tokens b = base.encode(text);
      if (allSingle && b.size() == cut.total()) {
        texts++;
        assertArrayEquals(b.ids(), extended.encode(text).ids(), "text '" + text + "'");
      }
    }
    return singles.size() + texts;
  }

  private static boolean spelledAsAByte(Tokenizer t, int id, String piece) {
    return t.tokenBytes(id).length == 1 && !t.token(id).equals(piece);
  }

  /**
   * Every Europarl body encodes with offsets that hold the invariants, and decodes to its NFC form
   * ({@link java.text.Normalizer}, an independent reference) unless it holds the unknown token.
   *
   * @return bodies that hold an unknown token
   */
  public static int assertEuroparlRoundTrip(Tokenizer t) {
    assertEquals(Normalization.parse("nfc"), t.pipeline().normalization(), "the check compares with NFC");
    int unknown = 0;
    List<String> bodies = Europarl.bodies();
    for (int b = 0; b < bodies.size(); b++) {
      String text = bodies.get(b);
      Tokens tokens = t.encode(text);
      OffsetInvariants.check(tokens, text);
      boolean unk = false;
      for (int i = 0; i < tokens.size(); i++) {
        unk |= tokens.id(i) == t.unknownId();
      }
      if (unk) {
        unknown++;
      } else {
        assertEquals(Normalizer.normalize(text, Normalizer.Form.NFC), t.decode(tokens.ids()), "body " + b);
      }
    }
    return unknown;
  }

  /**
   * The refusals every extender makes: a base of another scheme, counts of another pipeline (the
   * message names both), empty counts, and {@code addedIds} below 1 through the settings.
   */
  public static void assertRefusesWrongInputs(String scheme, Tokenizer base, IntFunction<Extender> extender) {
    Extender e = extender.apply(10);
    assertEquals(scheme, e.scheme());
    Tokenizer other = Tokenizers.of(Pipeline.defaults(), new ByteSegmenter(0));
    PieceCounts some = PieceCounts.of(base.pipeline(), java.util.Map.of("ferry", 3, "Oskevik", 2));
    IllegalArgumentException scheme0 = assertThrows(IllegalArgumentException.class, () -> e.extend(other, some));
    assertTrue(scheme0.getMessage().contains(ByteSegmenter.SCHEME) && scheme0.getMessage().contains(scheme), scheme0.getMessage());
    Pipeline folded = Pipeline.of(Normalization.parse("nfkc+casefold"), Splitting.runs());
    PieceCounts foldedCounts = PieceCounts.of(folded, java.util.Map.of("ferry", 3));
    IllegalArgumentException pipe = assertThrows(IllegalArgumentException.class, () -> e.extend(base, foldedCounts));
    assertTrue(pipe.getMessage().contains("nfkc+casefold") && pipe.getMessage().contains(
        base.pipeline().normalization().spec()), pipe.getMessage());
    IllegalArgumentException empty = assertThrows(IllegalArgumentException.class,
        () -> e.extend(base, PieceCounts.empty(base.pipeline())));
    assertTrue(empty.getMessage().contains("empty"), empty.getMessage());
    for (int bad : new int[] {0, -1}) {
      IllegalArgumentException added = assertThrows(IllegalArgumentException.class, () -> extender.apply(bad));
      assertTrue(added.getMessage().contains("addedIds=" + bad), added.getMessage());
      assertThrows(IllegalArgumentException.class, () -> ExtensionSettings.of(bad));
    }
    IllegalArgumentException huge = assertThrows(IllegalArgumentException.class,
        () -> extender.apply(Integer.MAX_VALUE - 2).extend(base, some));
    assertTrue(huge.getMessage().contains("addedIds="), huge.getMessage());
    // through the provider, as the command-line tool builds it
    Extender viaSpi = Learners.extender(scheme, ExtensionSettings.of(10).withThreads(2));
    assertEquals(scheme, viaSpi.scheme());
    assertThrows(IllegalArgumentException.class, () -> viaSpi.extend(other, some));
  }

  // ------------------------------------------------------------------ measurement

  /** Held-out tokens per whitespace-separated word, as the sweep report counts them. */
  public static double tokensPerWord(Tokenizer t, List<String> texts) {
    long tokens = 0;
    long words = 0;
    for (String s : texts) {
      tokens += t.encode(s).size();
      boolean in = false;
      for (int i = 0; i < s.length(); i++) {
        boolean ws = Character.isWhitespace(s.charAt(i));
        if (!ws && !in) {
          words++;
        }
        in = !ws;
      }
    }
    return (double) tokens / words;
  }

  /** One scheme's measurement: held-out tokens per word of each model on each domain, and the models. */
  public record Measured(String scheme, double baseEuroparl, double baseCode, double extendedEuroparl,
      double extendedCode, double scratchEuroparl, double scratchCode, Tokenizer base, Tokenizer extended,
      Tokenizer scratch, String seconds) {
    /** Extended on code over scratch on code. */
    public double codeVsScratch() {
      return extendedCode / scratchCode;
    }

    /** Extended on Europarl over the base on Europarl. */
    public double europarlVsBase() {
      return extendedEuroparl / baseEuroparl;
    }

    /** Markdown rows for docs/adapting.md. */
    public String table() {
      return String.format(Locale.ROOT, "| %s | Europarl | %.3f | %.3f | %.3f | %+.1f %% vs base |%n"
          + "| %s | code | %.3f | %.3f | %.3f | %+.1f %% vs scratch |", scheme, baseEuroparl, extendedEuroparl,
          scratchEuroparl, 100 * (europarlVsBase() - 1), scheme, baseCode, extendedCode, scratchCode,
          100 * (codeVsScratch() - 1));
    }
  }

  /**
   * Learns the base on Europarl ({@link #BASE_IDS}), extends it with code ({@link #ADDED_IDS}),
   * learns a scratch model of the same total size on both, measures all three on both held-out
   * sets, checks {@link #assertExtends}, prints the table rows and returns them.
   */
  public static Measured measure(String scheme, IntFunction<Function<PieceCounts, Tokenizer>> learner,
      Function<Tokenizer, Tokenizer> extend) {
    Corpora c = corpora();
    long t0 = System.nanoTime();
    Tokenizer base = learner.apply(BASE_IDS).apply(c.europarl());
    long t1 = System.nanoTime();
    Tokenizer extended = extend.apply(base);
    long t2 = System.nanoTime();
    assertExtends(base, extended, ADDED_IDS);
    Tokenizer scratch = learner.apply(extended.vocabularySize()).apply(c.both());
    long t3 = System.nanoTime();
    String seconds = String.format(Locale.ROOT, "base %.1f s, extension %.1f s, scratch %.1f s", (t1 - t0) / 1e9,
        (t2 - t1) / 1e9, (t3 - t2) / 1e9);
    Measured m = new Measured(scheme, tokensPerWord(base, c.europarlHeld()), tokensPerWord(base, c.codeHeld()),
        tokensPerWord(extended, c.europarlHeld()), tokensPerWord(extended, c.codeHeld()),
        tokensPerWord(scratch, c.europarlHeld()), tokensPerWord(scratch, c.codeHeld()), base, extended, scratch,
        seconds);
    System.out.println("extension measurement (" + CodeCorpus.files() + " source files, " + c.codeTrain().size()
        + " code lines, " + c.europarlTrain().size() + " Europarl bodies; ids " + base.vocabularySize() + " + "
        + (extended.vocabularySize() - base.vocabularySize()) + ", scratch " + scratch.vocabularySize() + "; "
        + seconds + "):\n" + m.table());
    return m;
  }

  static byte[] utf8(String s) {
    return s.getBytes(StandardCharsets.UTF_8);
  }
}
