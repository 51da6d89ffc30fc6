package dev.morsel.tokenize.split;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.lang.UProperty;
import com.ibm.icu.text.BreakIterator;
import com.ibm.icu.util.ULocale;
import java.util.Objects;

/**
 * How normalized text is split into pieces before segmentation. Immutable and thread-safe.
 *
 * <h2>Contract</h2>
 * {@link #split(CharSequence, int, int, PieceSink)} reports pieces of {@code text[start, end)} that
 * are non-empty, in order and cover the range exactly, so the pieces concatenate back to the text
 * (lossless). A piece never starts or ends between the two halves of a surrogate pair that lies
 * inside the range. Splitting allocates nothing per piece; it runs in time linear in the length of
 * the range. There is no cap on piece length: a 10 MiB run of letters is one piece, and segmenters
 * must cope with long pieces.
 *
 * <h2>Modes</h2>
 * <ul>
 *   <li>{@link Mode#RUNS} ({@code "runs:space=S,digits=D"}): class runs, Morsel's own rules on
 *       Unicode properties, below. {@link #runs()} is the default of {@link
 *       dev.morsel.tokenize.Pipeline#defaults()}, chosen by measurement (docs/splitting.md).
 *   <li>{@link Mode#WORDS} ({@code "words"}): the default word boundaries of UAX #29 [1], as
 *       implemented by ICU's root-locale word break iterator (which adds dictionary-based breaks
 *       inside runs of Thai, Lao, Khmer, Burmese and CJK text). Every boundary is a piece boundary,
 *       spaces included.
 *   <li>{@link Mode#WHITESPACE} ({@code "whitespace"}): maximal runs of {@code White_Space} code
 *       points and maximal runs of other code points.
 *   <li>{@link Mode#NONE} ({@code "none"}): the whole range is one piece (none if it is empty).
 * </ul>
 *
 * <h2>Class runs</h2>
 * Each code point gets one class, checked in this order:
 * <ol>
 *   <li><b>newline</b>: U+000A..U+000D, U+0085, U+2028, U+2029;
 *   <li><b>space</b>: any other {@code White_Space} code point (U+0020, tab, no-break space...);
 *   <li><b>mark</b>: general category M*, or grapheme-cluster-break value Extend, ZWJ or
 *       SpacingMark [2] (so U+200C, U+200D, variation selectors, emoji modifiers U+1F3FB..U+1F3FF
 *       and emoji tag characters are marks);
 *   <li><b>ideograph</b>: {@code Unified_Ideograph} (Hiragana and Katakana are not ideographs: kana
 *       runs are letters);
 *   <li><b>letter</b>: L*; <b>digit</b>: Nd; <b>punctuation</b>: P*;
 *   <li><b>replacement</b>: U+FFFD alone (so decoding damage never merges with real symbols);
 *   <li><b>symbol</b>: S*;
 *   <li><b>other</b>: anything else, one class per general category (Cc, Cf, Co, Cn, Nl, No and Cs
 *       for unpaired surrogates).
 * </ol>
 * Pieces are then:
 * <ul>
 *   <li>a maximal run of one class among letter, punctuation, symbol, replacement and each "other"
 *       category; a mark always continues the piece before it (it stays in its grapheme cluster), and
 *       an {@code Extended_Pictographic} code point continues the piece when it follows
 *       {@code Extended_Pictographic Extend* U+200D} (rule GB11 of [2]), so emoji ZWJ sequences and
 *       skin tones are never cut. An apostrophe is punctuation even
 *       between letters: {@code "ferry's"} is {@code "ferry" "'" "s"} (kept simple on purpose).
 *       A mark with nothing before it in its piece (at the start, or after whitespace) starts a
 *       piece of marks;
 *   <li>a run of digits, cut into groups of at most {@link #digitGroup()} digits counted from the
 *       start of the run ({@code digits=2}: {@code "20260"} is {@code "20" "26" "0"}), or kept
 *       whole ({@code digits=whole}, {@link #WHOLE_DIGIT_RUNS});
 *   <li>each ideograph alone (with its marks);
 *   <li>a run of newlines; a run of spaces, which lends one U+0020 to a neighbour as
 *       {@link #space()} says:
 *       <ul>
 *         <li>{@link Space#OWN} ({@code space=own}): never; {@code "the ferry"} is
 *             {@code "the" " " "ferry"};
 *         <li>{@link Space#NEXT} ({@code space=next}): if the run ends with U+0020 and a
 *             non-whitespace piece follows, that last U+0020 joins the front of the following piece:
 *             {@code "the" " ferry"}, {@code "a   ferry"} is {@code "a" "  " " ferry"};
 *         <li>{@link Space#PREVIOUS} ({@code space=previous}): if the run starts with U+0020 right
 *             after a non-whitespace piece, that first U+0020 joins the end of that piece:
 *             {@code "the " "ferry"}, {@code "a   ferry"} is {@code "a " "  " "ferry"}.
 *       </ul>
 *       Newlines never lend or take a space; what is left of a run is its own piece.
 * </ul>
 * Characters below U+0080 are classified by a 128-entry table in a tight loop; the rest of the BMP
 * by a 64 KiB table built from ICU properties on first use; supplementary code points by ICU
 * directly.
 *
 * <p>References: [1] Unicode Standard Annex #29, "Unicode Text Segmentation", section 4 (Word
 * Boundaries). [2] the same annex, section 3 (Grapheme Cluster Boundaries), table 2.
 *
 * @since 0.1.0
 */
