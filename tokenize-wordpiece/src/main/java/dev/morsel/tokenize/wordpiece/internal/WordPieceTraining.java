package dev.morsel.tokenize.wordpiece.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.train.Alphabet;
import dev.morsel.tokenize.train.AlphabetPolicy;
import dev.morsel.tokenize.train.Learner;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import it.unimi.dsi.fastutil.ints.Int2LongOpenHashMap;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import it.unimi.dsi.fastutil.longs.Long2LongOpenHashMap;
import it.unimi.dsi.fastutil.longs.Long2ObjectOpenHashMap;
import it.unimi.dsi.fastutil.longs.LongIterator;
import it.unimi.dsi.fastutil.longs.LongOpenHashSet;
import it.unimi.dsi.fastutil.objects.Object2IntOpenHashMap;
import it.unimi.dsi.fastutil.objects.ObjectArrayList;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Objects;
import java.util.Set;

/**
 * Learns a WordPiece vocabulary from piece counts by likelihood-based pair merging. Immutable and
 * thread-safe; {@link #train} is deterministic.
 *
 * <p>Contract of {@link #train}:
 * <ol>
 *   <li>Pieces with a count below {@code minCount} are dropped, and so are pieces longer than the
 *       piece limit (the settings' {@link WordPieceSettings#maxPieceLength()}, or when that is derived,
 *       {@code vocabularySize}, the derived limit of the largest model training can make; see {@link
 *       WordPieceSegmenter#pieceLimit()}): the encoder maps them to the unknown
 *       token as a whole, and the work of every merge that touches a piece grows with its length
 *       (one 100 MB piece would keep training busy for hours).
 *   <li>The count-weighted number of UTF-16 units of the kept pieces must fit a long (unit and pair
 *       counts never exceed it); otherwise {@link #train} fails rather than let a count wrap around.
 *   <li>Alphabet: the code points of the pieces, ranked by total occurrences (count-weighted), ties
 *       by smaller code point; the {@link AlphabetPolicy} keeps the first ones until they cover its
 *       share of the occurrences, at most its cap (derived: a quarter of the ids left after the
 *       reserved and unknown tokens, since every character takes two ids). The choice goes to
 *       {@link TrainingListener#alphabet}. Pieces holding any other code
 *       point are left out of training (the encoder maps such pieces to the unknown token anyway).
 *       The initial units are both forms (word-initial and continuation) of every code point that
 *       occurs in a piece lying wholly inside the alphabet, so every such piece stays encodable
 *       whichever position its code points take at encode time; ids follow the alphabet rank,
 *       word-initial form first.
 *   <li>Merges: each piece is a sequence of units; repeatedly the adjacent pair (a, b) with the
 *       highest score is merged everywhere (leftmost first within a piece) into the unit ab, which
 *       keeps a's form. Counts are count-weighted occurrences in the current segmentation (pair
 *       counts include overlapping occurrences such as the two (x, x) in x x x); N is the total
 *       unit count. The score ({@link Score}) is, for the default {@link Score#LIKELIHOOD_GAIN},
 *       the double {@code (double) count(ab) * StrictMath.log(((double) count(ab) * (double) N) /
 *       ((double) count(a) * (double) count(b)))}, and for {@link Score#PAIR_RATIO} the double
 *       {@code (double) count(ab) / ((double) count(a) * (double) count(b))}. Ties go to the
 *       higher count(ab), then the smaller spelling of a, then the smaller spelling of b ({@link
 *       String#compareTo}). Pairs with count(ab) below {@code minPairCount} are never merged.
 *   <li>A pair is never merged if the new unit's spelling equals a reserved or unknown spelling, or
 *       if it is word-initial and starts with the marker while being longer than it (its spelling
 *       would read as a continuation token).
 *   <li>Merging stops when the vocabulary (reserved tokens, the unknown token and all units ever
 *       created) reaches {@code vocabularySize}, or no pair is left.
 * </ol>
 *
 * <p>Exactness of the incremental merge loop: a pair's score depends on count(ab), count(a),
 * count(b) and (gain only) N. After each merge the learner pushes a fresh heap entry for every pair
 * whose count changed and for every live pair that contains a, b or ab (kept per unit in a pair
 * set). N only falls, and the gain rises with N for fixed counts (each step of its computation is
 * monotone: exact or correctly rounded products and quotient, a semi-monotone log, a positive
 * factor), so an entry whose counts are unchanged holds an upper bound of its current score. A
 * popped entry whose pair count differs from the current one is dropped (a fresh entry exists); one
 * whose score differs from the recomputed score is pushed again with the current score; one whose
 * score is current is the true best pair, since every live pair has an entry at least as high
 * (lazy re-evaluation of upper bounds, as in Minoux's accelerated greedy [3]). Only pieces that
 * hold the merged pair (pair → pieces index) are rescanned; no full recount is ever made.
 *
 * <p>Note on the score. Under a unigram model of the units, P(u) = count(u) / N, the corpus
 * log-likelihood is L = Σ count(u) ln count(u) − N ln N. Merging the k = count(ab) occurrences of
 * (a, b) recodes each of them as one unit of probability k/N instead of two of probabilities
 * count(a)/N and count(b)/N; with the probabilities held at their current estimates the change is
 * k · ln((k/N) / ((count(a)/N)(count(b)/N))) = k · ln(k N / (count(a) count(b))), the gain used
 * here: the frequency-weighted pointwise association of the pair [1][2]. Re-estimating all
 * probabilities after the merge and expanding L to first order in k adds a term −k (the exact
 * change is f(k) + f(ca−k) − f(ca) + f(cb−k) − f(cb) − f(N−k) + f(N), f(x) = x ln x); that variant
 * was measured and gave markedly longer encodings (demo corpus, 2,000 tokens: 2.22 against 1.32
 * tokens per word; docs/wordpiece.md), so it is not offered. Dividing the gain by k gives the old
 * {@link Score#PAIR_RATIO} ranking up to the monotone map x → ln(x N), which ignores how often a
 * pair occurs and so fills small vocabularies with rare long strings.
 *
 * <p>References: [1] Schuster &amp; Nakajima (2012), "Japanese and Korean Voice Search", ICASSP
 * 2012 (// from memory: the unit whose addition most increases the training-data likelihood under
 * the language model is added, greedily, until the inventory has the wanted size); [2] Church &amp; Hanks (1990), "Word
 * Association Norms, Mutual Information, and Lexicography", Computational Linguistics 16(1)
 * (pointwise mutual information); [3] Minoux (1978), "Accelerated greedy algorithms for maximizing
 * submodular set functions", Optimization Techniques, LNCIS 7 (// from memory: venue; lazy
 * evaluation of stale upper bounds in a priority queue).
 *
 * @since 0.1.0
 */
