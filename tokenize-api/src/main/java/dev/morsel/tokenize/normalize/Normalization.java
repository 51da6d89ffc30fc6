package dev.morsel.tokenize.normalize;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.lang.UCharacterCategory;
import com.ibm.icu.text.Normalizer2;
import java.util.Locale;
import java.util.Objects;

/**
 * Unicode normalization settings, applied with exact alignment back to the original text.
 *
 * <p>Immutable and thread-safe: one instance may serve any number of threads. {@link #apply}
 * returns a {@link NormalizedText} that maps every normalized char back to an original
 * {@code [start, end)} in UTF-16 units of the caller's text.
 *
 * <h2>Steps, in this fixed order</h2>
 * <ol>
 *   <li><b>Lone surrogates</b> become U+FFFD, always. This is one char for one char, so the offsets
 *       of the replacement point at the surrogate. A pair cut by the end of the range counts as
 *       lone.</li>
 *   <li><b>{@code drop-controls}</b>: removes general category Cc except TAB, LF, VT, FF, CR and
 *       NEL (U+0085), which carry layout.</li>
 *   <li><b>The form</b> ({@link Form}), with its options:
 *     <ul>
 *       <li>{@code casefold}: full Unicode case folding (CaseFolding.txt statuses C and F). With NFKC
 *           it is ICU's NFKC_Casefold mapping, which also removes default-ignorable code points;
 *           with another form it is {@code form(fold(decompose(x)))}; with {@link Form#NONE} it
 *           folds each code point and does nothing else.</li>
 *       <li>{@code remove-marks}: decomposes (NFKD for NFKC/NFKD, NFD otherwise), removes
 *           nonspacing marks (general category Mn), then recomposes if the form is NFC or NFKC.
 *           With {@link Form#NONE} only the chunks that lost a mark are recomposed (NFC); the rest
 *           stays as written.</li>
 *     </ul></li>
 *   <li><b>{@code collapse-spaces}</b>: every run of White_Space characters that are not line
 *       breaks becomes one U+0020. Line breaks (LF, VT, FF, CR, U+0085, U+2028, U+2029) are kept.
 *       This is lossy on purpose: the original spacing survives only in the offsets.</li>
 * </ol>
 * A run of more than 30 non-starters is cut after each 30 and continued after an inserted U+034F
 * COMBINING GRAPHEME JOINER (UAX #15 section 13, Stream-Safe Text Format), which keeps the time
 * linear on any input; real text never has such runs.
 *
 * <h2>Spec strings</h2>
 * {@link #spec()} is {@code "none"} or the form name in lowercase followed by the options joined
 * with {@code '+'} in the fixed order {@code casefold}, {@code remove-marks},
 * {@code drop-controls}, {@code collapse-spaces}; for example
 * {@code "nfkc+casefold+remove-marks+drop-controls+collapse-spaces"} or {@code "none+casefold"}.
 * Two instances are equal when their specs are equal.
 *
 * <h2>Implementation note</h2>
 * Normalization runs chunk by chunk between normalization boundaries as defined by Unicode
 * Standard Annex #15 [1] (ICU's {@code Normalizer2.hasBoundaryBefore}); text that passes the quick
 * check of UAX #15 section 9 [1] ({@code spanQuickCheckYes}) is neither copied nor re-normalized,
 * and ASCII runs take a table-free fast path (ASCII is always normalized and always a boundary).
 * Case folding follows the Unicode Standard, chapter 3.13 [2].
 * <ol>
 *   <li>Unicode Standard Annex #15, Unicode Normalization Forms (revision for Unicode 15.0).</li>
 *   <li>The Unicode Standard, Version 15.0, section 3.13 Default Case Algorithms.</li>
 * </ol>
 *
 * @since 0.1.0
 */
