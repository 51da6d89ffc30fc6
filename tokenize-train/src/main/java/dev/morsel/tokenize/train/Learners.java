package dev.morsel.tokenize.train;

import java.util.Collections;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.ServiceLoader;
import java.util.TreeMap;

/**
 * The learners found on the class path or module path, by scheme name: every segmenter module
 * registers a {@link LearnerProvider}. Thread-safe; the providers are looked up once.
 *
 * <pre>{@code
 * PieceCounts counts = PieceCounter.builder().pipeline(pipeline).build().countFiles(files);
 * Tokenizer t = Learners.learner("bpe", LearnerSettings.of(16_000), "min-pair-count=3").train(counts);
 * }</pre>
 *
 * @since 0.1.0
 */
public final class Learners {
  private static volatile Map<String, LearnerProvider> providers;

  private Learners() {}

  /** The scheme names found, in code-point order. */
  public static List<String> schemes() {
    return List.copyOf(providerMap().keySet());
  }

  /** The providers found, in scheme order. */
  public static List<LearnerProvider> providers() {
    return List.copyOf(providerMap().values());
  }

  /**
   * The provider of {@code scheme}.
   *
   * @throws IllegalArgumentException if no module on the class path provides it, naming the schemes found
   */
  public static LearnerProvider provider(String scheme) {
    Objects.requireNonNull(scheme, "scheme");
    LearnerProvider p = providerMap().get(scheme);
    if (p == null) {
      throw new IllegalArgumentException("no learner of scheme '" + scheme + "' is on the class path (found: "
          + String.join(", ", providerMap().keySet()) + "); add the module that provides it");
    }
    return p;
  }

  /**
   * A learner of {@code scheme} with the common settings and {@code name=value} options.
   *
   * @throws IllegalArgumentException if the scheme is not found, an option is malformed or not
   *     declared by the scheme, or a setting or option value is refused, naming it
   */
  public static Learner learner(String scheme, LearnerSettings settings, String... options) {
    return learner(scheme, settings, LearnerOptions.parse(List.of(Objects.requireNonNull(options, "options"))));
  }

  /**
   * A learner of {@code scheme} with the common settings and options by name.
   *
   * @throws IllegalArgumentException if the scheme is not found, an option is not declared by the
   *     scheme, or a setting or option value is refused, naming it
   */
  public static Learner learner(String scheme, LearnerSettings settings, Map<String, String> options) {
    Objects.requireNonNull(settings, "settings");
    LearnerProvider p = provider(scheme);
    return p.learner(settings, LearnerOptions.of(scheme, p.options(), options));
  }

  /**
   * An extender of {@code scheme} with the common settings and {@code name=value} options.
   *
   * @throws IllegalArgumentException if the scheme is not found or cannot extend, an option is
   *     malformed or not declared by the scheme, or a setting or option value is refused, naming it
   * @since 0.3.0
   */
  public static Extender extender(String scheme, ExtensionSettings settings, String... options) {
    return extender(scheme, settings, LearnerOptions.parse(List.of(Objects.requireNonNull(options, "options"))));
  }

  /**
   * An extender of {@code scheme} with the common settings and options by name.
   *
   * @throws IllegalArgumentException as {@link #extender(String, ExtensionSettings, String...)}
   * @since 0.3.0
   */
  public static Extender extender(String scheme, ExtensionSettings settings, Map<String, String> options) {
    Objects.requireNonNull(settings, "settings");
    LearnerProvider p = provider(scheme);
    return p.extender(settings, LearnerOptions.of(scheme, p.options(), options));
  }

  // ------------------------------------------------------------------ internals

  private static Map<String, LearnerProvider> providerMap() {
    Map<String, LearnerProvider> p = providers;
    if (p == null) {
      Map<String, LearnerProvider> found = new TreeMap<>();
      load(found, Learners.class.getClassLoader());
      if (found.isEmpty()) {
        // a thread context loader may see providers the module's own loader does not (application servers, notebooks)
        ClassLoader ctx = Thread.currentThread().getContextClassLoader();
        if (ctx != null) {
          load(found, ctx);
        }
      }
      p = Collections.unmodifiableMap(found);
      providers = p;
    }
    return p;
  }

  private static void load(Map<String, LearnerProvider> found, ClassLoader loader) {
    for (LearnerProvider provider : ServiceLoader.load(LearnerProvider.class, loader)) {
      found.putIfAbsent(provider.scheme(), provider); // the first on the path wins, as for segmenters
    }
  }
}