public final class WordPieceTraining implements Learner {
  /** Default {@code vocabularySize}, in tokens, the same for every scheme. */
  public static final int DEFAULT_VOCABULARY_SIZE = LearnerSettings.DEFAULT_VOCABULARY_SIZE;
  /**
   * Byte spelling is on by default from this vocabulary size up, in ids: there the 256 byte tokens
   * take at most an eighth of the vocabulary (reason: at 8,000 ids byte spelling removed every
   * unknown character for under 1 % more tokens, docs/guide.md "Large alphabets"; at the few hundred
   * ids of small models they would take most of it).
   */
  public static final int BYTE_SPELLING_FROM = 2048;

  /** The default byte spelling at {@code vocabularySize}: on from {@link #BYTE_SPELLING_FROM} ids. */
  public static boolean defaultByteSpelling(int vocabularySize) {
    return vocabularySize >= BYTE_SPELLING_FROM;
  }
  /** Default {@code minCount}: every piece is used. */
  public static final long DEFAULT_MIN_COUNT = 1;

  /**
   * Default {@code minPairCount}: no floor. With {@link Score#LIKELIHOOD_GAIN} a floor of 3 or 10
   * changed nothing measurable on Europarl or the demo corpus (docs/wordpiece.md).
   */
  public static final long DEFAULT_MIN_PAIR_COUNT = 1;

  /**
   * How the learner ranks candidate pairs (a, b); both are likelihood-based after [1].
   *
   * @since 0.1.0
   */
  public enum Score {
    /**
     * The log-likelihood gain of a merge under a unigram model of the units, estimated at the
     * current counts: {@code count(ab) * ln(count(ab) * N / (count(a) * count(b)))}, N the total
     * unit count (natural log). Weighs how often a pair occurs against how strongly its halves
     * attract. The default.
     */
    LIKELIHOOD_GAIN,
    /**
     * The ratio {@code count(ab) / (count(a) * count(b))}: the gain per merged occurrence, without the
     * weight of the occurrences. Favours pairs of rare units; kept for comparison and old models.
     */
    PAIR_RATIO
  }

  private final int vocabularySize;
  private final long minCount;
  private final AlphabetPolicy alphabet;
  private final List<String> reservedTokens;
  private final WordPieceSettings settings;
  private final TrainingListener listener;
  private final Score rule;
  private final long minPairCount;

  private WordPieceTraining(Builder b) {
    this.vocabularySize = b.vocabularySize;
    this.minCount = b.minCount;
    this.alphabet = b.alphabet;
    this.reservedTokens = List.copyOf(b.reservedTokens);
    this.settings = b.settings;
    this.listener = b.listener;
    this.rule = b.score;
    this.minPairCount = b.minPairCount;
  }

  /** A builder with the defaults. */
  public static Builder builder() {
    return new Builder();
  }

