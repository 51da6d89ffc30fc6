package dev.morsel.tokenize.normalize;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.util.VersionInfo;
import dev.morsel.tokenize.normalize.Normalization.Form;
import java.util.SplittableRandom;
import java.util.function.IntPredicate;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import java.util.stream.LongStream;

/**
 * {@code java.text.Normalizer} (the JDK's own implementation, sharing no code with ICU or Morsel)
 * as an independent reference for NFC, NFD, NFKC and NFKD on seeded random strings.
 *
 * <p>JDK 17 implements Unicode 13.0 (java.lang.Character class documentation), older than ICU 78's.
 * Generated code points are therefore restricted to those assigned in the running JDK
 * ({@code Character.getType != UNASSIGNED}) and assigned by Unicode 13.0 according to ICU's
 * {@code UCharacter.getAge}; normalization stability (UAX #15 section 11) then makes both agree.
 */
class JdkNormalizerAgreementTest {
  /** Strings per seed; 40 seeds x 100 strings x 4 forms = 16,000 comparisons. */
  private static final int STRINGS_PER_SEED = 100;
  private static final VersionInfo JDK_UNICODE = VersionInfo.getInstance(13, 0);
  private static final IntPredicate IN_BOTH = cp -> Character.getType(cp) != Character.UNASSIGNED
      && UCharacter.getAge(cp).compareTo(JDK_UNICODE) <= 0
      && !UCharacter.getAge(cp).equals(VersionInfo.getInstance(0, 0, 0, 0));

  static LongStream seeds() {
    return LongStream.range(0, 40).map(i -> 0x5EA_F0E5L * 31 + i);
  }

  @ParameterizedTest
  @MethodSource("seeds")
  void agreesWithJavaTextNormalizer(long seed) {
    SplittableRandom rnd = new SplittableRandom(seed);
    for (int k = 0; k < STRINGS_PER_SEED; k++) {
      String s = TextGen.next(rnd, 30, false, IN_BOTH);
      check(seed, s, Form.NFC, java.text.Normalizer.Form.NFC);
      check(seed, s, Form.NFD, java.text.Normalizer.Form.NFD);
      check(seed, s, Form.NFKC, java.text.Normalizer.Form.NFKC);
      check(seed, s, Form.NFKD, java.text.Normalizer.Form.NFKD);
    }
  }

  private static void check(long seed, String s, Form ours, java.text.Normalizer.Form jdk) {
    NormalizedText nt = Normalization.of(ours).apply(s);
    String expected = java.text.Normalizer.normalize(s, jdk);
    String where = "seed " + seed + ", " + ours + ", input " + AlignmentChecks.escape(s);
    assertEquals(AlignmentChecks.escape(expected), AlignmentChecks.escape(nt.text()), where);
    assertNull(AlignmentChecks.violation(nt, s, 0, s.length(), cp -> false), where);
    assertEquals(expected.equals(s), nt.isIdentity(), "isIdentity, " + where);
  }
}
