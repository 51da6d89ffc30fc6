package dev.morsel.tokenize;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.util.VersionInfo;
import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.SectionReader;
import dev.morsel.tokenize.format.SectionWriter;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.testkit.ByteSegmenter;
import java.nio.ByteBuffer;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Loading a model through {@link Tokenizers#load(byte[], ModelLimits)}: every limit names itself and
 * its setter, the pipeline section's Unicode version is part of the fingerprint and a model made with
 * another version is refused unless allowed, and large reserved-token lists load. Forged files are
 * written through {@link ModelFile#write}, so their checksums are right and only the forged field
 * differs.
 */
class ModelLoadingTest {

  private static Tokenizer sample(int extra, List<String> reserved) {
    ReservedTokens.Builder b = ReservedTokens.builder();
    for (int i = 0; i < reserved.size(); i++) {
      b.add(reserved.get(i), 256 + i);
    }
    return Tokenizers.of(Pipeline.defaults(), new ByteSegmenter(extra), b.build(), Template.none());
  }

  /** Every section's payload of a model file, by tag. */
  static Map<String, byte[]> payloads(byte[] model) {
    return dev.morsel.tokenize.testkit.Sections.payloads(model);
  }

  /** A PIPE payload with these three strings (the layout of docs/format.md section 4). */
  static byte[] pipe(String normalization, String splitting, String... rest) {
    ModelWriter w = new ModelWriter();
    SectionWriter s = w.section(ModelFile.TAG_PIPELINE).putString(normalization).putString(splitting);
    for (String r : rest) {
      s.putString(r);
    }
    return w.payloads().get(ModelFile.TAG_PIPELINE);
  }

  private static String[] pipeStrings(byte[] model) {
    SectionReader r = ModelFile.read(model).reader(ModelFile.TAG_PIPELINE);
    String[] out = {r.getString("n"), r.getString("s"), r.getString("u")};
    r.expectEnd();
    return out;
  }

  // ------------------------------------------------------------------ Unicode version

  @Test
  void unicodeVersionIsTheBundledIcus() {
    VersionInfo v = UCharacter.getUnicodeVersion();
    assertEquals(v.getMajor() + "." + v.getMinor() + "." + v.getMilli(), Pipeline.unicodeVersion());
    if (VersionInfo.ICU_VERSION.getMajor() == 78) {
      // from memory: ICU 78 (the pinned icu4j 78.3) implements Unicode 17.0
      assertEquals("17.0.0", Pipeline.unicodeVersion());
    }
  }

  @Test
  void pipelineSectionRecordsTheUnicodeVersion() {
    String[] pipe = pipeStrings(sample(0, List.of()).toBytes());
    assertEquals(Pipeline.defaults().normalization().spec(), pipe[0]);
    assertEquals(Pipeline.defaults().splitting().spec(), pipe[1]);
    assertEquals(Pipeline.unicodeVersion(), pipe[2]);
  }

  @Test
  void otherUnicodeVersionChangesTheFingerprintAndIsRefusedUnlessAllowed() {
    Tokenizer t = sample(2, List.of("⟨agent⟩", "⟨crew⟩"));
    byte[] model = t.toBytes();
    Map<String, byte[]> p = payloads(model);
    String[] pipe = pipeStrings(model);
    p.put(ModelFile.TAG_PIPELINE, pipe(pipe[0], pipe[1], "16.0.0"));
    byte[] forged = ModelFile.write(p);
    String forgedFingerprint = ModelFile.read(forged).fingerprint();
    assertNotEquals(t.fingerprint(), forgedFingerprint, "the Unicode version is part of the fingerprint");
    assertEquals(t.fingerprint(), ModelFile.read(model).fingerprint());

    ModelFormatException e = assertThrows(ModelFormatException.class, () -> Tokenizers.load(forged));
    assertEquals(ModelFile.TAG_PIPELINE, e.section());
    assertTrue(e.getMessage().contains("Unicode 16.0.0"), e.getMessage());
    assertTrue(e.getMessage().contains("Unicode " + Pipeline.unicodeVersion()), e.getMessage());
    assertTrue(e.getMessage().contains("ModelLimits.withUnicodeMismatchAllowed(true)"), e.getMessage());

    Tokenizer allowed = Tokenizers.load(forged, ModelLimits.defaults().withUnicodeMismatchAllowed(true));
    String text = "Is the 07:40 from Oskevik late? ⟨agent⟩";
    assertArrayEquals(t.encode(text, Trust.TRUSTED).ids(), allowed.encode(text, Trust.TRUSTED).ids());
    // the loaded tokenizer encodes with this runtime's data, so its fingerprint is this runtime's, not the file's
    assertEquals(t.fingerprint(), allowed.fingerprint());
    assertNotEquals(forgedFingerprint, allowed.fingerprint());
  }

  @Test
  void pipelineSectionWithoutUnicodeVersionIsRefused() {
    byte[] model = sample(0, List.of()).toBytes();
    Map<String, byte[]> p = payloads(model);
    String[] pipe = pipeStrings(model);
    p.put(ModelFile.TAG_PIPELINE, pipe(pipe[0], pipe[1]));
    ModelFormatException e = assertThrows(ModelFormatException.class, () -> Tokenizers.load(ModelFile.write(p)));
    assertEquals(ModelFile.TAG_PIPELINE, e.section());
    assertTrue(e.getMessage().contains("Unicode version is missing"), e.getMessage());
  }

  // ------------------------------------------------------------------ limits

  @Test
  void reservedTokenLimitNamesItselfAndItsSetter() {
    byte[] model = sample(3, List.of("⟨a⟩", "⟨b⟩", "⟨c⟩")).toBytes();
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> Tokenizers.load(model, ModelLimits.defaults().withMaxReservedTokens(2)));
    assertEquals(ModelFile.TAG_RESERVED, e.section());
    assertTrue(e.getMessage().contains("3 reserved tokens"), e.getMessage());
    assertTrue(e.getMessage().contains("exceeds ModelLimits.maxReservedTokens=2 (raise it with"
        + " ModelLimits.withMaxReservedTokens)"), e.getMessage());
    assertEquals(3, Tokenizers.load(model, ModelLimits.defaults().withMaxReservedTokens(3)).reservedTokens().size());
  }

  @Test
  void tokenBytesLimitNamesItselfAndItsSetter() {
    byte[] model = sample(1, List.of("⟨harbour⟩")).toBytes(); // 7 + 2 x 3 = 13 bytes of UTF-8
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> Tokenizers.load(model, ModelLimits.defaults().withMaxTokenBytes(12)));
    assertTrue(e.getMessage().contains("of 13 bytes"), e.getMessage());
    assertTrue(e.getMessage().contains("ModelLimits.maxTokenBytes=12 (raise it with ModelLimits.withMaxTokenBytes)"),
        e.getMessage());
    Tokenizers.load(model, ModelLimits.defaults().withMaxTokenBytes(13));
  }

  @Test
  void vocabularyLimitReachesTheSegmenter() {
    byte[] model = sample(10, List.of()).toBytes();
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> Tokenizers.load(model, ModelLimits.defaults().withMaxVocabulary(9)));
    assertEquals("TBYT", e.section());
    assertTrue(e.getMessage().contains("vocabulary of 10 entries"), e.getMessage());
    assertTrue(e.getMessage().contains("ModelLimits.maxVocabulary=9 (raise it with ModelLimits.withMaxVocabulary)"),
        e.getMessage());
  }

  @Test
  void pathLoadAppliesTheFileSizeLimit(@TempDir Path dir) throws Exception {
    Tokenizer t = sample(0, List.of());
    Path file = dir.resolve("ferry.morsel");
    t.save(file);
    long size = Files.size(file);
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> Tokenizers.load(file, ModelLimits.defaults().withMaxModelBytes(size - 8)));
    assertTrue(e.getMessage().contains("ModelLimits.maxModelBytes=" + (size - 8) + " (raise it with"
        + " ModelLimits.withMaxModelBytes)"), e.getMessage());
    assertEquals(t.fingerprint(), Tokenizers.load(file, ModelLimits.defaults().withMaxModelBytes(size)).fingerprint());
  }

  @Test
  void limitsAreValidatedAndCompared() {
    assertThrows(IllegalArgumentException.class, () -> ModelLimits.defaults().withMaxVocabulary(0));
    assertThrows(IllegalArgumentException.class, () -> ModelLimits.defaults().withMaxTokenBytes(0));
    assertThrows(IllegalArgumentException.class, () -> ModelLimits.defaults().withMaxMerges(-1));
    assertThrows(IllegalArgumentException.class, () -> ModelLimits.defaults().withMaxReservedTokens(-1));
    assertEquals(ModelLimits.defaults(), ModelLimits.defaults().withMaxVocabulary(ModelLimits.DEFAULT_MAX_VOCABULARY));
    assertNotEquals(ModelLimits.defaults(), ModelLimits.defaults().withUnicodeMismatchAllowed(true));
    assertTrue(ModelLimits.defaults().toString().contains("maxReservedTokens=65536"));
  }

  // ------------------------------------------------------------------ reserved tokens at scale

  @Test
  void sixtyFourKiReservedTokensSaveAndLoad() {
    List<String> spellings = ReservedTokensAutomatonTest.bracketed(1 << 16, 3);
    Tokenizer t = sample(1 << 16, spellings);
    Tokenizer back = Tokenizers.load(t.toBytes());
    assertEquals(t.fingerprint(), back.fingerprint());
    assertEquals(1 << 16, back.reservedTokens().size());
    String text = "berth " + spellings.get(65_535) + spellings.get(0) + " Harrowmere";
    Tokens tokens = back.encode(text, Trust.TRUSTED);
    assertEquals(256 + 65_535, tokens.id(6));
    assertEquals(256, tokens.id(7));
    assertEquals(text.indexOf(spellings.get(0)), tokens.start(7));
    // one over the limit is refused, naming it
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> Tokenizers.load(sample((1 << 16) + 1, ReservedTokensAutomatonTest.bracketed(1 << 16, 3)).toBytes(),
            ModelLimits.defaults().withMaxReservedTokens(65_535)));
    assertTrue(e.getMessage().contains("ModelLimits.maxReservedTokens=65535"), e.getMessage());
  }
}
