package dev.morsel.tokenize;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The reserved-token automaton against oracles written here from the rules alone: a pairwise check
 * of containment and overlap (quadratic, the rules as stated in the class Javadoc) and a matcher that
 * tries every spelling at every position. Large lists check correctness, not time; time is the
 * benchmark figure {@code load_reserved_64k_ms}.
 */
class ReservedTokensAutomatonTest {

  /** The rules, pair by pair, in registration order: the message {@code build()} must give, or null. */
  static String oracleConflict(List<String> all) {
    for (String a : all) {
      for (String b : all) {
        if (a.equals(b)) {
          continue;
        }
        if (a.contains(b)) {
          return "reserved token '" + a + "' contains reserved token '" + b + "': matching would be ambiguous";
        }
        for (int k = 1; k < Math.min(a.length(), b.length()); k++) {
          if (a.regionMatches(a.length() - k, b, 0, k)) {
            return "reserved tokens '" + a + "' and '" + b + "' overlap (the end of the first is the start of the"
                + " second): matching would be ambiguous";
          }
        }
      }
    }
    return null;
  }

  /** Leftmost match by trying every spelling at every start: {start, id, end} or null. */
  static int[] oracleFind(List<String> all, String text, int from, int to) {
    for (int i = from; i < to; i++) {
      for (int s = 0; s < all.size(); s++) {
        String sp = all.get(s);
        if (i + sp.length() <= to && text.startsWith(sp, i)) {
          return new int[] {i, s, i + sp.length()};
        }
      }
    }
    return null;
  }

  private static String randomSpelling(SplittableRandom r, String alphabet, int maxLen) {
    int len = 1 + r.nextInt(maxLen);
    StringBuilder sb = new StringBuilder(len);
    for (int i = 0; i < len; i++) {
      sb.append(alphabet.charAt(r.nextInt(alphabet.length())));
    }
    return sb.toString();
  }

  @ParameterizedTest
  @ValueSource(longs = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16})
  void conflictsAndMessagesAgreeWithThePairwiseRules(long seed) {
    SplittableRandom r = new SplittableRandom(seed);
    for (int round = 0; round < 300; round++) {
      // a small alphabet makes conflicts common; sizes from 1 to 12 spellings of up to 6 chars
      LinkedHashSet<String> set = new LinkedHashSet<>();
      int n = 1 + r.nextInt(12);
      String alphabet = r.nextBoolean() ? "ab" : "abc⟨⟩";
      while (set.size() < n) {
        set.add(randomSpelling(r, alphabet, 6));
      }
      List<String> all = new ArrayList<>(set);
      ReservedTokens.Builder b = ReservedTokens.builder();
      for (int i = 0; i < all.size(); i++) {
        b.add(all.get(i), i);
      }
      String expected = oracleConflict(all);
      if (expected != null) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, b::build, all::toString);
        assertEquals(expected, e.getMessage(), all.toString());
        continue;
      }
      ReservedTokens t = b.build();
      int[] out = new int[2];
      for (int q = 0; q < 20; q++) {
        String text = randomSpelling(r, alphabet + "x", 30);
        int from = r.nextInt(text.length() + 1);
        int to = from + r.nextInt(text.length() - from + 1);
        int[] want = oracleFind(all, text, from, to);
        int got = t.find(text, from, to, out);
        if (want == null) {
          assertEquals(-1, got, all + " in " + text);
        } else {
          assertEquals(want[0], got, all + " in " + text);
          assertEquals(want[1], out[0], all + " in " + text);
          assertEquals(want[2], out[1], all + " in " + text);
        }
      }
    }
  }

  /** 65,536 spellings: ⟨ then four letters of a 16-letter alphabet then ⟩, in a shuffled order. */
  static List<String> bracketed(int count, long seed) {
    String letters = "abcdefghijklmnop";
    List<String> out = new ArrayList<>(count);
    for (int i = 0; i < count; i++) {
      StringBuilder sb = new StringBuilder("⟨");
      for (int d = 0, x = i; d < 4; d++, x >>>= 4) {
        sb.append(letters.charAt(x & 15));
      }
      out.add(sb.append('⟩').toString());
    }
    java.util.Collections.shuffle(out, new java.util.Random(seed));
    return out;
  }

  @Test
  void sixtyFourKiSpellingsBuildAndMatch() {
    List<String> all = bracketed(1 << 16, 7);
    ReservedTokens.Builder b = ReservedTokens.builder();
    for (int i = 0; i < all.size(); i++) {
      b.add(all.get(i), 1000 + i);
    }
    ReservedTokens t = b.build();
    assertEquals(1 << 16, t.size());
    SplittableRandom r = new SplittableRandom(11);
    int[] out = new int[2];
    for (int q = 0; q < 2000; q++) {
      int s = r.nextInt(all.size());
      String text = "Harrowmere ⟨ab " + all.get(s) + " ⟩ Oskevik";
      int at = t.find(text, 0, text.length(), out);
      assertEquals(text.indexOf(all.get(s)), at);
      assertEquals(1000 + s, out[0]);
      assertEquals(at + all.get(s).length(), out[1]);
      assertEquals(all.get(s), t.spelling(1000 + s));
      assertEquals(1000 + s, t.id(all.get(s)));
    }
    assertEquals(-1, t.find("⟨abcd ⟨ab⟩ ⟨abcde⟩", 0, 17, out));
    assertNull(t.spelling(999));
  }

  @Test
  void oneConflictAmongSixtyFourKiIsNamed() {
    List<String> all = bracketed(1 << 16, 13);
    // a spelling that ends with the start of exactly one other: "x" + all of it but its closing bracket
    String victim = all.get(40_000);
    String forged = "x" + victim.substring(0, 5);
    ReservedTokens.Builder b = ReservedTokens.builder();
    for (int i = 0; i < all.size(); i++) {
      b.add(all.get(i), i);
    }
    b.add(forged, all.size());
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class, b::build);
    assertEquals("reserved tokens '" + forged + "' and '" + victim + "' overlap (the end of the first is the start of"
        + " the second): matching would be ambiguous", e.getMessage());

    ReservedTokens.Builder c = ReservedTokens.builder();
    c.add("[" + all.get(123) + "]", 0);
    for (int i = 0; i < all.size(); i++) {
      c.add(all.get(i), i + 1);
    }
    e = assertThrows(IllegalArgumentException.class, c::build);
    assertEquals("reserved token '[" + all.get(123) + "]' contains reserved token '" + all.get(123)
        + "': matching would be ambiguous", e.getMessage());
  }

  @Test
  void selfOverlapIsAllowedAndMatchesLeftmost() {
    // "aba" overlaps only itself, which the rules allow; matching stays leftmost and non-overlapping
    ReservedTokens t = ReservedTokens.builder().add("aba", 5).add("c", 6).build();
    int[] out = new int[2];
    assertEquals(1, t.find("xababa", 0, 6, out));
    assertEquals(5, out[0]);
    assertEquals(4, out[1]);
    assertEquals(3, t.find("xababa", 2, 6, out));
    assertTrue(t.find("xab", 0, 3, out) < 0);
  }

  @Test
  void nullSpellingIsNamed() {
    NullPointerException e = assertThrows(NullPointerException.class, () -> ReservedTokens.builder().add(null, 1));
    assertEquals("reserved token spelling is null", e.getMessage());
  }
}
