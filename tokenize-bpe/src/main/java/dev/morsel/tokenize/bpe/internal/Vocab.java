package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.format.ReviewText;
import it.unimi.dsi.fastutil.longs.Long2IntOpenHashMap;
import it.unimi.dsi.fastutil.objects.Object2IntOpenHashMap;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.List;

/**
 * The immutable vocabulary of a byte-level BPE model.
 *
 * <p>Layout: reserved tokens {@code 0..k-1}; byte tokens {@code k..k+255} (byte value {@code b} is id
 * {@code k+b}); merge of rank {@code r} is id {@code k+256+r}. A merge's operands are byte-level
 * tokens (never reserved ids) with ids below its own. Token byte strings are unique, so the display
 * spelling (the review text's field escaping, {@link ReviewText#escape(byte[])}) is unique per id.
 */
public final class Vocab {
  /** Longest token, in bytes: longer tokens buy almost no compression, and the bound keeps a forged model from claiming unbounded memory. */
  public static final int MAX_TOKEN_BYTES = 4096;
  /** Most bytes held by all tokens together (256 MiB), against forged models. */
  static final long MAX_TOTAL_BYTES = 1L << 28;

  /** Builds error exceptions: (entry index, message) → exception to throw. */
  @FunctionalInterface
  public interface Failure {
    /** The exception for a problem with merge entry {@code index}. */
    RuntimeException at(int index, String message);
  }

  final int k;
  final String[] reserved;
  final int[] left;
  final int[] right;
  final byte[] bytes;
  final int[] offsets; // id -> start in bytes; offsets[size] = total
  final Long2IntOpenHashMap ranks; // pair(left,right) -> rank, -1 if absent
  /**
   * Ranks of the 65,536 byte-byte pairs (256 KiB): the first lookups of every piece are between byte
   * tokens, and a dense table answers them without hashing.
   */
  final int[] bytePairRanks;
  /**
   * Every merge as an open-addressing table of longs {@code (left << 16 | right) << 32 | rank}, so a
   * probe reads one slot of one cache line (the general map reads a key array and a value array);
   * -1 marks an empty slot (no key is -1, as ids stay below 0xFFFF); load factor at most 1/2, linear
   * probing, Fibonacci hashing. Null when the vocabulary has
   * more than 65,535 ids (ids no longer fit 16 bits); then the general map answers.
   */
  final long[] pairTable;
  final int pairShift;
  final String[] display;
  final Object2IntOpenHashMap<String> displayIds;
  /**
   * {@code (left id << 8 | first byte of the right operand)} → lowest rank of a merge with that left
   * operand and a right operand starting with that byte ({@link #NO_RANK} if none): whether a symbol
   * can still join the unknown text that follows it (see {@link Encoder}'s windowed path).
   */
  final Long2IntOpenHashMap leftByByte;

  /** The value of {@link #firstRankJoiningRight} when no merge qualifies. */
  static final int NO_RANK = Integer.MAX_VALUE;

