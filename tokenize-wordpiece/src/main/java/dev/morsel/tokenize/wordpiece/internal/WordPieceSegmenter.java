package dev.morsel.tokenize.wordpiece.internal;

import dev.morsel.tokenize.internal.PieceTable;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.AlphabetRecord;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.ReviewDocument;
import dev.morsel.tokenize.format.ReviewText;
import dev.morsel.tokenize.format.ReviewWriter;
import dev.morsel.tokenize.format.SectionReader;
import dev.morsel.tokenize.format.SectionWriter;
import dev.morsel.tokenize.spi.ByteSink;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.TokenSink;
import dev.morsel.tokenize.spi.Workspace;
import dev.morsel.tokenize.spi.WorkspacePool;
import it.unimi.dsi.fastutil.objects.Object2IntOpenHashMap;
import java.io.BufferedReader;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Objects;

/**
 * A WordPiece segmenter: each piece is segmented greedily, longest match first, against a
 * vocabulary of word-initial and continuation tokens; a piece that cannot be covered, or that is
 * longer than {@link #pieceLimit()}, becomes the unknown token as a whole, unless the settings have
 * byte spelling on: then the runs of alphabet characters in it are matched on their own and every
 * other character is spelled with byte tokens, one per UTF-8 byte, each spanning the whole
 * character, so the encoding stays lossless.
 * Immutable and thread-safe; {@link #segment} allocates nothing in steady state and runs in time
 * linear in the piece length on every input (LinMaxMatch [3]).
 *
 * <p>Vocabulary layout: ids {@code 0..reservedCount-1} are reserved tokens (user spellings, never
 * produced by {@link #segment}), id {@code reservedCount} is the unknown token, the rest are
 * ordinary tokens; with byte spelling, ids {@code reservedCount+1..reservedCount+256} are the byte
 * tokens (spelled {@link WordPieceSettings#byteTokenText}) before them. An ordinary spelling that starts with the marker and is longer than it is a
 * continuation token whose text is the spelling without the marker; any other spelling is a
 * word-initial token. Spellings are distinct and well-formed UTF-16.
 *
 * <p>Decoding: a word-initial token writes its text, a continuation token its text without the
 * marker, the unknown token the UTF-8 of its spelling and a reserved token the UTF-8 of its spelling.
 * Decoding is therefore lossless only for results without an unknown token.
 *
 * <p>Model sections: {@value #SETTINGS_TAG} (format version, marker, unknown spelling, maximum
 * piece length, reserved count) and {@value #VOCABULARY_TAG} (token count, then each spelling);
 * see {@code docs/wordpiece.md}.
 *
 * <p>References: [2] Wu et al. (2016), "Google's Neural Machine Translation System", §4.1; [3]
 * Song et al. (2021), "Fast WordPiece Tokenization", EMNLP 2021.
 *
 * @since 0.1.0
 */
public final class WordPieceSegmenter implements Segmenter {
  /** The kind name written in model files. */
  public static final String SCHEME = "wordpiece";
  /** Section tag of the settings. */
  public static final String SETTINGS_TAG = "WPST";
  /** Section tag of the vocabulary. */
  public static final String VOCABULARY_TAG = "WPVO";
  /** Version of the two sections' layout without byte spelling (files of every version before it). */
  static final int FORMAT_VERSION = 1;
  /** Version of the settings layout with byte spelling: version 1's fields, then a u8 flag. */
  static final int FORMAT_VERSION_BYTES = 2;
  /** Most tokens a vocabulary may hold (keeps trie keys and pop runs in int range). */
  public static final int MAX_VOCABULARY_SIZE = 1 << 24;

  static final byte RESERVED = 0;
  static final byte UNKNOWN = 1;
  static final byte INITIAL = 2;
  static final byte CONTINUATION = 3;
  static final byte BYTE = 4;

  // ------------------------------------------------------------------ state

