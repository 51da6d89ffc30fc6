package dev.morsel.tokenize.hardening.kit;

import java.util.SplittableRandom;

/**
 * Seeded generator of hostile text for property tests, shared by every segmenter module through the
 * test-jar of tokenize-api. A text is a sequence of runs, each drawn from one {@link Kind}, joined
 * by spaces, punctuation or nothing; the same seed always gives the same text, so a failing case is
 * replayed from its seed alone ({@link #forSeed(long, int)}).
 *
 * <p>The kinds cover what a tokenizer in front of a service meets: ASCII, Latin letters with
 * precomposed and combining accents, Greek, Cyrillic, CJK ideographs, emoji with ZWJ and skin-tone
 * modifier sequences, stacks of combining marks, Hangul syllables and conjoining jamo, supplementary
 * planes, lone surrogates, C0/C1 controls and compatibility characters, and very long pieces (runs
 * of hundreds of letters with no break).
 *
 * <p>Code point ranges are from the Unicode Standard 15.0 code charts (block ranges); emoji
 * sequences follow UTS #51 section 2.4 (modifier sequences) and 2.3 (ZWJ sequences).
 */
public final class HardText {
  /** What one run of text is made of. */
  public enum Kind {
    ASCII, LATIN_ACCENTS, GREEK, CYRILLIC, CJK, EMOJI, COMBINING_STACK, HANGUL, SUPPLEMENTARY,
    LONE_SURROGATES, CONTROLS, LONG_PIECE, COMPATIBILITY
  }

  private static final Kind[] KINDS = Kind.values();

  /** Words of our own scenario (passengers writing to a regional ferry operator). */
  private static final String[] WORDS = {
      "ferry", "berth", "Skarvøy", "quay", "ticket", "delayed", "gangway", "Ålesund", "Fähre", "Überfahrt",
      "pier", "timetable", "café", "naïve", "coöperate", "deck", "bicycle", "refund", "storm", "harbour",
  };

  private HardText() {}

  /** The text that the case seeded {@code seed} gets (see {@link Seeds}). */
  public static String forSeed(long seed, int maxUnits) {
    return next(new SplittableRandom(seed), maxUnits);
  }

  /** A random text of at most about {@code maxUnits} UTF-16 units (long-piece runs may add up to 600). */
  public static String next(SplittableRandom rnd, int maxUnits) {
    StringBuilder sb = new StringBuilder();
    int target = rnd.nextInt(maxUnits + 1);
    while (sb.length() < target) {
      Kind k = KINDS[rnd.nextInt(KINDS.length)];
      if (k == Kind.LONG_PIECE && rnd.nextInt(4) != 0) {
        k = Kind.ASCII; // long pieces cost the most per case: one run in 52, not one in 13
      }
      run(rnd, k, sb);
      switch (rnd.nextInt(6)) {
        case 0: case 1: sb.append(' '); break;
        case 2: sb.append(rnd.nextBoolean() ? ", " : ". "); break;
        case 3: sb.append(rnd.nextBoolean() ? '\n' : '\t'); break;
        default: break; // runs of different kinds touch
      }
    }
    return sb.toString();
  }

