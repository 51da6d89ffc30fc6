package dev.morsel.tokenize.lucene;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.lang.UProperty;
import com.ibm.icu.text.Normalizer2;

/**
 * Where {@link SubwordTokenizer} may cut its input into separately encoded chunks: a place where
 * encoding the two sides apart gives exactly the tokens of encoding them together, whatever the
 * pipeline.
 *
 * <p>A cut goes at index {@code c} when either
 * <ul>
 *   <li>{@code text[c]} is U+0020 and both {@code text[c-1]} and {@code text[c+1]} are
 *       <em>plain</em>; or
 *   <li>{@code text[c-1]} is LF (U+000A) and {@code text[c]} is plain.
 * </ul>
 * A plain char is a BMP code point of class letters, digits, ideograph, punctuation or symbol
 * ({@link PieceClass}: general category L, Nd, P or S), not
 * {@code Default_Ignorable_Code_Point}, of canonical combining class 0, with a normalization
 * boundary before it under NFC, NFKC and NFKC_Casefold (so not a Hangul vowel or final jamo, which
 * compose with what precedes them), whose compatibility decomposition and full case folding hold
 * only such chars. Such a char stays a non-empty,
 * non-space, non-mark starter under every normalization Morsel offers (no form, case folding, mark
 * removal, control dropping or space collapsing removes it, joins it with a space or lets it
 * combine across the cut), so the normalization chunks [1] do not straddle the cut. The single
 * space, or the line feed, is then a piece boundary under every splitting except {@code none}:
 * the rule-based splitting starts a fresh piece at it with no pending state, whitespace splitting
 * ends a run there, and the word boundaries of UAX #29 [2] break on both sides of a lone space
 * between non-space characters (no rule but WB3d and WB4 joins a space to a neighbour) and always
 * after LF (WB3a). The chunked-versus-whole property test checks this on random text for every
 * normalization and splitting.
 *
 * <p>References: [1] Unicode Standard Annex #15, Unicode Normalization Forms. [2] Unicode
 * Standard Annex #29, Unicode Text Segmentation, section 4.
 */
final class ChunkCuts {
  private ChunkCuts() {}

  /** One bit per BMP char: plain (see the class comment); 8 KiB, built on first use. */
  private static final class Plain {
    static final long[] BITS = new long[1 << 10];

    static {
      Normalizer2 nfkd = Normalizer2.getNFKDInstance();
      Normalizer2[] composing = {Normalizer2.getNFCInstance(), Normalizer2.getNFKCInstance(),
          Normalizer2.getNFKCCasefoldInstance()};
      for (int c = 0; c < 0x10000; c++) {
        if (isPlainAlone(c) && composing[0].hasBoundaryBefore(c) && composing[1].hasBoundaryBefore(c)
            && composing[2].hasBoundaryBefore(c)) {
          String d = nfkd.getDecomposition(c);
          String f = UCharacter.foldCase(String.valueOf((char) c), true);
          if ((d == null || allPlainAlone(d)) && allPlainAlone(f)) {
            BITS[c >>> 6] |= 1L << c;
          }
        }
      }
    }

    private static boolean allPlainAlone(String s) {
      for (int i = 0; i < s.length(); i++) {
        if (!isPlainAlone(s.charAt(i))) {
          return false;
        }
      }
      return true;
    }

    private static boolean isPlainAlone(int c) {
      if (Character.isSurrogate((char) c) || UCharacter.getCombiningClass(c) != 0
          || UCharacter.hasBinaryProperty(c, UProperty.DEFAULT_IGNORABLE_CODE_POINT)
          || UCharacter.hasBinaryProperty(c, UProperty.WHITE_SPACE)) {
        return false;
      }
      PieceClass k = PieceClass.classify(c);
      return k != PieceClass.MARK && k != PieceClass.OTHER;
    }
  }

  /** Whether {@code c} is plain. ASCII letters, digits, punctuation and symbols are, by the rule. */
  static boolean isPlain(char c) {
    if (c < 128) {
      return c > ' ' && c < 0x7F;
    }
    return (Plain.BITS[c >>> 6] & (1L << c)) != 0;
  }

  /** Whether a cut may go at {@code c} of {@code text[0, length)}; {@code 0 < c < length}. */
  static boolean isCut(char[] text, int c, int length) {
    char at = text[c];
    if (at == ' ') {
      return c + 1 < length && isPlain(text[c - 1]) && isPlain(text[c + 1]);
    }
    return text[c - 1] == '\n' && isPlain(at);
  }

  /**
   * The last cut in {@code text[0, length)} at or above {@code floor} (and above 0), or -1 if there
   * is none. Linear in {@code length - floor}.
   */
  static int lastCut(char[] text, int length, int floor) {
    for (int c = length - 1, stop = Math.max(1, floor); c >= stop; c--) {
      if (isCut(text, c, length)) {
        return c;
      }
    }
    return -1;
  }
}
