package dev.morsel.tokenize.internal;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.HashMap;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** The whole-piece table against a {@link HashMap}, an oracle that shares no code with it. */
class PieceTableTest {

  @ParameterizedTest
  @ValueSource(longs = {1L, 0xFE77L, 0xD0C4L})
  void findAgreesWithAHashMap(long seed) {
    SplittableRandom r = new SplittableRandom(seed);
    // keys drawn from a small alphabet of harbour words, so that near-misses (prefixes, one char off) abound
    String alphabet = "harbourqayfeï渡\uD83D\uDEF3";
    String[] keys = new String[3000];
    Map<String, Integer> oracle = new HashMap<>();
    for (int id = 0; id < keys.length; id++) {
      if (r.nextInt(10) == 0) {
        continue; // null entry: not a key
      }
      String k = randomString(r, alphabet, r.nextInt(1, PieceTable.MAX_CHARS + 3));
      keys[id] = k;
      if (k.length() <= PieceTable.MAX_CHARS) {
        oracle.putIfAbsent(k, id); // the first id of a repeated string wins
      }
    }
    PieceTable t = PieceTable.of(keys);
    assertEquals(oracle.size(), t.size(), "seed " + seed);
    for (Map.Entry<String, Integer> e : oracle.entrySet()) {
      String padded = "~" + e.getKey() + "~";
      assertEquals(e.getValue().intValue(), t.find(padded, 1, padded.length() - 1), "seed " + seed + ", key " + e.getKey());
    }
    for (int k = 0; k < 20_000; k++) {
      String probe = randomString(r, alphabet, r.nextInt(0, 8));
      assertEquals(oracle.getOrDefault(probe, -1).intValue(), t.find(probe, 0, probe.length()),
          "seed " + seed + ", probe " + probe);
    }
  }

  private static String randomString(SplittableRandom r, String alphabet, int codePoints) {
    int[] cps = alphabet.codePoints().toArray();
    StringBuilder sb = new StringBuilder();
    for (int i = 0; i < codePoints; i++) {
      sb.appendCodePoint(cps[r.nextInt(cps.length)]);
    }
    return sb.toString();
  }
}
