package dev.morsel.tokenize;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;

/**
 * The result of encoding: token ids with, for each token, its {@code [start, end)} span in UTF-16
 * units of the caller's <em>original</em> text, a segment index (0 for the first text of a pair, 1
 * for the second) and flags (reserved token, framing marker, padding).
 *
 * <p>Stored as parallel primitive arrays: there is no object per token. Instances are immutable and
 * thread-safe; accessors that return arrays return copies.
 *
 * <p>Offset rules: spans are monotone (both starts and ends never decrease) and lie inside the
 * text; a span never starts or ends inside a surrogate pair; tokens produced from a normalization
 * chunk that changed the text map to the whole chunk, so their spans may coincide but never cross;
 * framing markers and padding have an empty span at their position.
 *
 * @since 0.1.0
 */
public final class Tokens {
  /** Flag: the token is a reserved token (matched in trusted text or framed in). */
  public static final int RESERVED = 1;
  /** Flag: the token was added by framing (begin, end or separator marker). */
  public static final int FRAME = 2;
  /** Flag: the token is padding. */
  public static final int PADDING = 4;

  private static final Tokens EMPTY = new Tokens(new int[0], new int[0], new int[0], new byte[0], new byte[0]);

  private final int[] ids;
  private final int[] starts;
  private final int[] ends;
  private final byte[] segments;
  private final byte[] flags;

  Tokens(int[] ids, int[] starts, int[] ends, byte[] segments, byte[] flags) {
    this.ids = ids;
    this.starts = starts;
    this.ends = ends;
    this.segments = segments;
    this.flags = flags;
  }

  /** The empty result. */
  public static Tokens empty() {
    return EMPTY;
  }

  /**
   * Builds a result from parallel arrays (copied). Validates lengths and that spans are monotone and
   * non-negative; meant for tests, adapters and deserialization, not for the encode path.
   *
   * @throws IllegalArgumentException if the arrays differ in length or the spans break the rules
   */
  public static Tokens of(int[] ids, int[] starts, int[] ends, byte[] segments, byte[] flags) {
    int n = ids.length;
    if (starts.length != n || ends.length != n || segments.length != n || flags.length != n) {
      throw new IllegalArgumentException("parallel arrays differ in length: ids=" + n + ", starts="
          + starts.length + ", ends=" + ends.length + ", segments=" + segments.length + ", flags=" + flags.length);
    }
    for (int i = 0; i < n; i++) {
      if (starts[i] < 0 || ends[i] < starts[i]) {
        throw new IllegalArgumentException("token " + i + " has span [" + starts[i] + ", " + ends[i] + ")");
      }
      if (i > 0 && (starts[i] < starts[i - 1] || ends[i] < ends[i - 1]) && segments[i] == segments[i - 1]) {
        throw new IllegalArgumentException("token " + i + " span [" + starts[i] + ", " + ends[i]
            + ") goes back from [" + starts[i - 1] + ", " + ends[i - 1] + ")");
      }
    }
    return new Tokens(ids.clone(), starts.clone(), ends.clone(), segments.clone(), flags.clone());
  }

  // ------------------------------------------------------------------ API

  /** Number of tokens. */
  public int size() {
    return ids.length;
  }

  /** Whether there are no tokens. */
  public boolean isEmpty() {
    return ids.length == 0;
  }

  /** Id of token {@code i}. */
  public int id(int i) {
    return ids[i];
  }

  /** Start (inclusive, UTF-16 units of the original text) of token {@code i}. */
  public int start(int i) {
    return starts[i];
  }

  /** End (exclusive, UTF-16 units of the original text) of token {@code i}. */
  public int end(int i) {
    return ends[i];
  }

  /** Segment index of token {@code i}: 0 for the first text, 1 for the second text of a pair. */
  public int segment(int i) {
    return segments[i];
  }

  /** Flags of token {@code i}: a combination of {@link #RESERVED}, {@link #FRAME}, {@link #PADDING}. */
  public int flags(int i) {
    return flags[i];
  }

  /** Whether token {@code i} is a reserved token. */
  public boolean isReserved(int i) {
    return (flags[i] & RESERVED) != 0;
  }

  /** Whether token {@code i} is padding. */
  public boolean isPadding(int i) {
    return (flags[i] & PADDING) != 0;
  }

  /** A copy of the ids. */
  public int[] ids() {
    return ids.clone();
  }