public final class Normalization {
  /**
   * The Unicode normalization form applied first.
   *
   * @since 0.1.0
   */
  public enum Form {
    /** No normalization form; options still apply. */
    NONE,
    /** Canonical decomposition followed by canonical composition (UAX #15). */
    NFC,
    /** Canonical decomposition (UAX #15). */
    NFD,
    /** Compatibility decomposition followed by canonical composition (UAX #15). */
    NFKC,
    /** Compatibility decomposition (UAX #15). */
    NFKD
  }

  // ---- configuration ------------------------------------------------------------------------

  private static final String OPT_CASEFOLD = "casefold";
  private static final String OPT_STRIP = "remove-marks";
  private static final String OPT_CONTROLS = "drop-controls";
  private static final String OPT_SPACES = "collapse-spaces";
  private static final String VALID_NAMES =
      "none, nfc, nfd, nfkc, nfkd, casefold, remove-marks, drop-controls, collapse-spaces";

  private static final Normalization NONE = new Normalization(Form.NONE, false, false, false, false);

  /**
   * Most non-starters (canonical combining class != 0) in a row inside one chunk: UAX #15 section 13,
   * Stream-Safe Text Format. Longer runs are cut there and U+034F COMBINING GRAPHEME JOINER starts
   * the continuation, so no chunk is long and canonical reordering stays linear in total (measured once
   * with a scratch program on the 2-core development machine, not JMH: without the cut 100,000
   * alternating marks took 6.7 s under NFC, quadratic; with it 51 ms, and 1,000,000 took 67 ms).
   */
  private static final int MAX_NON_STARTERS = 30;
  /** UAX #15 section 13: the starter inserted at a cut. */
  private static final String CGJ = "\u034F";
  /** Marks an unchanged entry in the one-char cache of the slow path (compared by identity). */
  private static final String SAME = new String("");

  // ---- state ----------------------------------------------------------------------------------

  private final Form form;
  private final boolean caseFold;
  private final boolean removeMarks;
  private final boolean dropControls;
  private final boolean collapseSpaces;
  private final String spec;

  /** True when nothing but the lone-surrogate step runs. */
  private final boolean passThrough;
  /** True when step 3 does anything. */
  private final boolean formStep;
  /** ICU instance whose quick check decides step 3 alone (plain forms, NFKC_Casefold); else null. */
  private final Normalizer2 quick;
  /** Boundaries for chunking step 3 when {@link #quick} is null; null means every code point. */
  private final Normalizer2 bound;
  /** The form's own instance (NFKC_Casefold for nfkc+casefold); null for NONE. */
  private final Normalizer2 formNorm;
  /** NFD or NFKD, matching the form. */
  private final Normalizer2 decomposer;
  /** Recomposer after stripping marks; null when the form is decomposed. */
  private final Normalizer2 composer;
  /** One-char results of the slow path, by page (high byte); null when the quick path is used. */
  private final String[][] singlePages;

  // ---- life-cycle -----------------------------------------------------------------------------

  private Normalization(Form form, boolean caseFold, boolean removeMarks, boolean dropControls,
      boolean collapseSpaces) {
    this.form = form;
    this.caseFold = caseFold;
    this.removeMarks = removeMarks;
    this.dropControls = dropControls;
    this.collapseSpaces = collapseSpaces;
    StringBuilder sb = new StringBuilder(form.name().toLowerCase(Locale.ROOT));
    if (caseFold) {
      sb.append('+').append(OPT_CASEFOLD);
    }
    if (removeMarks) {
      sb.append('+').append(OPT_STRIP);
    }
    if (dropControls) {
      sb.append('+').append(OPT_CONTROLS);
    }
    if (collapseSpaces) {
      sb.append('+').append(OPT_SPACES);
    }
    this.spec = sb.toString();
    this.formStep = form != Form.NONE || caseFold || removeMarks;
    this.passThrough = !formStep && !dropControls && !collapseSpaces;

    Normalizer2 fn;
    switch (form) {
      case NFC: fn = Normalizer2.getNFCInstance(); break;
      case NFD: fn = Normalizer2.getNFDInstance(); break;
      case NFKC: fn = caseFold ? Normalizer2.getNFKCCasefoldInstance() : Normalizer2.getNFKCInstance(); break;
      case NFKD: fn = Normalizer2.getNFKDInstance(); break;
      default: fn = null; break;
    }
    boolean compat = form == Form.NFKC || form == Form.NFKD;
    this.formNorm = fn;
    this.decomposer = compat ? Normalizer2.getNFKDInstance() : Normalizer2.getNFDInstance();
    if (form == Form.NFC || form == Form.NONE) {
      this.composer = Normalizer2.getNFCInstance();
    } else if (form == Form.NFKC) {
      this.composer = fn;
    } else {
      this.composer = null;
    }
    boolean plain = fn != null && !removeMarks && (!caseFold || form == Form.NFKC);
    this.quick = plain ? fn : null;
    this.singlePages = formStep && !plain ? new String[256][] : null;
    if (fn != null) {
      this.bound = fn;
    } else {
      // NONE: remove-marks recomposes with NFC, so chunk at NFC boundaries; fold alone is per code point
      this.bound = removeMarks ? Normalizer2.getNFCInstance() : null;
    }
  }