  /**
   * Builds {@link WordPieceTraining}s. Not thread-safe.
   *
   * @since 0.1.0
   */
  public static final class Builder {
    private int vocabularySize = DEFAULT_VOCABULARY_SIZE;
    private long minCount = DEFAULT_MIN_COUNT;
    private AlphabetPolicy alphabet = AlphabetPolicy.defaults();
    private List<String> reservedTokens = List.of();
    private WordPieceSettings settings = WordPieceSettings.defaults();
    private TrainingListener listener = TrainingListener.NONE;
    private Score score = Score.LIKELIHOOD_GAIN;
    private long minPairCount = DEFAULT_MIN_PAIR_COUNT;

    private Builder() {}

    /**
     * Target vocabulary size in tokens, reserved and unknown tokens included (default {@value
     * WordPieceTraining#DEFAULT_VOCABULARY_SIZE}).
     *
     * @throws IllegalArgumentException if not in {@code [2, MAX_VOCABULARY_SIZE]}
     */
    public Builder vocabularySize(int vocabularySize) {
      if (vocabularySize < 2 || vocabularySize > WordPieceSegmenter.MAX_VOCABULARY_SIZE) {
        throw new IllegalArgumentException("vocabularySize=" + vocabularySize + " is outside [2, "
            + WordPieceSegmenter.MAX_VOCABULARY_SIZE + "]");
      }
      this.vocabularySize = vocabularySize;
      return this;
    }

    /**
     * Pieces seen fewer times are dropped (default {@value WordPieceTraining#DEFAULT_MIN_COUNT}).
     *
     * @throws IllegalArgumentException if below 1
     */
    public Builder minCount(long minCount) {
      if (minCount < 1) {
        throw new IllegalArgumentException("minCount=" + minCount + " must be at least 1");
      }
      this.minCount = minCount;
      return this;
    }

    /** How the alphabet is chosen (default {@link AlphabetPolicy#defaults()}). */
    public Builder alphabet(AlphabetPolicy alphabet) {
      this.alphabet = Objects.requireNonNull(alphabet, "alphabet");
      return this;
    }

    /**
     * Reserved token spellings reserved at ids {@code 0..n-1} (default none), checked by the rules of
     * {@link dev.morsel.tokenize.ReservedTokens.Builder}.
     *
     * @throws IllegalArgumentException naming the spelling, by index, that breaks a rule
     * @throws NullPointerException naming the spelling, by index, that is null
     */
    public Builder reservedTokens(List<String> reservedTokens) {
      this.reservedTokens = LearnerSettings.checkReserved(reservedTokens);
      return this;
    }

    /** Marker, unknown spelling and piece limit of the trained model (default {@link WordPieceSettings#defaults()}). */
    public Builder settings(WordPieceSettings settings) {
      this.settings = Objects.requireNonNull(settings, "settings");
      return this;
    }

    /**
     * How candidate pairs are ranked (default {@link Score#LIKELIHOOD_GAIN}).
     *
     * @throws NullPointerException if {@code score} is null
     */
    public Builder score(Score score) {
      this.score = Objects.requireNonNull(score, "score");
      return this;
    }

    /**
     * Pairs occurring fewer times (count-weighted, in the current segmentation) are never merged;
     * merging stops early if no pair reaches the floor (default {@value
     * WordPieceTraining#DEFAULT_MIN_PAIR_COUNT}: no floor). Mainly useful with {@link
     * Score#PAIR_RATIO}, whose results depend strongly on it.
     *
     * @throws IllegalArgumentException if below 1
     */
    public Builder minPairCount(long minPairCount) {
      if (minPairCount < 1) {
        throw new IllegalArgumentException("minPairCount=" + minPairCount + " must be at least 1");
      }
      this.minPairCount = minPairCount;
      return this;
    }

    /** Progress listener, stage {@code "merges"} (default none). */
    public Builder listener(TrainingListener listener) {
      this.listener = Objects.requireNonNull(listener, "listener");
      return this;
    }

    /**
     * The learner.
     *
     * @throws IllegalArgumentException if a reserved token equals the unknown spelling
     */
    public WordPieceTraining build() {
      long floor = (long) reservedTokens.size() + 1 + 256 + 1;
      if (settings.byteSpelling() && vocabularySize < floor) {
        throw new IllegalArgumentException("vocabularySize=" + vocabularySize + " is below " + floor + " ("
            + reservedTokens.size() + " reserved tokens, the unknown token, 256 byte tokens and one more): too small"
            + " for byte spelling, turn it off (byteSpelling(false), option byte-spelling=false)");
      }
      int clash = reservedTokens.indexOf(settings.unknownToken());
      if (clash >= 0) {
        throw new IllegalArgumentException("reservedTokens[" + clash + "] '" + settings.unknownToken()
            + "' equals the unknownToken spelling");
      }
      return new WordPieceTraining(this);
    }
  }

  /** Target vocabulary size. */
  public int vocabularySize() {
    return vocabularySize;
  }

  /** The pair ranking in use. */
  public Score score() {
    return rule;
  }

  /** Pairs occurring fewer times are never merged. */
  public long minPairCount() {
    return minPairCount;
  }