  private final WordPieceSettings settings;
  /** The piece limit in force: the settings' explicit one, or the one derived from the vocabulary. */
  private final int pieceLimit;
  private final int reservedCount;
  private final int unknownId;
  /** Id of byte token 0, or -1 without byte spelling. */
  private final int byteBase;
  private final String[] spellings;
  private final byte[] kinds;
  private final int[] bodyLength;
  private final byte[] decodePool;
  private final int[] decodeStart; // length n + 1
  private final Object2IntOpenHashMap<String> ids;
  private final LinMaxMatchTrie trie;
  /**
   * Word-initial token bodies as whole pieces: greedy longest-match-first takes a piece that is itself
   * a word-initial token as that one token (no longer prefix exists), so one hash probe replaces a
   * walk of one trie transition per char. Measured with a seg-only harness (split + segment over
   * the Europarl bodies, 30k model, thread CPU time, best of 6 passes): 17.6 / 18.5 MB/s without,
   * 22.7 / 21.3 MB/s with.
   */
  private final PieceTable whole;
  /** Workspaces for calls that bring none; owned by this segmenter. */
  private final WorkspacePool<Matches> own;

  /** What the learner's alphabet policy did, or null (a model made from a token list, or an old file). */
  private volatile AlphabetRecord alphabetRecord;

  // ------------------------------------------------------------------ life-cycle

  /** Validates and builds; {@code errors} turns (entry index, message) into the exception to throw. */
  private WordPieceSegmenter(List<String> tokens, int reservedCount, WordPieceSettings settings, Errors errors) {
    this.settings = Objects.requireNonNull(settings, "settings");
    int n = tokens.size();
    if (n > MAX_VOCABULARY_SIZE) {
      throw errors.fail(-1, "vocabulary of " + n + " tokens exceeds " + MAX_VOCABULARY_SIZE);
    }
    if (reservedCount < 0 || reservedCount >= n) {
      throw errors.fail(-1, "reserved count " + reservedCount + " must lie in [0, " + (n - 1)
          + "] so that the unknown token follows the reserved tokens in a vocabulary of " + n + " tokens");
    }
    this.reservedCount = reservedCount;
    this.unknownId = reservedCount;
    this.byteBase = settings.byteSpelling() ? reservedCount + 1 : -1;
    if (byteBase >= 0 && n < byteBase + 256) {
      throw errors.fail(-1, "vocabulary of " + n + " tokens is too small for the unknown token and 256 byte tokens"
          + " after " + reservedCount + " reserved tokens (byte spelling is on)");
    }
    String marker = settings.marker();
    spellings = new String[n];
    kinds = new byte[n];
    bodyLength = new int[n];
    String[] bodies = new String[n];
    boolean[] cont = new boolean[n];
    ids = new Object2IntOpenHashMap<>(n);
    ids.defaultReturnValue(-1);
    byte[][] bytes = new byte[n][];
    long poolSize = 0;
    for (int i = 0; i < n; i++) {
      String s = tokens.get(i);
      if (s == null || s.isEmpty()) {
        throw errors.fail(i, "token is " + (s == null ? "null" : "empty"));
      }
      if (!WordPieceSettings.wellFormed(s)) {
        throw errors.fail(i, "token '" + s + "' holds a lone surrogate");
      }
      int prev = ids.putIfAbsent(s, i);
      if (prev >= 0) {
        throw errors.fail(i, "token '" + s + "' duplicates token " + prev);
      }
      spellings[i] = s;
      String text;
      if (i < reservedCount) {
        kinds[i] = RESERVED;
        text = s;
      } else if (i == reservedCount) {
        if (!s.equals(settings.unknownToken())) {
          throw errors.fail(i, "expected the unknown token '" + settings.unknownToken() + "' after "
              + reservedCount + " reserved tokens but found '" + s + "'");
        }
        kinds[i] = UNKNOWN;
        text = s;
      } else if (byteBase >= 0 && i < byteBase + 256) {
        String expected = WordPieceSettings.byteTokenText(i - byteBase);
        if (!s.equals(expected)) {
          throw errors.fail(i, "expected byte token " + (i - byteBase) + " '" + expected + "' but found '" + s + "'");
        }
        kinds[i] = BYTE;
        bytes[i] = new byte[] {(byte) (i - byteBase)};
        poolSize += 1;
        continue;
      } else if (s.length() > marker.length() && s.startsWith(marker)) {
        kinds[i] = CONTINUATION;
        text = s.substring(marker.length());
        if (!WordPieceSettings.wellFormed(text)) {
          throw errors.fail(i, "continuation token '" + s + "' holds a lone surrogate after the marker");
        }
        bodies[i] = text;
        cont[i] = true;
        bodyLength[i] = text.length();
      } else {
        kinds[i] = INITIAL;
        text = s;
        bodies[i] = text;
        bodyLength[i] = text.length();
      }
      bytes[i] = text.getBytes(StandardCharsets.UTF_8);
      poolSize += bytes[i].length;
    }
    if (poolSize > Integer.MAX_VALUE - 16) {
      throw errors.fail(-1, "vocabulary text of " + poolSize + " bytes is too large");
    }
    decodePool = new byte[(int) poolSize];
    decodeStart = new int[n + 1];
    int at = 0;
    for (int i = 0; i < n; i++) {
      decodeStart[i] = at;
      System.arraycopy(bytes[i], 0, decodePool, at, bytes[i].length);
      at += bytes[i].length;
    }
    decodeStart[n] = at;
    boolean derived = settings.maxPieceLength() == WordPieceSettings.DERIVED_PIECE_LENGTH;
    try {
      trie = new LinMaxMatchTrie(bodies, cont, derived ? WordPieceSettings.MAX_MAX_PIECE_LENGTH
          : settings.maxPieceLength());
    } catch (IllegalArgumentException e) {
      throw errors.fail(-1, e.getMessage());
    }
    pieceLimit = derived ? derivedPieceLimit(trie.nodeCount()) : settings.maxPieceLength();
    String[] initial = new String[n];
    for (int i = 0; i < n; i++) {
      if (bodies[i] != null && !cont[i] && bodies[i].length() <= pieceLimit) {
        initial[i] = bodies[i];
      }
    }
    whole = PieceTable.of(initial);
    int scratchSize = pieceLimit;
    own = WorkspacePool.of(() -> new Matches(scratchSize));
  }

