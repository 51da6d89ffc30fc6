package dev.morsel.tokenize.train;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;

/**
 * The values of a scheme's {@link LearnerOption options}: every declared option with the value given
 * or its default. Immutable. Made by {@link Learners} (or {@link #of}) after checking that every
 * given name is declared; the typed readers check the value and name the option when it is wrong,
 * so a learner provider reads its options in a few lines.
 *
 * @since 0.1.0
 */
public final class LearnerOptions {
  private final String scheme;
  private final Map<String, String> values;

  private LearnerOptions(String scheme, Map<String, String> values) {
    this.scheme = scheme;
    this.values = values;
  }

  /**
   * The declared options of {@code scheme} with the {@code given} values, defaults for the rest.
   *
   * @throws IllegalArgumentException if a given name is not declared (the message lists the declared
   *     ones), or two declarations share a name
   * @throws NullPointerException if a given name or value is null
   */
  public static LearnerOptions of(String scheme, List<LearnerOption> declared, Map<String, String> given) {
    Objects.requireNonNull(scheme, "scheme");
    Objects.requireNonNull(declared, "declared");
    Objects.requireNonNull(given, "given");
    Map<String, String> values = new LinkedHashMap<>();
    for (LearnerOption o : declared) {
      if (values.put(o.name(), o.defaultValue()) != null) {
        throw new IllegalArgumentException(scheme + " declares option " + o.name() + " twice");
      }
    }
    for (Map.Entry<String, String> e : given.entrySet()) {
      String name = Objects.requireNonNull(e.getKey(), "option name");
      String value = Objects.requireNonNull(e.getValue(), () -> "value of option " + name);
      if (!values.containsKey(name)) {
        throw new IllegalArgumentException(scheme + " has no option '" + name + "'; its options: "
            + (values.isEmpty() ? "none" : String.join(", ", values.keySet())));
      }
      values.put(name, value);
    }
    return new LearnerOptions(scheme, Collections.unmodifiableMap(values));
  }

  /**
   * Reads {@code key=value} strings into a map, in order; a later key replaces an earlier one.
   *
   * @throws IllegalArgumentException for a string without {@code =} or with an empty key, naming it by index
   * @throws NullPointerException for a null string, naming it by index
   */
  public static Map<String, String> parse(List<String> keyValues) {
    Objects.requireNonNull(keyValues, "options");
    Map<String, String> out = new LinkedHashMap<>();
    for (int i = 0; i < keyValues.size(); i++) {
      String kv = keyValues.get(i);
      if (kv == null) {
        throw new NullPointerException("options[" + i + "] is null");
      }
      int eq = kv.indexOf('=');
      if (eq <= 0) {
        throw new IllegalArgumentException("options[" + i + "] '" + kv + "' is not name=value");
      }
      out.put(kv.substring(0, eq).strip(), kv.substring(eq + 1).strip());
    }
    return out;
  }

  /** The scheme these options belong to. */
  public String scheme() {
    return scheme;
  }

  /** Every declared name with its value, in declaration order. */
  public Map<String, String> values() {
    return values;
  }

  /**
   * The value of {@code name} as text.
   *
   * @throws IllegalArgumentException if the option is not declared
   */
  public String string(String name) {
    String v = values.get(Objects.requireNonNull(name, "name"));
    if (v == null) {
      throw new IllegalArgumentException(scheme + " declares no option '" + name + "'");
    }
    return v;
  }

  /**
   * The value of {@code name} as an int in {@code [min, max]}.
   *
   * @throws IllegalArgumentException naming the option and its value if it is not such an int
   */
  public int intValue(String name, int min, int max) {
    return (int) longValue(name, min, max);
  }

  /**
   * The value of {@code name} as a long in {@code [min, max]} ({@code _} between digits allowed).
   *
   * @throws IllegalArgumentException naming the option and its value if it is not such a long
   */
  public long longValue(String name, long min, long max) {
    String v = string(name);
    long x;
    try {
      x = Long.parseLong(v.replace("_", ""));
    } catch (NumberFormatException e) {
      throw wrong(name, v, "is not an integer", e);
    }
    if (x < min || x > max) {
      throw wrong(name, v, "is outside [" + min + ", " + max + "]", null);
    }
    return x;
  }

  /**
   * The value of {@code name} as a finite double with {@code low < value < high} (or {@code <=} where
   * {@code inclusive}).
   *
   * @throws IllegalArgumentException naming the option and its value if it is not such a number
   */
  public double doubleValue(String name, double low, double high, boolean inclusive) {
    String v = string(name);
    double x;
    try {
      x = Double.parseDouble(v);
    } catch (NumberFormatException e) {
      throw wrong(name, v, "is not a number", e);
    }
    boolean in = inclusive ? x >= low && x <= high : x > low && x < high;
    if (!Double.isFinite(x) || !in) {
      throw wrong(name, v, "is outside " + (inclusive ? "[" : "(") + low + ", " + high + (inclusive ? "]" : ")"), null);
    }
    return x;
  }

  /**
   * The value of {@code name} as a boolean: {@code true} or {@code false}.
   *
   * @throws IllegalArgumentException naming the option and its value otherwise
   */
  public boolean booleanValue(String name) {
    String v = string(name);
    switch (v.toLowerCase(Locale.ROOT)) {
      case "true":
        return true;
      case "false":
        return false;
      default:
        throw wrong(name, v, "is not true or false", null);
    }
  }

  /**
   * The value of {@code name}, which must be one of {@code choices}.
   *
   * @throws IllegalArgumentException naming the option, its value and the choices otherwise
   */
  public String choice(String name, List<String> choices) {
    String v = string(name);
    if (!choices.contains(v)) {
      throw wrong(name, v, "is not one of " + String.join(", ", choices), null);
    }
    return v;
  }

  /**
   * An error about option {@code name}: {@code "<scheme> option <name>=<value> <problem>"}, for the
   * checks a provider makes beyond the typed readers.
   */
  public IllegalArgumentException wrong(String name, String value, String problem, Throwable cause) {
    return new IllegalArgumentException(scheme + " option " + name + "=" + value + " " + problem, cause);
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof LearnerOptions && scheme.equals(((LearnerOptions) o).scheme)
        && values.equals(((LearnerOptions) o).values);
  }

  @Override
  public int hashCode() {
    return scheme.hashCode() * 31 + values.hashCode();
  }

  @Override
  public String toString() {
    return scheme + values;
  }
}
