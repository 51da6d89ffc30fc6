package dev.morsel.tokenize;

import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import java.util.Objects;

/**
 * The text-processing steps before segmentation: normalization, then splitting into pieces. The
 * same pipeline is used for counting training pieces and for encoding, so that training and
 * encoding see the same pieces. Immutable and thread-safe; saved in the model file.
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
