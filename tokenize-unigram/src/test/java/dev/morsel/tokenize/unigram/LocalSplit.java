package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.train.PieceCounts;
import java.util.HashMap;
import java.util.Map;
import java.util.function.IntBinaryOperator;

/**
 * The tests' own tiny splitting rule, so that they never depend on the api's splitter: a new piece
 * starts at every space that follows a non-space (a space attaches to the following word).
 */
final class LocalSplit {
  private LocalSplit() {}

  /** Calls {@code piece.applyAsInt(start, end)} for each piece of {@code text}. */
  static void forEach(String text, IntBinaryOperator piece) {
    int start = 0;
    for (int i = 1; i < text.length(); i++) {
      if (text.charAt(i) == ' ' && text.charAt(i - 1) != ' ') {
        piece.applyAsInt(start, i);
        start = i;
      }
    }
    if (start < text.length()) {
      piece.applyAsInt(start, text.length());
    }
  }

  /** Piece counts of {@code texts}. */
  static PieceCounts count(Iterable<String> texts) {
    Map<String, Long> counts = new HashMap<>();
    for (String t : texts) {
      forEach(t, (s, e) -> {
        counts.merge(t.substring(s, e), 1L, Long::sum);
        return 0;
      });
    }
    return PieceCounts.of(counts);
  }
}
