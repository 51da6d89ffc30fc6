package dev.morsel.tokenize.normalize;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.lang.UCharacterCategory;
import com.ibm.icu.util.VersionInfo;
import dev.morsel.tokenize.normalize.Normalization.Form;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.BitSet;
import java.util.List;
import java.util.zip.GZIPInputStream;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * Conformance to Unicode Standard Annex #15, checked with the Unicode 15.0.0 conformance file
 * {@code NormalizationTest.txt} (vendored from Debian's unicode-data package as
 * {@code unicode/NormalizationTest-15.0.0.txt.gz}; license in {@code unicode/LICENSE-UNICODE.txt}).
 *
 * <p>Every line of parts 0 to 3 is checked against the invariants in the file's header
 * ("CONFORMANCE 1."), and every normalization also has its alignment checked. Part 1's second rule
 * ("CONFORMANCE 2.": unlisted assigned code points are unchanged by all four forms) is checked for
 * code points whose Unicode age is at most 15.0; ICU 78 implements a newer Unicode, so newer code
 * points are skipped and counted. Surrogate code points are skipped as well: as a string of one
 * lone surrogate they become U+FFFD under Morsel's documented lone-surrogate policy.
 */
class NormalizationConformanceTest {
  private static final String RESOURCE = "/unicode/NormalizationTest-15.0.0.txt.gz";
  private static final Form[] FORMS = {Form.NFC, Form.NFD, Form.NFKC, Form.NFKD};
  private static final Normalization[] NORMS = {
      Normalization.of(Form.NFC), Normalization.of(Form.NFD), Normalization.of(Form.NFKC), Normalization.of(Form.NFKD)};
  private static final int MAX_REPORTED = 25;

  /** columns per part: lines.get(part) = list of 5-column rows. */
  private static final List<List<String[]>> PARTS = new ArrayList<>();