  /**
   * The limit derived from a LinMaxMatch trie of {@code trieNodes} nodes: that many UTF-16 units, at
   * most {@link WordPieceSettings#MAX_MAX_PIECE_LENGTH} (reason in {@link
   * WordPieceSettings#DERIVED_PIECE_LENGTH}). A trie has a node for every prefix of every token text,
   * so the limit is never below the longest token.
   */
  static int derivedPieceLimit(int trieNodes) {
    return Math.min(WordPieceSettings.MAX_MAX_PIECE_LENGTH, trieNodes);
  }

  /** Maps a validation failure at an entry (or -1 for the whole) to an exception. */
  @FunctionalInterface
  private interface Errors {
    RuntimeException fail(int index, String message);
  }

  /**
   * A segmenter over {@code tokens} in id order: {@code reservedCount} reserved tokens, then the
   * unknown token, then word-initial and continuation tokens (marked with the settings' marker).
   *
   * @throws IllegalArgumentException naming the token index if a token is null, empty, duplicated or
   *     holds a lone surrogate, if the unknown token is not at index {@code reservedCount}, or if the
   *     reserved count is out of range
   */
  public static WordPieceSegmenter of(List<String> tokens, int reservedCount, WordPieceSettings settings) {
    Objects.requireNonNull(tokens, "tokens");
    return new WordPieceSegmenter(tokens, reservedCount, settings,
        (i, m) -> new IllegalArgumentException(i < 0 ? m : "token " + i + ": " + m));
  }