  /**
   * Learns a vocabulary from {@code counts}.
   *
   * @throws IllegalArgumentException if no piece reaches {@code minCount}, or if {@code
   *     vocabularySize} is smaller than the alphabet plus the reserved tokens
   */
  @Override
  public Tokenizer train(PieceCounts counts) {
    return Tokenizers.of(Objects.requireNonNull(counts, "counts").pipeline(), segmenter(counts));
  }

  @Override
  public String scheme() {
    return WordPieceSegmenter.SCHEME;
  }

  /** Learns the segmenter alone from {@code counts}. */
  public WordPieceSegmenter segmenter(PieceCounts counts) {
    Objects.requireNonNull(counts, "counts");
    return new Run(counts).run();
  }

  /**
   * Extends {@code base} with the units this learner's criterion picks on {@code counts}: the base's
   * units are the starting units (ids unchanged), each new piece is written in them by greedy
   * longest match (as encoding writes it), code points the base lacks are added in both forms (most
   * frequent first, at most the policy's {@code maxSize}), then pairs are merged exactly as in {@link #train}
   * until the vocabulary reaches {@code vocabularySize}; a merge that makes a unit the base already
   * has costs no id. The result has the base's tokens first, then the new ones in the order made.
   *
   * @param alsoReserved spellings no new unit may take (the whole tokenizer's reserved tokens)
   * @throws IllegalArgumentException if no new piece is usable
   */
  public WordPieceSegmenter extend(WordPieceSegmenter base, PieceCounts counts, java.util.Collection<String> alsoReserved) {
    Objects.requireNonNull(base, "base");
    Objects.requireNonNull(counts, "counts");
    return new Run(counts, base, alsoReserved).run();
  }

  /**
   * The alphabet cap a derived {@link AlphabetPolicy#maxSize()} stands for ({@code reservedCount}
   * counting the byte tokens too): a quarter of the ids left after the reserved and unknown tokens (each character takes two ids, so the alphabet fills at
   * most half of the vocabulary), at least 1.
   */
  public static int derivedAlphabetCap(int vocabularySize, int reservedCount) {
    return Math.max(1, (vocabularySize - reservedCount - 1) / 4);
  }

  // ------------------------------------------------------------------ internals

  private static long pairKey(int a, int b) {
    return ((long) a << 32) | (b & 0xFFFFFFFFL);
  }

  private static int left(long key) {
    return (int) (key >>> 32);
  }

  private static int right(long key) {
    return (int) key;
  }

  /**
   * The score of a pair under {@code rule}; {@code n} is the total unit count of the corpus in its
   * current segmentation. The ratio {@code cab * n / (ca * cb)} is formed from exact products (exact
   * while they stay below 2^53) and one division, so equal ratios give bit-identical scores.
   */
  static double score(Score rule, long cab, long ca, long cb, long n) {
    if (rule == Score.PAIR_RATIO) {
      return (double) cab / ((double) ca * (double) cb);
    }
    double ratio = ((double) cab * (double) n) / ((double) ca * (double) cb);
    return (double) cab * StrictMath.log(ratio);
  }

  /** One training run's mutable state. */
  private final class Run {
    private final PieceCounts counts;
    private final String marker = settings.marker();
    private final Set<String> reserved = new HashSet<>();
    // units
    private final ObjectArrayList<String> spelling = new ObjectArrayList<>();
    private final ObjectArrayList<String> body = new ObjectArrayList<>();
    private final IntArrayList continuation = new IntArrayList(); // 1 = continuation form
    private long[] unitCount = new long[64];
    private final Object2IntOpenHashMap<String> unitBySpelling = new Object2IntOpenHashMap<>();
    private final ObjectArrayList<LongOpenHashSet> unitPairs = new ObjectArrayList<>();
    // pieces
    private int[][] words;
    private long[] weights;
    /** Total unit count N of the current segmentation (count-weighted); falls by count(ab) per merge. */
    private long totalUnits;
    // pairs
    private final Long2LongOpenHashMap pairCount = new Long2LongOpenHashMap();
    private final Long2ObjectOpenHashMap<IntArrayList> pairPieces = new Long2ObjectOpenHashMap<>();
    private final LongOpenHashSet blocked = new LongOpenHashSet();
    private final PairHeap heap = new PairHeap();

    /** The model extended, or null when learning from scratch. */
    private final WordPieceSegmenter base;

    Run(PieceCounts counts) {
      this(counts, null, List.of());
    }

    Run(PieceCounts counts, WordPieceSegmenter base, java.util.Collection<String> alsoReserved) {
      this.counts = counts;
      this.base = base;
      reserved.addAll(reservedTokens);
      reserved.addAll(alsoReserved);
      reserved.add(settings.unknownToken());
      if (settings.byteSpelling()) {
        for (int b = 0; b < 256; b++) {
          reserved.add(WordPieceSettings.byteTokenText(b)); // a merge never makes a byte token's spelling
        }
      }
      unitBySpelling.defaultReturnValue(-1);
    }

    private Alphabet chosenAlphabet;