  /** Copies the ids into {@code dst} starting at {@code offset}; returns the number copied. */
  public int copyIds(int[] dst, int offset) {
    System.arraycopy(ids, 0, dst, offset, ids.length);
    return ids.length;
  }

  /** A copy of the start offsets (UTF-16 units). */
  public int[] starts() {
    return starts.clone();
  }

  /** A copy of the end offsets (UTF-16 units). */
  public int[] ends() {
    return ends.clone();
  }

  /** A copy of the segment indices. */
  public int[] segments() {
    int[] out = new int[segments.length];
    for (int i = 0; i < out.length; i++) {
      out[i] = segments[i];
    }
    return out;
  }

  /**
   * One int per token: 1 where the token came from the text or its framing, 0 where {@link #pad}
   * added it. A model that must not read padding can multiply by this array.
   */
  public int[] nonPaddingMask() {
    int[] out = new int[flags.length];
    for (int i = 0; i < out.length; i++) {
      out[i] = (flags[i] & PADDING) != 0 ? 0 : 1;
    }
    return out;
  }

  /** 1 for every reserved token (matched or framed), 0 otherwise. */
  public int[] reservedMask() {
    int[] out = new int[flags.length];
    for (int i = 0; i < out.length; i++) {
      out[i] = (flags[i] & RESERVED) != 0 ? 1 : 0;
    }
    return out;
  }

  /** The original characters of token {@code i} (empty for markers and padding). */
  public String text(CharSequence original, int i) {
    return original.subSequence(starts[i], ends[i]).toString();
  }

  // ------------------------------------------------------------------ offset conversion

  /**
   * Converts the spans to code point indices of {@code original} (the text that was encoded; for a
   * pair, the text of the token's segment). Returns {@code {starts, ends}}.
   */
  public int[][] codePointSpans(CharSequence original) {
    return convert(original, false);
  }

  /**
   * Converts the spans to UTF-8 byte offsets of {@code original} (the text that was encoded; for a
   * pair, the text of the token's segment). Returns {@code {starts, ends}}. A lone surrogate counts as
   * the three bytes of U+FFFD, the character normalization puts in its place.
   */
  public int[][] utf8Spans(CharSequence original) {
    return convert(original, true);
  }

  /** As {@link #codePointSpans(CharSequence)} for a pair: each token converts against its segment's text. */
  public int[][] codePointSpans(CharSequence first, CharSequence second) {
    return convertPair(first, second, false);
  }

  /** As {@link #utf8Spans(CharSequence)} for a pair: each token converts against its segment's text. */
  public int[][] utf8Spans(CharSequence first, CharSequence second) {
    return convertPair(first, second, true);
  }

  private int[][] convertPair(CharSequence first, CharSequence second, boolean utf8) {
    int[] cf = prefixUnits(first, utf8);
    int[] cs = prefixUnits(second, utf8);
    int[] s = new int[ids.length];
    int[] e = new int[ids.length];
    for (int i = 0; i < ids.length; i++) {
      int[] table = segments[i] == 0 ? cf : cs;
      s[i] = table[Math.min(starts[i], table.length - 1)];
      e[i] = table[Math.min(ends[i], table.length - 1)];
    }
    return new int[][] {s, e};
  }

  private int[][] convert(CharSequence original, boolean utf8) {
    int[] table = prefixUnits(original, utf8);
    int[] s = new int[ids.length];
    int[] e = new int[ids.length];
    for (int i = 0; i < ids.length; i++) {
      if (ends[i] >= table.length) {
        throw new IllegalArgumentException("token " + i + " ends at " + ends[i]
            + ", past the end of the given text (length " + original.length() + "): was it the text that was encoded?");
      }
      s[i] = table[starts[i]];
      e[i] = table[ends[i]];
    }
    return new int[][] {s, e};
  }

  /** table[k] = number of code points (or UTF-8 bytes) in original[0, k); length + 1 entries. */
  private static int[] prefixUnits(CharSequence text, boolean utf8) {
    int n = text.length();
    int[] table = new int[n + 1];
    int units = 0;
    int i = 0;
    while (i < n) {
      char c = text.charAt(i);
      table[i] = units;
      if (Character.isHighSurrogate(c) && i + 1 < n && Character.isLowSurrogate(text.charAt(i + 1))) {
        table[i + 1] = units; // inside a pair: never a token boundary
        units += utf8 ? 4 : 1;
        i += 2;
      } else {
        units += utf8 ? (c < 0x80 ? 1 : c < 0x800 ? 2 : 3) : 1;
        i++;
      }
    }
    table[n] = units;
    return table;
  }

