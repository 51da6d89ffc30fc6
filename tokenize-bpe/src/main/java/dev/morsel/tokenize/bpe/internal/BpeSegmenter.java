package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.ReservedTokens;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.AlphabetRecord;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.ReviewDocument;
import dev.morsel.tokenize.format.ReviewWriter;
import dev.morsel.tokenize.spi.ByteSink;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.TokenSink;
import dev.morsel.tokenize.spi.Workspace;
import dev.morsel.tokenize.spi.WorkspacePool;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.SplittableRandom;

/**
 * Byte-level BPE segmenter: applies ranked merges to the UTF-8 bytes of each piece. Immutable and
 * thread-safe; allocates nothing per token (per-thread scratch buffers, and cache hits allocate
 * nothing at all).
 *
 * <p>Vocabulary: reserved tokens {@code 0..k-1} (never produced by {@link #segment}), then the 256
 * byte tokens {@code k..k+255} (all present, so there is no unknown token), then one token per merge
 * in rank order. Segmentation repeatedly merges the lowest-ranked adjacent pair, leftmost first among
 * equal ranks [1]; a token that holds part of a multi-byte character reports that whole character's
 * span; a lone surrogate is encoded as U+FFFD (normalization already replaces it; this is defensive).
 *
 * <p>Display spellings ({@link #token}): a token's bytes in the review text's field escaping ({@link
 * dev.morsel.tokenize.format.ReviewText#escape(byte[])}): text where they are well-formed, printable
 * UTF-8, {@code \\} for a backslash, {@code \s} for a space, and escapes in braces for invisible
 * characters and for bytes not part of a well-formed UTF-8 sequence. Reserved tokens show their
 * spelling. Token bytes are unique, so spellings are unique, and {@link #id(String)} inverts {@link
 * #token(int)}.
 *
 * <p>Piece cache: on by default with {@link #DEFAULT_CACHE_ENTRIES} entries; see
 * {@link #withCacheEntries(int)}. Results are identical with the cache on or off, cold or warm.
 * BPE-dropout [2]: {@link #withDropout(double, long)}.
 *
 * <p>References: [1] Sennrich, Haddow, Birch (2016), "Neural Machine Translation of Rare Words with
 * Subword Units", ACL 2016. [2] Provilkov, Emelianenko, Voita (2020), "BPE-Dropout: Simple and
 * Effective Subword Regularization", ACL 2020.
 *
 * @since 0.1.0
 */
public final class BpeSegmenter implements Segmenter {
  /** Kind name in model files. */
  public static final String SCHEME = "bpe";
  /**
   * Default piece cache size, in entries (one entry = one distinct piece of up to 256 UTF-16 units and
   * its tokens; 65,536 entries cover the frequent pieces of a typical language with a few MiB).
   */
  public static final int DEFAULT_CACHE_ENTRIES = 65_536;
  /** Largest allowed cache, in entries. */
  public static final int MAX_CACHE_ENTRIES = BpeSections.MAX_CACHE_ENTRIES;
  /** Longest token a model may hold, in bytes. */
  public static final int MAX_TOKEN_BYTES = Vocab.MAX_TOKEN_BYTES;

  // ------------------------------------------------------------------ state

  private final Vocab vocab;
  private final Encoder encoder;
  private final ReservedTokens reservedTokens;
  private final int cacheEntries;
  private final PieceCache cache; // null when off
  private final double dropout;
  private final long seed;
  private final SplittableRandom dropoutRoot; // null when dropout is off
  /** Workspaces for calls that bring none; owned by this segmenter. */
  private final WorkspacePool<Encoder.Scratch> own;

  /** What the learner's alphabet policy did, or null (a model made from a token list, or an old file). */
  private volatile AlphabetRecord alphabetRecord;

  private BpeSegmenter(Vocab vocab, Encoder encoder, ReservedTokens reserved, int cacheEntries, double dropout, long seed) {
    this.vocab = vocab;
    this.encoder = encoder;
    this.reservedTokens = reserved;
    this.cacheEntries = cacheEntries;
    this.cache = cacheEntries == 0 || dropout > 0 ? null : new PieceCache(cacheEntries); // dropout bypasses it
    this.dropout = dropout;
    this.seed = seed;
    this.dropoutRoot = dropout > 0 ? new SplittableRandom(seed) : null;
    this.own = WorkspacePool.of(encoder::newScratch);
  }

