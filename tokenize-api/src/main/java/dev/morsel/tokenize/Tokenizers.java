package dev.morsel.tokenize;

import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.SectionReader;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.spi.PieceSegmentation;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.SegmenterProvider;
import dev.morsel.tokenize.split.Splitting;
import java.nio.ByteBuffer;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
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

  /** A tokenizer with the default pipeline, the segmenter's own reserved tokens and no framing. */
  public static Tokenizer of(Segmenter segmenter) {
    return of(Pipeline.defaults(), segmenter);
  }

  /**
   * A tokenizer with the given pipeline, the segmenter's own reserved tokens ({@link
   * Segmenter#reservedSpellings()} at ids {@code 0..k-1}) and no framing.
   */
  public static Tokenizer of(Pipeline pipeline, Segmenter segmenter) {
    List<String> spellings = segmenter.reservedSpellings();
    ReservedTokens.Builder b = ReservedTokens.builder();
    for (int i = 0; i < spellings.size(); i++) {
      b.add(spellings.get(i), i);
    }
    return of(pipeline, segmenter, b.build(), Template.none());
  }

  /** Loads a model file, validating it fully before building anything. */
  public static Tokenizer load(Path path) {
    return build(ModelFile.read(path));
  }

  /** Loads a model file's bytes, validating them fully before building anything. */
  public static Tokenizer load(byte[] model) {
    return build(ModelFile.read(model));
  }

  /** Loads a model from a buffer (for example a memory-mapped file), validating it fully first. */
  public static Tokenizer load(ByteBuffer model) {
    return build(ModelFile.read(model));
  }

  /** The kinds of segmenter found on the class path or module path. */
  public static Set<String> kinds() {
    return Collections.unmodifiableSet(providers().keySet());
  }

  // ------------------------------------------------------------------ internals

  private static volatile Map<String, SegmenterProvider> providers;

  private static Map<String, SegmenterProvider> providers() {
    Map<String, SegmenterProvider> p = providers;
    if (p == null) {
      Map<String, SegmenterProvider> found = new TreeMap<>();
      for (SegmenterProvider provider : ServiceLoader.load(SegmenterProvider.class, Tokenizers.class.getClassLoader())) {
        found.putIfAbsent(provider.kind(), provider);
      }
      if (found.isEmpty()) {
        // a thread context loader may see providers the api's own loader does not (application servers, notebooks)
        ClassLoader ctx = Thread.currentThread().getContextClassLoader();
        if (ctx != null) {
          for (SegmenterProvider provider : ServiceLoader.load(SegmenterProvider.class, ctx)) {
            found.putIfAbsent(provider.kind(), provider);
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
   * as a cache size, before assembling a tokenizer with {@link #of(Pipeline, Segmenter)}).
   *
   * @throws ModelFormatException if the kind is unknown or the segmenter's sections are malformed
   */
  public static Segmenter segmenterOf(ModelSections sections) {
    return provider(sections).read(sections);
  }

  private static SegmenterProvider provider(ModelSections sections) {
    SectionReader k = sections.reader(PipelineTokenizer.KIND);
    String kind = k.getString("segmenter kind");
    k.expectEnd();
    SegmenterProvider provider = providers().get(kind);
    if (provider == null) {
      throw new ModelFormatException(PipelineTokenizer.KIND, "no segmenter of kind '" + kind
          + "' is on the class path (found: " + providers().keySet() + "); add the module that provides it");
    }
    return provider;
  }

  private static Tokenizer build(ModelSections sections) {
    SegmenterProvider provider = provider(sections);
    SectionReader p = sections.reader(PipelineTokenizer.PIPE);
    Pipeline pipeline;
    String normSpec = p.getString("normalization");
    String splitSpec = p.getString("splitting");
    p.expectEnd();
    try {
      pipeline = Pipeline.of(Normalization.parse(normSpec), Splitting.parse(splitSpec));
    } catch (IllegalArgumentException e) {
      throw new ModelFormatException(PipelineTokenizer.PIPE, e.getMessage(), e);
    }
    SectionReader c = sections.reader(PipelineTokenizer.RSRV);
    ReservedTokens.Builder cb = ReservedTokens.builder();
    int n = c.getCount("reserved tokens", 1 << 20, 8);
    ReservedTokens reserved;
    try {
      for (int i = 0; i < n; i++) {
        int id = c.getInt("reserved token id");
        cb.add(c.getString("reserved token spelling"), id);
      }
      c.expectEnd();
      reserved = cb.build();
    } catch (IllegalArgumentException e) {
      throw new ModelFormatException(PipelineTokenizer.RSRV, e.getMessage(), e);
    }
    SectionReader f = sections.reader(PipelineTokenizer.FRAM);
    List<List<String>> lists = new ArrayList<>();
    for (String what : List.of("begin markers", "separator markers", "end markers")) {
      int m = f.getCount(what, 1 << 10, 4);
      List<String> list = new ArrayList<>(m);
      for (int i = 0; i < m; i++) {
        list.add(f.getString(what));
      }
      lists.add(list);
    }
    f.expectEnd();
    Segmenter segmenter = provider.read(sections);
    try {
      return new PipelineTokenizer(pipeline, segmenter, reserved, Template.of(lists.get(0), lists.get(1), lists.get(2)),
          Limits.defaults(), sections.fingerprint());
    } catch (IllegalArgumentException e) {
      throw new ModelFormatException(PipelineTokenizer.RSRV, e.getMessage(), e);
    }
  }
}
