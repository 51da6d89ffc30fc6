package dev.morsel.tokenize.unigram.internal;

import dev.morsel.tokenize.spi.TokenSink;

/**
 * A per-thread, direct-mapped cache from a short piece's chars to its Viterbi tokens. A slot holds
 * the exact key, so a hit returns exactly what Viterbi returned for the same chars; a collision
 * just overwrites the slot. There are no chains, so crafted input can at worst make every lookup a
 * miss (no hash flooding). Memory: {@value #SLOTS} slots × ({@value #MAX_CHARS} chars +
 * {@value #SLOT_TOKENS} × 8 bytes + 2) ≈ 1.2 MB per thread and model.
 */
final class SegmentationCache {
  /** Longest piece cached, in chars (reason: covers nearly all words of prose; longer ones are rare). */
  static final int MAX_CHARS = 24;
  /** Most tokens of a piece of at most MAX_CHARS chars: every char as 3 byte tokens (byte spelling, BMP). */
  static final int MAX_TOKENS = 3 * MAX_CHARS;
  /** Most tokens a slot holds (reason: words of prose need few; pieces with more are simply not cached). */
  static final int SLOT_TOKENS = 12;
  /** Slots, a power of two (reason: several thousand distinct words cover most running text). */
  static final int SLOTS = 8192;

  private final char[] keys = new char[SLOTS * MAX_CHARS];
  private final byte[] keyLength = new byte[SLOTS];
  private final byte[] tokenCount = new byte[SLOTS];
  private final int[] ids = new int[SLOTS * SLOT_TOKENS];
  /** Token spans relative to the piece start: start in the low 16 bits, end in the high 16. */
  private final int[] spans = new int[SLOTS * SLOT_TOKENS];

  /** The slot of {@code text[start, end)}; {@code end - start <= MAX_CHARS}. */
  int slot(CharSequence text, int start, int end) {
    int h = end - start;
    for (int i = start; i < end; i++) {
      h = 31 * h + text.charAt(i);
    }
    h *= 0x9E3779B9; // Fibonacci hashing spreads the low bits (Knuth, TAOCP vol. 3, section 6.4)
    return h >>> (32 - Integer.numberOfTrailingZeros(SLOTS));
  }

  boolean matches(int slot, CharSequence text, int start, int end) {
    int n = end - start;
    if (keyLength[slot] != n) {
      return false;
    }
    int base = slot * MAX_CHARS;
    for (int i = 0; i < n; i++) {
      if (keys[base + i] != text.charAt(start + i)) {
        return false;
      }
    }
    return true;
  }

  void replay(int slot, int start, TokenSink sink) {
    int base = slot * SLOT_TOKENS;
    int c = tokenCount[slot];
    for (int i = 0; i < c; i++) {
      int sp = spans[base + i];
      sink.token(ids[base + i], start + (sp & 0xFFFF), start + (sp >>> 16));
    }
  }

  void store(int slot, CharSequence text, int start, int end, int[] tokIds, int[] starts, int[] ends, int count) {
    if (count > SLOT_TOKENS) {
      keyLength[slot] = 0; // too many tokens to keep: the slot is emptied, the next lookup misses
      return;
    }
    int n = end - start;
    int base = slot * MAX_CHARS;
    for (int i = 0; i < n; i++) {
      keys[base + i] = text.charAt(start + i);
    }
    keyLength[slot] = (byte) n;
    int tb = slot * SLOT_TOKENS;
    for (int i = 0; i < count; i++) {
      ids[tb + i] = tokIds[i];
      spans[tb + i] = (starts[i] - start) | (ends[i] - start) << 16;
    }
    tokenCount[slot] = (byte) count;
  }
}
