package dev.morsel.tokenize.train.testkit;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.net.JarURLConnection;
import java.net.URL;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Collections;
import java.util.Enumeration;
import java.util.List;
import java.util.jar.JarEntry;
import java.util.jar.JarFile;

/**
 * A source-code corpus from open data: the Java source files of fastutil-core 8.5.18 (Vigna, "fastutil:
 * Fast &amp; compact type-specific collections for Java", Apache License 2.0), read from its
 * {@code -sources} jar, which the build puts on the test class path (a test-scoped dependency pinned in
 * the parent POM). One text per non-blank line, as the corpus files of the command-line tool hold text.
 *
 * <p>Split by file, deterministic: the files in name order, file {@code i} held out when
 * {@code i % 5 == 4}; at most {@link #MAX_LINES} training lines and {@code MAX_LINES / 4} held-out lines
 * are kept, taken from the files in that order (reason: a modest corpus keeps each extension test well
 * under a minute; the library's generated type-specific files repeat one another, so more lines add
 * little).
 */
public final class CodeCorpus {
  /** A file only the sources jar has: it finds the jar on the class path. */
  static final String PROBE = "it/unimi/dsi/fastutil/ints/IntArrayList.java";
  /** Most training lines kept. */
  public static final int MAX_LINES = 25_000;

  private CodeCorpus() {}

  /** Training lines. */
  public static List<String> train() {
    return Holder.TRAIN;
  }

  /** Held-out lines (from files not trained on). */
  public static List<String> heldOut() {
    return Holder.HELD;
  }

  /** Number of source files read. */
  public static int files() {
    return Holder.FILES;
  }

  private static final class Holder {
    static final List<String> TRAIN = new ArrayList<>();
    static final List<String> HELD = new ArrayList<>();
    static int FILES;

    static {
      load();
    }

    private static void load() {
      URL probe = CodeCorpus.class.getClassLoader().getResource(PROBE);
      if (probe == null || !"jar".equals(probe.getProtocol())) {
        throw new IllegalStateException(PROBE + " is not on the test class path: the fastutil-core sources jar"
            + " (test dependency, classifier sources) is missing");
      }
      try {
        JarURLConnection c = (JarURLConnection) probe.openConnection();
        c.setUseCaches(false);
        try (JarFile jar = c.getJarFile()) {
          List<String> names = new ArrayList<>();
          for (Enumeration<JarEntry> e = jar.entries(); e.hasMoreElements(); ) {
            String n = e.nextElement().getName();
            if (n.endsWith(".java")) {
              names.add(n);
            }
          }
          Collections.sort(names);
          for (int i = 0; i < names.size(); i++) {
            List<String> into = i % 5 == 4 ? HELD : TRAIN;
            int cap = i % 5 == 4 ? MAX_LINES / 4 : MAX_LINES;
            if (into.size() >= cap) {
              continue;
            }
            FILES++;
            try (BufferedReader r = new BufferedReader(new InputStreamReader(jar.getInputStream(jar.getEntry(names.get(i))),
                StandardCharsets.UTF_8))) {
              for (String line; (line = r.readLine()) != null && into.size() < cap; ) {
                if (!line.isBlank()) {
                  into.add(line);
                }
              }
            }
          }
        }
      } catch (IOException e) {
        throw new UncheckedIOException("cannot read the fastutil-core sources jar", e);
      }
    }
  }
}