  private Vocab(String[] reserved, int[] left, int[] right, byte[] bytes, int[] offsets, Long2IntOpenHashMap ranks,
      String[] display, Object2IntOpenHashMap<String> displayIds) {
    this.k = reserved.length;
    this.reserved = reserved;
    this.left = left;
    this.right = right;
    this.bytes = bytes;
    this.offsets = offsets;
    this.ranks = ranks;
    this.display = display;
    this.displayIds = displayIds;
    int merges = left.length;
    int size = k + 256 + merges;
    if (size <= 65_535) {
      // load at most 1/2: 32k merges take 2^16 slots of 8 bytes (512 KiB, half of this machine's
      // 1 MiB L2) instead of 2^17 int pairs (1 MiB) at load 1/4
      int bits = Math.max(2, 32 - Integer.numberOfLeadingZeros(Math.max(1, 2 * merges - 1)));
      int cap = 1 << bits;
      long[] table = new long[cap];
      java.util.Arrays.fill(table, -1L);
      for (int r = 0; r < merges; r++) {
        int key = (left[r] << 16) | right[r];
        int i = (key * 0x9E3779B9) >>> (32 - bits);
        while (table[i] != -1L) {
          i = (i + 1) & (cap - 1);
        }
        table[i] = ((long) key << 32) | r;
      }
      this.pairTable = table;
      this.pairShift = 32 - bits;
    } else {
      this.pairTable = null;
      this.pairShift = 0;
    }
    this.leftByByte = new Long2IntOpenHashMap(Math.max(16, merges));
    leftByByte.defaultReturnValue(NO_RANK);
    for (int r = 0; r < merges; r++) {
      leftByByte.putIfAbsent(((long) left[r] << 8) | (bytes[offsets[right[r]]] & 0xFF), r); // first is lowest
    }
    this.bytePairRanks = new int[1 << 16];
    java.util.Arrays.fill(bytePairRanks, -1);
    for (int r = 0; r < left.length; r++) {
      int a = left[r] - k;
      int b = right[r] - k;
      if (a >= 0 && a < 256 && b >= 0 && b < 256) {
        bytePairRanks[(a << 8) | b] = r;
      }
    }
  }

  /** The pair key: left id in the high 32 bits, right id in the low 32 bits. */
  public static long pair(int left, int right) {
    return ((long) left << 32) | (right & 0xFFFFFFFFL);
  }

  /**
   * Validates and builds. Reserved spellings are assumed valid (checked by {@code ReservedTokens}); merges are
   * checked here: operands are existing byte-level ids below the merge's own id, no pair twice, no
   * token's bytes twice, no display equal to a reserved spelling, lengths within the limits.
   */
  public static Vocab build(List<String> reservedList, int[] left, int[] right, Failure fail) {
    String[] reserved = reservedList.toArray(new String[0]);
    int k = reserved.length;
    int m = left.length;
    int size = k + 256 + m;
    int[] offsets = new int[size + 1];
    long total = 0;
    byte[][] ctl = new byte[k][];
    for (int i = 0; i < k; i++) {
      ctl[i] = reserved[i].getBytes(StandardCharsets.UTF_8);
      total += ctl[i].length;
    }
    total += 256;
    int[] len = new int[size];
    Long2IntOpenHashMap ranks = new Long2IntOpenHashMap(Math.max(16, m));
    ranks.defaultReturnValue(-1);
    for (int i = 0; i < k; i++) {
      len[i] = ctl[i].length;
    }
    for (int b = 0; b < 256; b++) {
      len[k + b] = 1;
    }
    for (int r = 0; r < m; r++) {
      int id = k + 256 + r;
      int a = left[r];
      int b = right[r];
      if (a < k || a >= id || b < k || b >= id) {
        throw fail.at(r, "merge " + r + " (" + a + ", " + b + ") refers to an id outside the byte-level tokens ["
            + k + ", " + id + ") that precede it");
      }
      if (ranks.putIfAbsent(pair(a, b), r) != -1) {
        throw fail.at(r, "merge " + r + " repeats the pair (" + a + ", " + b + ") of merge " + ranks.get(pair(a, b)));
      }
      long l = (long) len[a] + len[b];
      if (l > MAX_TOKEN_BYTES) {
        throw fail.at(r, "merge " + r + " makes a token of " + l + " bytes; the limit is MAX_TOKEN_BYTES="
            + MAX_TOKEN_BYTES);
      }
      len[id] = (int) l;
      total += l;
      if (total > MAX_TOTAL_BYTES) {
        throw fail.at(r, "merge " + r + " brings token bytes over " + MAX_TOTAL_BYTES);
      }
    }
    byte[] bytes = new byte[(int) total];
    int at = 0;
    for (int i = 0; i < k; i++) {
      offsets[i] = at;
      System.arraycopy(ctl[i], 0, bytes, at, ctl[i].length);
      at += ctl[i].length;
    }
    for (int b = 0; b < 256; b++) {
      offsets[k + b] = at;
      bytes[at++] = (byte) b;
    }
    for (int r = 0; r < m; r++) {
      int id = k + 256 + r;
      offsets[id] = at;
      int a = left[r];
      int b = right[r];
      System.arraycopy(bytes, offsets[a], bytes, at, len[a]);
      at += len[a];
      System.arraycopy(bytes, offsets[b], bytes, at, len[b]);
      at += len[b];
    }
    offsets[size] = at;
    String[] display = new String[size];
    Object2IntOpenHashMap<String> ids = new Object2IntOpenHashMap<>(size);
    ids.defaultReturnValue(-1);
    for (int i = 0; i < k; i++) {
      display[i] = reserved[i];
      ids.put(reserved[i], i);
    }
    for (int id = k; id < size; id++) {
      display[id] = ReviewText.escape(Arrays.copyOfRange(bytes, offsets[id], offsets[id] + len[id]));
      int prev = ids.putIfAbsent(display[id], id);
      if (prev != -1) {
        int r = id - k - 256;
        throw fail.at(Math.max(r, 0), (prev < k ? "token " + id + " is spelled like reserved token " + prev
            : "merge " + r + " makes token '" + display[id] + "', already token " + prev) + ": token bytes must be unique");
      }
    }
    return new Vocab(reserved, left.clone(), right.clone(), bytes, offsets, ranks, display, ids);
  }