  /**
   * Reads a plain token list: one token spelling a line, in id order, in the review text's field
   * escaping ({@link ReviewText#readTextLines}), laid out as in {@link #of}.
   *
   * @param source names the input in error messages, for example a file name
   * @throws ModelFormatException naming the line if a line is malformed or the vocabulary is invalid
   * @throws UncheckedIOException if reading fails
   */
  public static WordPieceSegmenter readTokenList(Reader in, String source, int reservedCount,
      WordPieceSettings settings) {
    Objects.requireNonNull(in, "in");
    Objects.requireNonNull(source, "source");
    List<String> tokens = ReviewText.readTextLines(in instanceof BufferedReader ? (BufferedReader) in
        : new BufferedReader(in), source);
    return new WordPieceSegmenter(tokens, reservedCount, settings,
        (i, m) -> i < 0 ? new ModelFormatException(source, m) : ModelFormatException.atLine(source, i + 1, m));
  }

  /**
   * Reads a segmenter from its sections of a review text ({@code settings}, {@code vocabulary}),
   * validating everything before building.
   *
   * @throws ModelFormatException naming the line and column that is wrong
   */
  public static WordPieceSegmenter readReview(ReviewDocument review) {
    WordPieceReview.Read r = WordPieceReview.read(review);
    return new WordPieceSegmenter(r.tokens, r.reservedCount, r.settings,
        (i, m) -> i < 0 ? r.section.fail(m) : r.rows[i].fail(2, m));
  }

  /**
   * Reads a segmenter from its model sections ({@value #SETTINGS_TAG}, {@value #VOCABULARY_TAG}),
   * validating everything before building.
   *
   * @throws ModelFormatException naming the section and entry that is wrong
   */
  public static WordPieceSegmenter read(ModelSections sections) {
    return read(sections, ModelLimits.defaults());
  }

  /**
   * As {@link #read(ModelSections)}, with the token count and every token checked against {@code limits}.
   *
   * @throws ModelFormatException naming the section and entry that is wrong, or the limit exceeded
   */
  public static WordPieceSegmenter read(ModelSections sections, ModelLimits limits) {
    SectionReader st = sections.reader(SETTINGS_TAG);
    int version = st.getInt("format version");
    if (version != FORMAT_VERSION && version != FORMAT_VERSION_BYTES) {
      throw st.fail("format version " + version + " is not supported (expected " + FORMAT_VERSION + " or "
          + FORMAT_VERSION_BYTES + ")");
    }
    String marker = st.getString("marker");
    String unknown = st.getString("unknown token");
    int maxPieceLength = st.getInt("max piece length");
    int reservedCount = st.getInt("reserved count");
    boolean byteSpelling = false;
    if (version == FORMAT_VERSION_BYTES) {
      int flag = st.getByte("byte spelling flag");
      if (flag != 1) {
        throw st.fail("byte spelling flag " + flag + " must be 1 in format version " + FORMAT_VERSION_BYTES);
      }
      byteSpelling = true;
    }
    st.expectEnd();
    WordPieceSettings settings;
    try {
      settings = WordPieceSettings.defaults().withMarker(marker).withUnknownToken(unknown)
          .withMaxPieceLength(maxPieceLength).withByteSpelling(byteSpelling);
    } catch (IllegalArgumentException e) {
      throw new ModelFormatException(SETTINGS_TAG, e.getMessage(), e);
    }
    SectionReader vo = sections.reader(VOCABULARY_TAG);
    int n = limits.readVocabularyCount(vo, "tokens", 4);
    String[] tokens = new String[n];
    for (int i = 0; i < n; i++) {
      tokens[i] = limits.readToken(vo, "token " + i);
    }
    vo.expectEnd();
    if (reservedCount < 0 || reservedCount >= n) {
      throw new ModelFormatException(SETTINGS_TAG, "reserved count " + reservedCount + " must lie in [0, "
          + (n - 1) + "] for a vocabulary of " + n + " tokens");
    }
    return new WordPieceSegmenter(List.of(tokens), reservedCount, settings,
        (i, m) -> new ModelFormatException(VOCABULARY_TAG, i < 0 ? m : "entry " + i + ": " + m));
  }

  // ------------------------------------------------------------------ API

  @Override
  public String scheme() {
    return SCHEME;
  }

