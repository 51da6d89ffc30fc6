package dev.morsel.tokenize.format;

/**
 * Limits applied when a model file is read, so that a hostile or damaged file is rejected before it
 * costs memory. Immutable and thread-safe; change a limit with the {@code with…} methods.
 *
 * <table>
 *   <caption>limits and defaults</caption>
 *   <tr><th>setting</th><th>default</th><th>why</th></tr>
 *   <tr><td>{@code maxModelBytes}</td><td>{@value ModelFile#MAX_MODEL_BYTES} (2 GiB - 1)</td>
 *       <td>a file is read as one {@link java.nio.ByteBuffer}, whose size is an {@code int}</td></tr>
 *   <tr><td>{@code maxSections}</td><td>{@value ModelFile#MAX_SECTIONS}</td>
 *       <td>a model uses about ten sections; the table of 64 is 1,536 bytes</td></tr>
 * </table>
 *
 * <p>A file over a limit fails with a {@link ModelFormatException} that names the setting.
 *
 * @since 0.1.0
 */
public final class ModelLimits {
  private static final ModelLimits DEFAULTS = new ModelLimits(ModelFile.MAX_MODEL_BYTES, ModelFile.MAX_SECTIONS);

  private final long maxModelBytes;
  private final int maxSections;

  private ModelLimits(long maxModelBytes, int maxSections) {
    this.maxModelBytes = maxModelBytes;
    this.maxSections = maxSections;
  }

  /** The default limits. */
  public static ModelLimits defaults() {
    return DEFAULTS;
  }

  /** Largest accepted file, in bytes. */
  public long maxModelBytes() {
    return maxModelBytes;
  }

  /** Largest accepted section count. */
  public int maxSections() {
    return maxSections;
  }

  /**
   * These limits with {@code maxModelBytes} changed.
   *
   * @param bytes in {@code [32, }{@value ModelFile#MAX_MODEL_BYTES}{@code ]} (32 = the header alone)
   * @throws IllegalArgumentException if {@code bytes} is outside that range
   */
  public ModelLimits withMaxModelBytes(long bytes) {
    if (bytes < ModelFileLayout.HEADER_LENGTH || bytes > ModelFile.MAX_MODEL_BYTES) {
      throw new IllegalArgumentException("maxModelBytes=" + bytes + " is outside [" + ModelFileLayout.HEADER_LENGTH
          + ", " + ModelFile.MAX_MODEL_BYTES + "]");
    }
    return new ModelLimits(bytes, maxSections);
  }

  /**
   * These limits with {@code maxSections} changed.
   *
   * @param count in {@code [0, }{@value ModelFile#MAX_SECTIONS}{@code ]}
   * @throws IllegalArgumentException if {@code count} is outside that range
   */
  public ModelLimits withMaxSections(int count) {
    if (count < 0 || count > ModelFile.MAX_SECTIONS) {
      throw new IllegalArgumentException("maxSections=" + count + " is outside [0, " + ModelFile.MAX_SECTIONS + "]");
    }
    return new ModelLimits(maxModelBytes, count);
  }

  @Override
  public String toString() {
    return "ModelLimits[maxModelBytes=" + maxModelBytes + ", maxSections=" + maxSections + "]";
  }
}