  /** No normalization at all: the text passes unchanged (lone surrogates still become U+FFFD). */
  public static Normalization none() {
    return NONE;
  }

  /** Only the given form, no other step. */
  public static Normalization of(Form form) {
    Objects.requireNonNull(form, "form");
    return form == Form.NONE ? NONE : new Normalization(form, false, false, false, false);
  }

  /** A builder starting from {@link #none()}. */
  public static Builder builder() {
    return new Builder();
  }

  /**
   * Parses a {@link #spec()} string: names joined by {@code '+'}, case-insensitive, each at most
   * once, at most one form (absent means {@code none}).
   *
   * @throws NullPointerException if {@code spec} is null
   * @throws IllegalArgumentException naming the unknown, repeated or empty part and listing the
   *     valid names
   */
  public static Normalization parse(String spec) {
    Objects.requireNonNull(spec, "spec");
    Builder b = new Builder();
    boolean formSeen = false;
    boolean[] seen = new boolean[4];
    for (String raw : spec.split("\\+", -1)) {
      String part = raw.toLowerCase(Locale.ROOT);
      int opt = -1;
      Form f = null;
      switch (part) {
        case "none": f = Form.NONE; break;
        case "nfc": f = Form.NFC; break;
        case "nfd": f = Form.NFD; break;
        case "nfkc": f = Form.NFKC; break;
        case "nfkd": f = Form.NFKD; break;
        case OPT_CASEFOLD: opt = 0; break;
        case OPT_STRIP: opt = 1; break;
        case OPT_CONTROLS: opt = 2; break;
        case OPT_SPACES: opt = 3; break;
        default: throw badSpec(spec, "unknown part '" + raw + "'");
      }
      if (f != null) {
        if (formSeen) {
          throw badSpec(spec, "second form '" + raw + "' (at most one form)");
        }
        formSeen = true;
        b.form(f);
      } else {
        if (seen[opt]) {
          throw badSpec(spec, "repeated option '" + raw + "'");
        }
        seen[opt] = true;
      }
    }
    return b.caseFold(seen[0]).removeMarks(seen[1]).dropControls(seen[2]).collapseSpaces(seen[3])
        .build();
  }

  // ---- API --------------------------------------------------------------------------------------

  /** Canonical text form, for example {@code "nfkc+casefold"}; {@code parse(spec())} equals this. */
  public String spec() {
    return spec;
  }

  /** The normalization form (added accessor). */
  public Form form() {
    return form;
  }

  /** Whether full case folding is on (added accessor). */
  public boolean caseFold() {
    return caseFold;
  }

  /** Whether nonspacing marks are removed (added accessor). */
  public boolean removeMarks() {
    return removeMarks;
  }

  /** Whether control characters other than TAB, LF, VT, FF, CR and NEL are removed (added accessor). */
  public boolean dropControls() {
    return dropControls;
  }

  /** Whether runs of non-line-break white space become one space (added accessor). */
  public boolean collapseSpaces() {
    return collapseSpaces;
  }