  @Override
  public int vocabularySize() {
    return spellings.length;
  }

  @Override
  public String token(int id) {
    return spellings[Objects.checkIndex(id, spellings.length)];
  }

  @Override
  public int id(String token) {
    return ids.getInt(token);
  }

  @Override
  public int unknownId() {
    return unknownId;
  }

  /** The settings: marker, unknown spelling, piece limit. */
  public WordPieceSettings settings() {
    return settings;
  }

  /**
   * The longest piece, in UTF-16 units, that is segmented; longer pieces become the unknown token.
   * The settings' {@link WordPieceSettings#maxPieceLength()} if set, else derived from the vocabulary:
   * the number of nodes of its LinMaxMatch trie (see {@link WordPieceSettings#DERIVED_PIECE_LENGTH}
   * for the reason).
   */
  public int pieceLimit() {
    return pieceLimit;
  }

  /** Number of reserved tokens (ids {@code 0..reservedCount-1}). */
  public int reservedCount() {
    return reservedCount;
  }

  @Override
  public List<String> reservedSpellings() {
    return List.of(spellings).subList(0, reservedCount);
  }

  /** The reserved tokens: ids {@code 0..reservedCount-1} bound to their spellings, for assembling a tokenizer. */
  public dev.morsel.tokenize.ReservedTokens reservedTokens() {
    dev.morsel.tokenize.ReservedTokens.Builder b = dev.morsel.tokenize.ReservedTokens.builder();
    for (int i = 0; i < reservedCount; i++) {
      b.add(spellings[i], i);
    }
    return b.build();
  }

  /**
   * Whether {@code id} is a continuation token.
   *
   * @throws IndexOutOfBoundsException if {@code id} is not in the vocabulary
   */
  public boolean isContinuation(int id) {
    return kinds[Objects.checkIndex(id, kinds.length)] == CONTINUATION;
  }

  /**
   * The spellings in id order, as given to {@link #of}.
   */
  public List<String> tokens() {
    return List.of(spellings);
  }

  /** Writes the {@code settings} and {@code vocabulary} sections of a review text. */
  @Override
  public void writeReview(ReviewWriter out) {
    WordPieceReview.write(out, settings, spellings, kinds);
    AlphabetRecord r = alphabetRecord;
    if (r != null) {
      r.writeReview(out);
    }
  }

  /**
   * Greedy longest-match-first, step by step: at each position the longest vocabulary token that
   * matches (word-initial at the start, continuation after), and how many longer candidates were tried
   * and backed off from; or why the piece became the unknown token. For people, not for the hot path
   * (quadratic in the piece length); the result equals {@link #segment}.
   */
  @Override
  public List<String> explain(CharSequence text, int start, int end) {
    Objects.checkFromToIndex(start, end, text.length());
    String piece = text.subSequence(start, end).toString();
    java.util.ArrayList<String> out = new java.util.ArrayList<>();
    if (byteBase >= 0 && (piece.length() > pieceLimit || trie.match(piece, 0, piece.length(), new int[piece.length()]) < 0)) {
      out.add(piece.length() > pieceLimit ? "the piece has " + piece.length() + " chars, over the piece limit "
          + pieceLimit + ": byte spelling" : "no greedy match covers the piece: byte spelling, runs of alphabet"
          + " characters matched on their own, other characters as byte tokens");
      segment(piece, 0, piece.length(), (id, s0, e0) -> out.add("  [" + s0 + ", " + e0 + ") '" + spellings[id] + "' ("
          + id + ")"));
      return out;
    }
    if (piece.length() > pieceLimit) {
      out.add("the piece has " + piece.length() + " chars, over the piece limit " + pieceLimit
          + ": unknown token '" + settings.unknownToken() + "'");
      return out;
    }
    int i = 0;
    while (i < piece.length()) {
      int found = -1;
      int backedOff = 0;
      for (int len = piece.length() - i; len > 0; len--) {
        String sub = piece.substring(i, i + len);
        String spelling = i == 0 ? sub : settings.marker() + sub;
        int id = id(spelling);
        if (id >= reservedCount && id != unknownId()) {
          found = len;
          out.add("at " + i + ": '" + spelling + "' (" + id + ")" + (backedOff > 0 ? ", after backing off from "
              + backedOff + " longer candidate(s) that are not tokens" : ""));
          break;
        }
        backedOff++;
      }
      if (found < 0) {
        out.add("at " + i + ": no token matches '" + (i == 0 ? "" : settings.marker()) + piece.charAt(i)
            + "…': the whole piece becomes the unknown token '" + settings.unknownToken() + "'");
        return out;
      }
      i += found;
    }
    return out;
  }