    WordPieceSegmenter run() {
      PieceCounts kept = counts.withMinCount(minCount);
      if (kept.isEmpty()) {
        throw new IllegalArgumentException("no piece has a count of at least minCount=" + minCount
            + " (" + counts.size() + " pieces given)");
      }
      kept = withinLimits(kept);
      if (base == null) {
        buildAlphabetAndWords(kept);
      } else {
        extendAlphabetAndWords(kept);
      }
      int reservedCount = reservedTokens.size() + 1 + (settings.byteSpelling() ? 256 : 0);
      int initial = reservedCount + spelling.size();
      if (vocabularySize < initial) {
        throw new IllegalArgumentException("vocabularySize=" + vocabularySize + " is smaller than the alphabet ("
            + spelling.size() + " units) plus the reserved, unknown and byte tokens (" + reservedCount + "); raise"
            + " vocabularySize or lower"
            + " the alphabet's maxSize or coverage");
      }
      for (int u = 0; u < spelling.size(); u++) {
        totalUnits += unitCount[u];
      }
      countPairs();
      merge(initial);
      List<String> vocab = new ArrayList<>(reservedTokens);
      vocab.add(settings.unknownToken());
      if (settings.byteSpelling()) {
        for (int b = 0; b < 256; b++) {
          vocab.add(WordPieceSettings.byteTokenText(b));
        }
      }
      vocab.addAll(spelling);
      WordPieceSegmenter made = WordPieceSegmenter.of(vocab, reservedTokens.size(), settings);
      if (chosenAlphabet != null) { // an extension chooses no alphabet of its own: it keeps the base's units
        made.recordAlphabet(chosenAlphabet.record());
      }
      return made;
    }

    /**
     * The pieces no longer than the piece limit (the settings' explicit one, or else {@code
     * vocabularySize} units: the trained vocabulary's trie has a node per distinct token text, so
     * its derived limit is about that large or larger, and a kept piece stays within it); fails if
     * none is left or counts could overflow.
     */
    private PieceCounts withinLimits(PieceCounts kept) {
      int limit = settings.maxPieceLength() == WordPieceSettings.DERIVED_PIECE_LENGTH
          ? Math.min(vocabularySize, WordPieceSettings.MAX_MAX_PIECE_LENGTH) : settings.maxPieceLength();
      int n = 0;
      long weighted = 0;
      for (int i = 0; i < kept.size(); i++) {
        String p = kept.piece(i);
        if (p.length() <= limit) {
          n++;
          try {
            weighted = Math.addExact(weighted, Math.multiplyExact(kept.count(i), (long) p.length()));
          } catch (ArithmeticException e) {
            throw new IllegalArgumentException("piece counts are too large: the count-weighted number of UTF-16 units"
                + " exceeds Long.MAX_VALUE, so unit and pair counts would overflow; divide the counts by a common factor", e);
          }
        }
      }
      if (n == kept.size()) {
        return kept;
      }
      if (n == 0) {
        throw new IllegalArgumentException("every piece is longer than the piece limit of " + limit + " UTF-16 units ("
            + (settings.maxPieceLength() == WordPieceSettings.DERIVED_PIECE_LENGTH ? "maxPieceLength derived from"
            + " vocabularySize=" + vocabularySize : "maxPieceLength=" + limit) + "): nothing to train on (raise it with"
            + " WordPieceSettings.withMaxPieceLength)");
      }
      String[] pieces = new String[n];
      long[] c = new long[n];
      for (int i = 0, j = 0; i < kept.size(); i++) {
        if (kept.piece(i).length() <= limit) {
          pieces[j] = kept.piece(i);
          c[j++] = kept.count(i);
        }
      }
      return PieceCounts.of(pieces, c);
    }