  /**
   * Normalizes all of {@code text}. Thread-safe.
   *
   * @throws NullPointerException if {@code text} is null
   */
  public NormalizedText apply(CharSequence text) {
    if (text == null) {
      throw new NullPointerException("text");
    }
    return apply(text, 0, text.length());
  }

  /**
   * Normalizes {@code text[start, end)}; the alignment reports absolute indices of {@code text}.
   * The range is treated as the whole text: a surrogate pair cut by {@code start} or {@code end}
   * counts as lone.
   *
   * @throws NullPointerException if {@code text} is null
   * @throws IndexOutOfBoundsException unless {@code 0 <= start <= end <= text.length()}
   */
  public NormalizedText apply(CharSequence text, int start, int end) {
    if (text == null) {
      throw new NullPointerException("text");
    }
    if (start < 0 || end > text.length() || start > end) {
      throwBadRange(start, end, text.length());
    }
    Emitter em = new Emitter();
    CharSequence cur = text;
    int cs = start;
    int ce = end;
    Chunks align = null;
    // (1) lone surrogates and (2) drop-controls, in one scan
    if (prefilter(em.reset(text, start, end), text, start, end)) {
      cur = em.text();
      align = em.chunks();
      cs = 0;
      ce = cur.length();
    }
    if (passThrough && align == null) {
      return NormalizedText.identity(text, start, end);
    }
    // (3) form, casefold, remove-marks
    if (formStep) {
      em.reset(cur, cs, ce);
      boolean changed = quick != null ? quickStep(em, cur, cs, ce) : slowStep(em, cur, cs, ce);
      if (changed) {
        Chunks c = em.chunks();
        align = align == null ? c : Chunks.compose(align, c);
        cur = em.text();
        cs = 0;
        ce = cur.length();
      }
    }
    // (4) collapse-spaces
    if (collapseSpaces && collapseStep(em.reset(cur, cs, ce), cur, cs, ce)) {
      Chunks c = em.chunks();
      align = align == null ? c : Chunks.compose(align, c);
      cur = em.text();
    }
    if (align == null) {
      return NormalizedText.identity(text, start, end);
    }
    return new NormalizedText(cur.toString(), align, start, end);
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Normalization && ((Normalization) o).spec.equals(spec);
  }

  @Override
  public int hashCode() {
    return spec.hashCode();
  }

  /** The {@link #spec()}. */
  @Override
  public String toString() {
    return spec;
  }

  // ---- internals: steps -------------------------------------------------------------------------

  /** Steps 1 and 2. Returns whether anything changed. */
  private boolean prefilter(Emitter em, CharSequence s, int from, int to) {
    final boolean drop = dropControls;
    int run = from;
    int i = from;
    while (i < to) {
      char c = s.charAt(i);
      if (c >= 0x20 && c < 0x7F) {
        i++;
      } else if (c <= 0x9F) { // C0 or DEL..C1
        if (drop && isDroppedControl(c)) {
          int j = i + 1;
          while (j < to && isDroppedControl(s.charAt(j))) {
            j++;
          }
          em.same(run, i);
          em.changed("", i, j);
          i = j;
          run = j;
        } else {
          i++;
        }
      } else if (Character.isSurrogate(c)) {
        if (Character.isHighSurrogate(c) && i + 1 < to && Character.isLowSurrogate(s.charAt(i + 1))) {
          i += 2;
        } else {
          em.same(run, i);
          em.oneToOne("\uFFFD", i, i + 1);
          i++;
          run = i;
        }
      } else {
        i++;
      }
    }
    em.same(run, to);
    return em.finish(to);
  }

  /** Cc other than TAB, LF, VT, FF, CR (U+0009..U+000D) and NEL (U+0085). */
  static boolean isDroppedControl(char c) {
    return (c < 0x20 && (c < 0x09 || c > 0x0D)) || (c >= 0x7F && c <= 0x9F && c != 0x85);
  }

