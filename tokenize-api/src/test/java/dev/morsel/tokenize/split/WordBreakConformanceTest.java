package dev.morsel.tokenize.split;

import dev.morsel.tokenize.testkit.BreakTestFile;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.lang.UProperty;
import java.io.IOException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;

/**
 * Conformance of {@link Splitting#words()} to Unicode Standard Annex #29, section 4 (Word
 * Boundaries), checked against the annex's test file {@code WordBreakTest.txt} of Unicode 15.0.0
 * (vendored as {@code unicode/WordBreakTest-15.0.0.txt.gz}, see README-WordBreakTest.txt there).
 *
 * <p>ICU 78 implements a later Unicode version than 15.0.0; lines whose expected breaks differ for
 * that reason are listed in {@link #EXPECTED_DIFFERENCES} with the reason. Any other difference
 * fails, and so does a listed line that starts to agree (so the list stays true).
 */
class WordBreakConformanceTest {
  private static final String RESOURCE = "/unicode/WordBreakTest-15.0.0.txt.gz";

  /** Test-file line number → why ICU 78 breaks differently from the 15.0.0 expectation. */
  static final Map<Integer, String> EXPECTED_DIFFERENCES = new TreeMap<>();

  /**
   * U+2701 UPPER BLADE SCISSORS is Extended_Pictographic in Unicode 15.0.0 (emoji/emoji-data.txt,
   * range 26FE..2701) but not in the Unicode 17.0 data of ICU 78, so rule WB3c
   * (ZWJ × \p{Extended_Pictographic}) no longer joins it; checked in
   * {@link #listedReasonStillHolds()}.
   */
  private static final String SCISSORS_NOT_PICTOGRAPHIC =
      "U+2701 lost Extended_Pictographic after Unicode 15.0; ICU 78 breaks between U+200D and U+2701 (WB3c no longer applies)";

  static {
    EXPECTED_DIFFERENCES.put(1730, SCISSORS_NOT_PICTOGRAPHIC); // 2701 × 200D × 2701
    EXPECTED_DIFFERENCES.put(1731, SCISSORS_NOT_PICTOGRAPHIC); // 0061 × 200D × 2701
  }

  @Test
  void listedReasonStillHolds() throws IOException {
    // the reason given for lines 1730 and 1731: Unicode 15.0.0 says yes, ICU 78 says no
    assertFalse(UCharacter.hasBinaryProperty(0x2701, UProperty.EXTENDED_PICTOGRAPHIC),
        "ICU now treats U+2701 as Extended_Pictographic; revisit EXPECTED_DIFFERENCES");
    assertTrue(UCharacter.hasBinaryProperty(0x2702, UProperty.EXTENDED_PICTOGRAPHIC), "U+2702 stays pictographic");
    for (Case c : cases()) {
      if (EXPECTED_DIFFERENCES.containsKey(c.line())) {
        assertTrue(c.text().contains("\u200D\u2701"), "listed line " + c.line() + " joins U+2701 after ZWJ");
      }
    }
  }

  /** One test case: its line number, text and expected break positions (UTF-16 indices). */
  record Case(int line, String text, List<Integer> breaks, String source) {}

  static List<Case> cases() throws IOException {
    List<Case> cases = new ArrayList<>();
    for (BreakTestFile.Line line : BreakTestFile.read(RESOURCE)) {
      cases.add(new Case(line.number(), line.text(), line.breaks(), line.source()));
    }
    return cases;
  }

  static List<Integer> wordBreaks(String text) {
    List<Integer> out = new ArrayList<>();
    out.add(0);
    Splitting.words().split(text, 0, text.length(), (s, e) -> out.add(e));
    return out;
  }

  @Test
  void wordsModeMatchesEveryLineOfWordBreakTest() throws IOException {
    List<Case> cases = cases();
    // WordBreakTest-15.0.0.txt: 1823 test lines (count of lines starting with the break sign)
    assertEquals(1823, cases.size(), "test lines in WordBreakTest-15.0.0.txt");
    Map<Integer, String> unexpected = new LinkedHashMap<>();
    List<Integer> nowAgreeing = new ArrayList<>();
    int agree = 0;
    int listed = 0;
    for (Case c : cases) {
      List<Integer> got = wordBreaks(c.text());
      boolean same = got.equals(c.breaks());
      if (EXPECTED_DIFFERENCES.containsKey(c.line())) {
        listed++;
        if (same) {
          nowAgreeing.add(c.line());
        }
      } else if (same) {
        agree++;
      } else {
        unexpected.put(c.line(), "expected " + c.breaks() + " got " + got + " : " + c.source());
      }
    }
    System.out.printf("WordBreakTest-15.0.0: %d lines, %d agree, %d listed differences%n", cases.size(), agree, listed);
    StringBuilder msg = new StringBuilder();
    unexpected.forEach((k, v) -> msg.append("\nline ").append(k).append(": ").append(v));
    assertTrue(unexpected.isEmpty(), unexpected.size() + " unexpected differences:" + msg);
    assertTrue(nowAgreeing.isEmpty(), "listed differences now agree, remove them from the list: " + nowAgreeing);
    assertEquals(EXPECTED_DIFFERENCES.size(), listed, "every listed line exists in the file");
  }
}
