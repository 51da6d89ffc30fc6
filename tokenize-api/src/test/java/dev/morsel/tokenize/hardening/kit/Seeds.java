package dev.morsel.tokenize.hardening.kit;

/**
 * Per-case seeds for property tests. Case {@code i} of a run with base seed {@code b} uses seed
 * {@code mix(b + i)} (the SplitMix64 finalizer, so neighbouring cases are unrelated). Set the system
 * property {@value #REPLAY_PROPERTY} (decimal or {@code 0x} hex) to run only that one seed, for
 * example {@code ./mvnw -B -pl tokenize-bpe -am test -Dtest=SegmenterPropertyTest
 * -Dsurefire.failIfNoSpecifiedTests=false -Dmorsel.replay=0x1234}.
 */
public final class Seeds {
  /** System property holding a single seed to replay. */
  public static final String REPLAY_PROPERTY = "morsel.replay";

  private Seeds() {}

  /** The seeds of {@code count} cases from {@code base}, or just the replay seed if one is set. */
  public static long[] cases(long base, int count) {
    String replay = System.getProperty(REPLAY_PROPERTY);
    if (replay != null && !replay.isBlank()) {
      String r = replay.trim();
      return new long[] {r.startsWith("0x") ? Long.parseUnsignedLong(r.substring(2), 16) : Long.parseLong(r)};
    }
    long[] out = new long[count];
    for (int i = 0; i < count; i++) {
      out[i] = mix(base + i);
    }
    return out;
  }

  /** Whether a single seed is being replayed (tests then skip their case-count assertions). */
  public static boolean replaying() {
    String replay = System.getProperty(REPLAY_PROPERTY);
    return replay != null && !replay.isBlank();
  }

  /** The SplitMix64 output function (Steele, Lea, Flood 2014, "Fast Splittable Pseudorandom Number Generators"). */
  public static long mix(long z) {
    z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
    z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
    return z ^ (z >>> 31);
  }
}
