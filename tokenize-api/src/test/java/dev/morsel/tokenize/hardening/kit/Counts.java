package dev.morsel.tokenize.hardening.kit;

import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.LongAdder;

/**
 * Counts checked cases per property so that each test class can print and assert how many it ran.
 * Thread-safe.
 */
public final class Counts {
  private final String suite;
  private final Map<String, LongAdder> byProperty = new ConcurrentHashMap<>();

  /** Counts for the suite named {@code suite} (printed as a prefix). */
  public Counts(String suite) {
    this.suite = suite;
  }

  /** One more checked case of {@code property}. */
  public void add(String property) {
    byProperty.computeIfAbsent(property, k -> new LongAdder()).increment();
  }

  /** {@code n} more checked cases of {@code property}. */
  public void add(String property, long n) {
    byProperty.computeIfAbsent(property, k -> new LongAdder()).add(n);
  }

  /** Cases checked for {@code property} so far. */
  public long get(String property) {
    LongAdder a = byProperty.get(property);
    return a == null ? 0 : a.sum();
  }

  /** Sum over all properties. */
  public long total() {
    long t = 0;
    for (LongAdder a : byProperty.values()) {
      t += a.sum();
    }
    return t;
  }

  /** Prints one line per property, in name order, and the total; returns the text. */
  public String print() {
    StringBuilder sb = new StringBuilder();
    for (Map.Entry<String, LongAdder> e : new TreeMap<>(byProperty).entrySet()) {
      sb.append('[').append(suite).append("] ").append(e.getKey()).append(": ").append(e.getValue().sum())
          .append(" cases\n");
    }
    sb.append('[').append(suite).append("] total: ").append(total()).append(" checks");
    System.out.println(sb);
    return sb.toString();
  }
}
