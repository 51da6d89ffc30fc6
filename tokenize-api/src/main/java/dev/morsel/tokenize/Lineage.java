package dev.morsel.tokenize;

import java.util.Objects;
import java.util.regex.Pattern;

/**
 * The model an extended model grew from: the base model's {@link Tokenizer#fingerprint()
 * fingerprint} and its {@link Tokenizer#vocabularySize() vocabulary size}. An extended model keeps
 * the base's first {@code baseVocabularySize()} ids byte for byte (token bytes, display spellings,
 * reserved tokens, framing), so a service that holds per-id data for the base (embedding rows,
 * allow-lists) can check with {@link #isBase(Tokenizer)} that the new model is a lineal extension of the
 * one it has and keep every row it already has. Immutable value class.
 *
 * <p>Stored in the model file's {@code BASE} section and in the review text's {@code lineage}
 * section ({@code docs/format.md}); part of the fingerprint.
 *
 * @since 0.3.0
 */
public final class Lineage {
  private static final Pattern HEX = Pattern.compile("[0-9a-f]{64}");

  private final String baseFingerprint;
  private final int baseVocabularySize;

  private Lineage(String baseFingerprint, int baseVocabularySize) {
    this.baseFingerprint = baseFingerprint;
    this.baseVocabularySize = baseVocabularySize;
  }

  /**
   * A lineage record.
   *
   * @param baseFingerprint the base model's fingerprint: 64 lower-case hex digits
   * @param baseVocabularySize the base model's number of ids, at least 1
   * @throws IllegalArgumentException naming the value that is malformed
   */
  public static Lineage of(String baseFingerprint, int baseVocabularySize) {
    Objects.requireNonNull(baseFingerprint, "baseFingerprint");
    if (!HEX.matcher(baseFingerprint).matches()) {
      throw new IllegalArgumentException("baseFingerprint '" + baseFingerprint
          + "' is not 64 lower-case hex digits (a SHA-256 fingerprint)");
    }
    if (baseVocabularySize < 1) {
      throw new IllegalArgumentException("baseVocabularySize=" + baseVocabularySize + " must be at least 1");
    }
    return new Lineage(baseFingerprint, baseVocabularySize);
  }

  /** The record of a model extending {@code base}: its fingerprint and vocabulary size. */
  public static Lineage of(Tokenizer base) {
    Objects.requireNonNull(base, "base");
    return of(base.fingerprint(), base.vocabularySize());
  }

  /** The base model's fingerprint (SHA-256, lower-case hex). */
  public String baseFingerprint() {
    return baseFingerprint;
  }

  /** The base model's number of ids: ids {@code 0..baseVocabularySize()-1} keep their meaning. */
  public int baseVocabularySize() {
    return baseVocabularySize;
  }

  /** Whether {@code base} is the model this record names: same fingerprint and vocabulary size. */
  public boolean isBase(Tokenizer base) {
    Objects.requireNonNull(base, "base");
    return base.vocabularySize() == baseVocabularySize && base.fingerprint().equals(baseFingerprint);
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof Lineage && baseVocabularySize == ((Lineage) o).baseVocabularySize
        && baseFingerprint.equals(((Lineage) o).baseFingerprint);
  }

  @Override
  public int hashCode() {
    return baseFingerprint.hashCode() * 31 + baseVocabularySize;
  }

  @Override
  public String toString() {
    return "Lineage[base " + baseFingerprint + ", " + baseVocabularySize + " ids]";
  }
}
