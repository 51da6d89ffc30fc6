package dev.morsel.tokenize;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.SectionWriter;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import dev.morsel.tokenize.testkit.Sections;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;

/** The lineage record of an extended model: made, checked, stored in section BASE, kept. */
class LineageTest {
  private static final String AGENT = "\u27e8agent\u27e9";

  private static Tokenizer base() {
    ReservedTokens reserved = ReservedTokens.builder().add(AGENT, 256).build();
    return Tokenizers.of(Pipeline.defaults(), new ByteSegmenter(1), reserved, Template.of(List.of(AGENT), List.of(),
        List.of()));
  }

  @Test
  void anExtensionRecordsItsBaseAndKeepsItThroughTheFile() {
    Tokenizer base = base();
    assertEquals(Optional.empty(), base.lineage());
    Tokenizer ext = Tokenizers.extension(base, new ByteSegmenter(9));
    assertEquals(Lineage.of(base.fingerprint(), 257), ext.lineage().orElseThrow());
    assertTrue(ext.lineage().orElseThrow().isBase(base));
    assertFalse(ext.lineage().orElseThrow().isBase(ext));
    assertEquals(base.reservedTokens(), ext.reservedTokens());
    assertEquals(base.template(), ext.template());
    assertNotEquals(base.fingerprint(), ext.fingerprint());
    Map<String, byte[]> payloads = Sections.payloads(ext.toBytes());
    assertTrue(payloads.containsKey(ModelFile.TAG_BASE));
    assertFalse(Sections.payloads(base.toBytes()).containsKey(ModelFile.TAG_BASE), "no record without a base");
    Tokenizer loaded = Tokenizers.load(ext.toBytes());
    assertEquals(ext.lineage(), loaded.lineage());
    assertEquals(ext.fingerprint(), loaded.fingerprint());
    assertEquals(ext.lineage(), ext.withTemplate(Template.none()).lineage());
    assertEquals(ext.lineage(), ext.withLimits(Limits.defaults()).lineage());
    assertEquals(ext.lineage(), Tokenizers.withSegmenter(ext, new ByteSegmenter(9)).lineage());
    // the record is part of the canonical content: the same vocabulary without it is another model
    Tokenizer same = Tokenizers.of(Pipeline.defaults(), new ByteSegmenter(9), base.reservedTokens(), base.template());
    assertNotEquals(same.fingerprint(), ext.fingerprint());
  }

  @Test
  void refusesWhatIsNoExtension() {
    Tokenizer base = base();
    IllegalArgumentException smaller = assertThrows(IllegalArgumentException.class,
        () -> Tokenizers.extension(base, new ByteSegmenter(1)));
    assertTrue(smaller.getMessage().contains("257"), smaller.getMessage());
    IllegalArgumentException fp = assertThrows(IllegalArgumentException.class, () -> Lineage.of("ABC", 3));
    assertTrue(fp.getMessage().contains("baseFingerprint"), fp.getMessage());
    assertThrows(IllegalArgumentException.class, () -> Lineage.of(base.fingerprint(), 0));
  }

  /** A forged record: a base larger than the model, or a malformed fingerprint, is refused naming BASE. */
  @Test
  void loadingRefusesAForgedRecord() {
    Tokenizer ext = Tokenizers.extension(base(), new ByteSegmenter(9));
    Map<String, byte[]> payloads = new TreeMap<>(Sections.payloads(ext.toBytes()));
    for (Object[] forged : new Object[][] {{ext.fingerprint(), 10_000}, {"not hex", 257}}) {
      SectionWriter w = new dev.morsel.tokenize.format.ModelWriter().section(ModelFile.TAG_BASE);
      w.putString((String) forged[0]).putInt((Integer) forged[1]);
      payloads.put(ModelFile.TAG_BASE, w.toByteArray());
      ModelFormatException e = assertThrows(ModelFormatException.class,
          () -> Tokenizers.load(ModelFile.write(payloads)));
      assertEquals(ModelFile.TAG_BASE, e.section(), e.getMessage());
    }
  }
}
