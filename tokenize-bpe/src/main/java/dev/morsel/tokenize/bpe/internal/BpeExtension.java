package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.train.Extender;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;

/**
 * Extends a byte-level BPE model by continuing to learn merges [1] on new piece counts. Each new
 * piece is first written in the base vocabulary (the base's merges applied, as encoding applies
 * them); merges are then learned on those words exactly as {@link BpeTraining} learns them (same
 * counts, tie-break and eligibility; {@link MergeLearner}) and appended after the base's ranks, so
 * new token {@code base + r} is new merge {@code r}. The base's merges, ranks and ids are unchanged,
 * and because every new merge has a higher rank than every old one and no old merge involves a new
 * token, encoding a piece with the extended model first reaches the base's
 * encoding and then applies new merges: a piece the base encoded as one token still is one.
 *
 * <p>Immutable and thread-safe.
 *
 * <p>[1] Sennrich, Haddow, Birch (2016), "Neural Machine Translation of Rare Words with Subword
 * Units", ACL 2016, section 3.2, Algorithm 1.
 */
public final class BpeExtension implements Extender {
  private final int addedIds;
  private final long minPairCount;
  private final int maxTokenBytes;
  private final long minCount;
  private final int maxPieceBytes;
  private final int threads;
  private final TrainingListener listener;

  /**
   * An extender with every setting checked.
   *
   * @throws IllegalArgumentException naming the setting that is out of range
   */
  public BpeExtension(int addedIds, long minPairCount, int maxTokenBytes, long minCount, int maxPieceBytes, int threads,
      TrainingListener listener) {
    if (addedIds < 1 || addedIds > ModelLimits.DEFAULT_MAX_MERGES) {
      throw new IllegalArgumentException("addedIds=" + addedIds + " is outside [1, " + ModelLimits.DEFAULT_MAX_MERGES
          + "] (the most merges a model file may hold, ModelLimits.maxMerges)");
    }
    if (minPairCount < 1) {
      throw new IllegalArgumentException("minPairCount=" + minPairCount + " must be at least 1");
    }
    if (maxTokenBytes < 2 || maxTokenBytes > BpeSegmenter.MAX_TOKEN_BYTES) {
      throw new IllegalArgumentException("maxTokenBytes=" + maxTokenBytes + " is outside [2, "
          + BpeSegmenter.MAX_TOKEN_BYTES + "]");
    }
    if (minCount < 1) {
      throw new IllegalArgumentException("minCount=" + minCount + " must be at least 1");
    }
    if (maxPieceBytes < 2) {
      throw new IllegalArgumentException("maxPieceBytes=" + maxPieceBytes + " must be at least 2");
    }
    if (threads < 1) {
      throw new IllegalArgumentException("threads=" + threads + " must be at least 1");
    }
    this.addedIds = addedIds;
    this.minPairCount = minPairCount;
    this.maxTokenBytes = maxTokenBytes;
    this.minCount = minCount;
    this.maxPieceBytes = maxPieceBytes;
    this.threads = threads;
    this.listener = Objects.requireNonNull(listener, "listener");
  }

  @Override
  public String scheme() {
    return BpeSegmenter.SCHEME;
  }

  @Override
  public Tokenizer extend(Tokenizer base, PieceCounts counts) {
    Extender.checkInputs(BpeSegmenter.SCHEME, base, counts);
    Segmenter seg = Tokenizers.segmenterOf(base);
    if (!(seg instanceof BpeSegmenter)) {
      throw new IllegalArgumentException("the base's segmenter is not Morsel's BPE segmenter: " + seg);
    }
    BpeSegmenter s = (BpeSegmenter) seg;
    if (s.dropout() > 0) {
      throw new IllegalArgumentException("the base encodes with BPE-dropout p=" + s.dropout()
          + "; extend the model without dropout (the pieces must be written in its own encoding)");
    }
    int oldMerges = s.mergeCount();
    long total = (long) s.vocabularySize() + addedIds;
    if ((long) oldMerges + addedIds > ModelLimits.DEFAULT_MAX_MERGES || total > ModelLimits.DEFAULT_MAX_VOCABULARY) {
      throw new IllegalArgumentException("addedIds=" + addedIds + " would give " + total + " ids and "
          + (oldMerges + (long) addedIds) + " merges, over the model limits (ModelLimits.maxVocabulary "
          + ModelLimits.DEFAULT_MAX_VOCABULARY + ", maxMerges " + ModelLimits.DEFAULT_MAX_MERGES + ")");
    }
    int k = s.reservedSpellings().size();
    PieceCounts kept = minCount > 1 ? counts.withMinCount(minCount) : counts;
    if (kept.isEmpty()) {
      throw new IllegalArgumentException("no piece has a count >= minCount=" + minCount);
    }
    // each piece in the base's own encoding; one-token pieces hold no pair and are left out
    List<int[]> words = new ArrayList<>(kept.size());
    IntArrayList ids = new IntArrayList();
    long[] weights = new long[kept.size()];
    long pairTotal = 0;
    for (int i = 0; i < kept.size(); i++) {
      String piece = kept.piece(i);
      if (piece.length() > maxPieceBytes || Utf8.encode(piece).length > maxPieceBytes) {
        continue;
      }
      ids.clear();
      s.segment(piece, 0, piece.length(), (id, a, b) -> ids.add(id));
      if (ids.size() < 2) {
        continue;
      }
      try {
        pairTotal = Math.addExact(pairTotal, Math.multiplyExact(kept.count(i), (long) ids.size() - 1));
      } catch (ArithmeticException e) {
        throw new IllegalArgumentException("piece counts are too large: the count-weighted number of token pairs"
            + " exceeds Long.MAX_VALUE, so pair counts would overflow; divide the counts by a common factor", e);
      }
      weights[words.size()] = kept.count(i);
      words.add(ids.toIntArray());
    }
    int[] left;
    int[] right;
    if (words.isEmpty()) {
      left = new int[0];
      right = new int[0];
    } else {
      List<byte[]> merged = new ArrayList<>(oldMerges);
      for (int r = 0; r < oldMerges; r++) {
        merged.add(s.tokenBytes(k + 256 + r));
      }
      // the reserved spellings of the whole tokenizer, not only the segmenter's: none may become a merge
      List<String> reserved = base.reservedTokens().spellings();
      MergeLearner learner = MergeLearner.continuing(k, words.toArray(new int[0][]),
          java.util.Arrays.copyOf(weights, words.size()), merged, addedIds, minPairCount, maxTokenBytes, reserved,
          listener);
      int[][] learned = learner.run(threads);
      left = learned[0];
      right = learned[1];
    }
    if (left.length == 0) {
      throw new IllegalArgumentException("the piece counts offer no new merge (every pair count is below minPairCount="
          + minPairCount + ", or every piece is already one token of the base)");
    }
    int[] allLeft = new int[oldMerges + left.length];
    int[] allRight = new int[allLeft.length];
    for (int r = 0; r < oldMerges; r++) {
      allLeft[r] = s.mergeLeft(r);
      allRight[r] = s.mergeRight(r);
    }
    System.arraycopy(left, 0, allLeft, oldMerges, left.length);
    System.arraycopy(right, 0, allRight, oldMerges, right.length);
    Vocab v = Vocab.build(s.reservedSpellings(), allLeft, allRight, (i, msg) -> new IllegalStateException(msg));
    return Tokenizers.extension(base, BpeSegmenter.create(v, s.cacheEntries()));
  }
}
