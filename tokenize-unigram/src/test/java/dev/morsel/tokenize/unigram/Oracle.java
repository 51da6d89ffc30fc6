package dev.morsel.tokenize.unigram;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * Brute-force enumeration of every segmentation of a short string, written for the tests and sharing
 * no code with the segmenter: recursion over the prefixes that are in the vocabulary, plus the
 * documented unknown edge (one code point, scored {@code min(0, lowest score) - 10}) wherever that code point
 * is not itself a piece.
 */
final class Oracle {
  /** One path: its edges as "start-end:spelling" (unknown edges spelled "?") and its score. */
  record Path(List<String> edges, double score) {}

  private Oracle() {}

  static double unknownScore(Map<String, Double> vocab) {
    double min = 0;
    for (double v : vocab.values()) {
      min = Math.min(min, v);
    }
    return min - 10;
  }

  static List<Path> all(String text, Map<String, Double> vocab) {
    List<Path> out = new ArrayList<>();
    walk(text, 0, vocab, unknownScore(vocab), new ArrayList<>(), 0.0, out);
    return out;
  }

  private static void walk(String text, int at, Map<String, Double> vocab, double unk, List<String> edges,
      double score, List<Path> out) {
    if (at == text.length()) {
      out.add(new Path(List.copyOf(edges), score));
      return;
    }
    for (int end = at + 1; end <= text.length(); end++) {
      String sub = text.substring(at, end);
      Double s = vocab.get(sub);
      if (s != null) {
        edges.add(at + "-" + end + ":" + sub);
        walk(text, end, vocab, unk, edges, score + s, out);
        edges.remove(edges.size() - 1);
      }
    }
    int cp = text.codePointAt(at);
    int end = at + Character.charCount(cp);
    if (!vocab.containsKey(text.substring(at, end))) {
      edges.add(at + "-" + end + ":?");
      walk(text, end, vocab, unk, edges, score + unk, out);
      edges.remove(edges.size() - 1);
    }
  }
}
