package dev.morsel.tokenize.format;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.Collections;
import java.util.LinkedHashSet;
import java.util.Map;
import java.util.Set;

/** {@link ModelSections} over the read-only payload views of a validated container. Immutable. */
final class ValidatedSections implements ModelSections {
  private final Map<String, ByteBuffer> payloads; // sorted, unmodifiable, read-only buffers
  private final Set<String> tags;
  private volatile String fingerprint; // computed on first use; racy but idempotent

  ValidatedSections(Map<String, ByteBuffer> payloads) {
    this.payloads = payloads;
    this.tags = Collections.unmodifiableSet(new LinkedHashSet<>(payloads.keySet()));
  }

  @Override
  public Set<String> tags() {
    return tags;
  }

  @Override
  public boolean has(String tag) {
    return payloads.containsKey(tag);
  }

  @Override
  public SectionReader reader(String tag) {
    return new SectionReader(tag, payload(tag));
  }

  @Override
  public ByteBuffer payload(String tag) {
    ByteBuffer p = payloads.get(tag);
    if (p == null) {
      throw new ModelFormatException(String.valueOf(tag), "section is missing; the file has " + tags);
    }
    return p.duplicate().order(ByteOrder.LITTLE_ENDIAN);
  }

  @Override
  public String fingerprint() {
    String f = fingerprint;
    if (f == null) {
      f = Digests.fingerprint(payloads);
      fingerprint = f;
    }
    return f;
  }

  @Override
  public String toString() {
    return "ModelSections" + tags;
  }
}