  public static BpeSegmenter create(Vocab vocab, int cacheEntries) {
    ReservedTokens.Builder b = ReservedTokens.builder();
    List<String> reserved = vocab.reserved(); // a copy: taken once, not per token
    for (int i = 0; i < reserved.size(); i++) {
      b.add(reserved.get(i), i);
    }
    return new BpeSegmenter(vocab, new Encoder(vocab), b.build(), cacheEntries, 0.0, 0L);
  }

  // ------------------------------------------------------------------ factories

  /**
   * A segmenter from explicit merges: merge {@code r} joins {@code left[r]} and {@code right[r]} into
   * id {@code reserved.size() + 256 + r}.
   *
   * @throws IllegalArgumentException if a merge refers to a reserved id or an id not below its own, a
   *     pair repeats, two tokens would have the same bytes, a token exceeds {@link #MAX_TOKEN_BYTES},
   *     or the reserved spellings are invalid (see {@link ReservedTokens.Builder})
   */
  public static BpeSegmenter of(List<String> reserved, int[] left, int[] right) {
    Objects.requireNonNull(reserved, "reserved");
    if (left.length != right.length) {
      throw new IllegalArgumentException("left (" + left.length + ") and right (" + right.length + ") differ in length");
    }
    Vocab v = Vocab.build(reserved, left, right, (i, msg) -> new IllegalArgumentException(msg));
    return create(v, DEFAULT_CACHE_ENTRIES);
  }

  /**
   * Reads a segmenter from its model sections ({@code BPST}, {@code BPMG}).
   *
   * @throws ModelFormatException naming the section and the entry that is wrong
   */
  public static BpeSegmenter read(ModelSections sections) {
    return read(sections, ModelLimits.defaults());
  }

  /**
   * As {@link #read(ModelSections)}, with every count and spelling checked against {@code limits}.
   *
   * @throws ModelFormatException naming the section and the entry that is wrong, or the limit exceeded
   */
  public static BpeSegmenter read(ModelSections sections, ModelLimits limits) {
    BpeSections.Read r = BpeSections.read(sections, limits);
    try {
      return create(r.vocab, r.cacheEntries);
    } catch (IllegalArgumentException e) {
      throw new ModelFormatException(BpeSections.SETTINGS, e.getMessage(), e);
    }
  }

  /**
   * Reads a segmenter from its sections of a review text ({@code vocabulary}: reserved and byte
   * tokens; {@code merges}: rank, left, right, token), validating everything before building.
   *
   * @throws ModelFormatException naming the line and column that is wrong
   */
  public static BpeSegmenter readReview(ReviewDocument review) {
    return create(BpeReview.read(review), DEFAULT_CACHE_ENTRIES);
  }

  // ------------------------------------------------------------------ options

  /**
   * This segmenter with a piece cache of {@code entries} entries (rounded up to a power of two), or
   * none for 0. Each instance has its own cache. Default {@link #DEFAULT_CACHE_ENTRIES}.
   *
   * @throws IllegalArgumentException if {@code entries} is outside [0, {@link #MAX_CACHE_ENTRIES}]
   */
  public BpeSegmenter withCacheEntries(int entries) {
    if (entries < 0 || entries > MAX_CACHE_ENTRIES) {
      throw new IllegalArgumentException("cacheEntries=" + entries + " is outside [0, " + MAX_CACHE_ENTRIES + "]");
    }
    return new BpeSegmenter(vocab, encoder, reservedTokens, entries, dropout, seed);
  }

  /** The configured cache size in entries (0 = off). */
  public int cacheEntries() {
    return cacheEntries;
  }