  /** Appends one run of {@code kind}. */
  public static void run(SplittableRandom rnd, Kind kind, StringBuilder sb) {
    int n = 1 + rnd.nextInt(8);
    switch (kind) {
      case ASCII:
        if (rnd.nextBoolean()) {
          sb.append(WORDS[rnd.nextInt(WORDS.length)]);
        } else {
          for (int i = 0; i < n; i++) {
            sb.append((char) rnd.nextInt(0x20, 0x7F));
          }
        }
        break;
      case LATIN_ACCENTS:
        for (int i = 0; i < n; i++) {
          if (rnd.nextBoolean()) {
            sb.append((char) rnd.nextInt(0xC0, 0x250)); // Latin-1 Supplement .. Latin Extended-B
          } else {
            sb.append((char) rnd.nextInt('a', 'z' + 1)).append((char) rnd.nextInt(0x300, 0x370));
          }
        }
        break;
      case GREEK:
        for (int i = 0; i < n; i++) {
          sb.append((char) rnd.nextInt(0x370, 0x400));
        }
        break;
      case CYRILLIC:
        for (int i = 0; i < n; i++) {
          sb.append((char) rnd.nextInt(0x400, 0x530));
        }
        break;
      case CJK:
        for (int i = 0; i < n; i++) {
          int pick = rnd.nextInt(3);
          sb.append((char) (pick == 0 ? rnd.nextInt(0x4E00, 0xA000) // CJK Unified Ideographs
              : pick == 1 ? rnd.nextInt(0x3041, 0x3097) : rnd.nextInt(0x30A1, 0x30FB))); // Hiragana, Katakana
        }
        break;
      case EMOJI:
        for (int i = 0; i < n; i++) {
          sb.appendCodePoint(rnd.nextInt(0x1F600, 0x1F650));
          if (rnd.nextBoolean()) {
            sb.appendCodePoint(rnd.nextInt(0x1F3FB, 0x1F400)); // skin-tone modifier (UTS #51 2.4)
          }
          if (rnd.nextBoolean()) {
            sb.append('\u200D').appendCodePoint(rnd.nextBoolean() ? 0x2764 : 0x1F9D1); // ZWJ sequence (UTS #51 2.3)
            if (rnd.nextBoolean()) {
              sb.append('\uFE0F'); // variation selector 16
            }
          }
        }
        break;
      case COMBINING_STACK:
        sb.append((char) rnd.nextInt('a', 'z' + 1));
        for (int i = 0, m = rnd.nextInt(1, 40); i < m; i++) {
          sb.append((char) (rnd.nextBoolean() ? rnd.nextInt(0x300, 0x370) : rnd.nextInt(0x1AB0, 0x1ABF)));
        }
        break;
      case HANGUL:
        for (int i = 0; i < n; i++) {
          if (rnd.nextBoolean()) {
            sb.append((char) rnd.nextInt(0xAC00, 0xD7A4));
          } else { // conjoining jamo L V (T)
            sb.append((char) rnd.nextInt(0x1100, 0x1113)).append((char) rnd.nextInt(0x1161, 0x1176));
            if (rnd.nextBoolean()) {
              sb.append((char) rnd.nextInt(0x11A8, 0x11C3));
            }
          }
        }
        break;
      case SUPPLEMENTARY:
        for (int i = 0; i < n; i++) {
          int pick = rnd.nextInt(4);
          sb.appendCodePoint(pick == 0 ? rnd.nextInt(0x10400, 0x10450) // Deseret (cased)
              : pick == 1 ? rnd.nextInt(0x1D400, 0x1D800) // mathematical alphanumerics (compatibility)
              : pick == 2 ? rnd.nextInt(0x20000, 0x2A6E0) // CJK Extension B
              : rnd.nextInt(0x10000, 0x110000)); // anything, assigned or not
        }
        break;
      case LONE_SURROGATES:
        for (int i = 0; i < n; i++) {
          int pick = rnd.nextInt(3);
          if (pick == 0) {
            sb.append((char) rnd.nextInt(0xD800, 0xDC00)); // high alone
          } else if (pick == 1) {
            sb.append((char) rnd.nextInt(0xDC00, 0xE000)); // low alone
          } else { // reversed pair: low then high, both lone
            sb.append((char) rnd.nextInt(0xDC00, 0xE000)).append((char) rnd.nextInt(0xD800, 0xDC00));
          }
        }
        break;
      case CONTROLS:
        for (int i = 0; i < n; i++) {
          int pick = rnd.nextInt(4);
          sb.append((char) (pick == 0 ? rnd.nextInt(0, 0x20) : pick == 1 ? rnd.nextInt(0x7F, 0xA0)
              : pick == 2 ? "\u200B\u200C\u200D\u2028\u2029\u00AD\uFEFF\u202E".charAt(rnd.nextInt(8))
              : rnd.nextInt(0xE000, 0xE100))); // private use
        }
        break;
      case LONG_PIECE:
        for (int i = 0, m = rnd.nextInt(100, 600); i < m; i++) {
          sb.append(rnd.nextInt(8) == 0 ? (char) rnd.nextInt(0xE0, 0x100) : (char) rnd.nextInt('a', 'z' + 1));
        }
        break;
      case COMPATIBILITY:
        for (int i = 0; i < n; i++) {
          int pick = rnd.nextInt(4);
          sb.append((char) (pick == 0 ? rnd.nextInt(0xFB00, 0xFB07) // ligatures
              : pick == 1 ? rnd.nextInt(0xFF01, 0xFF5F) // fullwidth ASCII
              : pick == 2 ? rnd.nextInt(0x2460, 0x2474) // circled digits
              : "\u2126\u212A\u212B\u00DF\u0130\u1E9E\u03A3\u03C2".charAt(rnd.nextInt(8)))); // Ohm, Kelvin, ...
        }
        break;
      default:
        throw new AssertionError(kind);
    }
  }

  /**
   * The text as a Java string literal body: printable ASCII as is, backslash and quote escaped,
   * everything else as {@code \}{@code uXXXX} per UTF-16 unit, cut after {@code max} units.
   */
  public static String escape(CharSequence text, int max) {
    StringBuilder sb = new StringBuilder(Math.min(text.length(), max) + 16);
    int n = Math.min(text.length(), max);
    for (int i = 0; i < n; i++) {
      char c = text.charAt(i);
      if (c == '\\' || c == '"') {
        sb.append('\\').append(c);
      } else if (c >= 0x20 && c < 0x7F) {
        sb.append(c);
      } else {
        sb.append(String.format("\\u%04X", (int) c));
      }
    }
    if (n < text.length()) {
      sb.append("...(").append(text.length() - n).append(" more units)");
    }
    return sb.toString();
  }

  /** The replay line printed for a failing case. */
  public static String replay(String property, long seed, CharSequence text) {
    return property + " failed for seed=0x" + Long.toHexString(seed) + " (replay with -D" + Seeds.REPLAY_PROPERTY
        + "=0x" + Long.toHexString(seed) + "), input (" + text.length() + " units) = \"" + escape(text, 4000) + "\"";
  }
}
