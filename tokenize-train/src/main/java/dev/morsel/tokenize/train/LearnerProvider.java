package dev.morsel.tokenize.train;

import java.util.List;

/**
 * Makes the {@link Learner}s of one scheme. Found through {@link java.util.ServiceLoader} by
 * {@link Learners}, so the command-line tool, the benchmarks and the Spark module list and build
 * schemes without knowing any of them: a segmenter module registers its provider
 * ({@code provides dev.morsel.tokenize.train.LearnerProvider with …} in its module descriptor and
 * a {@code META-INF/services/dev.morsel.tokenize.train.LearnerProvider} file for the class path).
 *
 * <p>Implementations are stateless and thread-safe, with a public no-argument constructor.
 *
 * @since 0.1.0
 */
public interface LearnerProvider {
  /**
   * The scheme name: lower-case, for example {@code "bpe"}; the same as the {@link dev.morsel.tokenize.Tokenizer#scheme() scheme} of the
   * segmenter it learns, so a learned tokenizer loads through the segmenter provider of that name.
   */
  String scheme();

  /** One line for listings, for example {@code "byte-level BPE: never an unknown token"}. */
  String description();

  /** The scheme-specific options, with their defaults, in the order listings show them. */
  List<LearnerOption> options();

  /**
   * A learner with the common {@code settings} and the scheme's {@code options} (every declared
   * option present, defaults filled in), checked here: every value, and every combination such as a
   * vocabulary size too small for the reserved tokens, is refused now rather than when learning.
   *
   * @throws IllegalArgumentException naming the setting or option that is wrong
   */
  Learner learner(LearnerSettings settings, LearnerOptions options);

  /**
   * An extender with the common {@code settings} and the scheme's {@code options} (the same
   * declarations as {@link #options()}, every one present, defaults filled in; options that only
   * shape a vocabulary from scratch are ignored, as each scheme documents), checked here.
   *
   * @throws IllegalArgumentException naming the setting or option that is wrong, or, by default,
   *     saying that the scheme cannot extend a model
   * @since 0.3.0
   */
  default Extender extender(ExtensionSettings settings, LearnerOptions options) {
    throw new IllegalArgumentException("scheme '" + scheme() + "' cannot extend a trained model");
  }
}
