package dev.morsel.tokenize.train;

import java.util.Objects;
import java.util.regex.Pattern;

/**
 * The declaration of one scheme-specific learner option: its name, its default as text, and a
 * one-line description for listings ({@code morsel schemes}, for one). Immutable.
 *
 * <p>Names are lower-case words joined by hyphens ({@code min-pair-count}); values are given as text
 * ({@code min-pair-count=3}) and read by {@link LearnerOptions}.
 *
 * @since 0.1.0
 */
public final class LearnerOption {
  private static final Pattern NAME = Pattern.compile("[a-z][a-z0-9]*(-[a-z0-9]+)*");

  private final String name;
  private final String defaultValue;
  private final String description;

  private LearnerOption(String name, String defaultValue, String description) {
    this.name = name;
    this.defaultValue = defaultValue;
    this.description = description;
  }

  /**
   * An option declaration.
   *
   * @throws IllegalArgumentException if {@code name} is not lower-case words joined by hyphens
   */
  public static LearnerOption of(String name, String defaultValue, String description) {
    Objects.requireNonNull(name, "name");
    Objects.requireNonNull(defaultValue, "defaultValue");
    Objects.requireNonNull(description, "description");
    if (!NAME.matcher(name).matches()) {
      throw new IllegalArgumentException("option name '" + name + "' must be lower-case words joined by hyphens");
    }
    return new LearnerOption(name, defaultValue, description);
  }

  /** The name, for example {@code min-pair-count}. */
  public String name() {
    return name;
  }

  /** The value used when none is given, as text. */
  public String defaultValue() {
    return defaultValue;
  }

  /** One line for people. */
  public String description() {
    return description;
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof LearnerOption && name.equals(((LearnerOption) o).name)
        && defaultValue.equals(((LearnerOption) o).defaultValue) && description.equals(((LearnerOption) o).description);
  }

  @Override
  public int hashCode() {
    return Objects.hash(name, defaultValue, description);
  }

  @Override
  public String toString() {
    return name + "=" + defaultValue;
  }
}
