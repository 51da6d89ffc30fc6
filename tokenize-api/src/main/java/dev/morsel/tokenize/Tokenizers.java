package dev.morsel.tokenize;

import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.SectionReader;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.spi.PieceSegmentation;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.SegmenterProvider;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.format.ReviewDocument;
import java.io.BufferedReader;
import java.nio.ByteBuffer;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.ServiceLoader;
import java.util.Set;
import java.util.TreeMap;

/**
 * Static factories for {@link Tokenizer}s: from parts, or from a model file.
 *
 * @since 0.1.0
 */
public final class Tokenizers {
  private Tokenizers() {}

  /**
   * A tokenizer from its parts.
   *
   * @throws IllegalArgumentException if a reserved token's id is outside the segmenter's vocabulary,
   *     or the template names a spelling that is not a registered reserved token
   */
  public static Tokenizer of(Pipeline pipeline, Segmenter segmenter, ReservedTokens reservedTokens, Template template) {
    return new PipelineTokenizer(pipeline, segmenter, reservedTokens, template, Limits.defaults(), null);
  }

  /**
   * A tokenizer with the given pipeline, the segmenter's own reserved tokens ({@link
   * Segmenter#reservedSpellings()} at ids {@code 0..k-1}) and no framing. The pipeline is always
   * named: there is no overload that picks one, so a vocabulary cannot be paired with a pipeline it
   * was not learned with by omission (a learner's tokenizer is bound to its counts' pipeline).
   */
  public static Tokenizer of(Pipeline pipeline, Segmenter segmenter) {
    return of(pipeline, segmenter, ownReserved(segmenter), Template.none());
  }

  /** The segmenter's own reserved tokens: {@link Segmenter#reservedSpellings()} at ids {@code 0..k-1}. */
  static ReservedTokens ownReserved(Segmenter segmenter) {
    List<String> spellings = segmenter.reservedSpellings();
    if (spellings.isEmpty()) {
      return ReservedTokens.none();
    }
    ReservedTokens.Builder b = ReservedTokens.builder();
    for (int i = 0; i < spellings.size(); i++) {
      b.add(spellings.get(i), i);
    }
    return b.build();
  }

  /** Loads a model file with {@link ModelLimits#defaults()}, validating it fully before building anything. */
  public static Tokenizer load(Path path) {
    return load(path, ModelLimits.defaults());
  }

  /** Loads a model file's bytes with {@link ModelLimits#defaults()}, validating them fully before building anything. */
  public static Tokenizer load(byte[] model) {
    return load(model, ModelLimits.defaults());
  }

  /**
   * Loads a model from a buffer (for example a memory-mapped file) with {@link ModelLimits#defaults()},
   * validating it fully first.
   */
  public static Tokenizer load(ByteBuffer model) {
    return load(model, ModelLimits.defaults());
  }

  /**
   * Loads a model file (memory-mapped), validating it fully against {@code limits} before building anything.
   *
   * @throws ModelFormatException naming the section if the file is malformed, exceeds a
   *     limit (naming the limit and its setter), holds reserved-token lists that disagree, or was made
   *     with another Unicode version than this runtime's and {@code limits} do not allow that
   * @throws java.io.UncheckedIOException naming the path if the file cannot be read
   */
  public static Tokenizer load(Path path, ModelLimits limits) {
    return build(ModelFile.read(path, limits), limits);
  }

  /**
   * Loads a model file's bytes, validating them fully against {@code limits} first; the tokenizer may
   * view the array, so do not change it afterwards.
   *
   * @throws ModelFormatException as {@link #load(Path, ModelLimits)}
   */
  public static Tokenizer load(byte[] model, ModelLimits limits) {
    java.util.Objects.requireNonNull(model, "model");
    return load(ByteBuffer.wrap(model), limits);
  }

