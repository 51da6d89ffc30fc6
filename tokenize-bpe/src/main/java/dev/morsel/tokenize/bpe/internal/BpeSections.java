package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.SectionReader;
import dev.morsel.tokenize.format.SectionWriter;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;

/**
 * Layout of the byte-level BPE sections of a model file (little-endian, written through the api's
 * {@link SectionWriter}).
 *
 * <pre>
 * BPST  settings
 *   u32 layout version (1)
 *   u32 reserved count k (&lt;= {@link ModelLimits#maxReservedTokens()})
 *   k x (u32 byte length, UTF-8 spelling)   reserved spellings in id order (ids 0..k-1)
 *   u32 cache size (entries, 0 = off, &lt;= {@link #MAX_CACHE_ENTRIES}); writers put the default here,
 *       since the cache is a runtime setting that changes no result and so must not change the fingerprint
 * BPMG  merges
 *   u32 merge count m (&lt;= {@link ModelLimits#maxMerges()})
 *   m x (u32 left id, u32 right id)           in rank order; merge r is id k+256+r
 * </pre>
 * The api also writes reserved spellings in its own section; this copy lets the segmenter stand alone,
 * and the loader refuses a file whose two lists disagree.
 */
public final class BpeSections {
  /** Settings section tag. */
  public static final String SETTINGS = "BPST";
  /** Merges section tag. */
  public static final String MERGES = "BPMG";
  /** Layout version written in {@link #SETTINGS}. */
  public static final int VERSION = 1;
  /** Largest cache accepted, in entries (16 Mi slots = 64 MiB of references). */
  public static final int MAX_CACHE_ENTRIES = 1 << 24;

  private BpeSections() {}

  /** Writes both sections. */
  public static void write(ModelWriter out, Vocab vocab, int cacheEntries) {
    SectionWriter s = out.section(SETTINGS);
    s.putInt(VERSION);
    s.putInt(vocab.k);
    for (String c : vocab.reserved) {
      s.putString(c);
    }
    s.putInt(cacheEntries);
    SectionWriter m = out.section(MERGES);
    m.putInt(vocab.left.length);
    for (int r = 0; r < vocab.left.length; r++) {
      m.putInt(vocab.left[r]);
      m.putInt(vocab.right[r]);
    }
  }

  /** What {@link #read} returns. */
  public static final class Read {
    /** The vocabulary. */
    public final Vocab vocab;
    /** The stored cache size. */
    public final int cacheEntries;

    Read(Vocab vocab, int cacheEntries) {
      this.vocab = vocab;
      this.cacheEntries = cacheEntries;
    }
  }

  /**
   * Reads and validates both sections.
   *
   * @throws ModelFormatException naming the section and entry
   */
  public static Read read(ModelSections sections, ModelLimits limits) {
    SectionReader s = sections.reader(SETTINGS);
    int version = s.getInt("layout version");
    if (version != VERSION) {
      throw s.fail("layout version " + version + " is not supported (this reader knows " + VERSION + ")");
    }
    int k = limits.readReservedCount(s, "reserved tokens", 4);
    List<String> reserved = new ArrayList<>(k);
    HashSet<String> seen = new HashSet<>();
    for (int i = 0; i < k; i++) {
      String c = limits.readToken(s, "reserved token " + i);
      if (c.isEmpty()) {
        throw new ModelFormatException(SETTINGS, "reserved token " + i + " has an empty spelling");
      }
      if (!seen.add(c)) {
        throw new ModelFormatException(SETTINGS, "reserved token " + i + " repeats spelling '" + c + "'");
      }
      reserved.add(c);
    }
    int cache = s.getInt("cache size");
    if (cache < 0 || cache > MAX_CACHE_ENTRIES) {
      throw s.fail("cache size " + cache + " is outside [0, " + MAX_CACHE_ENTRIES + "]");
    }
    s.expectEnd();
    SectionReader m = sections.reader(MERGES);
    int count = limits.readMergeCount(m, "merges", 8);
    int[] left = new int[count];
    int[] right = new int[count];
    for (int r = 0; r < count; r++) {
      left[r] = m.getInt("merge " + r + " left");
      right[r] = m.getInt("merge " + r + " right");
    }
    m.expectEnd();
    Vocab v = Vocab.build(reserved, left, right,
        (index, msg) -> new ModelFormatException(MERGES, "entry " + index + ": " + msg));
    return new Read(v, cache);
  }
}