  // ------------------------------------------------------------------ length management

  /**
   * Shortens the result to at most {@code maxLength} tokens, keeping framing markers. Content tokens
   * are removed per {@code truncation}: for a pair, {@link Truncation.Strategy#LONGER_YIELDS} takes one
   * token at a time from whichever segment currently holds more content tokens (on a tie, from the
   * second segment), {@link Truncation.Strategy#FIRST_YIELDS} and {@link Truncation.Strategy#SECOND_YIELDS}
   * take them all from one segment; tokens go from the end or the start as the truncation says.
   * Returns {@code this} if nothing needs removing.
   *
   * @throws IllegalArgumentException if {@code maxLength} is smaller than the number of framing markers
   */
  public Tokens truncate(int maxLength, Truncation truncation) {
    Objects.requireNonNull(truncation, "truncation");
    if (ids.length <= maxLength) {
      return this;
    }
    int framed = 0;
    int[] perSegment = new int[2];
    for (int i = 0; i < ids.length; i++) {
      if ((flags[i] & (FRAME | PADDING)) != 0) {
        framed++;
      } else {
        perSegment[segments[i] & 1]++;
      }
    }
    if (maxLength < framed) {
      throw new IllegalArgumentException("maxLength=" + maxLength + " is smaller than the " + framed
          + " framing markers this result carries");
    }
    int budget = maxLength - framed;
    int keep0;
    int keep1;
    if (truncation.strategy() == Truncation.Strategy.LONGER_YIELDS) {
      keep0 = perSegment[0];
      keep1 = perSegment[1];
      while (keep0 + keep1 > budget) {
        if (keep1 >= keep0) {
          keep1--;
        } else {
          keep0--;
        }
      }
    } else if (truncation.strategy() == Truncation.Strategy.FIRST_YIELDS) {
      keep1 = perSegment[1];
      keep0 = budget - keep1;
      if (keep0 < 0) {
        throw new IllegalArgumentException("maxLength=" + maxLength + " cannot be met by truncating the first text only");
      }
    } else {
      keep0 = perSegment[0];
      keep1 = budget - keep0;
      if (keep1 < 0) {
        throw new IllegalArgumentException("maxLength=" + maxLength + " cannot be met by truncating the second text only");
      }
    }
    int[] drop = {perSegment[0] - keep0, perSegment[1] - keep1};
    boolean fromEnd = truncation.side() == Side.END;
    int[] seen = new int[2];
    Builder b = new Builder(maxLength);
    for (int i = 0; i < ids.length; i++) {
      if ((flags[i] & (FRAME | PADDING)) == 0) {
        int seg = segments[i] & 1;
        int k = seen[seg]++;
        boolean dropped = fromEnd ? k >= perSegment[seg] - drop[seg] : k < drop[seg];
        if (dropped) {
          continue;
        }
      }
      b.add(ids[i], starts[i], ends[i], segments[i], flags[i]);
    }
    return b.build();
  }

  /**
   * Pads to exactly {@code length} tokens with {@code padId} on the given side; padding has an empty
   * span at the text's edge and is masked out of {@link #nonPaddingMask()}. Returns {@code this} if
   * already long enough (padding never truncates).
   *
   * @throws IllegalArgumentException if {@code padId} is negative (ids are never negative)
   */
  public Tokens pad(int length, int padId, Side side) {
    Objects.requireNonNull(side, "side");
    checkPadId(padId);
    int n = ids.length;
    if (n >= length) {
      return this;
    }
    int extra = length - n;
    int[] ni = new int[length];
    int[] ns = new int[length];
    int[] ne = new int[length];
    byte[] ng = new byte[length];
    byte[] nf = new byte[length];
    int off = side == Side.START ? extra : 0;
    System.arraycopy(ids, 0, ni, off, n);
    System.arraycopy(starts, 0, ns, off, n);
    System.arraycopy(ends, 0, ne, off, n);
    System.arraycopy(segments, 0, ng, off, n);
    System.arraycopy(flags, 0, nf, off, n);
    int edge = side == Side.START ? 0 : (n == 0 ? 0 : ends[n - 1]);
    byte seg = n == 0 ? 0 : (side == Side.START ? segments[0] : segments[n - 1]);
    int from = side == Side.START ? 0 : n;
    for (int k = 0; k < extra; k++) {
      int i = from + k;
      ni[i] = padId;
      ns[i] = edge;
      ne[i] = edge;
      ng[i] = seg;
      nf[i] = PADDING;
    }
    return new Tokens(ni, ns, ne, ng, nf);
  }