  /**
   * {@inheritDoc}
   *
   * <p>The piece is segmented greedily, longest match first; if it cannot be covered or is longer
   * than {@link #pieceLimit()}, one unknown token spans the whole piece. The
   * sink must not call back into this segmenter on the same thread.
   */
  @Override
  public void segment(CharSequence text, int start, int end, TokenSink sink) {
    Matches m = own.take();
    try {
      segment(text, start, end, sink, m);
    } finally {
      own.give(m);
    }
  }

  /** A workspace of one int per char of the {@link #pieceLimit() piece limit}. */
  @Override
  public Workspace newWorkspace() {
    return new Matches(pieceLimit);
  }

  @Override
  public void segment(CharSequence text, int start, int end, TokenSink sink, Workspace workspace) {
    if (!(workspace instanceof Matches)) {
      segment(text, start, end, sink);
      return;
    }
    Objects.checkFromToIndex(start, end, text.length());
    int len = end - start;
    if (len == 0) {
      return;
    }
    if (len > pieceLimit) {
      if (byteBase >= 0) {
        spell(text, start, end, sink, ((Matches) workspace).ids);
        return;
      }
      sink.token(unknownId, start, end);
      return;
    }
    int id0 = whole.find(text, start, end);
    if (id0 >= 0) {
      sink.token(id0, start, end);
      return;
    }
    int[] buf = ((Matches) workspace).ids;
    int n = trie.match(text, start, end, buf);
    if (n < 0) {
      if (byteBase >= 0) {
        spell(text, start, end, sink, buf);
        return;
      }
      sink.token(unknownId, start, end);
      return;
    }
    final int[] lengths = bodyLength;
    int pos = start;
    for (int k = 0; k < n; k++) {
      int id = buf[k];
      int e = pos + lengths[id];
      sink.token(id, pos, e);
      pos = e;
    }
  }

  /**
   * Byte spelling of a piece that greedy matching cannot cover: each maximal run of characters that
   * have a word-initial token is matched on its own (in chunks of at most the piece limit; a chunk
   * that greedy matching cannot cover is spelled with bytes), and every other character is spelled
   * with byte tokens spanning the whole character. Linear in
   * the piece length, no allocation.
   */
  private void spell(CharSequence text, int start, int end, TokenSink sink, int[] buf) {
    int k = start;
    while (k < end) {
      int run = k;
      while (run < end) {
        int cc = charCountAt(text, run, end);
        if (whole.find(text, run, run + cc) < 0) {
          break;
        }
        run += cc;
      }
      if (run > k) {
        // a run over the piece limit is matched in chunks of at most the limit, never inside a pair
        for (int a = k; a < run; ) {
          int b = Math.min(run, a + pieceLimit);
          if (b < run && Character.isLowSurrogate(text.charAt(b)) && Character.isHighSurrogate(text.charAt(b - 1))) {
            b--;
          }
          if (b == a) { // a limit of one unit and a surrogate pair: the pair is spelled with bytes
            spellBytes(text, a, a + 2, sink);
            a += 2;
            continue;
          }
          matchOrSpell(text, a, b, sink, buf);
          a = b;
        }
        k = run;
      } else {
        int cc = charCountAt(text, k, end);
        spellBytes(text, k, k + cc, sink);
        k += cc;
      }
    }
  }