public final class Splitting {
  /**
   * The splitting rule set.
   *
   * @since 0.1.0
   */
  public enum Mode {
    /** Class runs: runs of one character class, with a space policy and a digit group. */
    RUNS,
    /** UAX #29 word boundaries. */
    WORDS,
    /** Runs of whitespace and runs of everything else. */
    WHITESPACE,
    /** The whole text is one piece. */
    NONE
  }

  /**
   * Where the class-run rules put one U+0020 of a space run.
   *
   * @since 0.1.0
   */
  public enum Space {
    /** Space runs are always pieces of their own (spec {@code space=own}). */
    OWN("own"),
    /** The last U+0020 of a run joins the front of the following word (spec {@code space=next}). */
    NEXT("next"),
    /** The first U+0020 of a run joins the end of the preceding word (spec {@code space=previous}). */
    PREVIOUS("previous");

    private final String spec;

    Space(String spec) {
      this.spec = spec;
    }

    /** The spelling in a spec string: {@code own}, {@code next} or {@code previous}. */
    public String spec() {
      return spec;
    }
  }

  // ---------------------------------------------------------------- configuration

  /** {@link #digitGroup()} value meaning digit runs are never cut by length (spec {@code digits=whole}). */
  public static final int WHOLE_DIGIT_RUNS = 0;
  /**
   * Space policy of {@link #runs()}: chosen by the held-out measurement in docs/splitting.md
   * ({@code SplittingStudy} in tokenize-bench).
   */
  private static final Space DEFAULT_SPACE = Space.NEXT;
  /** Digit group of {@link #runs()}: chosen by the same measurement. */
  private static final int DEFAULT_DIGIT_GROUP = WHOLE_DIGIT_RUNS;
  /** Longest digit group allowed; a limit so a group always fits a small scratch buffer. */
  private static final int MAX_DIGIT_GROUP = 64;

  private static final String RUNS_PREFIX = "runs:space=";
  private static final String DIGITS_KEY = ",digits=";
  private static final String WHOLE = "whole";

  private static final Splitting WORDS = new Splitting(Mode.WORDS, Space.OWN, 0, "words");
  private static final Splitting WHITESPACE = new Splitting(Mode.WHITESPACE, Space.OWN, 0, "whitespace");
  private static final Splitting NONE = new Splitting(Mode.NONE, Space.OWN, 0, "none");

  // ---------------------------------------------------------------- state

  private final Mode mode;
  private final Space space;
  private final int digitGroup;
  private final String spec;

  // ---------------------------------------------------------------- life-cycle

  private Splitting(Mode mode, Space space, int digitGroup, String spec) {
    this.mode = mode;
    this.space = space;
    this.digitGroup = digitGroup;
    this.spec = spec;
  }

  /**
   * The default class runs, {@code runs:space=next,digits=whole}: the last U+0020 of a space run
   * joins the next word, digit runs stay whole. Chosen by the held-out measurement in
   * docs/splitting.md.
   */
  public static Splitting runs() {
    return runs(DEFAULT_SPACE, DEFAULT_DIGIT_GROUP);
  }

