package dev.morsel.tokenize.train;

import dev.morsel.tokenize.Lineage;
import dev.morsel.tokenize.Tokenizer;
import java.util.Objects;

/**
 * Extends a trained model of one scheme with the pieces a new corpus needs, appended after the
 * existing ids: every id of the base keeps its spelling and bytes (and the base's reserved tokens
 * and framing stay), so per-id data kept for the base (a model's embedding rows) stays valid. The
 * result records its base ({@link Tokenizer#lineage()}). Implementations are immutable, thread-safe
 * and deterministic, and check their settings when they are built.
 *
 * <p>Get one by scheme name from {@link Learners#extender}, or from a scheme's learner class
 * ({@code BpeLearner.extender()}, {@code WordPieceLearner.extender()}, {@code
 * UnigramLearner.extender()}).
 *
 * <pre>{@code
 * PieceCounts code = PieceCounter.builder().pipeline(base.pipeline()).build().countFiles(files);
 * Tokenizer extended = Learners.extender("bpe", ExtensionSettings.of(2_000)).extend(base, code);
 * }</pre>
 *
 * @since 0.3.0
 */
public interface Extender {
  /** The scheme name, for example {@code "bpe"}: the {@link Tokenizer#scheme()} of the bases it takes. */
  String scheme();

  /**
   * A model with the base's ids, then at most {@code addedIds} new ones learned from {@code counts}
   * (fewer when the counts offer no more).
   *
   * @throws IllegalArgumentException if {@code base} is of another scheme, the counts were made with
   *     another pipeline than the base's (naming both), the counts leave nothing to learn from, or the
   *     result would exceed the scheme's model limits (naming the setting)
   */
  Tokenizer extend(Tokenizer base, PieceCounts counts);

  /**
   * The checks every extender makes before it learns: {@code base} is of {@code scheme}, and
   * {@code counts} were made with the base's pipeline and are not empty.
   *
   * @throws IllegalArgumentException naming the scheme, or both pipelines
   */
  static void checkInputs(String scheme, Tokenizer base, PieceCounts counts) {
    Objects.requireNonNull(base, "base");
    Objects.requireNonNull(counts, "counts");
    if (!base.scheme().equals(scheme)) {
      throw new IllegalArgumentException("a " + scheme + " extender cannot extend a model of scheme '" + base.scheme()
          + "'; use the extender of that scheme");
    }
    if (!counts.pipeline().equals(base.pipeline())) {
      throw new IllegalArgumentException("the piece counts were made with " + PieceCounts.describe(counts.pipeline())
          + ", but the base model encodes with " + PieceCounts.describe(base.pipeline())
          + "; count the new corpus with the base's pipeline (PieceCounter.builder().pipeline(base.pipeline()))");
    }
    if (counts.isEmpty()) {
      throw new IllegalArgumentException("piece counts are empty: nothing to extend the model with");
    }
  }

  /**
   * Whether {@code extended} lineally extends {@code base}: it records {@code base} as its base
   * ({@link Lineage#isBase}) and every base id has the same display spelling and bytes in both.
   * Linear in the base's vocabulary.
   */
  static boolean keepsIds(Tokenizer base, Tokenizer extended) {
    Objects.requireNonNull(base, "base");
    Objects.requireNonNull(extended, "extended");
    if (extended.lineage().map(l -> l.isBase(base)).orElse(false) && extended.scheme().equals(base.scheme())) {
      for (int id = 0; id < base.vocabularySize(); id++) {
        if (!base.token(id).equals(extended.token(id))
            || !java.util.Arrays.equals(base.tokenBytes(id), extended.tokenBytes(id))) {
          return false;
        }
      }
      return true;
    }
    return false;
  }
}
