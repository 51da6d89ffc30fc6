package dev.morsel.tokenize.normalize;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.lang.UCharacterCategory;
import com.ibm.icu.lang.UProperty;
import com.ibm.icu.text.Normalizer2;
import dev.morsel.tokenize.normalize.Normalization.Form;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.function.IntPredicate;
import java.util.regex.Pattern;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Property tests over every option combination (5 forms x 16 option sets = 80 settings) on seeded
 * random strings: the text equals a whole-string oracle written here, and the alignment keeps the
 * contract of DESIGN.md "Results and offsets" (monotone, in range, no surrogate split, coverage).
 *
 * <p>The oracle applies each step to the whole string at once with plain ICU calls (no chunking,
 * no alignment), in the documented order, so it shares no code with the chunked implementation.
 */
class AlignmentPropertyTest {
  /** Random strings per setting; 80 settings x 150 = 12,000 cases, each also on a random sub-range. */
  private static final int CASES = 150;
  private static final Normalizer2 NFC = Normalizer2.getNFCInstance();
  private static final Normalizer2 NFD = Normalizer2.getNFDInstance();
  private static final Normalizer2 NFKC = Normalizer2.getNFKCInstance();
  private static final Normalizer2 NFKD = Normalizer2.getNFKDInstance();
  private static final Normalizer2 NFKC_CF = Normalizer2.getNFKCCasefoldInstance();
  /**
   * White_Space minus line breaks, listed from PropList.txt (Unicode 15.0.0): 0009, 0020, 00A0,
   * 1680, 2000..200A, 202F, 205F, 3000 (000A..000D, 0085, 2028, 2029 are the line breaks).
   */
  private static final Pattern SPACE_RUN =
      Pattern.compile("[\\u0009\\u0020\\u00A0\\u1680\\u2000-\\u200A\\u202F\\u205F\\u3000]+");

  static List<Normalization> settings() {
    List<Normalization> all = new ArrayList<>();
    for (Form f : Form.values()) {
      for (int bits = 0; bits < 16; bits++) {
        all.add(Normalization.builder().form(f).caseFold((bits & 1) != 0).removeMarks((bits & 2) != 0)
            .dropControls((bits & 4) != 0).collapseSpaces((bits & 8) != 0).build());
      }
    }
    return all;
  }

  @ParameterizedTest
  @MethodSource("settings")
  void textMatchesOracleAndAlignmentHolds(Normalization n) {
    long seed = n.spec().hashCode() * 0x9E3779B97F4A7C15L;
    SplittableRandom rnd = new SplittableRandom(seed);
    IntPredicate removable = removable(n);
    for (int k = 0; k < CASES; k++) {
      String s = TextGen.next(rnd, 24, true, cp -> true);
      String where = "spec " + n.spec() + ", seed " + seed + ", case " + k + ", input " + AlignmentChecks.escape(s);
      NormalizedText nt = n.apply(s);
      String expected = oracle(n, s);
      String actual = nt.text();
      if (n.form() == Form.NONE && n.removeMarks()) {
        // NONE recomposes only chunks that lost a mark (documented), so compare canonical equivalents
        expected = NFC.normalize(expected);
        actual = NFC.normalize(actual);
      }
      assertEquals(AlignmentChecks.escape(expected), AlignmentChecks.escape(actual), where);
      assertNull(AlignmentChecks.violation(nt, s, 0, s.length(), removable), where);
      assertEquals(nt.text().equals(s), nt.isIdentity(), "isIdentity, " + where);

      // a sub-range at code point boundaries: indices are absolute, text equals that of the substring
      int a = cpBoundary(s, rnd.nextInt(s.length() + 1));
      int b = cpBoundary(s, a + rnd.nextInt(s.length() - a + 1));
      NormalizedText sub = n.apply(new StringBuilder(s), a, b);
      String rangeWhere = where + ", range [" + a + ", " + b + ")";
      assertEquals(n.apply(s.substring(a, b)).text(), sub.text(), rangeWhere);
      assertNull(AlignmentChecks.violation(sub, s, a, b, removable), rangeWhere);
    }
  }

