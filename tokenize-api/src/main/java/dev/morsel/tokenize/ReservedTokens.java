package dev.morsel.tokenize;

import it.unimi.dsi.fastutil.ints.Int2ObjectOpenHashMap;
import it.unimi.dsi.fastutil.ints.IntOpenHashSet;
import it.unimi.dsi.fastutil.longs.Long2IntOpenHashMap;
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
 * rejects such sets. Matching is then leftmost, and takes O(n) for text length n.
 *
 * <p>Note: the spellings are kept in an Aho–Corasick automaton [1]: a trie of the spellings with,
 * for each node, the link to the longest proper suffix that is also a trie node, and the nearest
 * spelling on that chain. Because no spelling contains another, the first spelling the automaton
 * completes is the leftmost one, so {@link #find} reads each character once. The same automaton
 * checks the containment and overlap rules in time linear in the total length of the spellings
 * (a 65,536-spelling list builds in milliseconds; benchmark figure {@code load_reserved_64k_ms}):
 * a spelling contains another exactly when a spelling lies on the suffix chain of one of its
 * prefixes, and it overlaps another exactly when a proper suffix of it is a trie node with a
 * spelling below it.
 * <ol>
 *   <li>A. V. Aho, M. J. Corasick, "Efficient string matching: an aid to bibliographic search",
 *       Communications of the ACM 18(6), 1975.
 * </ol>
 *
 * @since 0.1.0
 */
public final class ReservedTokens {
  /** Longest allowed spelling, in UTF-16 units (bounds the matcher's work per position). */
  public static final int MAX_SPELLING_LENGTH = 256;

  private static final ReservedTokens NONE = new ReservedTokens(new LinkedHashMap<>(), Automaton.EMPTY);

  private final Map<String, Integer> byspelling; // insertion order
  private final Object2IntOpenHashMap<String> ids;
  private final Int2ObjectOpenHashMap<String> spellings;
  private final Automaton automaton;
  private final int[] idOfSpelling; // spelling index (insertion order) -> id

  private ReservedTokens(Map<String, Integer> map, Automaton automaton) {
    this.byspelling = Collections.unmodifiableMap(new LinkedHashMap<>(map));
    this.automaton = automaton;
    this.idOfSpelling = new int[map.size()];
    this.ids = new Object2IntOpenHashMap<>(map.size());
    this.spellings = new Int2ObjectOpenHashMap<>(map.size());
    ids.defaultReturnValue(-1);
    int i = 0;
    for (Map.Entry<String, Integer> e : map.entrySet()) {
      ids.put(e.getKey(), e.getValue().intValue());
      spellings.put(e.getValue().intValue(), e.getKey());
      idOfSpelling[i++] = e.getValue();
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
    final Automaton a = automaton;
    final long[] first = a.firstChar;
    int state = Automaton.ROOT;
    for (int i = from; i < to; i++) {
      char c = text.charAt(i);
      if (state == Automaton.ROOT && (first[c >>> 6] & (1L << c)) == 0) {
        continue;
      }
      state = a.step(state, c);
      int t = a.dict[state];
      if (t >= 0) {
        out[0] = idOfSpelling[a.term[t]];
        out[1] = i + 1;
        return i + 1 - a.depth[t];
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

  /**
   * The Aho–Corasick automaton over the spellings (see the class note). Nodes are ints, the root is
   * 0; transitions live in one primitive map keyed by {@code node << 16 | char}.
   */
  private static final class Automaton {
    static final int ROOT = 0;
    static final Automaton EMPTY = new Automaton(List.of());

    final Long2IntOpenHashMap next;
    final int[] fail;
    final int[] depth;
    final int[] term; // spelling index ending at the node, or -1
    final int[] dict; // nearest node on the suffix chain (the node included) where a spelling ends, or -1
    final int[] parent;
    final int[] below1; // smallest spelling index ending strictly below the node, or MAX_VALUE
    final int[] below2; // second smallest, or MAX_VALUE
    final long[] firstChar = new long[1024];
    final int[][] paths; // per spelling, its trie node after each character
    final int nodes;

    Automaton(List<String> spellings) {
      long total = 1;
      for (String s : spellings) {
        total += s.length();
      }
      int cap = (int) total; // at most 65,536 x 256 + 1 for any list the builder accepts through a model file
      next = new Long2IntOpenHashMap(Math.max(16, cap));
      next.defaultReturnValue(-1);
      fail = new int[cap];
      depth = new int[cap];
      term = new int[cap];
      dict = new int[cap];
      parent = new int[cap];
      below1 = new int[cap];
      below2 = new int[cap];
      int[] firstChild = new int[cap];
      int[] sibling = new int[cap];
      char[] label = new char[cap];
      java.util.Arrays.fill(term, -1);
      java.util.Arrays.fill(firstChild, -1);
      paths = new int[spellings.size()][];
      int count = 1;
      for (int si = 0; si < spellings.size(); si++) {
        String s = spellings.get(si);
        int[] path = new int[s.length()];
        int node = ROOT;
        firstChar[s.charAt(0) >>> 6] |= 1L << s.charAt(0);
        for (int i = 0; i < s.length(); i++) {
          char c = s.charAt(i);
          long key = key(node, c);
          int child = next.get(key);
          if (child < 0) {
            child = count++;
            next.put(key, child);
            parent[child] = node;
            depth[child] = depth[node] + 1;
            label[child] = c;
            sibling[child] = firstChild[node];
            firstChild[node] = child;
          }
          node = child;
          path[i] = node;
        }
        term[node] = si;
        paths[si] = path;
      }
      nodes = count;
      // breadth-first: suffix links and dictionary links
      int[] order = new int[count];
      int head = 0;
      int tail = 0;
      order[tail++] = ROOT;
      fail[ROOT] = ROOT;
      dict[ROOT] = -1;
      while (head < tail) {
        int u = order[head++];
        for (int v = firstChild[u]; v >= 0; v = sibling[v]) {
          order[tail++] = v;
          int f = ROOT;
          if (u != ROOT) {
            char c = label[v];
            f = fail[u];
            int g = next.get(key(f, c));
            while (g < 0 && f != ROOT) {
              f = fail[f];
              g = next.get(key(f, c));
            }
            f = g < 0 ? ROOT : g;
          }
          fail[v] = f;
          dict[v] = term[v] >= 0 ? v : dict[f];
        }
      }
      // reverse breadth-first: the two smallest spelling indices strictly below each node
      java.util.Arrays.fill(below1, 0, count, Integer.MAX_VALUE);
      java.util.Arrays.fill(below2, 0, count, Integer.MAX_VALUE);
      for (int k = count - 1; k > 0; k--) {
        int v = order[k];
        int p = parent[v];
        offer(p, term[v]);
        offer(p, below1[v]);
        offer(p, below2[v]);
      }
    }

    private void offer(int node, int index) {
      if (index < 0 || index == Integer.MAX_VALUE) {
        return;
      }
      if (index < below1[node]) {
        below2[node] = below1[node];
        below1[node] = index;
      } else if (index != below1[node] && index < below2[node]) {
        below2[node] = index;
      }
    }

    static long key(int node, char c) {
      return ((long) node << 16) | c;
    }

    /** The state after reading {@code c} in {@code state}. */
    int step(int state, char c) {
      int s = state;
      int g = next.get(key(s, c));
      while (g < 0 && s != ROOT) {
        s = fail[s];
        g = next.get(key(s, c));
      }
      return g < 0 ? ROOT : g;
    }

    /** Whether spelling {@code si} contains another spelling or overlaps another; O(its length). */
    boolean conflicts(int si) {
      int[] path = paths[si];
      int n = path.length;
      for (int i = 0; i < n - 1; i++) {
        if (dict[path[i]] >= 0) {
          return true; // a spelling ends inside this one: containment
        }
      }
      if (dict[fail[path[n - 1]]] >= 0) {
        return true; // a spelling is a proper suffix of this one
      }
      for (int v = fail[path[n - 1]]; v != ROOT; v = fail[v]) {
        if (otherBelow(v, si) != Integer.MAX_VALUE) {
          return true;
        }
      }
      return false;
    }

    /** The smallest spelling index strictly below node {@code v}, other than {@code si}. */
    int otherBelow(int v, int si) {
      return below1[v] != si ? below1[v] : below2[v];
    }

    /**
     * The smallest spelling index that spelling {@code si} contains (result {@code [index, 1]}) or
     * overlaps at its end (result {@code [index, 0]}), containment winning a tie. O(L^2) for a
     * spelling of L units; used only to name the pair in an error.
     */
    int[] firstConflict(int si) {
      int[] path = paths[si];
      int n = path.length;
      int contained = Integer.MAX_VALUE;
      for (int i = 0; i < n; i++) {
        int t = i < n - 1 ? dict[path[i]] : dict[fail[path[i]]];
        while (t >= 0) {
          contained = Math.min(contained, term[t]);
          t = dict[fail[t]];
        }
      }
      int overlapped = Integer.MAX_VALUE;
      for (int v = fail[path[n - 1]]; v != ROOT; v = fail[v]) {
        overlapped = Math.min(overlapped, otherBelow(v, si));
      }
      return contained <= overlapped ? new int[] {contained, 1} : new int[] {overlapped, 0};
    }
  }

  /**
   * Builder; validates each spelling as it is added and the whole set at {@link #build()}.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private final Map<String, Integer> map = new LinkedHashMap<>();
    private final IntOpenHashSet usedIds = new IntOpenHashSet();

    private Builder() {}

    /**
     * Registers {@code spelling} as reserved token {@code id}.
     *
     * @throws NullPointerException if {@code spelling} is null
     * @throws IllegalArgumentException for an empty or over-long spelling, one with a lone surrogate,
     *     a spelling or id registered twice, or a negative id
     */
    public Builder add(String spelling, int id) {
      Objects.requireNonNull(spelling, "reserved token spelling is null");
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
      if (usedIds.contains(id)) {
        throw new IllegalArgumentException("reserved token id " + id + " registered twice ('" + spelling + "')");
      }
      map.put(spelling, id);
      usedIds.add(id);
      return this;
    }

    /**
     * The reserved tokens. Linear in the total length of the spellings.
     *
     * @throws IllegalArgumentException if one spelling contains or overlaps another, naming both (of
     *     all offending pairs, the one whose first spelling was registered first, then whose second was)
     */
    public ReservedTokens build() {
      if (map.isEmpty()) {
        return NONE;
      }
      List<String> all = new ArrayList<>(map.keySet());
      Automaton automaton = new Automaton(all);
      for (int si = 0; si < all.size(); si++) {
        if (automaton.conflicts(si)) {
          int[] other = automaton.firstConflict(si);
          String a = all.get(si);
          String b = all.get(other[0]);
          if (other[1] == 1) {
            throw new IllegalArgumentException("reserved token '" + a + "' contains reserved token '" + b
                + "': matching would be ambiguous");
          }
          throw new IllegalArgumentException("reserved tokens '" + a + "' and '" + b + "' overlap (the end of the"
              + " first is the start of the second): matching would be ambiguous");
        }
      }
      return new ReservedTokens(map, automaton);
    }
  }
}
