package dev.morsel.tokenize.wordpiece.internal;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.stream.LongStream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The automaton's two transition layouts (double array and hashed table) against an independent
 * oracle: greedy longest-match-first written from its definition (Wu et al. 2016, section 4.1: take
 * the longest vocabulary prefix of the rest, continuation tokens after the first; a rest with no
 * matching prefix makes the whole piece unknown), on random vocabularies over small alphabets (many
 * near misses) and wide ones (Han, surrogate pairs, the char extremes).
 */
class LinMaxMatchLayoutTest {
  private static final String[] ALPHABETS = {"ab", "abcde", "aeiou\u00e9\u0301tn",
      "\u4e00\u4e8c\ud83d\ude00\ue000\uffff\u0000x"};

  static LongStream seeds() {
    return LongStream.rangeClosed(1, 24);
  }

  @ParameterizedTest(name = "seed {0}")
  @MethodSource("seeds")
  void bothLayoutsMatchGreedyLongestMatch(long seed) {
    SplittableRandom random = new SplittableRandom(seed);
    String letters = ALPHABETS[(int) (seed % ALPHABETS.length)];
    int size = 2 + random.nextInt(seed % 3 == 0 ? 3_000 : 60);
    Map<String, Integer> initial = new LinkedHashMap<>();
    Map<String, Integer> cont = new HashMap<>();
    for (int i = 0; i < letters.length(); i++) {
      if (random.nextInt(4) > 0) {
        initial.putIfAbsent(letters.substring(i, i + 1), initial.size() + cont.size());
      }
      if (random.nextInt(4) > 0) {
        cont.putIfAbsent(letters.substring(i, i + 1), initial.size() + cont.size());
      }
    }
    for (int tries = 0; initial.size() + cont.size() < size && tries < 20 * size; tries++) { // small alphabets run out
      String w = word(random, letters, 1 + random.nextInt(6));
      Map<String, Integer> into = random.nextBoolean() ? initial : cont;
      into.putIfAbsent(w, initial.size() + cont.size());
    }
    int ids = initial.size() + cont.size();
    String[] bodies = new String[ids];
    boolean[] continuation = new boolean[ids];
    initial.forEach((w, id) -> bodies[id] = w);
    cont.forEach((w, id) -> {
      bodies[id] = w;
      continuation[id] = true;
    });
    LinMaxMatchTrie packed = new LinMaxMatchTrie(bodies, continuation, 64);
    LinMaxMatchTrie hashed = new LinMaxMatchTrie(bodies, continuation, 64, true);
    assertFalse(packed.hashed(), "small vocabularies fit the double array");
    assertTrue(hashed.hashed());
    assertEquals(hashed.nodeCount(), packed.nodeCount());
    int[] outA = new int[64];
    int[] outB = new int[64];
    for (int probe = 0; probe < 3_000; probe++) {
      String piece = word(random, letters, 1 + random.nextInt(16));
      int[] expected = greedy(piece, initial, cont);
      int a = packed.match(piece, 0, piece.length(), outA);
      int b = hashed.match(piece, 0, piece.length(), outB);
      String where = "piece '" + piece + "' (seed " + seed + ")";
      if (expected == null) {
        assertEquals(-1, a, where);
        assertEquals(-1, b, where);
      } else {
        assertArrayEquals(expected, Arrays.copyOf(outA, Math.max(a, 0)), where + " double array");
        assertArrayEquals(expected, Arrays.copyOf(outB, Math.max(b, 0)), where + " hashed");
      }
    }
  }

  /** Greedy longest-match-first by definition, quadratic; null if the piece cannot be covered. */
  private static int[] greedy(String piece, Map<String, Integer> initial, Map<String, Integer> cont) {
    int[] out = new int[piece.length()];
    int n = 0;
    int at = 0;
    while (at < piece.length()) {
      Map<String, Integer> vocab = at == 0 ? initial : cont;
      int end = piece.length();
      while (end > at && !vocab.containsKey(piece.substring(at, end))) {
        end--;
      }
      if (end == at) {
        return null;
      }
      out[n++] = vocab.get(piece.substring(at, end));
      at = end;
    }
    return Arrays.copyOf(out, n);
  }

  private static String word(SplittableRandom random, String letters, int length) {
    StringBuilder b = new StringBuilder(length);
    for (int i = 0; i < length; i++) {
      b.append(letters.charAt(random.nextInt(letters.length())));
    }
    return b.toString();
  }
}
