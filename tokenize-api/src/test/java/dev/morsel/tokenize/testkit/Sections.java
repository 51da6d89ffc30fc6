package dev.morsel.tokenize.testkit;

import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.ModelWriter;
import java.nio.ByteBuffer;
import java.util.Map;
import java.util.TreeMap;

/**
 * Model sections for segmenter tests, through the real container: the payloads are written as a
 * model file and read back, so a segmenter's reader sees exactly what it would see when loading.
 */
public final class Sections {
  private Sections() {}

  /** The sections holding these payloads (tags must be four characters from A-Z0-9). */
  public static ModelSections of(Map<String, byte[]> payloads) {
    return ModelFile.read(ModelFile.write(payloads));
  }

  /** The sections a writer collected. */
  public static ModelSections of(ModelWriter writer) {
    return of(writer.payloads());
  }

  /** Every section's payload of a model file, by tag: forge one and write them back with {@code ModelFile.write}. */
  public static Map<String, byte[]> payloads(byte[] model) {
    ModelSections s = ModelFile.read(model);
    Map<String, byte[]> out = new TreeMap<>();
    for (String tag : s.tags()) {
      ByteBuffer p = s.payload(tag);
      byte[] b = new byte[p.remaining()];
      p.get(b);
      out.put(tag, b);
    }
    return out;
  }
}
