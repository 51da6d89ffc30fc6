package dev.morsel.tokenize.hardening.kit;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.format.ModelFormatException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.function.Consumer;
import java.util.zip.CRC32C;

/**
 * Damages a saved model in every way the hardening issue lists and checks that each damaged file is
 * rejected by {@link Tokenizers#load(byte[])} with a {@link ModelFormatException} naming a section,
 * never another exception, never a silent load, and without allocating more than the file's size
 * (plus a fixed allowance for the exception itself), measured with the JVM's per-thread allocation
 * counter ({@code com.sun.management.ThreadMXBean#getThreadAllocatedBytes}).
 *
 * <p>The container layout is read here independently of the api's reader, from the published
 * layout (docs/format.md): 32-byte header (magic 8, version 4, count 4 at offset 12, file length 8,
 * reserved 4, CRC-32C 4 at offset 28 over bytes [0, 28) and the table), then 24-byte entries (tag 4,
 * payload CRC-32C 4, offset 8, length 8), little-endian.
 *
 * <p>Besides raw damage (which the checksums catch), the harness forges damage <em>with valid
 * checksums</em> so that the segmenter's own section parser is exercised: random byte changes and
 * 32-bit fields set to large values (up to 2^31 - 1) inside every payload. Such a file may be
 * rejected (a {@link ModelFormatException} naming a section) or, if the change happens to describe
 * another valid model, load; a model that loads must then encode and decode sample texts without
 * any exception.
 */
public final class ModelCorruption {
  /** Allocation allowed beyond the file's size for a rejected file: the exception, its message and stack. */
  public static final long ALLOWANCE_BYTES = 256 * 1024;
  /**
   * Fixed cost of one rejection in steady state, beyond the file's size: the exception, its message
   * and its stack trace (observed 10.8 KB for a 10 KB unigram model, 12.2 KB for BPE: independent
   * of the file, so a small model needs this margin).
   */
  public static final long REJECTION_BYTES = 16 * 1024;

  private static final int HEADER = 32;
  private static final int ENTRY = 24;

  private final String name;
  private final byte[] model;
  private final List<String> samples;
  private final Counts counts;
  private final int count;
  private final int tableEnd;
  private final String[] tags;
  private final int[] offsets;
  private final int[] lengths;
  private final Set<String> known = new HashSet<>();
  private final Allocation threads = new Allocation();
  private long maxRejectedAllocation;
  private String maxRejectedCase = "none";
  private long maxForgedAllocation;

  /**
   * @param name names the model in messages
   * @param model a valid saved model
   * @param samples texts a forged model that loads must encode without an exception
   * @param counts where case counts go
   */
  public ModelCorruption(String name, byte[] model, List<String> samples, Counts counts) {
    this.name = name;
    this.model = model.clone();
    this.samples = List.copyOf(samples);
    this.counts = counts;
    ByteBuffer b = ByteBuffer.wrap(model).order(ByteOrder.LITTLE_ENDIAN);
    this.count = b.getInt(12);
    this.tableEnd = HEADER + ENTRY * count;
    tags = new String[count];
    offsets = new int[count];
    lengths = new int[count];
    known.add("header");
    known.add("table");
    for (int i = 0; i < count; i++) {
      int e = HEADER + ENTRY * i;
      tags[i] = new String(model, e, 4, java.nio.charset.StandardCharsets.US_ASCII);
      offsets[i] = (int) b.getLong(e + 8);
      lengths[i] = (int) b.getLong(e + 16);
      known.add(tags[i]);
    }
    Tokenizers.load(model); // must be valid, and warms up the loader before allocations are measured
  }

  /** Section tags in table order. */
  public List<String> tags() {
    return List.of(tags);
  }

  /** End of the section table (bytes). */
  public int tableEnd() {
    return tableEnd;
  }

  /** Largest allocation seen while rejecting a file damaged below the checksums. */
  public long maxRejectedAllocation() {
    return maxRejectedAllocation;
  }

  /** The damage that gave {@link #maxRejectedAllocation()}. */
  public String maxRejectedCase() {
    return maxRejectedCase;
  }

  /** Largest allocation seen while rejecting a file forged with valid checksums. */
  public long maxForgedAllocation() {
    return maxForgedAllocation;
  }

  // ------------------------------------------------------------------ cases

  /** Every other value of every byte of the header and the section table. */
  public void everyHeaderAndTableByte() {
    for (int pos = 0; pos < tableEnd; pos++) {
      for (int v = 0; v < 256; v++) {
        if (v == (model[pos] & 0xFF)) {
          continue;
        }
        byte[] f = model.clone();
        f[pos] = (byte) v;
        rejected(f, "header/table byte " + pos + " set to " + v, null);
        counts.add(name + " header/table single-byte changes rejected");
      }
    }
  }

