package dev.morsel.tokenize.hardening.kit;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Objects;

/**
 * One tokenizer under test plus the variants that must give identical results: the same model with
 * its cache off or tiny, a fresh (cold) instance, the model after save and load. Segmenter modules
 * build their subjects and hand them to {@link TokenizerProperties}, {@link SharedUse} and
 * {@link ModelCorruption}; adding a segmenter means adding its subjects, nothing else.
 */
public final class Subject {
  private final String name;
  private final Tokenizer main;
  private final boolean lossless;
  private final List<String> variantNames = new ArrayList<>();
  private final List<Tokenizer> variants = new ArrayList<>();

  private Subject(String name, Tokenizer main, boolean lossless) {
    this.name = Objects.requireNonNull(name, "name");
    this.main = Objects.requireNonNull(main, "main");
    this.lossless = lossless;
  }

  /**
   * A subject; the variant "saved and loaded" is added at once.
   *
   * @param lossless whether decode gives back the normalized text for every input (byte-level
   *     schemes); otherwise only for results without the unknown token
   */
  public static Subject of(String name, Tokenizer main, boolean lossless) {
    Subject s = new Subject(name, main, lossless);
    s.variant("saved and loaded", Tokenizers.load(main.toBytes()));
    return s;
  }

  /** Adds a variant that must agree with the main tokenizer on every input. */
  public Subject variant(String variantName, Tokenizer t) {
    variantNames.add(variantName);
    variants.add(Objects.requireNonNull(t, variantName));
    return this;
  }

  /** The name, for example {@code "bpe nfkc+casefold"}. */
  public String name() {
    return name;
  }

  /** The tokenizer under test (shared and warm). */
  public Tokenizer main() {
    return main;
  }

  /** Whether decoding is lossless for every input. */
  public boolean lossless() {
    return lossless;
  }

  /** Names of the variants, parallel to {@link #variants()}. */
  public List<String> variantNames() {
    return Collections.unmodifiableList(variantNames);
  }

  /** The variants. */
  public List<Tokenizer> variants() {
    return Collections.unmodifiableList(variants);
  }

  @Override
  public String toString() {
    return name;
  }
}