  @BeforeAll
  static void load() {
    InputStream raw = NormalizationConformanceTest.class.getResourceAsStream(RESOURCE);
    assertTrue(raw != null, "missing test resource " + RESOURCE);
    try (BufferedReader r = new BufferedReader(new InputStreamReader(new GZIPInputStream(raw), StandardCharsets.UTF_8))) {
      int part = -1;
      for (String line; (line = r.readLine()) != null; ) {
        if (line.startsWith("@Part")) {
          part = line.charAt(5) - '0';
          while (PARTS.size() <= part) {
            PARTS.add(new ArrayList<>());
          }
          continue;
        }
        int hash = line.indexOf('#');
        String data = (hash >= 0 ? line.substring(0, hash) : line).trim();
        if (data.isEmpty()) {
          continue;
        }
        String[] f = data.split(";");
        String[] cols = new String[5];
        for (int c = 0; c < 5; c++) {
          cols[c] = decode(f[c].trim());
        }
        PARTS.get(part).add(cols);
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  private static String decode(String hexes) {
    StringBuilder sb = new StringBuilder();
    for (String h : hexes.split(" ")) {
      sb.appendCodePoint(Integer.parseInt(h, 16));
    }
    return sb.toString();
  }

  @Test
  void fileHasTheExpectedShape() {
    // counted in the vendored file with awk: data lines per @Part section
    assertEquals(4, PARTS.size(), "parts");
    assertEquals(25, PARTS.get(0).size(), "part 0 lines");
    assertEquals(17029, PARTS.get(1).size(), "part 1 lines");
    assertEquals(1844, PARTS.get(2).size(), "part 2 lines");
    assertEquals(176, PARTS.get(3).size(), "part 3 lines");
  }

  @Test
  void part0SpecificCases() {
    checkPart(0);
  }

  @Test
  void part1CharacterByCharacter() {
    checkPart(1);
  }

  @Test
  void part2CanonicalOrder() {
    checkPart(2);
  }

  @Test
  void part3PublicReviewIssue29() {
    checkPart(3);
  }

  /** NormalizationTest.txt header, "CONFORMANCE 1.": the invariants for NFC, NFD, NFKC, NFKD. */
  private static void checkPart(int part) {
    List<String> failures = new ArrayList<>();
    int checks = 0;
    for (String[] c : PARTS.get(part)) {
      // NFC:  c2 == toNFC(c1) == toNFC(c2) == toNFC(c3);  c4 == toNFC(c4) == toNFC(c5)
      checks += expect(failures, Form.NFC, c, c[1], 0, 1, 2);
      checks += expect(failures, Form.NFC, c, c[3], 3, 4);
      // NFD:  c3 == toNFD(c1) == toNFD(c2) == toNFD(c3);  c5 == toNFD(c4) == toNFD(c5)
      checks += expect(failures, Form.NFD, c, c[2], 0, 1, 2);
      checks += expect(failures, Form.NFD, c, c[4], 3, 4);
      // NFKC: c4 == toNFKC(c1) == ... == toNFKC(c5)
      checks += expect(failures, Form.NFKC, c, c[3], 0, 1, 2, 3, 4);
      // NFKD: c5 == toNFKD(c1) == ... == toNFKD(c5)
      checks += expect(failures, Form.NFKD, c, c[4], 0, 1, 2, 3, 4);
    }
    System.out.printf("NormalizationTest-15.0.0 part %d: %d lines, %d normalizations checked%n",
        part, PARTS.get(part).size(), checks);
    assertTrue(failures.isEmpty(), () -> failures.size() + " failures in part " + part + ":\n" + String.join("\n", failures));
  }

  private static int expect(List<String> failures, Form form, String[] cols, String expected, int... columns) {
    Normalization n = NORMS[form.ordinal() - 1];
    for (int col : columns) {
      String src = cols[col];
      NormalizedText nt = n.apply(src);
      if (!nt.text().equals(expected) && failures.size() < MAX_REPORTED) {
        failures.add(form + "(c" + (col + 1) + "=" + AlignmentChecks.escape(src) + ") = "
            + AlignmentChecks.escape(nt.text()) + ", file says " + AlignmentChecks.escape(expected));
      }
      String v = AlignmentChecks.violation(nt, src, 0, src.length(), cp -> false);
      if (v != null && failures.size() < MAX_REPORTED) {
        failures.add(form + " alignment of " + AlignmentChecks.escape(src) + ": " + v);
      }
    }
    return columns.length;
  }

  /** NormalizationTest.txt header, "CONFORMANCE 2.": X == toNFC(X) == toNFD(X) == toNFKC(X) == toNFKD(X). */
  @Test
  void part1UnlistedCodePointsAreUnchanged() {
    BitSet listed = new BitSet(0x110000);
    for (String[] c : PARTS.get(1)) {
      listed.set(c[0].codePointAt(0));
    }
    VersionInfo v15 = VersionInfo.getInstance(15, 0);
    VersionInfo unassigned = VersionInfo.getInstance(0, 0, 0, 0);
    int checked = 0;
    int newer = 0;
    int surrogates = 0;
    int notAssigned = 0;
    List<String> failures = new ArrayList<>();
    for (int cp = 0; cp <= 0x10FFFF; cp++) {
      if (listed.get(cp)) {
        continue;
      }
      VersionInfo age = UCharacter.getAge(cp);
      if (age.equals(unassigned)) {
        notAssigned++;
        continue;
      }
      if (age.compareTo(v15) > 0) {
        newer++; // assigned after Unicode 15.0; ICU 78 may normalize it, the 15.0 file cannot say
        continue;
      }
      if (UCharacter.getType(cp) == UCharacterCategory.SURROGATE) {
        surrogates++; // a lone surrogate becomes U+FFFD by Morsel's policy, not a form
        continue;
      }
      String x = new String(Character.toChars(cp));
      for (int f = 0; f < FORMS.length; f++) {
        NormalizedText nt = NORMS[f].apply(x);
        if ((!nt.text().equals(x) || !nt.isIdentity()) && failures.size() < MAX_REPORTED) {
          failures.add(String.format("%s(U+%04X) = %s, expected unchanged", FORMS[f], cp, AlignmentChecks.escape(nt.text())));
        }
      }
      checked++;
    }
    System.out.printf("NormalizationTest-15.0.0 part 1 rule 2: %d unlisted code points checked in 4 forms; "
        + "skipped %d assigned after Unicode 15.0, %d surrogates; %d unassigned not required%n",
        checked, newer, surrogates, notAssigned);
    assertTrue(failures.isEmpty(), () -> String.join("\n", failures));
    assertTrue(checked > 250_000, "too few code points checked: " + checked);
  }
}
