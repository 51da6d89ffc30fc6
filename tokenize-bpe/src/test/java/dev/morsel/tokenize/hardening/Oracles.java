package dev.morsel.tokenize.hardening;

import dev.morsel.tokenize.bpe.BpeSegmenter;
import dev.morsel.tokenize.wordpiece.WordPieceSegmenter;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Reference segmenters written in the test from the methods' definitions alone, sharing no code
 * with the implementations; slow on purpose (simple loops), so run on inputs of bounded size.
 */
final class Oracles {
  private Oracles() {}

  /**
   * Textbook BPE on one piece (Sennrich, Haddow, Birch 2016, section 3.2, Algorithm 1, applied as
   * an encoder): start from the UTF-8 bytes; while some adjacent pair has a merge, take the pair
   * with the lowest merge rank and merge all its occurrences, left to right, without overlap.
   * Merging every occurrence of the lowest-ranked pair in one pass equals merging the leftmost one
   * at a time, because a merge only creates pairs of higher rank than its own. Vocabulary layout as
   * documented by {@link BpeSegmenter}: reserved ids, then 256 byte ids, then one id per merge rank.
   */
  static int[] textbookBpe(BpeSegmenter bpe, String normalizedPiece) {
    int k = bpe.reservedTokens().size();
    Map<Long, Integer> rank = new HashMap<>();
    for (int r = 0; r < bpe.mergeCount(); r++) {
      rank.put(((long) bpe.mergeLeft(r) << 32) | bpe.mergeRight(r), r);
    }
    byte[] bytes = normalizedPiece.getBytes(StandardCharsets.UTF_8);
    int[] ids = new int[bytes.length];
    for (int i = 0; i < bytes.length; i++) {
      ids[i] = k + (bytes[i] & 0xFF);
    }
    int n = ids.length;
    while (n > 1) {
      int best = Integer.MAX_VALUE;
      for (int i = 0; i + 1 < n; i++) {
        Integer r = rank.get(((long) ids[i] << 32) | ids[i + 1]);
        if (r != null && r < best) {
          best = r;
        }
      }
      if (best == Integer.MAX_VALUE) {
        break;
      }
      int left = bpe.mergeLeft(best);
      int right = bpe.mergeRight(best);
      int merged = k + 256 + best;
      int w = 0;
      for (int i = 0; i < n; i++) {
        if (i + 1 < n && ids[i] == left && ids[i + 1] == right) {
          ids[w++] = merged;
          i++;
        } else {
          ids[w++] = ids[i];
        }
      }
      n = w;
    }
    return java.util.Arrays.copyOf(ids, n);
  }

  /**
   * Greedy longest-match-first WordPiece on one piece (Wu et al. 2016, section 4.1; Song et al.
   * 2021, section 2): at each position take the longest vocabulary entry of the right form
   * (word-initial at the start, continuation after); if none matches anywhere, or the piece is
   * longer than the limit, the whole piece is the unknown token.
   */
  static int[] greedyWordPiece(WordPieceSegmenter wp, String piece) {
    List<String> tokens = wp.tokens();
    String marker = wp.settings().marker();
    int reserved = wp.reservedCount();
    Map<String, Integer> initial = new HashMap<>();
    Map<String, Integer> continuation = new HashMap<>();
    int longest = 0;
    for (int id = reserved + 1; id < tokens.size(); id++) {
      String s = tokens.get(id);
      if (s.length() > marker.length() && s.startsWith(marker)) {
        continuation.put(s.substring(marker.length()), id);
        longest = Math.max(longest, s.length() - marker.length());
      } else {
        initial.put(s, id);
        longest = Math.max(longest, s.length());
      }
    }
    int unknown = reserved;
    if (piece.length() > wp.pieceLimit()) {
      return new int[] {unknown};
    }
    IntArrayList out = new IntArrayList();
    int pos = 0;
    while (pos < piece.length()) {
      Map<String, Integer> table = pos == 0 ? initial : continuation;
      int end = Math.min(piece.length(), pos + longest);
      Integer found = null;
      for (; end > pos; end--) {
        found = table.get(piece.substring(pos, end));
        if (found != null) {
          break;
        }
      }
      if (found == null) {
        return new int[] {unknown};
      }
      out.add(found.intValue());
      pos = end;
    }
    return out.toIntArray();
  }
}