  /**
   * Loads a model from a buffer, validating it fully against {@code limits} first.
   *
   * @throws ModelFormatException as {@link #load(Path, ModelLimits)}
   */
  public static Tokenizer load(ByteBuffer model, ModelLimits limits) {
    java.util.Objects.requireNonNull(model, "model");
    java.util.Objects.requireNonNull(limits, "limits");
    return build(ModelFile.read(model, limits), limits);
  }

  /**
   * Writes the review text of a model file's sections (see {@link Tokenizer#writeReview}), with its
   * {@code META} entries as a {@code metadata} section when it has one.
   *
   * @throws ModelFormatException if the sections do not form a valid model
   * @throws java.io.UncheckedIOException if {@code out} fails
   */
  public static void writeReview(ModelSections sections, Appendable out) {
    Objects.requireNonNull(out, "out");
    Map<String, String> metadata = Review.metadata(sections);
    Review.write((PipelineTokenizer) build(sections, ModelLimits.defaults()), metadata, out);
  }

  /**
   * The model file described by a review text, validated as fully as {@link #load(byte[])} validates
   * (load it with that method, or store it). The review text of a model gives back a file with the
   * same fingerprint.
   *
   * @param source names the input in errors, for example a file name
   * @throws ModelFormatException at {@code source:line} with the column for a malformed line or a
   *     value the model cannot hold; naming {@code source} alone for a missing section
   * @throws java.io.UncheckedIOException if reading fails
   */
  public static byte[] modelFromReview(BufferedReader in, String source) {
    return modelFromReview(ReviewDocument.read(in, source));
  }

  /** As {@link #modelFromReview(BufferedReader, String)} for a UTF-8 file, strictly decoded; errors name the file. */
  public static byte[] modelFromReview(Path path) {
    return modelFromReview(ReviewDocument.read(path));
  }

  private static byte[] modelFromReview(ReviewDocument doc) {
    SegmenterProvider provider = providers().get(doc.scheme());
    if (provider == null) {
      throw (doc.fail("no segmenter of scheme '" + doc.scheme()
          + "' is on the class path (found: " + providers().keySet() + "); add the module that provides it"));
    }
    return Review.modelFile(doc, provider);
  }

  /** The kinds of segmenter found on the class path or module path. */
  public static Set<String> schemes() {
    return Collections.unmodifiableSet(providers().keySet());
  }

  // ------------------------------------------------------------------ internals

  private static volatile Map<String, SegmenterProvider> providers;

  private static Map<String, SegmenterProvider> providers() {
    Map<String, SegmenterProvider> p = providers;
    if (p == null) {
      Map<String, SegmenterProvider> found = new TreeMap<>();
      for (SegmenterProvider provider : ServiceLoader.load(SegmenterProvider.class, Tokenizers.class.getClassLoader())) {
        found.putIfAbsent(provider.scheme(), provider);
      }
      if (found.isEmpty()) {
        // a thread context loader may see providers the api's own loader does not (application servers, notebooks)
        ClassLoader ctx = Thread.currentThread().getContextClassLoader();
        if (ctx != null) {
          for (SegmenterProvider provider : ServiceLoader.load(SegmenterProvider.class, ctx)) {
            found.putIfAbsent(provider.scheme(), provider);
          }
        }
      }
      p = found;
      providers = p;
    }
    return p;
  }

  /**
   * The segmenter of a tokenizer made by this class (for a segmenter module's own extra features, or
   * to assemble it with another pipeline on purpose).
   *
   * @throws IllegalArgumentException if {@code tokenizer} was not made by this class
   */
  public static Segmenter segmenterOf(Tokenizer tokenizer) {
    return pipelineTokenizer(tokenizer).segmenter();
  }

  /**
   * Encodes {@code text} like {@link Tokenizer#encode(CharSequence, Trust)} — reserved-token scan,
   * normalization, splitting, framing, offsets into the original text — but with every piece
   * segmented by {@code how} instead of the segmenter's own {@link Segmenter#segment}. The hook for a
   * segmenter module's extra ways of encoding a loaded tokenizer (sampling, n-best lists).
   *
   * @throws IllegalArgumentException if {@code tokenizer} was not made by this class
   */
  public static Tokens encodeWith(Tokenizer tokenizer, CharSequence text, Trust trust, PieceSegmentation how) {
    return pipelineTokenizer(tokenizer).encodeWith(text, trust, how);
  }

