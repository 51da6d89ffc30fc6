package dev.morsel.tokenize.bpe;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import dev.morsel.tokenize.spi.Segmenter;
import java.util.Objects;
import java.util.SplittableRandom;

/**
 * What a byte-level BPE tokenizer offers beyond {@link Tokenizer}: its merges in rank order, its
 * piece cache, and BPE-dropout [1] for subword regularization. Works on any tokenizer of scheme
 * {@value #SCHEME}, learned or loaded, without casts; {@link #dropout} goes through the tokenizer's
 * reserved-token scan, normalization, splitting and framing like an encode call, with offsets into
 * the original text. Stateless and thread-safe.
 *
 * <p>References: [1] Provilkov, Emelianenko, Voita (2020), "BPE-Dropout: Simple and Effective
 * Subword Regularization", ACL 2020.
 *
 * @since 0.1.0
 */
public final class Bpe {
  /** The kind of BPE tokenizers: {@value}. */
  public static final String SCHEME = BpeSegmenter.SCHEME;
  /**
   * Default piece cache size, in entries (one entry = one distinct piece of up to 256 UTF-16 units and
   * its tokens; 65,536 entries cover the frequent pieces of a typical language with a few MiB).
   */
  public static final int DEFAULT_CACHE_ENTRIES = BpeSegmenter.DEFAULT_CACHE_ENTRIES;
  /** Largest allowed cache, in entries. */
  public static final int MAX_CACHE_ENTRIES = BpeSegmenter.MAX_CACHE_ENTRIES;

  private Bpe() {}

  /** BPE-dropout on untrusted {@code text}; see {@link #dropout(Tokenizer, CharSequence, double, long, Trust)}. */
  public static Tokens dropout(Tokenizer tokenizer, CharSequence text, double p, long seed) {
    return dropout(tokenizer, text, p, seed, Trust.UNTRUSTED);
  }

  /**
   * Encodes {@code text} with BPE-dropout [1]: at every merge step of a piece, each candidate merge
   * (each adjacent pair occurrence that has a rank) is skipped independently with probability
   * {@code p}; the lowest-ranked remaining candidate, leftmost among equals, is applied; when every
   * candidate of a step is skipped, the piece's segmentation ends there. {@code p = 0} is the
   * tokenizer's own encoding, {@code p = 1} single bytes. The pieces draw in turn from one generator
   * seeded with {@code seed}: equal arguments give equal results.
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME} (naming its
   *     kind), or {@code p} is not in {@code [0, 1]}
   */
  public static Tokens dropout(Tokenizer tokenizer, CharSequence text, double p, long seed, Trust trust) {
    BpeSegmenter s = segmenter(tokenizer, "dropout");
    if (!(p >= 0.0 && p <= 1.0)) {
      throw new IllegalArgumentException("p=" + p + " is not a probability in [0, 1]");
    }
    SplittableRandom random = new SplittableRandom(seed);
    return Tokenizers.encodeWith(tokenizer, text, trust, (seg, t, start, end, sink, ws) -> s.segmentDropout(t, start, end, sink, p, random, ws));
  }

  /**
   * {@code tokenizer} with a piece cache of {@code entries} entries (rounded up to a power of two), or
   * none for 0; the same model (same fingerprint), and results are identical with the cache on or
   * off, cold or warm. Each tokenizer has its own cache.
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}, or
   *     {@code entries} is outside {@code [0, MAX_CACHE_ENTRIES]}
   */
  public static Tokenizer withCacheEntries(Tokenizer tokenizer, int entries) {
    BpeSegmenter s = segmenter(tokenizer, "withCacheEntries").withCacheEntries(entries);
    return Tokenizers.of(tokenizer.pipeline(), s, tokenizer.reservedTokens(), tokenizer.template())
        .withLimits(tokenizer.limits());
  }

  /**
   * The piece cache size of {@code tokenizer}, in entries (0 = off).
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}
   */
  public static int cacheEntries(Tokenizer tokenizer) {
    return segmenter(tokenizer, "cacheEntries").cacheEntries();
  }

  /**
   * Number of merges of {@code tokenizer}; merge {@code r} made token {@code reserved + 256 + r}.
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}
   */
  public static int mergeCount(Tokenizer tokenizer) {
    return segmenter(tokenizer, "mergeCount").mergeCount();
  }

  /**
   * The two ids merge {@code rank} joins, left then right.
   *
   * @throws IllegalArgumentException if {@code tokenizer} is not of scheme {@value #SCHEME}
   * @throws IndexOutOfBoundsException if {@code rank} is not below {@link #mergeCount}
   */
  public static int[] merge(Tokenizer tokenizer, int rank) {
    BpeSegmenter s = segmenter(tokenizer, "merge");
    return new int[] {s.mergeLeft(rank), s.mergeRight(rank)};
  }

  private static BpeSegmenter segmenter(Tokenizer tokenizer, String what) {
    Objects.requireNonNull(tokenizer, "tokenizer");
    Segmenter s = Tokenizers.segmenterOf(tokenizer);
    if (!(s instanceof BpeSegmenter)) {
      throw new IllegalArgumentException("Bpe." + what + " needs a tokenizer of scheme '" + SCHEME + "'; this one is of scheme '"
          + tokenizer.scheme() + "'");
    }
    return (BpeSegmenter) s;
  }
}
