package dev.morsel.tokenize.unigram.internal;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.internal.DoubleArray;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.Map;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The trie's two layouts (double array and hashed) against an independent oracle: a hash map of every
 * key, asked for every prefix of every probe string. A walk must stop exactly where no key has the
 * prefix, and report a key's value exactly where a key ends (the definition of a prefix trie, Knuth,
 * TAOCP vol. 3, section 6.3).
 */
class PieceTrieTest {
  /** Key alphabets: ASCII letters; Latin with marks; wide (Han, surrogates, private use); char extremes. */
  private static final String[] ALPHABETS = {
      "abcdefghijklmnopqrstuvwxyz ",
      "aeiou\u00e9\u00e8\u00f6\u0301\u0308tn ",
      "\u4e00\u4e8c\u4e09\ud83d\ude00\ud83d\udea2\ue000\uffef\u00ff",
      "\u0000\u0001\u007f\u0080\uffff\ufffe",
  };

  static Stream<Arguments> cases() {
    Stream.Builder<Arguments> b = Stream.builder();
    for (int a = 0; a < ALPHABETS.length; a++) {
      for (int keys : new int[] {1, 7, 300, 5_000}) {
        for (long seed = 1; seed <= 3; seed++) {
          b.add(Arguments.of(a, keys, seed));
        }
      }
    }
    return b.build();
  }

  @ParameterizedTest(name = "alphabet {0}, {1} keys, seed {2}")
  @MethodSource("cases")
  void bothLayoutsAnswerEveryPrefixAsTheMap(int alphabet, int count, long seed) {
    SplittableRandom random = new SplittableRandom(seed * 7919 + alphabet);
    String letters = ALPHABETS[alphabet];
    Set<String> keySet = new LinkedHashSet<>();
    while (keySet.size() < count) {
      keySet.add(word(random, letters, 1 + random.nextInt(12)));
    }
    String[] keys = keySet.toArray(new String[0]);
    int[] values = new int[keys.length];
    Map<String, Integer> oracle = new HashMap<>();
    Set<String> prefixes = new java.util.HashSet<>();
    for (int i = 0; i < keys.length; i++) {
      values[i] = random.nextInt(1 << 20);
      oracle.put(keys[i], values[i]);
      for (int l = 1; l <= keys[i].length(); l++) {
        prefixes.add(keys[i].substring(0, l));
      }
    }
    PieceTrie packed = new PieceTrie(keys, values);
    PieceTrie hashed = new PieceTrie(keys, values, true);
    assertFalse(packed.hashed(), "these key sets fit the double array");
    assertTrue(hashed.hashed());
    assertEquals(prefixes.size() + 1, packed.nodes(), "one node per distinct prefix and the root");
    assertEquals(packed.nodes(), hashed.nodes());
    assertTrue(packed.slots() <= DoubleArray.SPARSE_LIMIT * packed.nodes() + letters.length() + 64 + letters.length() + 1,
        "slots " + packed.slots() + " for " + packed.nodes() + " nodes");
    for (int probe = 0; probe < 2_000; probe++) {
      String s = probe < keys.length ? keys[probe] + word(random, letters, random.nextInt(3))
          : word(random, letters, 1 + random.nextInt(14));
      for (PieceTrie trie : new PieceTrie[] {packed, hashed}) {
        int node = PieceTrie.root();
        for (int j = 0; j < s.length(); j++) {
          node = trie.child(node, s.charAt(j));
          String prefix = s.substring(0, j + 1);
          if (!prefixes.contains(prefix)) {
            assertEquals(-1, node, "walk past '" + prefix + "' (hashed=" + trie.hashed() + ")");
            break;
          }
          assertTrue(node >= 0, "walk stopped before '" + prefix + "'");
          assertEquals(oracle.getOrDefault(prefix, -1).intValue(), trie.value(node),
              "value at '" + prefix + "' (hashed=" + trie.hashed() + ")");
        }
      }
    }
  }

  /**
   * Children far apart in the char numbering at many nodes (each two-letter key pairs a frequent and a
   * rare char): the double array stays within its bound, or the trie takes the hashed layout; the
   * answers are the map's either way.
   */
  @ParameterizedTest(name = "seed {0}")
  @MethodSource("seeds")
  void sparseChildrenStayBoundedAndExact(long seed) {
    SplittableRandom random = new SplittableRandom(seed);
    Set<String> keySet = new LinkedHashSet<>();
    for (int i = 0; i < 3_000; i++) {
      char first = (char) (0x4e00 + i);
      keySet.add("" + first + 'a');
      keySet.add("" + first + (char) (0xac00 + random.nextInt(11_000)));
    }
    String[] keys = keySet.toArray(new String[0]);
    int[] values = new int[keys.length];
    for (int i = 0; i < values.length; i++) {
      values[i] = i;
    }
    PieceTrie trie = new PieceTrie(keys, values);
    if (!trie.hashed()) {
      assertTrue(trie.slots() <= (long) DoubleArray.SPARSE_LIMIT * trie.nodes() + 2 * 11_100 + 65,
          "slots " + trie.slots() + " for " + trie.nodes() + " nodes");
    }
    for (int i = 0; i < keys.length; i++) {
      int node = trie.child(trie.child(PieceTrie.root(), keys[i].charAt(0)), keys[i].charAt(1));
      assertEquals(i, trie.value(node), keys[i]);
    }
    assertEquals(-1, trie.child(trie.child(PieceTrie.root(), '\u4e00'), 'b'));
  }

  static Stream<Long> seeds() {
    return Stream.of(1L, 2L, 3L);
  }

  private static String word(SplittableRandom random, String letters, int length) {
    StringBuilder b = new StringBuilder(length);
    for (int i = 0; i < length; i++) {
      b.append(letters.charAt(random.nextInt(letters.length())));
    }
    return b.toString();
  }
}