  /**
   * This segmenter with BPE-dropout [2]: at every merge step of a piece, each candidate merge (each
   * adjacent pair occurrence that has a rank) is skipped independently with probability {@code p};
   * the lowest-ranked remaining candidate, leftmost among equals, is applied; when every candidate of
   * a step is skipped, the piece's segmentation ends there. {@code p = 0} gives plain segmentation,
   * {@code p = 1} single bytes. The cache is bypassed. Each encode workspace draws from its own
   * generator, split from a root {@code SplittableRandom(seed)} in the order workspaces are first
   * used, so a single-threaded run (which reuses one workspace) is reproducible for a given seed.
   *
   * @throws IllegalArgumentException if {@code p} is not in [0, 1]
   */
  public BpeSegmenter withDropout(double p, long seed) {
    if (!(p >= 0.0 && p <= 1.0)) {
      throw new IllegalArgumentException("dropout=" + p + " is not a probability in [0, 1]");
    }
    return new BpeSegmenter(vocab, encoder, reservedTokens, cacheEntries, p, seed);
  }

  /** The dropout probability (0 = off). */
  public double dropout() {
    return dropout;
  }

  // ------------------------------------------------------------------ API

  @Override
  public String scheme() {
    return SCHEME;
  }

  @Override
  public int vocabularySize() {
    return vocab.size();
  }

  @Override
  public String token(int id) {
    Objects.checkIndex(id, vocab.size());
    return vocab.display(id);
  }

  @Override
  public int id(String token) {
    return token == null ? -1 : vocab.id(token);
  }

  /** The reserved tokens given to the learner, ids {@code 0..k-1}, for assembling a tokenizer. */
  public ReservedTokens reservedTokens() {
    return reservedTokens;
  }

  @Override
  public List<String> reservedSpellings() {
    return reservedTokens.spellings();
  }

  /** Number of merges. */
  public int mergeCount() {
    return vocab.mergeCount();
  }

  /** Left operand id of merge {@code rank}. */
  public int mergeLeft(int rank) {
    Objects.checkIndex(rank, vocab.mergeCount());
    return vocab.left(rank);
  }

  /** Right operand id of merge {@code rank}. */
  public int mergeRight(int rank) {
    Objects.checkIndex(rank, vocab.mergeCount());
    return vocab.right(rank);
  }

  /** A copy of token {@code id}'s bytes (a reserved token's spelling as UTF-8). */
  public byte[] tokenBytes(int id) {
    Objects.checkIndex(id, vocab.size());
    return vocab.tokenBytes(id);
  }

  @Override
  public void segment(CharSequence text, int start, int end, TokenSink sink) {
    Encoder.Scratch s = own.take();
    try {
      segment(text, start, end, sink, s);
    } finally {
      own.give(s);
    }
  }

  /** A workspace of a few hundred bytes; it grows with the pieces it sees (see {@link Encoder.Scratch}). */
  @Override
  public Workspace newWorkspace() {
    return encoder.newScratch();
  }

  @Override
  public void segment(CharSequence text, int start, int end, TokenSink sink, Workspace workspace) {
    Objects.checkFromToIndex(start, end, text.length());
    if (!(workspace instanceof Encoder.Scratch)) {
      segment(text, start, end, sink);
      return;
    }
    Encoder.Scratch s = (Encoder.Scratch) workspace;
    if (dropout > 0) {
      SplittableRandom r = s.random;
      if (r == null) {
        synchronized (dropoutRoot) {
          r = dropoutRoot.split();
        }
        s.random = r;
      }
      encoder.segmentDropout(text, start, end, sink, dropout, r, s);
    } else {
      encoder.segment(text, start, end, sink, cache, s);
    }
  }

  /**
   * The merges applied to the piece, in the order the encoder applies them (lowest rank first,
   * leftmost first among equal ranks), each with its rank, then the resulting tokens. Quadratic in
   * the piece length: for people, not for the hot path.
   */
  @Override
  public List<String> explain(CharSequence text, int start, int end) {
    Objects.checkFromToIndex(start, end, text.length());
    Map<Long, Integer> ranks = new HashMap<>();
    for (int r = 0; r < vocab.mergeCount(); r++) {
      ranks.put(((long) vocab.left(r) << 32) | vocab.right(r), r);
    }
    int first = vocab.reservedCount() + 256;
    String piece = text.subSequence(start, end).toString().replaceAll("[\\ud800-\\udbff](?![\\udc00-\\udfff])|(?<![\\ud800-\\udbff])[\\udc00-\\udfff]", "\ufffd");
    java.util.ArrayList<Integer> ids = new java.util.ArrayList<>();
    for (byte b : piece.getBytes(StandardCharsets.UTF_8)) {
      ids.add(vocab.reservedCount() + (b & 0xFF));
    }
    java.util.ArrayList<String> out = new java.util.ArrayList<>();
    out.add(ids.size() + " byte tokens; merges in order:");
    while (true) {
      int best = -1;
      int bestRank = Integer.MAX_VALUE;
      for (int i = 0; i + 1 < ids.size(); i++) {
        Integer r = ranks.get(((long) ids.get(i) << 32) | ids.get(i + 1));
        if (r != null && r < bestRank) {
          bestRank = r;
          best = i;
        }
      }
      if (best < 0) {
        break;
      }
      out.add("rank " + bestRank + ": '" + token(ids.get(best)) + "' + '" + token(ids.get(best + 1)) + "' -> '"
          + token(first + bestRank) + "'");
      ids.set(best, first + bestRank);
      ids.remove(best + 1);
    }
    StringBuilder sb = new StringBuilder("no merge applies any more; tokens:");
    for (int id : ids) {
      sb.append(" '").append(token(id)).append("'(").append(id).append(')');
    }
    out.add(sb.toString());
    return out;
  }