  /**
   * Class runs with the given space policy and digit groups of at most {@code digitGroup} digits
   * (1..64), or whole digit runs ({@link #WHOLE_DIGIT_RUNS}).
   *
   * @throws IllegalArgumentException if {@code digitGroup} is outside 0..64
   */
  public static Splitting runs(Space space, int digitGroup) {
    Objects.requireNonNull(space, "space");
    if (digitGroup < 0 || digitGroup > MAX_DIGIT_GROUP) {
      throw new IllegalArgumentException("digitGroup=" + digitGroup + " is outside 1.." + MAX_DIGIT_GROUP
          + " (or " + WHOLE_DIGIT_RUNS + " for whole digit runs)");
    }
    String digits = digitGroup == WHOLE_DIGIT_RUNS ? WHOLE : Integer.toString(digitGroup);
    return new Splitting(Mode.RUNS, space, digitGroup, RUNS_PREFIX + space.spec() + DIGITS_KEY + digits);
  }

  /** UAX #29 word boundaries. */
  public static Splitting words() {
    return WORDS;
  }

  /** Runs of whitespace and runs of non-whitespace. */
  public static Splitting whitespace() {
    return WHITESPACE;
  }

  /** The whole text is one piece. */
  public static Splitting none() {
    return NONE;
  }

  /**
   * Parses a {@link #spec()} string: {@code "runs:space=S,digits=D"} with S one of {@code own},
   * {@code next}, {@code previous} and D either {@code whole} or 1..64 written without sign or
   * leading zeros (both keys, in this order); or {@code "words"}, {@code "whitespace"},
   * {@code "none"}. Only these canonical spellings are accepted.
   *
   * @throws IllegalArgumentException for any other string, quoting it and saying what was wrong
   */
  public static Splitting parse(String spec) {
    Objects.requireNonNull(spec, "spec");
    switch (spec) {
      case "words":
        return WORDS;
      case "whitespace":
        return WHITESPACE;
      case "none":
        return NONE;
      default:
        break;
    }
    if (!spec.startsWith("runs")) {
      throw badSpec(spec, "unknown mode");
    }
    if (!spec.startsWith(RUNS_PREFIX)) {
      throw badSpec(spec, "class runs are written 'runs:space=S,digits=D'");
    }
    int comma = spec.indexOf(DIGITS_KEY, RUNS_PREFIX.length());
    if (comma < 0) {
      throw badSpec(spec, "missing ',digits=' after the space policy");
    }
    String spaceName = spec.substring(RUNS_PREFIX.length(), comma);
    Space space = null;
    for (Space s : Space.values()) {
      if (s.spec().equals(spaceName)) {
        space = s;
      }
    }
    if (space == null) {
      throw badSpec(spec, "space policy '" + spaceName + "' is not own, next or previous");
    }
    String digits = spec.substring(comma + DIGITS_KEY.length());
    if (digits.equals(WHOLE)) {
      return runs(space, WHOLE_DIGIT_RUNS);
    }
    if (!digits.isEmpty() && digits.length() <= 2 && digits.charAt(0) != '0'
        && digits.chars().allMatch(c -> c >= '0' && c <= '9')) {
      int n = Integer.parseInt(digits);
      if (n <= MAX_DIGIT_GROUP) {
        return runs(space, n);
      }
    }
    throw badSpec(spec, "digit group '" + digits + "' is not 'whole' or 1.." + MAX_DIGIT_GROUP
        + " without sign or leading zeros");
  }

  private static IllegalArgumentException badSpec(String spec, String why) {
    return new IllegalArgumentException("unknown splitting spec '" + spec + "' (" + why
        + "); expected 'runs:space=own|next|previous,digits=whole|1.." + MAX_DIGIT_GROUP
        + "', 'words', 'whitespace' or 'none'");
  }

  // ---------------------------------------------------------------- API

  /** Canonical text form, for example {@code "runs:space=own,digits=whole"}, {@code "words"}. */
  public String spec() {
    return spec;
  }

  /** The mode. */
  public Mode mode() {
    return mode;
  }

  /**
   * The space policy of {@link Mode#RUNS}; {@link Space#OWN} for the other modes (none of them
   * joins a space to a word).
   *
   * @since 0.1.0
   */
  public Space space() {
    return space;
  }

  /**
   * The longest digit group of {@link Mode#RUNS}; {@link #WHOLE_DIGIT_RUNS} (0) when digit runs
   * are not cut by length, as in the other modes.
   *
   * @since 0.1.0
   */
  public int digitGroup() {
    return digitGroup;
  }