  /** {@code perSection} seeded changes in every payload (and its padding); the section is named. */
  public void sampledPayloadChanges(long seed, int perSection) {
    SplittableRandom rnd = new SplittableRandom(seed);
    for (int s = 0; s < count; s++) {
      int end = (int) align(offsets[s] + (long) lengths[s]);
      if (end == offsets[s]) {
        continue;
      }
      for (int k = 0; k < perSection; k++) {
        int pos = rnd.nextInt(offsets[s], end);
        int delta = rnd.nextInt(1, 256);
        byte[] f = model.clone();
        f[pos] = (byte) (f[pos] + delta);
        rejected(f, "seed " + seed + ": " + tags[s] + " byte " + pos + " + " + delta, tags[s]);
        counts.add(name + " payload changes rejected (section named)");
      }
    }
  }

  /** Every truncation up to the end of the table, and {@code sampled} seeded ones beyond. */
  public void truncations(long seed, int sampled) {
    for (int len = 0; len <= tableEnd; len++) {
      rejected(Arrays.copyOf(model, len), "truncated to " + len, null);
      counts.add(name + " truncations rejected");
    }
    SplittableRandom rnd = new SplittableRandom(seed);
    for (int k = 0; k < sampled; k++) {
      int len = k == 0 ? model.length - 1 : rnd.nextInt(tableEnd + 1, model.length);
      rejected(Arrays.copyOf(model, len), "truncated to " + len, null);
      counts.add(name + " truncations rejected");
    }
  }