  /**
   * As {@link #segment(CharSequence, int, int, TokenSink)} with this segmenter's dropout probability
   * but drawing from {@code random} (plain segmentation if dropout is off).
   */
  public void segment(CharSequence text, int start, int end, TokenSink sink, SplittableRandom random) {
    Objects.checkFromToIndex(start, end, text.length());
    Objects.requireNonNull(random, "random");
    if (dropout > 0) {
      encoder.segmentDropout(text, start, end, sink, dropout, random);
    } else {
      encoder.segment(text, start, end, sink, cache);
    }
  }

  /**
   * Segments one piece with BPE-dropout at probability {@code p} (see {@link #withDropout}), drawing
   * from {@code random}, with working memory from {@code workspace} if it is one of this segmenter's
   * (null: its own); {@code p = 0} is plain segmentation.
   */
  public void segmentDropout(CharSequence text, int start, int end, TokenSink sink, double p, SplittableRandom random,
      Workspace workspace) {
    Objects.checkFromToIndex(start, end, text.length());
    Objects.requireNonNull(random, "random");
    if (p == 0) {
      segment(text, start, end, sink, workspace);
    } else if (workspace instanceof Encoder.Scratch) {
      encoder.segmentDropout(text, start, end, sink, p, random, (Encoder.Scratch) workspace);
    } else {
      encoder.segmentDropout(text, start, end, sink, p, random);
    }
  }

  @Override
  public void decodeToken(int id, ByteSink out) {
    Objects.checkIndex(id, vocab.size());
    out.write(vocab.byteStore(), vocab.offset(id), vocab.length(id));
  }


  /**
   * Records what the alphabet policy did, once, before the segmenter is shared: the model file and
   * the review text then carry it (section {@code ALPH}, outside the fingerprint). A null record is
   * ignored.
   *
   * @throws IllegalStateException if a record was set already
   */
  public void recordAlphabet(AlphabetRecord record) {
    if (record == null) {
      return;
    }
    if (alphabetRecord != null) {
      throw new IllegalStateException("the alphabet record is set once");
    }
    alphabetRecord = record;
  }

  /** What the learner's alphabet policy did, or null when the model does not say. */
  public AlphabetRecord alphabetRecord() {
    return alphabetRecord;
  }

  @Override
  public void write(ModelWriter out) {
    BpeSections.write(out, vocab, DEFAULT_CACHE_ENTRIES);
    AlphabetRecord r = alphabetRecord;
    if (r != null) {
      r.write(out);
    }
  }

  /** Writes the {@code vocabulary} and {@code merges} sections of a review text. */
  @Override
  public void writeReview(ReviewWriter out) {
    BpeReview.write(out, vocab);
    AlphabetRecord r = alphabetRecord;
    if (r != null) {
      r.writeReview(out);
    }
  }

  /** Test and benchmark access to the two merge paths and the vocabulary. */
  public Encoder encoder() {
    return encoder;
  }

  @Override
  public String toString() {
    return "BpeSegmenter[" + vocab.reservedCount() + " reserved, " + vocab.mergeCount() + " merges, cache "
        + cacheEntries + (dropout > 0 ? ", dropout " + dropout : "") + "]";
  }
}