  /** Number of reserved tokens. */
  public int reservedCount() {
    return k;
  }

  /** Reserved spellings in id order. */
  public List<String> reserved() {
    return List.of(reserved);
  }

  /** Number of merges. */
  public int mergeCount() {
    return left.length;
  }

  /** Vocabulary size. */
  public int size() {
    return display.length;
  }

  /** Left operand of merge {@code rank}. */
  public int left(int rank) {
    return left[rank];
  }

  /** Right operand of merge {@code rank}. */
  public int right(int rank) {
    return right[rank];
  }

  /** Rank of the pair, or -1. */
  public int rank(int a, int b) {
    int x = a - k;
    int y = b - k;
    if ((x | y) >= 0 && x < 256 && y < 256) {
      return bytePairRanks[(x << 8) | y];
    }
    final long[] t = pairTable;
    if (t == null) {
      return ranks.get(pair(a, b));
    }
    int key = (a << 16) | b;
    int mask = t.length - 1;
    int i = (key * 0x9E3779B9) >>> pairShift;
    while (true) {
      long e = t[i];
      if ((int) (e >>> 32) == key) {
        return (int) e;
      }
      if (e == -1L) {
        return -1;
      }
      i = (i + 1) & mask;
    }
  }

  /**
   * The lowest rank of a merge whose left operand is {@code id} and whose right operand's bytes start
   * with {@code nextByte} (0..255), or {@link #NO_RANK}.
   */
  int firstRankJoiningRight(int id, int nextByte) {
    return leftByByte.get(((long) id << 8) | nextByte);
  }

  public String display(int id) {
    return display[id];
  }

  /** Id of a display spelling, or -1. */
  public int id(String spelling) {
    return displayIds.getInt(spelling);
  }

  /** A copy of token {@code id}'s bytes (a reserved token's spelling as UTF-8). */
  public byte[] tokenBytes(int id) {
    return Arrays.copyOfRange(bytes, offsets[id], offsets[id + 1]);
  }

  /** Backing byte store (read only). */
  public byte[] byteStore() {
    return bytes;
  }

  /** Start of token {@code id} in {@link #byteStore()}. */
  public int offset(int id) {
    return offsets[id];
  }

  /** Length in bytes of token {@code id}. */
  public int length(int id) {
    return offsets[id + 1] - offsets[id];
  }
}
