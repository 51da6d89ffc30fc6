package dev.morsel.tokenize.testkit;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.zip.GZIPInputStream;

/**
 * Chinese prose as a test corpus: an excerpt of the Simplified Chinese <em>Debian Reference</em>
 * (Debian package {@code debian-reference-zh-cn} 2.100, GPL-2+, copyright 2007-2013 Osamu Aoki and
 * the translators), 4,865 lines; how it was cut and its licence are in the {@code README.md} beside
 * the resource. Technical prose: Han text with Latin command names, paths and numbers between.
 *
 * <p>Loaded once per class loader; the list is unmodifiable. Shared through the test-jar of
 * tokenize-api.
 */
public final class ChineseReference {
  /** The classpath resource that holds the excerpt. */
  public static final String RESOURCE = "dev/morsel/tokenize/testkit/zh/debian-reference-zh-cn.txt.gz";

  /** Lines of the excerpt (counted when it was cut). */
  public static final int LINES = 4_865;

  private ChineseReference() {}

  /**
   * The lines of the excerpt, in file order.
   *
   * @throws IllegalStateException if the resource is missing or its line count is not {@link #LINES}
   */
  public static List<String> lines() {
    return Holder.LINES_READ;
  }

  private static final class Holder {
    static final List<String> LINES_READ = load();
  }

  private static List<String> load() {
    InputStream raw = ChineseReference.class.getClassLoader().getResourceAsStream(RESOURCE);
    if (raw == null) {
      throw new IllegalStateException("classpath resource " + RESOURCE + " not found (test-jar of tokenize-api)");
    }
    List<String> lines = new ArrayList<>(LINES);
    try (BufferedReader in = new BufferedReader(new InputStreamReader(new GZIPInputStream(raw), StandardCharsets.UTF_8))) {
      for (String line = in.readLine(); line != null; line = in.readLine()) {
        lines.add(line);
      }
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read " + RESOURCE, e);
    }
    if (lines.size() != LINES) {
      throw new IllegalStateException(RESOURCE + " has " + lines.size() + " lines, expected " + LINES);
    }
    return Collections.unmodifiableList(lines);
  }
}