  /** Greedy match of text[a, b) (at most the piece limit) as a piece of its own, or its bytes if it has none. */
  private void matchOrSpell(CharSequence text, int a, int b, TokenSink sink, int[] buf) {
    int n = trie.match(text, a, b, buf);
    if (n >= 0) {
      int pos = a;
      for (int i = 0; i < n; i++) {
        int e = pos + bodyLength[buf[i]];
        sink.token(buf[i], pos, e);
        pos = e;
      }
      return;
    }
    for (int c = a; c < b; ) {
      int cc = charCountAt(text, c, b);
      spellBytes(text, c, c + cc, sink);
      c += cc;
    }
  }

  /** 2 for a surrogate pair starting at {@code i} before {@code end}, else 1. */
  private static int charCountAt(CharSequence text, int i, int end) {
    return Character.isHighSurrogate(text.charAt(i)) && i + 1 < end && Character.isLowSurrogate(text.charAt(i + 1))
        ? 2 : 1;
  }

  /** The UTF-8 bytes of the character text[s, e) as byte tokens, each spanning it (a lone surrogate: U+FFFD). */
  private void spellBytes(CharSequence text, int s, int e, TokenSink sink) {
    int cp = e - s == 2 ? Character.toCodePoint(text.charAt(s), text.charAt(s + 1)) : text.charAt(s);
    if (Character.isSurrogate((char) cp) && e - s == 1) {
      cp = 0xFFFD;
    }
    int b = byteBase;
    if (cp < 0x80) {
      sink.token(b + cp, s, e);
    } else if (cp < 0x800) {
      sink.token(b + (0xC0 | (cp >>> 6)), s, e);
      sink.token(b + (0x80 | (cp & 0x3F)), s, e);
    } else if (cp < 0x10000) {
      sink.token(b + (0xE0 | (cp >>> 12)), s, e);
      sink.token(b + (0x80 | ((cp >>> 6) & 0x3F)), s, e);
      sink.token(b + (0x80 | (cp & 0x3F)), s, e);
    } else {
      sink.token(b + (0xF0 | (cp >>> 18)), s, e);
      sink.token(b + (0x80 | ((cp >>> 12) & 0x3F)), s, e);
      sink.token(b + (0x80 | ((cp >>> 6) & 0x3F)), s, e);
      sink.token(b + (0x80 | (cp & 0x3F)), s, e);
    }
  }

  /** Whether the vocabulary has byte tokens (ids {@code reservedCount+1..reservedCount+256}). */
  public boolean byteSpelling() {
    return byteBase >= 0;
  }

  @Override
  public void decodeToken(int id, ByteSink out) {
    Objects.checkIndex(id, spellings.length);
    int s = decodeStart[id];
    out.write(decodePool, s, decodeStart[id + 1] - s);
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
    AlphabetRecord r = alphabetRecord;
    if (r != null) {
      r.write(out);
    }
    SectionWriter st = out.section(SETTINGS_TAG);
    st.putInt(byteBase >= 0 ? FORMAT_VERSION_BYTES : FORMAT_VERSION); // version 1 bytes stay as they were
    st.putString(settings.marker());
    st.putString(settings.unknownToken());
    st.putInt(settings.maxPieceLength());
    st.putInt(reservedCount);
    if (byteBase >= 0) {
      st.putByte(1);
    }
    SectionWriter vo = out.section(VOCABULARY_TAG);
    vo.putInt(spellings.length);
    for (String s : spellings) {
      vo.putString(s);
    }
  }

  // ------------------------------------------------------------------ internals (diagnostics)

  /** One encode call's match buffer: the ids of one piece, at most one per char. */
  private static final class Matches extends Workspace {
    final int[] ids;

    Matches(int size) {
      ids = new int[size];
    }
  }

  /** Number of trie nodes (both roots included); for memory diagnostics and benchmarks. */
  int trieNodeCount() {
    return trie.nodeCount();
  }

  @Override
  public String toString() {
    return "WordPieceSegmenter[" + spellings.length + " tokens, " + settings + "]";
  }
}
