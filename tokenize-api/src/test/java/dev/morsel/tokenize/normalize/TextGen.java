package dev.morsel.tokenize.normalize;

import java.util.SplittableRandom;
import java.util.function.IntPredicate;

/**
 * Seeded random text for property tests: a mix of ASCII, controls, Latin letters with and without
 * combining marks, Hangul syllables and conjoining jamo, compatibility characters (ligatures,
 * circled digits, fullwidth forms, spaces), case-sensitive letters whose folding expands, Greek,
 * Cyrillic, supplementary-plane letters and symbols, and (optionally) lone surrogates.
 */
final class TextGen {
  /** Inclusive code point ranges, each picked with equal weight. */
  private static final int[][] POOLS = {
      {'a', 'z'}, {'A', 'Z'}, {'0', '9'}, {' ', '/'}, {' ', ' '}, {'\t', '\r'},
      {0x00, 0x1F}, {0x7F, 0x9F},                           // C0 and C1 controls
      {0xA0, 0xFF}, {0x100, 0x17F},                         // Latin-1 supplement, Latin Extended-A
      {0x300, 0x36F}, {0x591, 0x5C7}, {0x1AB0, 0x1ABE},     // combining marks
      {0x370, 0x3FF}, {0x400, 0x4FF},                       // Greek, Cyrillic
      {0x1100, 0x1112}, {0x1161, 0x1175}, {0x11A8, 0x11C2}, // conjoining jamo L, V, T
      {0xAC00, 0xD7A3},                                     // Hangul syllables
      {0xFB00, 0xFB06}, {0x2460, 0x2473}, {0xFF01, 0xFF5E}, // ligatures, circled digits, fullwidth
      {0x2000, 0x200F}, {0x2028, 0x202F}, {0x3000, 0x3000}, // spaces, joiners, separators
      {0x1E00, 0x1EFF}, {0x1F00, 0x1FFF},                   // Latin and Greek extended (precomposed)
      {0x2100, 0x214F},                                     // letterlike (Ohm, Angstrom, Kelvin)
      {0x0F70, 0x0F84}, {0x0900, 0x097F},                   // Tibetan vowel signs, Devanagari
      {0x10400, 0x1044F},                                   // Deseret (supplementary, cased)
      {0x1D15E, 0x1D164},                                   // musical symbols with canonical decompositions
      {0x1D400, 0x1D7FF},                                   // mathematical alphanumerics (compatibility)
      {0x1F600, 0x1F64F}, {0x20000, 0x2A6DF},               // emoji, CJK extension B
      {0x00, 0xFFFF}, {0x10000, 0x10FFFF},                  // anything
  };
  /** Characters worth extra weight: expanding folds, default ignorables, combining-with-ASCII. */
  private static final int[] SPECIALS = {
      0x00DF, 0x0130, 0x0149, 0x01F0, 0x0345, 0x0390, 0x1E9E, 0xFB01, 0x00AD, 0x200D, 0x034F,
      0x0338, 0x00B4, 0x00A8, 0x2126, 0x212B, 0x212A, 0x0085, 0x2028, 0x00A0, 0x3000, 0x1680,
  };

  private TextGen() {}

  /**
   * A random string of up to {@code maxCodePoints} code points, each accepted by {@code allow};
   * lone surrogates are added only when {@code loneSurrogates}.
   */
  static String next(SplittableRandom rnd, int maxCodePoints, boolean loneSurrogates, IntPredicate allow) {
    int n = rnd.nextInt(maxCodePoints + 1);
    StringBuilder sb = new StringBuilder(n * 2);
    while (n > 0) {
      int cp;
      int pick = rnd.nextInt(POOLS.length + 3);
      if (pick < POOLS.length) {
        int[] r = POOLS[pick];
        cp = r[0] + rnd.nextInt(r[1] - r[0] + 1);
      } else if (pick == POOLS.length && loneSurrogates) {
        sb.append((char) (0xD800 + rnd.nextInt(0x800)));
        n--;
        continue;
      } else {
        cp = SPECIALS[rnd.nextInt(SPECIALS.length)];
      }
      if (Character.getType(cp) == Character.SURROGATE || !allow.test(cp)) {
        continue;
      }
      sb.appendCodePoint(cp);
      n--;
    }
    return sb.toString();
  }
}
