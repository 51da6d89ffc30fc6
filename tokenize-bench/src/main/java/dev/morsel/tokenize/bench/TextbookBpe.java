package dev.morsel.tokenize.bench;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.bpe.Bpe;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * The textbook BPE encoder, the baseline for {@code bpe_textbook}: the piece's bytes as a list of
 * ids; repeatedly find the adjacent pair with the lowest merge rank by scanning the whole list, merge
 * its leftmost occurrence, rescan; no cache, boxed map lookups (Sennrich et al. 2016, Algorithm 1,
 * applied to encoding). Quadratic in the piece length; shares no code with Morsel's encoder.
 */
final class TextbookBpe {
  private final Map<Long, Integer> ranks = new HashMap<>();
  private final int firstByte;
  private final int firstMerge;

  TextbookBpe(Tokenizer bpe) {
    int reserved = bpe.reservedTokens().size();
    firstByte = reserved;
    firstMerge = reserved + 256;
    for (int r = 0; r < Bpe.mergeCount(bpe); r++) {
      int[] m = Bpe.merge(bpe, r);
      ranks.put(((long) m[0] << 32) | m[1], r);
    }
  }

  /** Token ids of one piece. */
  List<Integer> encode(String piece) {
    List<Integer> ids = new ArrayList<>();
    for (byte b : piece.getBytes(StandardCharsets.UTF_8)) {
      ids.add(firstByte + (b & 0xFF));
    }
    while (ids.size() > 1) {
      int best = -1;
      int bestRank = Integer.MAX_VALUE;
      for (int i = 0; i + 1 < ids.size(); i++) {
        Integer r = ranks.get(((long) ids.get(i) << 32) | ids.get(i + 1));
        if (r != null && r < bestRank) {
          bestRank = r;
          best = i;
        }
      }
      if (best < 0) {
        break;
      }
      ids.set(best, firstMerge + bestRank);
      ids.remove(best + 1);
    }
    return ids;
  }
}