    private void buildAlphabetAndWords(PieceCounts kept) {
      Alphabet chosen = alphabet.select(kept, derivedAlphabetCap(vocabularySize,
          reservedTokens.size() + (settings.byteSpelling() ? 256 : 0)), settings.byteSpelling());
      chosenAlphabet = chosen;
      listener.alphabet(WordPieceSegmenter.SCHEME, chosen);
      int keep = chosen.size();
      int[] cps = new int[keep];
      int[] order = new int[keep];
      for (int r = 0; r < keep; r++) {
        cps[r] = chosen.codePoint(r);
        order[r] = r;
      }
      Int2LongOpenHashMap rank = new Int2LongOpenHashMap();
      rank.defaultReturnValue(-1);
      for (int r = 0; r < keep; r++) {
        int cp = cps[order[r]];
        String s = new String(Character.toChars(cp));
        if (reserved.contains(s) || reserved.contains(marker + s)) {
          continue; // its spelling is taken by a reserved token: treated as outside the alphabet
        }
        rank.put(cp, r);
      }
      // which forms occur among the pieces that are fully inside the alphabet
      boolean[] initialSeen = new boolean[keep];
      boolean[] contSeen = new boolean[keep];
      IntArrayList usable = new IntArrayList();
      for (int i = 0; i < kept.size(); i++) {
        String p = kept.piece(i);
        boolean ok = true;
        for (int k = 0; k < p.length() && ok; ) {
          int cp = p.codePointAt(k);
          ok = rank.get(cp) >= 0;
          k += Character.charCount(cp);
        }
        if (!ok) {
          continue;
        }
        usable.add(i);
        for (int k = 0; k < p.length(); ) {
          int cp = p.codePointAt(k);
          int r = (int) rank.get(cp);
          if (k == 0) {
            initialSeen[r] = true;
          } else {
            contSeen[r] = true;
          }
          k += Character.charCount(cp);
        }
      }
      if (usable.isEmpty()) {
        throw new IllegalArgumentException("no piece lies inside the alphabet (" + chosen.summary() + ")");
      }
      // Both forms of every code point that occurs in a usable piece: a code point seen only after
      // '-' or '/' in training (the second half of "по-широко") still starts a piece at encode time
      // when the splitter cuts there, and one seen only word-initially still continues a longer
      // piece; with both forms every piece made of alphabet code points is encodable.
      for (int r = 0; r < keep; r++) {
        String s = new String(Character.toChars(cps[order[r]]));
        if (initialSeen[r] || contSeen[r]) {
          addUnit(s, false);
          addUnit(s, true);
        }
      }
      words = new int[usable.size()][];
      weights = new long[usable.size()];
      for (int j = 0; j < usable.size(); j++) {
        int i = usable.getInt(j);
        String p = kept.piece(i);
        int[] units = new int[p.codePointCount(0, p.length())];
        int u = 0;
        for (int k = 0; k < p.length(); ) {
          int cp = p.codePointAt(k);
          String s = new String(Character.toChars(cp));
          units[u] = unitBySpelling.getInt(k == 0 ? s : marker + s);
          unitCount[units[u]] += kept.count(i);
          u++;
          k += Character.charCount(cp);
        }
        words[j] = units;
        weights[j] = kept.count(i);
      }
    }

    /**
     * The base's units first (unit {@code u} is base id {@code reservedCount + 1 + u}), then both forms
     * of each code point the base lacks, most frequent first, while the vocabulary has room; then
     * every piece written in these units by greedy longest match, leftmost first, as encoding writes it.
     */
    private void extendAlphabetAndWords(PieceCounts kept) {
      int first = base.reservedCount() + 1 + (settings.byteSpelling() ? 256 : 0); // the base's units start after its byte tokens
      int maxUnitChars = 1;
      for (int id = first; id < base.vocabularySize(); id++) {
        String sp = base.token(id);
        boolean cont = base.isContinuation(id);
        String text = cont ? sp.substring(marker.length()) : sp;
        addUnit(text, cont);
        maxUnitChars = Math.max(maxUnitChars, text.length());
      }
      Int2LongOpenHashMap freq = new Int2LongOpenHashMap();
      for (int i = 0; i < kept.size(); i++) {
        String p = kept.piece(i);
        for (int k = 0; k < p.length(); ) {
          int cp = p.codePointAt(k);
          String c = new String(Character.toChars(cp));
          if (unitBySpelling.getInt(c) < 0 || unitBySpelling.getInt(marker + c) < 0) {
            freq.addTo(cp, kept.count(i));
          }
          k += Character.charCount(cp);
        }
      }
      int[] cps = freq.keySet().toIntArray();
      Integer[] order = byFrequency(cps, freq);
      int room = vocabularySize - first - spelling.size();
      for (int r = 0; r < Math.min(addedAlphabetCap(), cps.length); r++) {
        String c = new String(Character.toChars(cps[order[r]]));
        if (reserved.contains(c) || reserved.contains(marker + c)) {
          continue; // its spelling is taken by a reserved token: stays outside the alphabet
        }
        int need = (unitBySpelling.getInt(c) < 0 ? 1 : 0) + (unitBySpelling.getInt(marker + c) < 0 ? 1 : 0);
        if (need > room) {
          break;
        }
        if (unitBySpelling.getInt(c) < 0) {
          addUnit(c, false);
        }
        if (unitBySpelling.getInt(marker + c) < 0) {
          addUnit(c, true);
        }
        room -= need;
      }
      List<int[]> ws = new ArrayList<>();
      IntArrayList wt = new IntArrayList();
      IntArrayList units = new IntArrayList();
      for (int i = 0; i < kept.size(); i++) {
        String p = kept.piece(i);
        units.clear();
        int k = 0;
        while (k < p.length()) {
          int found = -1;
          int end = -1;
          for (int e = Math.min(p.length(), k + maxUnitChars); e > k; e--) {
            String text = p.substring(k, e);
            int u = unitBySpelling.getInt(k == 0 ? text : marker + text);
            if (u >= 0) {
              found = u;
              end = e;
              break;
            }
          }
          if (found < 0) {
            break;
          }
          units.add(found);
          k = end;
        }
        if (k < p.length()) {
          continue; // a code point outside the units: encoding maps the piece to the unknown token
        }
        for (int j = 0; j < units.size(); j++) {
          unitCount[units.getInt(j)] += kept.count(i);
        }
        ws.add(units.toIntArray());
        wt.add(i);
      }
      if (ws.isEmpty()) {
        throw new IllegalArgumentException("no new piece can be written in the base's units and the code points"
            + " added (at most " + addedAlphabetCap() + ")");
      }
      words = ws.toArray(new int[0][]);
      weights = new long[words.length];
      for (int j = 0; j < words.length; j++) {
        weights[j] = kept.count(wt.getInt(j));
      }
    }

