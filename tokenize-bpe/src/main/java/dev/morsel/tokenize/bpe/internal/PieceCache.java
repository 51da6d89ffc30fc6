package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.spi.TokenSink;
import java.util.SplittableRandom;

/**
 * A bounded, thread-safe cache from a piece's characters to its tokens.
 *
 * <p>Two-way set associative: a fixed array of {@code capacity} slots (a power of two, at least 2),
 * paired into sets by the hash; a new entry takes an empty way of its set, else a way chosen by a hash
 * bit (a fixed, not recency-based, replacement). Each slot holds one immutable {@link Entry} (final fields only, so any thread that sees the reference sees its
 * contents). Writers overwrite a slot without locking; a reader either finds the full entry it
 * checks, another piece's entry (a miss, detected by comparing the characters) or null. Races
 * therefore only cost misses, never wrong results. A hit compares characters and emits tokens: no
 * allocation.
 *
 * <p>Admission by frequency: a piece is stored only the second time it misses, as remembered by a
 * doorkeeper bitset of {@code 8 × capacity} bits indexed by other bits of the same hash (a piece
 * seen once, as most long pieces of running text are, costs one bit instead of three allocated
 * objects and the eviction of a useful entry). A race on the bitset only changes which pieces are
 * admitted, never a result.
 *
 * <p>Slots are chosen by a 64-bit hash seeded per cache instance at random, so untrusted text cannot
 * aim many pieces at one slot in advance; and since a set holds two entries (no chains), even a
 * successful collision attack only turns hits into misses, whose cost is bounded by the encoder.
 */
public final class PieceCache {
  /** Longest piece stored, in UTF-16 units: longer pieces are rare and would pin large entries. */
  public static final int MAX_PIECE_CHARS = 256;

  private final Entry[] slots;
  private final int mask;
  private final long seed;
  private final long[] seen; // doorkeeper: one bit per hash bucket, 8 buckets per slot
  private final int seenMask;

  /** A cache of at least {@code entries} slots (rounded up to a power of two; at least 2). */
  public PieceCache(int entries) {
    int cap = entries <= 2 ? 2 : Integer.highestOneBit(entries - 1) << 1;
    this.slots = new Entry[cap];
    this.mask = cap - 1;
    this.seed = new SplittableRandom().nextLong() | 1L;
    this.seen = new long[Math.max(1, cap >>> 3)];
    this.seenMask = seen.length * 64 - 1;
  }

  /** Whether a piece with this hash missed before (and, if not, remembers that it missed now). */
  boolean admit(long hash) {
    int bit = (int) (hash >>> 20) & seenMask;
    long[] s = seen;
    long m = 1L << bit;
    long w = s[bit >>> 6];
    if ((w & m) != 0) {
      return true;
    }
    s[bit >>> 6] = w | m;
    return false;
  }

  /** Number of slots. */
  public int capacity() {
    return slots.length;
  }

  long hash(CharSequence text, int start, int end) {
    long h = seed ^ ((long) (end - start) * 0x9E3779B97F4A7C15L);
    for (int i = start; i < end; i++) {
      h = (h ^ text.charAt(i)) * 0xBF58476D1CE4E5B9L;
      h ^= h >>> 31;
    }
    h ^= h >>> 33;
    h *= 0xFF51AFD7ED558CCDL;
    h ^= h >>> 33;
    return h;
  }

  boolean emitIfPresent(long hash, CharSequence text, int start, int end, TokenSink sink) {
    int set = (int) hash & mask & ~1;
    Entry e = slots[set];
    if (e == null || e.hash != hash) {
      e = slots[set | 1];
      if (e == null || e.hash != hash) {
        return false;
      }
    }
    char[] key = e.key;
    if (key.length != end - start) {
      return false;
    }
    for (int i = 0; i < key.length; i++) {
      if (key[i] != text.charAt(start + i)) {
        return false;
      }
    }
    int[] d = e.data;
    for (int j = 0; j < d.length; j += 3) {
      sink.token(d[j], start + d[j + 1], start + d[j + 2]);
    }
    return true;
  }

  void store(long hash, CharSequence text, int start, int end, Encoder.Scratch s, int m) {
    char[] key = new char[end - start];
    for (int i = 0; i < key.length; i++) {
      key[i] = text.charAt(start + i);
    }
    int[] d = new int[3 * m];
    int n = s.byteCount;
    for (int j = 0; j < m; j++) {
      int bs = s.outAt[j];
      int be = j + 1 < m ? s.outAt[j + 1] : n;
      d[3 * j] = s.outId[j];
      d[3 * j + 1] = s.charStartOf(bs);
      d[3 * j + 2] = s.charEndOf(be - 1);
    }
    int set = (int) hash & mask & ~1;
    int way = slots[set] == null ? 0 : slots[set | 1] == null ? 1 : (int) (hash >>> 40) & 1;
    slots[set | way] = new Entry(hash, key, d);
  }

  /** One cached piece: immutable. */
  static final class Entry {
    final long hash;
    final char[] key;
    final int[] data; // (id, relative start, relative end) per token

    Entry(long hash, char[] key, int[] data) {
      this.hash = hash;
      this.key = key;
      this.data = data;
    }
  }
}