  /**
   * Splits {@code text[start, end)}, reporting absolute indices of {@code text}. Thread-safe;
   * allocates nothing per piece.
   *
   * @throws IndexOutOfBoundsException if the range is not inside the text
   */
  public void split(CharSequence text, int start, int end, PieceSink sink) {
    Objects.requireNonNull(text, "text");
    Objects.requireNonNull(sink, "sink");
    Objects.checkFromToIndex(start, end, text.length());
    if (start == end) {
      return;
    }
    switch (mode) {
      case RUNS:
        splitRuns(text, start, end, space, digitGroup == WHOLE_DIGIT_RUNS ? Integer.MAX_VALUE : digitGroup, sink);
        break;
      case WHITESPACE:
        splitWhitespace(text, start, end, sink);
        break;
      case WORDS:
        splitWords(text, start, end, sink);
        break;
      default:
        sink.piece(start, end);
        break;
    }
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Splitting && spec.equals(((Splitting) o).spec);
  }

  @Override
  public int hashCode() {
    return spec.hashCode();
  }

  @Override
  public String toString() {
    return "Splitting[" + spec + "]";
  }

  // ---------------------------------------------------------------- internals: classes

  static final byte NEWLINE = 1;
  static final byte SPACE = 2;
  static final byte MARK = 3;
  static final byte IDEOGRAPH = 4;
  static final byte LETTER = 5;
  static final byte DIGIT = 6;
  static final byte PUNCT = 7;
  static final byte REPLACEMENT = 8;
  static final byte SYMBOL = 9;
  /** "Other" classes are OTHER_BASE + ICU general category (0..29), so each category is its own run type. */
  static final byte OTHER_BASE = 32;

  private static final int ZWJ = 0x200D;

  /** Class of each char below U+0080: the fast path. */
  private static final byte[] ASCII = new byte[128];

  static {
    for (int c = 0; c < 128; c++) {
      ASCII[c] = classifyIcu(c);
    }
  }

  /** Classes of the BMP, built on first use of a non-ASCII char (64 KiB, a few ms of ICU lookups). */
  private static final class Bmp {
    static final byte[] TABLE = new byte[0x10000];

    static {
      for (int c = 0; c < 0x10000; c++) {
        TABLE[c] = classifyIcu(c);
      }
    }
  }

  /** The class-run class of a code point, from ICU properties (the slow path). */
  static byte classifyIcu(int cp) {
    if (cp == 0x0A || cp == 0x0B || cp == 0x0C || cp == 0x0D || cp == 0x85 || cp == 0x2028 || cp == 0x2029) {
      return NEWLINE;
    }
    if (UCharacter.hasBinaryProperty(cp, UProperty.WHITE_SPACE)) {
      return SPACE;
    }
    int type = UCharacter.getType(cp);
    int gcb = UCharacter.getIntPropertyValue(cp, UProperty.GRAPHEME_CLUSTER_BREAK);
    if (type == UCharacter.NON_SPACING_MARK || type == UCharacter.ENCLOSING_MARK
        || type == UCharacter.COMBINING_SPACING_MARK
        || gcb == UCharacter.GraphemeClusterBreak.EXTEND || gcb == UCharacter.GraphemeClusterBreak.ZWJ
        || gcb == UCharacter.GraphemeClusterBreak.SPACING_MARK
        || UCharacter.hasBinaryProperty(cp, UProperty.EMOJI_MODIFIER)) {
      return MARK;
    }
    if (UCharacter.hasBinaryProperty(cp, UProperty.UNIFIED_IDEOGRAPH)) {
      return IDEOGRAPH;
    }
    switch (type) {
      case UCharacter.UPPERCASE_LETTER:
      case UCharacter.LOWERCASE_LETTER:
      case UCharacter.TITLECASE_LETTER:
      case UCharacter.MODIFIER_LETTER:
      case UCharacter.OTHER_LETTER:
        return LETTER;
      case UCharacter.DECIMAL_DIGIT_NUMBER:
        return DIGIT;
      case UCharacter.CONNECTOR_PUNCTUATION:
      case UCharacter.DASH_PUNCTUATION:
      case UCharacter.START_PUNCTUATION:
      case UCharacter.END_PUNCTUATION:
      case UCharacter.INITIAL_PUNCTUATION:
      case UCharacter.FINAL_PUNCTUATION:
      case UCharacter.OTHER_PUNCTUATION:
        return PUNCT;
      default:
        break;
    }
    if (cp == 0xFFFD) {
      return REPLACEMENT;
    }
    switch (type) {
      case UCharacter.MATH_SYMBOL:
      case UCharacter.CURRENCY_SYMBOL:
      case UCharacter.MODIFIER_SYMBOL:
      case UCharacter.OTHER_SYMBOL:
        return SYMBOL;
      default:
        return (byte) (OTHER_BASE + type);
    }
  }