  /** Step 3 when one ICU instance does all of it: quick check, slow path per chunk. */
  private boolean quickStep(Emitter em, CharSequence s, int from, int to) {
    final Normalizer2 n = quick;
    final boolean fold = caseFold;
    Window w = null;
    boolean cut = false; // the previous chunk was cut inside a run of non-starters
    int i = from;
    while (i < to) {
      if (!cut) {
        int j = asciiEnd(s, i, to);
        if (j > i) {
          if (j < to && !n.hasBoundaryBefore(cpAt(s, j, to))) {
            j--; // the last ASCII char combines with what follows (e.g. '<' + U+0338)
          }
          if (j > i) {
            ascii(em, s, i, j, fold);
            i = j;
            if (i >= to) {
              break;
            }
          }
        }
        if (w == null) {
          w = new Window();
        }
        int q = i + n.spanQuickCheckYes(w.set(s, i, to));
        if (q > i) {
          em.same(i, q);
          i = q;
          continue;
        }
      }
      int e = chunkEnd(n, s, i, to);
      String chunk = s.subSequence(i, e).toString();
      String o = n.normalize(chunk);
      if (cut) {
        em.changed(o.isEmpty() ? o : CGJ + o, i, e);
      } else if (o.equals(chunk)) {
        em.same(i, e);
      } else {
        em.changed(o, i, e);
      }
      cut = isCut(n, s, e, to);
      i = e;
    }
    return em.finish(to);
  }

  /**
   * Step 3 with fold (other than NFKC) or remove-marks: chunk by chunk; a chunk of one BMP char
   * (most chunks in practice) is looked up in {@link #single}.
   */
  private boolean slowStep(Emitter em, CharSequence s, int from, int to) {
    final Normalizer2 n = bound;
    final boolean fold = caseFold;
    boolean cut = false;
    int i = from;
    while (i < to) {
      if (!cut) {
        int j = asciiEnd(s, i, to);
        if (j > i) {
          if (j < to && n != null && !boundaryBefore(cpAt(s, j, to))) {
            j--;
          }
          if (j > i) {
            ascii(em, s, i, j, fold);
            i = j;
            if (i >= to) {
              break;
            }
          }
        }
      }
      int e = n == null ? i + Character.charCount(cpAt(s, i, to)) : chunkEnd(n, this::boundaryBefore, s, i, to);
      if (e == i + 1 && !cut && !Character.isSurrogate(s.charAt(i))) {
        String o = single(s.charAt(i));
        if (o == SAME) {
          em.same(i, e);
        } else {
          em.changed(o, i, e);
        }
      } else {
        String chunk = s.subSequence(i, e).toString();
        String o = transform(chunk);
        if (cut) {
          em.changed(o.isEmpty() ? o : CGJ + o, i, e);
        } else if (o.equals(chunk)) {
          em.same(i, e);
        } else {
          em.changed(o, i, e);
        }
      }
      cut = n != null && e < to && !boundaryBefore(cpAt(s, e, to));
      i = e;
    }
    return em.finish(to);
  }

  /**
   * Step 3 of a one-char chunk, cached per instance in pages of 256 chars allocated on first use
   * (at most 65,536 references per instance). The cache is racy on purpose, like
   * {@code String.hashCode}: entries are immutable Strings (or {@link #SAME}), so a thread either
   * sees a complete entry or null and recomputes it.
   */
  private String single(char c) {
    String[][] pages = singlePages;
    String[] page = pages[c >>> 8];
    if (page == null) {
      page = new String[256]; // unit: chars per page; one page covers a typical script block
      pages[c >>> 8] = page;
    }
    String r = page[c & 0xFF];
    if (r == null) {
      String x = String.valueOf(c);
      String o = transform(x);
      r = o.equals(x) ? SAME : o;
      page[c & 0xFF] = r;
    }
    return r;
  }