  private static PipelineTokenizer pipelineTokenizer(Tokenizer tokenizer) {
    if (!(Objects.requireNonNull(tokenizer, "tokenizer") instanceof PipelineTokenizer)) {
      throw new IllegalArgumentException("not a tokenizer made by Tokenizers: " + tokenizer.getClass().getName());
    }
    return (PipelineTokenizer) tokenizer;
  }

  /**
   * Reads only the segmenter of a validated model file (for example to change its own settings, such
   * as a cache size, before assembling a tokenizer with {@link #of(Pipeline, Segmenter)}), with
   * {@link ModelLimits#defaults()}.
   *
   * @throws ModelFormatException if the scheme is unknown or the segmenter's sections are malformed
   */
  public static Segmenter segmenterOf(ModelSections sections) {
    return segmenterOf(sections, ModelLimits.defaults());
  }

  /**
   * As {@link #segmenterOf(ModelSections)}, with every count and entry checked against {@code limits}.
   *
   * @throws ModelFormatException if the scheme is unknown, the segmenter's sections are malformed or a
   *     limit is exceeded
   */
  public static Segmenter segmenterOf(ModelSections sections, ModelLimits limits) {
    java.util.Objects.requireNonNull(limits, "limits");
    return provider(sections).read(sections, limits);
  }

  private static SegmenterProvider provider(ModelSections sections) {
    SectionReader k = sections.reader(PipelineTokenizer.SCHEME);
    String scheme = k.getString("scheme");
    k.expectEnd();
    SegmenterProvider provider = providers().get(scheme);
    if (provider == null) {
      throw new ModelFormatException(PipelineTokenizer.SCHEME, "no segmenter of scheme '" + scheme
          + "' is on the class path (found: " + providers().keySet() + "); add the module that provides it");
    }
    return provider;
  }

  private static Tokenizer build(ModelSections sections, ModelLimits limits) {
    SegmenterProvider provider = provider(sections);
    SectionReader p = sections.reader(PipelineTokenizer.PIPE);
    Pipeline pipeline;
    String normSpec = p.getString("normalization");
    String splitSpec = p.getString("splitting");
    if (p.remaining() == 0) {
      throw p.fail("the Unicode version is missing (the file predates it); save the model again with this version"
          + " of Morsel");
    }
    String unicode = p.getString("Unicode version");
    p.expectEnd();
    boolean otherUnicode = !unicode.equals(Pipeline.unicodeVersion());
    if (otherUnicode && !limits.unicodeMismatchAllowed()) {
      throw new ModelFormatException(PipelineTokenizer.PIPE, "the model was made with Unicode " + unicode
          + " data but this runtime has Unicode " + Pipeline.unicodeVersion() + " (from its ICU); normalization and"
          + " splitting may differ, so encodings would not match the model's fingerprint. Load it on a runtime with"
          + " Unicode " + unicode + ", or accept the difference with ModelLimits.withUnicodeMismatchAllowed(true)");
    }
    try {
      pipeline = Pipeline.of(Normalization.parse(normSpec), Splitting.parse(splitSpec));
    } catch (IllegalArgumentException e) {
      throw new ModelFormatException(PipelineTokenizer.PIPE, e.getMessage(), e);
    }
    SectionReader c = sections.reader(PipelineTokenizer.RSRV);
    int n = limits.readReservedCount(c, "reserved tokens", 8);
    int[] ids = new int[n];
    String[] spellings = new String[n];
    for (int i = 0; i < n; i++) {
      ids[i] = c.getInt("reserved token " + i + " id");
      spellings[i] = limits.readToken(c, "reserved token " + i + " spelling");
    }
    c.expectEnd();
    SectionReader f = sections.reader(PipelineTokenizer.FRAM);
    List<List<String>> lists = new ArrayList<>();
    for (String what : List.of("begin markers", "separator markers", "end markers")) {
      int m = limits.readReservedCount(f, what, 4);
      List<String> list = new ArrayList<>(m);
      for (int i = 0; i < m; i++) {
        list.add(limits.readToken(f, what));
      }
      lists.add(list);
    }
    f.expectEnd();
    Segmenter segmenter = provider.read(sections, limits);
    List<String> own = segmenter.reservedSpellings();
    ReservedTokens reserved;
    ReservedTokens.Builder cb = ReservedTokens.builder();
    try {
      for (int i = 0; i < n; i++) {
        cb.add(spellings[i], ids[i]);
      }
      reserved = cb.build(); // built once: the segmenter keeps only its spellings
    } catch (IllegalArgumentException e) {
      throw new ModelFormatException(PipelineTokenizer.RSRV, e.getMessage(), e);
    }
    if (!sameAs(own, ids, spellings)) { // the usual case is one list twice; otherwise they must agree
      checkAgree(reserved, own, segmenter.scheme(), sections);
    }
    try {
      // with another Unicode version allowed, the fingerprint is this runtime's (the file's no longer proves encodings)
      return new PipelineTokenizer(pipeline, segmenter, reserved, Template.of(lists.get(0), lists.get(1), lists.get(2)),
          Limits.defaults(), otherUnicode ? null : sections.fingerprint());
    } catch (IllegalArgumentException e) {
      throw new ModelFormatException(PipelineTokenizer.RSRV, e.getMessage(), e);
    }
  }