  /** Class of a non-ASCII code point (unpaired surrogates are classified as themselves, category Cs). */
  private static byte classifyNonAscii(int cp) {
    return cp < 0x10000 ? Bmp.TABLE[cp] : classifyIcu(cp);
  }

  /**
   * Whether the piece that began at {@code from} may continue with code point {@code cp} of class
   * {@code cls} at {@code i}: a mark always does; a pictograph does when it follows
   * {@code Extended_Pictographic Extend* ZWJ} (UAX #29 rule GB11).
   */
  private static boolean joinsPrevious(CharSequence text, int from, int i, int cp, byte cls) {
    if (cls == MARK) {
      return true;
    }
    if (text.charAt(i - 1) != ZWJ || !UCharacter.hasBinaryProperty(cp, UProperty.EXTENDED_PICTOGRAPHIC)) {
      return false;
    }
    // walk back over the marks before the ZWJ; linear overall, as each walk stops at the last non-mark
    int j = i - 1;
    while (j > from) {
      int before = text.charAt(j - 1);
      if (Character.isLowSurrogate((char) before) && j - 2 >= from && Character.isHighSurrogate(text.charAt(j - 2))) {
        before = Character.toCodePoint(text.charAt(j - 2), (char) before);
      }
      if (classifyAny(before) != MARK) {
        return UCharacter.hasBinaryProperty(before, UProperty.EXTENDED_PICTOGRAPHIC);
      }
      j -= Character.charCount(before);
    }
    return false;
  }

  private static byte classifyAny(int cp) {
    return cp < 128 ? ASCII[cp] : classifyNonAscii(cp);
  }

  /** The code point at {@code i}, not looking at or beyond {@code end} for a low surrogate. */
  private static int codePointAt(CharSequence text, int i, int end) {
    char c = text.charAt(i);
    if (Character.isHighSurrogate(c) && i + 1 < end) {
      char d = text.charAt(i + 1);
      if (Character.isLowSurrogate(d)) {
        return Character.toCodePoint(c, d);
      }
    }
    return c;
  }

  private static byte classAt(CharSequence text, int i, int end) {
    char c = text.charAt(i);
    return c < 128 ? ASCII[c] : classifyNonAscii(codePointAt(text, i, end));
  }

  // ---------------------------------------------------------------- internals: RUNS

  private static void splitRuns(CharSequence text, int start, int end, Space space, int digitGroup, PieceSink sink) {
    final byte[] ascii = ASCII;
    final boolean toNext = space == Space.NEXT;
    final boolean toPrevious = space == Space.PREVIOUS;
    int i = start;
    int pending = -1; // index of a U+0020 detached from a space run, waiting for the next piece
    while (i < end) {
      char c = text.charAt(i);
      byte cls;
      int n = 1;
      if (c < 128) {
        cls = ascii[c];
      } else {
        int cp = codePointAt(text, i, end);
        n = Character.charCount(cp);
        cls = classifyNonAscii(cp);
      }
      int pieceStart = pending >= 0 ? pending : i;
      pending = -1;
      int j;
      switch (cls) {
        case NEWLINE:
          j = scanSame(text, i + n, end, NEWLINE);
          sink.piece(pieceStart, j);
          break;
        case SPACE:
          j = scanSame(text, i + n, end, SPACE);
          if (toNext && j < end && text.charAt(j - 1) == ' ' && classAt(text, j, end) > SPACE) {
            if (j - 1 > pieceStart) {
              sink.piece(pieceStart, j - 1);
            }
            pending = j - 1;
          } else {
            sink.piece(pieceStart, j);
          }
          break;
        case DIGIT:
          j = scanDigits(text, i, i + n, end, digitGroup - 1);
          j = emit(text, pieceStart, j, end, toPrevious, sink);
          break;
        case IDEOGRAPH:
          j = scanRun(text, i, i + n, end, MARK);
          j = emit(text, pieceStart, j, end, toPrevious, sink);
          break;
        default:
          j = scanRun(text, i, i + n, end, cls);
          j = emit(text, pieceStart, j, end, toPrevious, sink);
          break;
      }
      i = j;
    }
  }

