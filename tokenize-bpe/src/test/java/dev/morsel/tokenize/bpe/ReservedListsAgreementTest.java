package dev.morsel.tokenize.bpe;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.ReservedTokens;
import dev.morsel.tokenize.Template;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.SectionWriter;
import java.nio.ByteBuffer;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;

/**
 * A BPE model file holds its reserved tokens twice: in the api's section {@code RSRV} and in the
 * segmenter's own {@code BPST}. Forged files whose copies disagree (re-checksummed through
 * {@link ModelFile#write}, so only the list differs) are refused, naming both sections; the merge
 * count obeys {@link ModelLimits#maxMerges()}.
 */
class ReservedListsAgreementTest {
  private static final List<String> RESERVED = List.of("⟨agent⟩", "⟨crew⟩");

  private static BpeSegmenter segmenter() {
    // ids 0..1 reserved, 2..257 bytes, then merges "f"+"e" and "fe"+"r" (merge r makes id 258 + r)
    return BpeSegmenter.of(RESERVED, new int[] {2 + 'f', 258}, new int[] {2 + 'e', 2 + 'r'});
  }

  private static Map<String, byte[]> payloads(byte[] model) {
    return dev.morsel.tokenize.testkit.Sections.payloads(model);
  }

  /** An RSRV payload binding these (id, spelling) pairs, in the layout of docs/format.md section 4. */
  private static byte[] rsrv(Object... idThenSpelling) {
    ModelWriter w = new ModelWriter();
    SectionWriter s = w.section(ModelFile.TAG_RESERVED).putInt(idThenSpelling.length / 2);
    for (int i = 0; i < idThenSpelling.length; i += 2) {
      s.putInt((Integer) idThenSpelling[i]).putString((String) idThenSpelling[i + 1]);
    }
    return w.payloads().get(ModelFile.TAG_RESERVED);
  }

  private static byte[] forged(byte[] rsrv) {
    Map<String, byte[]> p = payloads(Tokenizers.of(Pipeline.defaults(), segmenter()).toBytes());
    p.put(ModelFile.TAG_RESERVED, rsrv);
    return ModelFile.write(p);
  }

  @Test
  void agreeingCopiesLoad() {
    Tokenizer t = Tokenizers.of(Pipeline.defaults(), segmenter());
    Tokenizer back = Tokenizers.load(t.toBytes());
    assertEquals(t.fingerprint(), back.fingerprint());
    String text = "ferry ⟨crew⟩";
    assertArrayEquals(t.encode(text, Trust.TRUSTED).ids(), back.encode(text, Trust.TRUSTED).ids());
    assertEquals(1, back.encode("⟨crew⟩", Trust.TRUSTED).id(0));
  }

  @Test
  void aSpellingBoundToAnotherIdIsRefusedNamingBothSections() {
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> Tokenizers.load(forged(rsrv(0, "⟨crew⟩", 1, "⟨agent⟩"))));
    assertEquals(ModelFile.TAG_RESERVED, e.section());
    assertTrue(e.getMessage().contains("section RSRV"), e.getMessage());
    assertTrue(e.getMessage().contains("[BPMG, BPST]"), e.getMessage());
    assertTrue(e.getMessage().contains("disagree"), e.getMessage());
  }

  @Test
  void anIdSpelledDifferentlyIsRefused() {
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> Tokenizers.load(forged(rsrv(0, "⟨agent⟩", 1, "⟨purser⟩"))));
    assertTrue(e.getMessage().contains("id 1 is '⟨crew⟩'"), e.getMessage());
    assertTrue(e.getMessage().contains("'⟨purser⟩' has id 1 in section RSRV"), e.getMessage());
  }

  @Test
  void aSubsetOrAnOrdinaryIdIsNotADisagreement() {
    // a tokenizer may match fewer reserved tokens than its segmenter holds, or bind a spelling to an ordinary id
    Tokenizer fewer = Tokenizers.of(Pipeline.defaults(), segmenter(),
        ReservedTokens.builder().add("⟨crew⟩", 1).add("⟨ferry⟩", 259).build(), Template.none());
    Tokenizer back = Tokenizers.load(fewer.toBytes());
    assertEquals(fewer.fingerprint(), back.fingerprint());
    assertEquals(259, back.encode("⟨ferry⟩", Trust.TRUSTED).id(0));
  }

  @Test
  void mergeCountObeysTheLimit() {
    byte[] model = Tokenizers.of(Pipeline.defaults(), segmenter()).toBytes();
    ModelFormatException e = assertThrows(ModelFormatException.class,
        () -> Tokenizers.load(model, ModelLimits.defaults().withMaxMerges(1)));
    assertEquals("BPMG", e.section());
    assertTrue(e.getMessage().contains("2 merges"), e.getMessage());
    assertTrue(e.getMessage().contains("ModelLimits.maxMerges=1 (raise it with ModelLimits.withMaxMerges)"),
        e.getMessage());
    ModelFormatException r = assertThrows(ModelFormatException.class,
        () -> Tokenizers.load(model, ModelLimits.defaults().withMaxReservedTokens(1)));
    assertTrue(r.getMessage().contains("ModelLimits.maxReservedTokens=1"), r.getMessage());
  }
}