  /** Whether the segmenter's spellings {@code own} (ids {@code 0..k-1}) are exactly these (spelling, id) pairs in this order. */
  private static boolean sameAs(List<String> own, int[] ids, String[] spellings) {
    if (own.size() != ids.length) {
      return false;
    }
    for (int i = 0; i < ids.length; i++) {
      if (ids[i] != i || !own.get(i).equals(spellings[i])) {
        return false;
      }
    }
    return true;
  }

  /**
   * Refuses a file whose two reserved-token lists disagree: the api's list ({@code RSRV}) may hold
   * fewer tokens than the segmenter's own, or bind spellings to ordinary ids, but an id or a spelling
   * that both lists hold must be bound the same way in both. Linear in the two lists.
   */
  private static void checkAgree(ReservedTokens api, List<String> own, String scheme, ModelSections sections) {
    if (own.isEmpty() || api.isEmpty()) {
      return;
    }
    Map<String, Integer> ownIds = new HashMap<>(own.size() * 2);
    for (int i = 0; i < own.size(); i++) {
      ownIds.putIfAbsent(own.get(i), i);
    }
    for (String spelling : api.spellings()) {
      int id = api.id(spelling);
      String ownSpelling = id >= 0 && id < own.size() ? own.get(id) : null;
      int ownId = ownIds.getOrDefault(spelling, -1);
      if ((ownSpelling != null && !ownSpelling.equals(spelling)) || (ownId >= 0 && ownId != id)) {
        List<String> segmenterTags = new ArrayList<>();
        for (String tag : sections.tags()) {
          if (!API_TAGS.contains(tag)) {
            segmenterTags.add(tag);
          }
        }
        String theirs = ownSpelling != null && !ownSpelling.equals(spelling)
            ? "id " + id + " is '" + ownSpelling + "'"
            : "'" + spelling + "' has id " + ownId;
        throw new ModelFormatException(PipelineTokenizer.RSRV, "reserved token '" + spelling + "' has id " + id
            + " in section " + PipelineTokenizer.RSRV + ", but in the " + scheme + " segmenter's sections "
            + segmenterTags + " " + theirs + ": the two reserved-token lists disagree");
      }
    }
  }

  private static final Set<String> API_TAGS = Set.of(PipelineTokenizer.SCHEME, PipelineTokenizer.PIPE,
      PipelineTokenizer.RSRV, PipelineTokenizer.FRAM, ModelFile.TAG_METADATA);
}