  /**
   * Reports the non-whitespace piece {@code [from, to)}, taking the U+0020 right after it when
   * {@code takeSpace}; returns where the next piece starts.
   */
  private static int emit(CharSequence text, int from, int to, int end, boolean takeSpace, PieceSink sink) {
    if (takeSpace && to < end && text.charAt(to) == ' ') {
      to++;
    }
    sink.piece(from, to);
    return to;
  }

  /** End of the run of whitespace class {@code cls} from {@code i} (whitespace takes no marks). */
  private static int scanSame(CharSequence text, int i, int end, byte cls) {
    final byte[] ascii = ASCII;
    while (i < end) {
      char c = text.charAt(i);
      if (c < 128) {
        if (ascii[c] != cls) {
          return i;
        }
        i++;
      } else {
        int cp = codePointAt(text, i, end);
        if (classifyNonAscii(cp) != cls) {
          return i;
        }
        i += Character.charCount(cp);
      }
    }
    return i;
  }

  /** End of the run of class {@code cls} (plus marks and ZWJ-joined pictographs) from {@code i}; the piece began at {@code from}. */
  private static int scanRun(CharSequence text, int from, int i, int end, byte cls) {
    final byte[] ascii = ASCII;
    while (i < end) {
      char c = text.charAt(i);
      if (c < 128) {
        if (ascii[c] != cls) {
          return i;
        }
        i++;
      } else {
        int cp = codePointAt(text, i, end);
        byte k = classifyNonAscii(cp);
        if (k != cls && !joinsPrevious(text, from, i, cp, k)) {
          return i;
        }
        i += Character.charCount(cp);
      }
    }
    return i;
  }

  /** End of a digit group from {@code i} that may take {@code left} more digits (and any marks). */
  private static int scanDigits(CharSequence text, int from, int i, int end, int left) {
    final byte[] ascii = ASCII;
    while (i < end) {
      char c = text.charAt(i);
      if (c < 128) {
        if (ascii[c] != DIGIT || left == 0) {
          return i;
        }
        left--;
        i++;
      } else {
        int cp = codePointAt(text, i, end);
        byte k = classifyNonAscii(cp);
        if (k == DIGIT) {
          if (left == 0) {
            return i;
          }
          left--;
        } else if (!joinsPrevious(text, from, i, cp, k)) {
          return i;
        }
        i += Character.charCount(cp);
      }
    }
    return i;
  }

  // ---------------------------------------------------------------- internals: WHITESPACE

  /** White_Space for chars below U+0080: TAB, LF, VT, FF, CR, SPACE. */
  private static final boolean[] ASCII_WS = new boolean[128];

  static {
    for (int c = 0; c < 128; c++) {
      ASCII_WS[c] = UCharacter.hasBinaryProperty(c, UProperty.WHITE_SPACE);
    }
  }

  private static boolean isWhiteSpace(char c) {
    // every White_Space code point is in the BMP and none is a surrogate, so chars suffice and a
    // surrogate pair always falls inside one non-whitespace run
    return c < 128 ? ASCII_WS[c] : UCharacter.hasBinaryProperty(c, UProperty.WHITE_SPACE);
  }

  private static void splitWhitespace(CharSequence text, int start, int end, PieceSink sink) {
    int pieceStart = start;
    boolean ws = isWhiteSpace(text.charAt(start));
    for (int i = start + 1; i < end; i++) {
      boolean w = isWhiteSpace(text.charAt(i));
      if (w != ws) {
        sink.piece(pieceStart, i);
        pieceStart = i;
        ws = w;
      }
    }
    sink.piece(pieceStart, end);
  }

  // ---------------------------------------------------------------- internals: WORDS

  /** Loaded on first use of WORDS mode only (ICU reads its break rules then). */
  private static final class Words {
    static final BreakIterator PROTOTYPE = BreakIterator.getWordInstance(ULocale.ROOT);

    /** BreakIterator is not thread-safe: one clone per thread. */
    static final ThreadLocal<BreakIterator> ITERATOR =
        ThreadLocal.withInitial(() -> PROTOTYPE.clone());
  }

  private static void splitWords(CharSequence text, int start, int end, PieceSink sink) {
    BreakIterator it = Words.ITERATOR.get();
    CharSequence range = start == 0 && end == text.length() ? text : text.subSequence(start, end);
    it.setText(range);
    try {
      int from = it.first();
      for (int to = it.next(); to != BreakIterator.DONE; to = it.next()) {
        sink.piece(start + from, start + to);
        from = to;
      }
    } finally {
      it.setText(""); // do not keep the caller's text reachable from the thread
    }
  }
}