  /**
   * The forward cursor gives the answers of {@code spanStart}/{@code spanEnd} (binary search) for
   * every span, asked in order as a segmenter reports tokens, and again in a random order; one
   * cursor is reused across all texts of a setting.
   */
  @ParameterizedTest
  @MethodSource("settings")
  void cursorAgreesWithSpanQueries(Normalization n) {
    long seed = n.spec().hashCode() * 0xC2B2AE3D27D4EB4FL;
    SplittableRandom rnd = new SplittableRandom(seed);
    NormalizedText.Cursor cursor = new NormalizedText.Cursor();
    for (int k = 0; k < CASES; k++) {
      String s = TextGen.next(rnd, 40, true, cp -> true);
      NormalizedText nt = n.apply(s);
      int len = nt.length();
      String where = "spec " + n.spec() + ", seed " + seed + ", case " + k + ", input " + AlignmentChecks.escape(s);
      cursor.reset(nt);
      for (int a = 0; a < len; ) { // spans in order, random lengths
        int b = Math.min(len, a + 1 + rnd.nextInt(4));
        assertEquals(nt.spanStart(a), cursor.spanStart(a), "start " + a + ", " + where);
        assertEquals(nt.spanEnd(b), cursor.spanEnd(b), "end " + b + ", " + where);
        a = b;
      }
      for (int q = 0; q < 20 && len > 0; q++) { // any order
        int i = rnd.nextInt(len + 1);
        assertEquals(nt.spanStart(i), cursor.spanStart(i), "random start " + i + ", " + where);
        assertEquals(nt.spanEnd(i), cursor.spanEnd(i), "random end " + i + ", " + where);
      }
    }
  }

  private static int cpBoundary(String s, int i) {
    return i > 0 && i < s.length() && Character.isLowSurrogate(s.charAt(i)) && Character.isHighSurrogate(s.charAt(i - 1))
        ? i - 1 : i;
  }

  /** Which original code points a setting may remove (documented in Normalization). */
  static IntPredicate removable(Normalization n) {
    return cp -> {
      if (n.dropControls() && UCharacter.getType(cp) == UCharacterCategory.CONTROL
          && !(cp >= 0x09 && cp <= 0x0D) && cp != 0x85) {
        return true;
      }
      String one = new String(Character.toChars(cp));
      if (n.removeMarks()) {
        String d = (n.form() == Form.NFKC || n.form() == Form.NFKD) ? NFKD.normalize(one) : NFD.normalize(one);
        if (d.codePoints().allMatch(c -> UCharacter.getType(c) == UCharacterCategory.NON_SPACING_MARK)) {
          return true;
        }
      }
      // NFKC_Casefold maps Default_Ignorable_Code_Point to nothing (UAX #44, DerivedNormalizationProps.txt)
      return n.caseFold() && n.form() == Form.NFKC && UCharacter.hasBinaryProperty(cp, UProperty.DEFAULT_IGNORABLE_CODE_POINT);
    };
  }

  /** The documented pipeline applied to the whole string at once. */
  static String oracle(Normalization n, String s) {
    // (1) lone surrogates -> U+FFFD
    StringBuilder sb = new StringBuilder(s.length());
    for (int i = 0; i < s.length(); i++) {
      char c = s.charAt(i);
      if (Character.isHighSurrogate(c) && i + 1 < s.length() && Character.isLowSurrogate(s.charAt(i + 1))) {
        sb.append(c).append(s.charAt(++i));
      } else if (Character.isSurrogate(c)) {
        sb.append('\uFFFD');
      } else if (n.dropControls() && Character.getType(c) == Character.CONTROL && !(c >= 0x09 && c <= 0x0D) && c != 0x85) {
        // (2) dropped
      } else {
        sb.append(c);
      }
    }
    String t = sb.toString();
    boolean compat = n.form() == Form.NFKC || n.form() == Form.NFKD;
    Normalizer2 decomp = compat ? NFKD : NFD;
    // (3) form, casefold, remove-marks
    if (n.caseFold()) {
      switch (n.form()) {
        case NFKC: t = NFKC_CF.normalize(t); break;
        case NONE: t = UCharacter.foldCase(t, true); break;
        default: t = form(n.form(), UCharacter.foldCase(decomp.normalize(t), true)); break;
      }
    } else {
      t = form(n.form(), t);
    }
    if (n.removeMarks()) {
      StringBuilder kept = new StringBuilder();
      decomp.normalize(t).codePoints()
          .filter(c -> UCharacter.getType(c) != UCharacterCategory.NON_SPACING_MARK)
          .forEach(kept::appendCodePoint);
      t = kept.toString();
      if (n.form() == Form.NFKC) {
        t = n.caseFold() ? NFKC_CF.normalize(t) : NFKC.normalize(t);
      } else if (n.form() == Form.NFC || n.form() == Form.NONE) {
        t = NFC.normalize(t);
      }
    }
    // (4) collapse-spaces
    if (n.collapseSpaces()) {
      t = SPACE_RUN.matcher(t).replaceAll(" ");
    }
    return t;
  }

  private static String form(Form f, String t) {
    switch (f) {
      case NFC: return NFC.normalize(t);
      case NFD: return NFD.normalize(t);
      case NFKC: return NFKC.normalize(t);
      case NFKD: return NFKD.normalize(t);
      default: return t;
    }
  }
}
