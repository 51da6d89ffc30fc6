package dev.morsel.tokenize;

import it.unimi.dsi.fastutil.ints.Int2ObjectOpenHashMap;
import it.unimi.dsi.fastutil.objects.Object2IntOpenHashMap;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * The reserved tokens of a model: spellings chosen by the user, each bound to a vocabulary id.
 * Morsel ships no default spellings. Immutable and thread-safe.
 *
 * <p>Matching happens in the <em>original</em> text, before normalization, and only for text the
 * caller marks {@link Trust#TRUSTED}. To keep matching unambiguous, no spelling may contain another
 * or overlap another (a proper suffix of one equal to a proper prefix of another); the builder
 * rejects such sets. Matching is then leftmost, and takes O(n · L) for text length n and longest
 * spelling L.
 *
 * @since 0.1.0
 */
public final class ReservedTokens {
  /** Longest allowed spelling, in UTF-16 units (bounds the matcher's work per position). */
  public static final int MAX_SPELLING_LENGTH = 256;

  private static final ReservedTokens NONE = new ReservedTokens(new LinkedHashMap<>());

  private final Map<String, Integer> byspelling; // insertion order
  private final Object2IntOpenHashMap<String> ids = new Object2IntOpenHashMap<>();
  private final Int2ObjectOpenHashMap<String> spellings = new Int2ObjectOpenHashMap<>();
  private final Node root = new Node();
  private final boolean[] firstChar = new boolean[65536];

  private ReservedTokens(Map<String, Integer> map) {
    this.byspelling = Collections.unmodifiableMap(new LinkedHashMap<>(map));
    ids.defaultReturnValue(-1);
    for (Map.Entry<String, Integer> e : map.entrySet()) {
      ids.put(e.getKey(), e.getValue().intValue());
      spellings.put(e.getValue().intValue(), e.getKey());
      Node n = root;
      String s = e.getKey();
      firstChar[s.charAt(0)] = true;
      for (int i = 0; i < s.length(); i++) {
        n = n.child(s.charAt(i));
      }
      n.id = e.getValue();
    }
  }

  /** No reserved tokens. */
  public static ReservedTokens none() {
    return NONE;
  }

  /** A builder. */
  public static Builder builder() {
    return new Builder();
  }

  /** Number of reserved tokens. */
  public int size() {
    return byspelling.size();
  }

  /** Whether there are none. */
  public boolean isEmpty() {
    return byspelling.isEmpty();
  }

  /** The id bound to {@code spelling}, or -1. */
  public int id(String spelling) {
    return ids.getInt(spelling);
  }

  /** The spelling bound to {@code id}, or {@code null}. */
  public String spelling(int id) {
    return spellings.get(id);
  }

  /** Whether {@code id} is a reserved token. */
  public boolean isReserved(int id) {
    return spellings.containsKey(id);
  }

  /** Spellings in registration order. */
  public List<String> spellings() {
    return new ArrayList<>(byspelling.keySet());
  }

  /**
   * Finds the first reserved token in {@code text[from, to)}. Returns its start, or -1 if none; on a
   * match {@code out[0]} receives the id and {@code out[1]} the end.
   */
  public int find(CharSequence text, int from, int to, int[] out) {
    if (byspelling.isEmpty()) {
      return -1;
    }
    for (int i = from; i < to; i++) {
      if (!firstChar[text.charAt(i)]) {
        continue;
      }
      Node n = root;
      for (int j = i; j < to && n != null; j++) {
        n = n.get(text.charAt(j));
        if (n != null && n.id >= 0) {
          out[0] = n.id;
          out[1] = j + 1;
          return i;
        }
      }
    }
    return -1;
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof ReservedTokens && byspelling.equals(((ReservedTokens) o).byspelling);
  }

  @Override
  public int hashCode() {
    return byspelling.hashCode();
  }

  @Override
  public String toString() {
    return "ReservedTokens" + byspelling;
  }

  // ------------------------------------------------------------------ internals

  private static final class Node {
    char[] keys = new char[0];
    Node[] next = new Node[0];
    int id = -1;

    Node get(char c) {
      for (int i = 0; i < keys.length; i++) {
        if (keys[i] == c) {
          return next[i];
        }
      }
      return null;
    }

    Node child(char c) {
      Node n = get(c);
      if (n == null) {
        n = new Node();
        keys = java.util.Arrays.copyOf(keys, keys.length + 1);
        next = java.util.Arrays.copyOf(next, next.length + 1);
        keys[keys.length - 1] = c;
        next[next.length - 1] = n;
      }
      return n;
    }
  }

  /**
   * Builder; validates each spelling as it is added and the whole set at {@link #build()}.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private final Map<String, Integer> map = new LinkedHashMap<>();

    private Builder() {}

    /**
     * Registers {@code spelling} as reserved token {@code id}.
     *
     * @throws IllegalArgumentException for an empty or over-long spelling, one with a lone surrogate,
     *     a spelling or id registered twice, or a negative id
     */
    public Builder add(String spelling, int id) {
      Objects.requireNonNull(spelling, "spelling");
      if (spelling.isEmpty()) {
        throw new IllegalArgumentException("reserved token spelling is empty");
      }
      if (spelling.length() > MAX_SPELLING_LENGTH) {
        throw new IllegalArgumentException("reserved token spelling is " + spelling.length()
            + " chars long; the limit is MAX_SPELLING_LENGTH=" + MAX_SPELLING_LENGTH);
      }
      for (int i = 0; i < spelling.length(); i++) {
        char c = spelling.charAt(i);
        if (Character.isSurrogate(c) && !(Character.isHighSurrogate(c) && i + 1 < spelling.length()
            && Character.isLowSurrogate(spelling.charAt(i + 1)))) {
          if (!(Character.isLowSurrogate(c) && i > 0 && Character.isHighSurrogate(spelling.charAt(i - 1)))) {
            throw new IllegalArgumentException("reserved token '" + spelling + "' has a lone surrogate at index " + i);
          }
        }
      }
      if (id < 0) {
        throw new IllegalArgumentException("reserved token '" + spelling + "' has negative id " + id);
      }
      if (map.containsKey(spelling)) {
        throw new IllegalArgumentException("reserved token '" + spelling + "' registered twice");
      }
      if (map.containsValue(id)) {
        throw new IllegalArgumentException("reserved token id " + id + " registered twice ('" + spelling + "')");
      }
      map.put(spelling, id);
      return this;
    }

    /**
     * The reserved tokens.
     *
     * @throws IllegalArgumentException if one spelling contains or overlaps another, naming both
     */
    public ReservedTokens build() {
      List<String> all = new ArrayList<>(map.keySet());
      for (String a : all) {
        for (String b : all) {
          if (a.equals(b)) {
            continue;
          }
          if (a.contains(b)) {
            throw new IllegalArgumentException("reserved token '" + a + "' contains reserved token '" + b
                + "': matching would be ambiguous");
          }
          for (int k = 1; k < Math.min(a.length(), b.length()); k++) {
            if (a.regionMatches(a.length() - k, b, 0, k)) {
              throw new IllegalArgumentException("reserved tokens '" + a + "' and '" + b + "' overlap (the end of the"
                  + " first is the start of the second): matching would be ambiguous");
            }
          }
        }
      }
      return map.isEmpty() ? NONE : new ReservedTokens(map);
    }
  }
}