  /** Section lengths forged up to 2^31 - 1 (header checksum fixed so the bound checks see them). */
  public void forgedSectionLengths() {
    for (int s = 0; s < count; s++) {
      long[] values = {Integer.MAX_VALUE, Integer.MAX_VALUE - 1L, 1L << 30, (1L << 24) + 3, model.length,
          model.length - offsets[s] + 1L, lengths[s] + 1L, lengths[s] + 8L, lengths[s] - 1L, 0L, 1L << 32,
          -1L};
      for (long v : values) {
        if (v == lengths[s] || v < -1) {
          continue;
        }
        byte[] f = model.clone();
        ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN).putLong(HEADER + ENTRY * s + 16, v);
        fixHeaderCrc(f);
        rejected(f, tags[s] + " length forged to " + Long.toUnsignedString(v), tags[s]);
        counts.add(name + " forged section lengths rejected");
      }
    }
  }

  /**
   * Damage under valid checksums: {@code perSection} seeded byte changes and a 32-bit field set to a
   * large value at every 4-byte position of the first 256 bytes of each payload.
   */
  public void forgedPayloads(long seed, int perSection, Consumer<Tokenizer> use) {
    SplittableRandom rnd = new SplittableRandom(seed);
    int[] large = {Integer.MAX_VALUE, Integer.MAX_VALUE - 7, 1 << 30, 1 << 24, 0xFFFF, -1};
    for (int s = 0; s < count; s++) {
      if (lengths[s] == 0) {
        continue;
      }
      List<byte[]> forged = new ArrayList<>();
      List<String> what = new ArrayList<>();
      for (int k = 0; k < perSection; k++) {
        int pos = offsets[s] + rnd.nextInt(lengths[s]);
        int delta = rnd.nextInt(1, 256);
        byte[] f = model.clone();
        f[pos] = (byte) (f[pos] + delta);
        forged.add(f);
        what.add("seed " + seed + ": " + tags[s] + " byte " + pos + " + " + delta + " (checksums fixed)");
      }
      for (int at = 0; at + 4 <= Math.min(lengths[s], 256); at += 4) {
        int v = large[(at / 4) % large.length];
        byte[] f = model.clone();
        ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN).putInt(offsets[s] + at, v);
        forged.add(f);
        what.add(tags[s] + " int at payload offset " + at + " set to " + v + " (checksums fixed)");
      }
      for (int k = 0; k < forged.size(); k++) {
        byte[] f = forged.get(k);
        fixPayloadCrc(f, s);
        fixHeaderCrc(f);
        long before = threads.getCurrentThreadAllocatedBytes();
        Tokenizer t;
        try {
          t = Tokenizers.load(f);
        } catch (ModelFormatException e) {
          if (!known.contains(e.section())) {
            throw new AssertionError(name + ": " + what.get(k) + ": unknown section in " + e.getMessage());
          }
          maxForgedAllocation = Math.max(maxForgedAllocation, threads.getCurrentThreadAllocatedBytes() - before);
          counts.add(name + " forged payloads (valid checksums) rejected");
          continue;
        } catch (Throwable e) {
          throw new AssertionError(name + ": " + what.get(k) + ": expected ModelFormatException, got " + e, e);
        }
        try {
          use.accept(t);
        } catch (Throwable e) {
          throw new AssertionError(name + ": " + what.get(k) + ": loaded, then failed in use: " + e, e);
        }
        counts.add(name + " forged payloads (valid checksums) loaded and usable");
      }
    }
  }

  /** A default use of a forged model that loaded: encode and decode the samples. */
  public Consumer<Tokenizer> encodeSamples() {
    return t -> {
      for (String s : samples) {
        t.decode(t.encode(s).ids());
      }
    };
  }

  /**
   * Every kind of damage on {@code model}: every header and table byte, {@code perSection} payload
   * changes per section, truncations ({@code truncations} beyond the table), forged section lengths,
   * and {@code forgedPerSection} changes under valid checksums per section (a model that loads must
   * encode and decode {@code samples}). Asserts that rejecting raw damage allocated at most the
   * file's size plus {@link #REJECTION_BYTES}, and rejecting forged damage at most {@code forgedFactor} times the file's size plus
   * 1 MiB (found only after a segmenter was built from the other sections: proportional to the
   * model, never to a forged count). Prints a summary line and returns the harness.
   */
  public static ModelCorruption everyDamage(String name, byte[] model, List<String> samples, Counts counts, long seed,
      int perSection, int truncations, int forgedPerSection, long forgedFactor) {
    ModelCorruption c = new ModelCorruption(name, model, samples, counts);
    c.everyHeaderAndTableByte();
    c.sampledPayloadChanges(seed, perSection);
    c.truncations(seed, truncations);
    c.forgedSectionLengths();
    c.forgedPayloads(seed, forgedPerSection, c.encodeSamples());
    System.out.println("[model corruption] " + name + ": " + model.length + "-byte model, sections " + c.tags()
        + ", table ends at " + c.tableEnd() + "; largest allocation while rejecting raw damage "
        + c.maxRejectedAllocation() + " bytes (" + c.maxRejectedCase() + "), forged damage " + c.maxForgedAllocation()
        + " bytes");
    if (c.maxRejectedAllocation() > model.length + REJECTION_BYTES) {
      throw new AssertionError(name + ": rejecting allocated " + c.maxRejectedAllocation() + " bytes for a "
          + model.length + "-byte model (" + c.maxRejectedCase() + ")");
    }
    if (c.maxForgedAllocation() > forgedFactor * model.length + (1 << 20)) {
      throw new AssertionError(name + ": forged damage allocated " + c.maxForgedAllocation() + " bytes");
    }
    return c;
  }

  // ------------------------------------------------------------------ internals

  private void rejected(byte[] f, String what, String section) {
    long before = threads.getCurrentThreadAllocatedBytes();
    try {
      Tokenizers.load(f);
    } catch (ModelFormatException e) {
      long used = threads.getCurrentThreadAllocatedBytes() - before;
      if (used > Math.min(f.length, 64 * 1024)) {
        // the first failure of a kind may load and initialize classes: measure a second time
        used = allocationOfLoad(f);
        if (used > f.length + ALLOWANCE_BYTES) {
          throw new AssertionError(name + ": " + what + ": rejecting a " + f.length + "-byte file allocated " + used
              + " bytes");
        }
      }
      if (used > maxRejectedAllocation) {
        maxRejectedAllocation = used;
        maxRejectedCase = what;
      }
      if (section != null ? !section.equals(e.section()) : !known.contains(e.section())) {
        throw new AssertionError(name + ": " + what + ": exception names section '" + e.section() + "', expected "
            + (section != null ? section : known) + ": " + e.getMessage());
      }
      return;
    } catch (Throwable e) {
      throw new AssertionError(name + ": " + what + ": expected ModelFormatException, got " + e, e);
    }
    throw new AssertionError(name + ": " + what + ": the damaged model loaded");
  }

  /**
   * The JVM's per-thread allocation counter, reached by reflection because the test classes are
   * compiled into the api module, which does not read {@code java.management} (tests run on the
   * class path, where reflection sees it).
   */
  static final class Allocation {
    private final Object bean;
    private final java.lang.reflect.Method method;

    Allocation() {
      try {
        bean = Class.forName("java.lang.management.ManagementFactory").getMethod("getThreadMXBean").invoke(null);
        method = Class.forName("com.sun.management.ThreadMXBean").getMethod("getCurrentThreadAllocatedBytes");
      } catch (ReflectiveOperationException e) {
        throw new IllegalStateException("this JVM has no per-thread allocation counter", e);
      }
    }

    long getCurrentThreadAllocatedBytes() {
      try {
        return (Long) method.invoke(bean);
      } catch (ReflectiveOperationException e) {
        throw new IllegalStateException(e);
      }
    }
  }

  private long allocationOfLoad(byte[] f) {
    long before = threads.getCurrentThreadAllocatedBytes();
    try {
      Tokenizers.load(f);
    } catch (ModelFormatException e) {
      return threads.getCurrentThreadAllocatedBytes() - before;
    }
    throw new AssertionError(name + ": a damaged model loaded on the second try");
  }

  private static long align(long n) {
    return (n + 7) & -8L;
  }

  private void fixPayloadCrc(byte[] f, int s) {
    CRC32C crc = new CRC32C();
    crc.update(f, offsets[s], lengths[s]);
    ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN).putInt(HEADER + ENTRY * s + 4, (int) crc.getValue());
  }

  private static void fixHeaderCrc(byte[] f) {
    ByteBuffer b = ByteBuffer.wrap(f).order(ByteOrder.LITTLE_ENDIAN);
    int n = b.getInt(12);
    CRC32C crc = new CRC32C();
    crc.update(f, 0, 28);
    crc.update(f, HEADER, Math.min(ENTRY * n, f.length - HEADER));
    b.putInt(28, (int) crc.getValue());
  }
}
