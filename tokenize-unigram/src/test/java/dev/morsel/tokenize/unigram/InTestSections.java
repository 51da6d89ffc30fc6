package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.SectionReader;
import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;

/** A tiny {@link ModelSections} over {@link ModelWriter#payloads()}, so tests need no model file. */
final class InTestSections implements ModelSections {
  private final TreeMap<String, byte[]> payloads;

  InTestSections(Map<String, byte[]> payloads) {
    this.payloads = new TreeMap<>(payloads);
  }

  static InTestSections of(ModelWriter w) {
    return new InTestSections(w.payloads());
  }

  @Override
  public Set<String> tags() {
    return payloads.keySet();
  }

  @Override
  public boolean has(String tag) {
    return payloads.containsKey(tag);
  }

  @Override
  public SectionReader reader(String tag) {
    byte[] b = payloads.get(tag);
    if (b == null) {
      throw new ModelFormatException(tag, "section is missing");
    }
    return new SectionReader(tag, ByteBuffer.wrap(b));
  }

  @Override
  public String fingerprint() {
    try {
      MessageDigest d = MessageDigest.getInstance("SHA-256");
      payloads.forEach((k, v) -> {
        d.update(k.getBytes(StandardCharsets.US_ASCII));
        d.update(v);
      });
      return HexFormat.of().formatHex(d.digest());
    } catch (NoSuchAlgorithmException e) {
      throw new IllegalStateException(e);
    }
  }
}