    /** Code points an extension may add: the policy's cap, or the learner's derived cap. */
    private int addedAlphabetCap() {
      return alphabet.maxSize() > 0 ? alphabet.maxSize()
          : derivedAlphabetCap(vocabularySize, reservedTokens.size() + (settings.byteSpelling() ? 256 : 0));
    }

    /** Indices into {@code cps} by total occurrences, most first, ties by smaller code point: the alphabet rank. */
    private Integer[] byFrequency(int[] cps, Int2LongOpenHashMap freq) {
      Integer[] order = new Integer[cps.length];
      for (int i = 0; i < cps.length; i++) {
        order[i] = i;
      }
      Arrays.sort(order, (x, y) -> {
        int c = Long.compare(freq.get(cps[y]), freq.get(cps[x]));
        return c != 0 ? c : Integer.compare(cps[x], cps[y]);
      });
      return order;
    }

    private int addUnit(String text, boolean cont) {
      int id = spelling.size();
      String sp = cont ? marker + text : text;
      spelling.add(sp);
      body.add(text);
      continuation.add(cont ? 1 : 0);
      unitBySpelling.put(sp, id);
      unitPairs.add(new LongOpenHashSet());
      if (id >= unitCount.length) {
        unitCount = Arrays.copyOf(unitCount, unitCount.length * 2);
      }
      return id;
    }

    private void countPairs() {
      for (int j = 0; j < words.length; j++) {
        int[] w = words[j];
        for (int k = 0; k + 1 < w.length; k++) {
          long key = pairKey(w[k], w[k + 1]);
          addPair(key, weights[j], j);
        }
      }
      for (LongIterator it = pairCount.keySet().iterator(); it.hasNext(); ) {
        push(it.nextLong());
      }
    }

    private void addPair(long key, long w, int piece) {
      if (pairCount.addTo(key, w) == 0) {
        unitPairs.get(left(key)).add(key);
        unitPairs.get(right(key)).add(key);
      }
      IntArrayList list = pairPieces.get(key);
      if (list == null) {
        list = new IntArrayList(2);
        pairPieces.put(key, list);
      }
      if (list.isEmpty() || list.getInt(list.size() - 1) != piece) {
        list.add(piece);
      }
    }

    private void push(long key) {
      long cab = pairCount.get(key);
      if (cab <= 0 || cab < minPairCount || blocked.contains(key)) {
        return;
      }
      int a = left(key);
      int b = right(key);
      heap.push(score(rule, cab, unitCount[a], unitCount[b], totalUnits), cab, a, b);
    }

    private boolean isBlocked(int a, int b) {
      String text = body.get(a) + body.get(b);
      boolean cont = continuation.getInt(a) == 1;
      String sp = cont ? marker + text : text;
      if (reserved.contains(sp)) {
        return true;
      }
      return !cont && sp.length() > marker.length() && sp.startsWith(marker);
    }

    private void merge(int initialSize) {
      int size = initialSize;
      long total = vocabularySize - initialSize;
      long merges = 0;
      int[] seen = new int[words.length];
      Arrays.fill(seen, -1);
      Long2LongOpenHashMap delta = new Long2LongOpenHashMap();
      LongOpenHashSet refresh = new LongOpenHashSet();
      IntArrayList buf = new IntArrayList();
      while (size < vocabularySize && !heap.isEmpty()) {
        int a = heap.topLeft();
        int b = heap.topRight();
        double sc = heap.topScore();
        long cab = heap.topCount();
        heap.pop();
        long key = pairKey(a, b);
        long now = pairCount.get(key);
        if (now != cab || now <= 0) {
          continue; // stale: a current entry for this pair is in the heap (or the pair is gone)
        }
        double current = score(rule, now, unitCount[a], unitCount[b], totalUnits);
        if (current != sc) {
          // an upper bound only (N or a unit count moved since it was pushed): re-rank it
          heap.push(current, now, a, b);
          continue;
        }
        if (isBlocked(a, b)) {
          blocked.add(key);
          continue;
        }
        String text = body.get(a) + body.get(b);
        boolean cont = continuation.getInt(a) == 1;
        int m = unitBySpelling.getInt(cont ? marker + text : text);
        if (m < 0) {
          m = addUnit(text, cont);
          size++;
        }
        delta.clear();
        refresh.clear();
        IntArrayList pieces = pairPieces.remove(key);
        int stamp = (int) merges;
        for (int p = 0; p < pieces.size(); p++) {
          int j = pieces.getInt(p);
          if (seen[j] == stamp) {
            continue;
          }
          seen[j] = stamp;
          rewrite(j, a, b, m, buf, delta);
        }
        for (Long2LongOpenHashMap.Entry e : delta.long2LongEntrySet()) {
          if (e.getLongValue() != 0) {
            refresh.add(e.getLongKey());
          }
        }
        collectLive(a, refresh);
        collectLive(b, refresh);
        collectLive(m, refresh);
        for (LongIterator it = refresh.iterator(); it.hasNext(); ) {
          push(it.nextLong());
        }
        merges++;
        listener.progress("merges", Math.min(merges, total), total,
            "'" + spelling.get(a) + "' + '" + spelling.get(b) + "' (" + now + ")");
      }
    }