  /** Step 3 on one chunk (or a run of whole chunks) for the slow path. */
  private String transform(String x) {
    String t = x;
    if (caseFold) {
      if (form == Form.NFKC) {
        t = formNorm.normalize(t); // NFKC_Casefold
      } else if (form == Form.NONE) {
        t = UCharacter.foldCase(t, UCharacter.FOLD_CASE_DEFAULT);
      } else {
        t = formNorm.normalize(UCharacter.foldCase(decomposer.normalize(t), UCharacter.FOLD_CASE_DEFAULT));
      }
    } else if (formNorm != null) {
      t = formNorm.normalize(t);
    }
    if (removeMarks) {
      String d = decomposer.normalize(t);
      String stripped = removeNonspacingMarks(d);
      if (stripped == null) {
        return t; // no mark: t is already in the form (or untouched for NONE)
      }
      t = composer == null ? stripped : composer.normalize(stripped);
    }
    return t;
  }

  /** Removes general category Mn; null when there is none. */
  private static String removeNonspacingMarks(String d) {
    int n = d.length();
    StringBuilder sb = null;
    for (int i = 0; i < n; ) {
      int c = d.codePointAt(i);
      int len = Character.charCount(c);
      if (c >= 0x300 && UCharacter.getType(c) == UCharacterCategory.NON_SPACING_MARK) {
        if (sb == null) {
          sb = new StringBuilder(n).append(d, 0, i);
        }
      } else if (sb != null) {
        sb.appendCodePoint(c);
      }
      i += len;
    }
    return sb == null ? null : sb.toString();
  }

  /** Step 4. Returns whether anything changed. */
  private static boolean collapseStep(Emitter em, CharSequence s, int from, int to) {
    int run = from;
    int i = from;
    while (i < to) {
      char c = s.charAt(i);
      if (!isCollapsible(c)) {
        i++;
        continue;
      }
      int j = i + 1;
      while (j < to && isCollapsible(s.charAt(j))) {
        j++;
      }
      if (j - i == 1 && c == ' ') {
        i = j;
        continue;
      }
      em.same(run, i);
      if (j - i == 1) {
        em.oneToOne(" ", i, j);
      } else {
        em.changed(" ", i, j);
      }
      i = j;
      run = j;
    }
    em.same(run, to);
    return em.finish(to);
  }

  /** White_Space and not a line break (LF, VT, FF, CR, U+0085, U+2028, U+2029); all are BMP. */
  static boolean isCollapsible(char c) {
    if (c < 0x80) {
      return c == ' ' || c == '\t';
    }
    return c != 0x85 && c != 0x2028 && c != 0x2029 && UCharacter.isUWhiteSpace(c);
  }

  private static void ascii(Emitter em, CharSequence s, int a, int b, boolean fold) {
    if (!fold) {
      em.same(a, b);
      return;
    }
    int run = a;
    int i = a;
    while (i < b) {
      char c = s.charAt(i);
      if (c >= 'A' && c <= 'Z') {
        int j = i + 1;
        while (j < b && s.charAt(j) >= 'A' && s.charAt(j) <= 'Z') {
          j++;
        }
        em.same(run, i);
        em.asciiLower(i, j);
        i = j;
        run = j;
      } else {
        i++;
      }
    }
    em.same(run, b);
  }

  private static int asciiEnd(CharSequence s, int i, int to) {
    while (i < to && s.charAt(i) < 0x80) {
      i++;
    }
    return i;
  }

  /**
   * End of the chunk starting at {@code i}: the next boundary after at least one code point, or the
   * point after {@link #MAX_NON_STARTERS} non-starters in a row (a cut, see {@link #isCut}).
   */
  private static int chunkEnd(Normalizer2 n, CharSequence s, int i, int to) {
    return chunkEnd(n, n::hasBoundaryBefore, s, i, to);
  }

  private static int chunkEnd(Normalizer2 n, java.util.function.IntPredicate boundary, CharSequence s, int i, int to) {
    int c = cpAt(s, i, to);
    int e = i + Character.charCount(c);
    int run = n.getCombiningClass(c) != 0 ? 1 : 0;
    while (e < to) {
      c = cpAt(s, e, to);
      if (boundary.test(c)) {
        break;
      }
      if (n.getCombiningClass(c) != 0) {
        if (run == MAX_NON_STARTERS) {
          break;
        }
        run++;
      } else {
        run = 0;
      }
      e += Character.charCount(c);
    }
    return e;
  }

