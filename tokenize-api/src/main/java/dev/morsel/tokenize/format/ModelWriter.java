package dev.morsel.tokenize.format;

import java.util.Map;
import java.util.Objects;
import java.util.TreeMap;
import java.util.regex.Pattern;

/**
 * Collects the sections of a model file before it is written by {@link ModelFile}. Not thread-safe.
 *
 * @since 0.1.0
 */
public final class ModelWriter {
  private static final Pattern TAG = Pattern.compile("[A-Z0-9]{4}");

  private final Map<String, SectionWriter> sections = new TreeMap<>();

  /** A new, empty writer. */
  public ModelWriter() {}

  /**
   * Starts section {@code tag}: four characters from {@code A-Z0-9}.
   *
   * @throws IllegalArgumentException if the tag is malformed or already used
   */
  public SectionWriter section(String tag) {
    Objects.requireNonNull(tag, "tag");
    if (!TAG.matcher(tag).matches()) {
      throw new IllegalArgumentException("section tag '" + tag + "' is not four characters from A-Z0-9");
    }
    if (sections.containsKey(tag)) {
      throw new IllegalArgumentException("section " + tag + " written twice");
    }
    SectionWriter w = new SectionWriter();
    sections.put(tag, w);
    return w;
  }

  /** The model file bytes for the sections written so far; same as {@code ModelFile.write(payloads())}. */
  public byte[] toModelFile() {
    return ModelFile.write(payloads());
  }

  /** Section payloads by tag, in tag order. */
  public Map<String, byte[]> payloads() {
    Map<String, byte[]> out = new TreeMap<>();
    sections.forEach((k, v) -> out.put(k, v.toByteArray()));
    return out;
  }
}