    /** Adds the live pairs holding {@code unit} to {@code out}, forgetting dead ones. */
    private void collectLive(int unit, LongOpenHashSet out) {
      LongOpenHashSet set = unitPairs.get(unit);
      for (LongIterator it = set.iterator(); it.hasNext(); ) {
        long k = it.nextLong();
        if (pairCount.get(k) <= 0) {
          it.remove();
        } else {
          out.add(k);
        }
      }
    }

    /** Replaces (a, b) by m in piece j, leftmost first, updating unit and pair counts. */
    private void rewrite(int j, int a, int b, int m, IntArrayList buf, Long2LongOpenHashMap delta) {
      int[] w = words[j];
      long wt = weights[j];
      buf.clear();
      int k = 0;
      boolean changed = false;
      while (k < w.length) {
        if (k + 1 < w.length && w[k] == a && w[k + 1] == b) {
          buf.add(m);
          unitCount[a] -= wt;
          unitCount[b] -= wt;
          unitCount[m] += wt;
          totalUnits -= wt;
          k += 2;
          changed = true;
        } else {
          buf.add(w[k++]);
        }
      }
      if (!changed) {
        return;
      }
      for (int i = 0; i + 1 < w.length; i++) {
        long key = pairKey(w[i], w[i + 1]);
        pairCount.addTo(key, -wt);
        delta.addTo(key, -wt);
      }
      int[] nw = buf.toIntArray();
      words[j] = nw;
      for (int i = 0; i + 1 < nw.length; i++) {
        long key = pairKey(nw[i], nw[i + 1]);
        addPair(key, wt, j);
        delta.addTo(key, wt);
      }
    }

    /** Binary max-heap of candidate pairs in parallel arrays; order: score, count, spellings. */
    private final class PairHeap {
      private double[] score = new double[256];
      private long[] count = new long[256];
      private int[] a = new int[256];
      private int[] b = new int[256];
      private int n;

      boolean isEmpty() {
        return n == 0;
      }

      double topScore() {
        return score[0];
      }

      long topCount() {
        return count[0];
      }

      int topLeft() {
        return a[0];
      }

      int topRight() {
        return b[0];
      }

      void push(double s, long c, int x, int y) {
        if (n == score.length) {
          int cap = n * 2;
          score = Arrays.copyOf(score, cap);
          count = Arrays.copyOf(count, cap);
          a = Arrays.copyOf(a, cap);
          b = Arrays.copyOf(b, cap);
        }
        set(n, s, c, x, y);
        int i = n++;
        while (i > 0) {
          int p = (i - 1) >>> 1;
          if (!before(i, p)) {
            break;
          }
          swap(i, p);
          i = p;
        }
      }

      void pop() {
        n--;
        if (n == 0) {
          return;
        }
        set(0, score[n], count[n], a[n], b[n]);
        int i = 0;
        while (true) {
          int l = 2 * i + 1;
          if (l >= n) {
            break;
          }
          int c = l + 1 < n && before(l + 1, l) ? l + 1 : l;
          if (!before(c, i)) {
            break;
          }
          swap(i, c);
          i = c;
        }
      }

      private void set(int i, double s, long c, int x, int y) {
        score[i] = s;
        count[i] = c;
        a[i] = x;
        b[i] = y;
      }

      private void swap(int i, int j) {
        double s = score[i];
        long c = count[i];
        int x = a[i];
        int y = b[i];
        set(i, score[j], count[j], a[j], b[j]);
        set(j, s, c, x, y);
      }

      /** Whether entry i goes before entry j. */
      private boolean before(int i, int j) {
        int c = Double.compare(score[i], score[j]);
        if (c != 0) {
          return c > 0;
        }
        c = Long.compare(count[i], count[j]);
        if (c != 0) {
          return c > 0;
        }
        c = spelling.get(a[i]).compareTo(spelling.get(a[j]));
        if (c != 0) {
          return c < 0;
        }
        return spelling.get(b[i]).compareTo(spelling.get(b[j])) < 0;
      }
    }
  }
}
