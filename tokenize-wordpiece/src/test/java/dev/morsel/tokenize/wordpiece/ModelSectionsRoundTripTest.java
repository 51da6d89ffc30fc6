package dev.morsel.tokenize.wordpiece;

import dev.morsel.tokenize.wordpiece.internal.WordPieceSegmenter;
import dev.morsel.tokenize.wordpiece.internal.WordPieceSettings;
import dev.morsel.tokenize.testkit.Sections;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.SectionWriter;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.SegmenterProvider;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.ServiceLoader;
import java.util.Set;
import java.util.function.Consumer;
import org.junit.jupiter.api.Test;

/** Save/load through the model sections, and rejection of corrupt sections. */
class ModelSectionsRoundTripTest {
  private static final String M = WordPieceSettings.DEFAULT_MARKER;
  private static final String UNK = WordPieceSettings.DEFAULT_UNKNOWN;

  private static WordPieceSegmenter sample() {
    WordPieceSettings st = WordPieceSettings.defaults().withMaxPieceLength(40);
    return WordPieceSegmenter.of(List.of("boarding-call", UNK, " ferry", " fer", M + "ry", M + "ries", "\n", " ", M + "s"),
        1, st);
  }

  private static Map<String, byte[]> save(WordPieceSegmenter s) {
    ModelWriter w = new ModelWriter();
    s.write(w);
    return w.payloads();
  }

  @Test
  void roundTripKeepsIdsAndSettings() {
    WordPieceSegmenter s = sample();
    Map<String, byte[]> p = save(s);
    assertEquals(Set.of(WordPieceSegmenter.SETTINGS_TAG, WordPieceSegmenter.VOCABULARY_TAG), p.keySet());
    WordPieceSegmenter back = WordPieceSegmenter.read(Sections.of(p));
    assertEquals(s.tokens(), back.tokens());
    assertEquals(s.settings(), back.settings());
    assertEquals(s.reservedCount(), back.reservedCount());
    String text = " ferries ferry fers\n ferryx";
    assertArrayEquals(TestSupport.encode(s, text).ids.toIntArray(), TestSupport.encode(back, text).ids.toIntArray());
  }

  @Test
  void providerIsFoundByKind() {
    SegmenterProvider found = null;
    for (SegmenterProvider p : ServiceLoader.load(SegmenterProvider.class)) {
      if (p.scheme().equals("wordpiece")) {
        found = p;
      }
    }
    assertTrue(found != null, "no provider of scheme wordpiece on the class path");
    Segmenter back = found.read(Sections.of(save(sample())), dev.morsel.tokenize.format.ModelLimits.defaults());
    assertEquals(sample().vocabularySize(), back.vocabularySize());
    assertEquals("wordpiece", back.scheme());
  }

  private static ModelFormatException corrupt(String tag, Consumer<SectionWriter> body) {
    Map<String, byte[]> p = new HashMap<>(save(sample()));
    ModelWriter w = new ModelWriter();
    body.accept(w.section(tag));
    p.put(tag, w.payloads().get(tag));
    return assertThrows(ModelFormatException.class, () -> WordPieceSegmenter.read(Sections.of(p)));
  }

  private static void settings(SectionWriter w, int version, String marker, String unk, int maxLen, int reserved) {
    w.putInt(version).putString(marker).putString(unk).putInt(maxLen).putInt(reserved);
  }

  @Test
  void corruptSettingsAreRejected() {
    String st = WordPieceSegmenter.SETTINGS_TAG;
    assertEquals(st, corrupt(st, w -> settings(w, 9, M, UNK, 40, 1)).section());
    assertEquals(st, corrupt(st, w -> settings(w, 1, "", UNK, 40, 1)).section());
    assertEquals(st, corrupt(st, w -> settings(w, 1, "a b", UNK, 40, 1)).section());
    assertEquals(st, corrupt(st, w -> settings(w, 1, M, UNK, -1, 1)).section());
    assertEquals(st, corrupt(st, w -> settings(w, 1, M, UNK, 40, 9)).section());
    assertEquals(st, corrupt(st, w -> settings(w, 1, M, UNK, 40, -1)).section());
    ModelFormatException trailing = corrupt(st, w -> {
      settings(w, 1, M, UNK, 40, 1);
      w.putByte(0);
    });
    assertTrue(trailing.getMessage().contains("trailing"), trailing.getMessage());
    assertEquals(st, corrupt(st, w -> w.putInt(1).putString(M)).section());
    // unknown spelling that is not at index reservedCount
    ModelFormatException unk = corrupt(st, w -> settings(w, 1, M, "lost-luggage", 40, 1));
    assertEquals(WordPieceSegmenter.VOCABULARY_TAG, unk.section());
    assertTrue(unk.getMessage().contains("entry 1"), unk.getMessage());
  }

  @Test
  void corruptVocabularyIsRejected() {
    String vo = WordPieceSegmenter.VOCABULARY_TAG;
    ModelFormatException dup = corrupt(vo, w -> w.putInt(4).putString("boarding-call").putString(UNK)
        .putString(" pier").putString(" pier"));
    assertEquals(vo, dup.section());
    assertTrue(dup.getMessage().contains("entry 3"), dup.getMessage());
    // forged count far beyond the bytes present: rejected before allocating
    assertEquals(vo, corrupt(vo, w -> w.putInt(1 << 23).putString("x")).section());
    assertEquals(vo, corrupt(vo, w -> w.putInt(3).putString("boarding-call").putString(UNK)).section());
    assertEquals(vo, corrupt(vo, w -> w.putInt(3).putString("boarding-call").putString(UNK).putString("")).section());
    assertEquals(vo, corrupt(vo, w -> w.putInt(2).putString("boarding-call").putBytes(new byte[] {(byte) 0xC3})).section());
    assertEquals(vo, corrupt(vo, w -> w.putInt(-5)).section());
    // missing section
    Map<String, byte[]> p = new HashMap<>(save(sample()));
    p.remove(vo);
    assertEquals(vo, assertThrows(ModelFormatException.class, () -> WordPieceSegmenter.read(Sections.of(p))).section());
  }
}