  /**
   * Pads a batch to one length: every member is padded (see {@link #pad}) to the size of the batch's
   * longest member, so all results have equal size. The longest member itself comes back unchanged;
   * an empty batch gives an empty list.
   *
   * @throws IllegalArgumentException if {@code padId} is negative
   * @throws NullPointerException if the batch or one of its members is null (the message names the
   *     index)
   */
  public static List<Tokens> padBatch(List<Tokens> batch, int padId, Side side) {
    Objects.requireNonNull(batch, "batch");
    Objects.requireNonNull(side, "side");
    checkPadId(padId);
    int longest = 0;
    for (int i = 0; i < batch.size(); i++) {
      Tokens t = batch.get(i);
      if (t == null) {
        throw new NullPointerException("batch member " + i + " is null");
      }
      longest = Math.max(longest, t.size());
    }
    List<Tokens> out = new ArrayList<>(batch.size());
    for (Tokens t : batch) {
      out.add(t.pad(longest, padId, side));
    }
    return out;
  }

  private static void checkPadId(int padId) {
    if (padId < 0) {
      throw new IllegalArgumentException("padId=" + padId + " is negative; a padding id is a vocabulary id (0 or more)");
    }
  }

  /** The tokens {@code [from, to)} as a new result (offsets unchanged). */
  public Tokens slice(int from, int to) {
    Objects.checkFromToIndex(from, to, ids.length);
    return new Tokens(Arrays.copyOfRange(ids, from, to), Arrays.copyOfRange(starts, from, to),
        Arrays.copyOfRange(ends, from, to), Arrays.copyOfRange(segments, from, to), Arrays.copyOfRange(flags, from, to));
  }

  // ------------------------------------------------------------------ object methods

  @Override
  public boolean equals(Object o) {
    if (this == o) {
      return true;
    }
    if (!(o instanceof Tokens)) {
      return false;
    }
    Tokens t = (Tokens) o;
    return Arrays.equals(ids, t.ids) && Arrays.equals(starts, t.starts) && Arrays.equals(ends, t.ends)
        && Arrays.equals(segments, t.segments) && Arrays.equals(flags, t.flags);
  }

  @Override
  public int hashCode() {
    return 31 * Arrays.hashCode(ids) + Arrays.hashCode(starts) + 7 * Arrays.hashCode(ends);
  }

  @Override
  public String toString() {
    StringBuilder sb = new StringBuilder("Tokens[");
    int shown = Math.min(ids.length, 32);
    for (int i = 0; i < shown; i++) {
      if (i > 0) {
        sb.append(", ");
      }
      sb.append(ids[i]).append('@').append(starts[i]).append('-').append(ends[i]);
      if (flags[i] != 0) {
        sb.append((flags[i] & PADDING) != 0 ? "p" : (flags[i] & FRAME) != 0 ? "f" : "c");
      }
    }
    if (shown < ids.length) {
      sb.append(", … ").append(ids.length - shown).append(" more");
    }
    return sb.append(']').toString();
  }

  // ------------------------------------------------------------------ builder (package use)

  /** Growable parallel arrays used while assembling a result. Not thread-safe. */
  static final class Builder {
    int[] ids;
    int[] starts;
    int[] ends;
    byte[] segments;
    byte[] flags;
    int size;

    Builder(int capacity) {
      int c = Math.max(4, capacity);
      ids = new int[c];
      starts = new int[c];
      ends = new int[c];
      segments = new byte[c];
      flags = new byte[c];
    }

    void add(int id, int start, int end, int segment, int flag) {
      if (size == ids.length) {
        int c = ids.length * 2;
        ids = Arrays.copyOf(ids, c);
        starts = Arrays.copyOf(starts, c);
        ends = Arrays.copyOf(ends, c);
        segments = Arrays.copyOf(segments, c);
        flags = Arrays.copyOf(flags, c);
      }
      ids[size] = id;
      starts[size] = start;
      ends[size] = end;
      segments[size] = (byte) segment;
      flags[size] = (byte) flag;
      size++;
    }

    void clear() {
      size = 0;
    }

    Tokens build() {
      return new Tokens(Arrays.copyOf(ids, size), Arrays.copyOf(starts, size), Arrays.copyOf(ends, size),
          Arrays.copyOf(segments, size), Arrays.copyOf(flags, size));
    }
  }

  static String utf8(byte[] b) {
    return new String(b, StandardCharsets.UTF_8);
  }
}