  /** Whether a chunk ending at {@code e} was cut, i.e. ends where there is no boundary. */
  private static boolean isCut(Normalizer2 n, CharSequence s, int e, int to) {
    return e < to && !n.hasBoundaryBefore(cpAt(s, e, to));
  }

  /**
   * Whether a chunk may end before {@code c} in the slow step. With remove-marks, removing marks can
   * bring starters together that then compose (a Hangul L jamo, a character whose decomposition is
   * only marks, then a V jamo: the whole-text result composes L and V), so {@code c} starts a new
   * chunk only if what remains of it after decomposition and mark removal is non-empty and starts
   * with a character that has a composition boundary before it.
   */
  private boolean boundaryBefore(int c) {
    if (!bound.hasBoundaryBefore(c)) {
      return false;
    }
    if (!removeMarks || c < 0x80) {
      return true;
    }
    String d = decomposer.getDecomposition(c);
    int first = -1;
    if (d == null) {
      first = UCharacter.getType(c) == UCharacterCategory.NON_SPACING_MARK ? -1 : c;
    } else {
      for (int k = 0; k < d.length(); ) {
        int x = d.codePointAt(k);
        if (UCharacter.getType(x) != UCharacterCategory.NON_SPACING_MARK) {
          first = x;
          break;
        }
        k += Character.charCount(x);
      }
    }
    if (first < 0) {
      return false; // nothing remains of c: keep it with the chunk before
    }
    return composer == null || composer.hasBoundaryBefore(first);
  }

  /** Code point at {@code i}, never reading at or past {@code to}. */
  private static int cpAt(CharSequence s, int i, int to) {
    char c = s.charAt(i);
    if (Character.isHighSurrogate(c) && i + 1 < to) {
      char d = s.charAt(i + 1);
      if (Character.isLowSurrogate(d)) {
        return Character.toCodePoint(c, d);
      }
    }
    return c;
  }

  // ---- errors ---------------------------------------------------------------------------------

  private static void throwBadRange(int start, int end, int length) {
    throw new IndexOutOfBoundsException(
        "range [" + start + ", " + end + ") is not inside the text [0, " + length + ")");
  }

  private static IllegalArgumentException badSpec(String spec, String what) {
    return new IllegalArgumentException(
        "normalization spec \"" + spec + "\": " + what + "; valid names (joined by '+'): " + VALID_NAMES);
  }

  /**
   * Builder; every option starts off and the form starts as {@link Form#NONE}. Not thread-safe;
   * {@link #build()} returns an immutable instance.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private Form form = Form.NONE;
    private boolean caseFold;
    private boolean removeMarks;
    private boolean dropControls;
    private boolean collapseSpaces;

    private Builder() {}

    /** Sets the form (default {@link Form#NONE}). */
    public Builder form(Form form) {
      this.form = Objects.requireNonNull(form, "form");
      return this;
    }

    /** Full Unicode case folding (default off). */
    public Builder caseFold(boolean on) {
      this.caseFold = on;
      return this;
    }

    /** Removes nonspacing marks after decomposition (default off). */
    public Builder removeMarks(boolean on) {
      this.removeMarks = on;
      return this;
    }

    /** Removes Cc controls other than TAB, LF, VT, FF, CR and NEL (default off). */
    public Builder dropControls(boolean on) {
      this.dropControls = on;
      return this;
    }

    /** Collapses runs of non-line-break white space into one U+0020 (default off). */
    public Builder collapseSpaces(boolean on) {
      this.collapseSpaces = on;
      return this;
    }

    /** The immutable settings. */
    public Normalization build() {
      if (form == Form.NONE && !caseFold && !removeMarks && !dropControls && !collapseSpaces) {
        return NONE;
      }
      return new Normalization(form, caseFold, removeMarks, dropControls, collapseSpaces);
    }
  }
}
