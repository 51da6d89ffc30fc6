package dev.morsel.tokenize;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.util.VersionInfo;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import java.util.Objects;

/**
 * The text-processing steps before segmentation: normalization, then splitting into pieces. The
 * same pipeline is used for counting training pieces and for encoding, so that training and
 * encoding see the same pieces. Immutable and thread-safe; saved in the model file together with
 * the {@linkplain #unicodeVersion() Unicode version} of the data both steps use.
 *
 * @since 0.1.0
 */
public final class Pipeline {
  private final Normalization normalization;
  private final Splitting splitting;

  private Pipeline(Normalization normalization, Splitting splitting) {
    this.normalization = Objects.requireNonNull(normalization, "normalization");
    this.splitting = Objects.requireNonNull(splitting, "splitting");
  }

  /** A pipeline of the given steps. */
  public static Pipeline of(Normalization normalization, Splitting splitting) {
    return new Pipeline(normalization, splitting);
  }

  /**
   * NFC normalization and Morsel's default class runs, {@link Splitting#runs()}
   * ({@code runs:space=next,digits=whole}, chosen by the held-out measurement in
   * docs/splitting.md): changes no character's meaning.
   */
  public static Pipeline defaults() {
    return new Pipeline(Normalization.of(Normalization.Form.NFC), Splitting.runs());
  }

  /** The normalization step. */
  public Normalization normalization() {
    return normalization;
  }

  /** The splitting step. */
  public Splitting splitting() {
    return splitting;
  }

  /** This pipeline with another normalization. */
  public Pipeline withNormalization(Normalization n) {
    return new Pipeline(n, splitting);
  }

  /** This pipeline with another splitting. */
  public Pipeline withSplitting(Splitting s) {
    return new Pipeline(normalization, s);
  }

  /**
   * The Unicode version of the character data that normalization and splitting use on this runtime,
   * as {@code major.minor.update} (for example {@code "17.0.0"}). Both steps take all their tables
   * from the bundled ICU (normalization data, character properties, word-break rules), which builds
   * them from one Unicode version and reports it through {@link UCharacter#getUnicodeVersion()}; a
   * Spark cluster or an application server that brings another ICU reports its own. Model files
   * record this value in their pipeline section, so it is part of the fingerprint, and loading a
   * model made with another version is refused unless
   * {@link dev.morsel.tokenize.format.ModelLimits#withUnicodeMismatchAllowed(boolean) allowed}.
   *
   * @since 0.1.0
   */
  public static String unicodeVersion() {
    return UNICODE_VERSION;
  }

  private static final String UNICODE_VERSION = format(UCharacter.getUnicodeVersion());

  private static String format(VersionInfo v) {
    return v.getMajor() + "." + v.getMinor() + "." + v.getMilli();
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Pipeline && normalization.spec().equals(((Pipeline) o).normalization.spec())
        && splitting.spec().equals(((Pipeline) o).splitting.spec());
  }

  @Override
  public int hashCode() {
    return normalization.spec().hashCode() * 31 + splitting.spec().hashCode();
  }

  @Override
  public String toString() {
    return "Pipeline[normalization=" + normalization.spec() + ", splitting=" + splitting.spec() + "]";
  }
}
