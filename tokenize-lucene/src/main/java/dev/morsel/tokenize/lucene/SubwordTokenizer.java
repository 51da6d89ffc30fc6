package dev.morsel.tokenize.lucene;

import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.normalize.NormalizedText;
import dev.morsel.tokenize.split.PieceSink;
import dev.morsel.tokenize.split.Splitting;
import java.io.IOException;
import java.util.Arrays;
import java.util.Objects;
import org.apache.lucene.analysis.Tokenizer;
import org.apache.lucene.analysis.tokenattributes.CharTermAttribute;
import org.apache.lucene.analysis.tokenattributes.OffsetAttribute;
import org.apache.lucene.analysis.tokenattributes.PayloadAttribute;
import org.apache.lucene.analysis.tokenattributes.PositionIncrementAttribute;
import org.apache.lucene.analysis.tokenattributes.TypeAttribute;
import org.apache.lucene.util.AttributeFactory;
import org.apache.lucene.util.BytesRef;

/**
 * A Lucene {@link Tokenizer} over a Morsel {@link dev.morsel.tokenize.Tokenizer}: the tokens of
 * {@code morsel.encode(text)} (untrusted text, so reserved spellings in it stay ordinary text) as a
 * Lucene token stream.
 *
 * <h2>Attributes</h2>
 * <ul>
 *   <li>{@link CharTermAttribute}: the token's vocabulary spelling, or its original text
 *       ({@link SubwordSettings#termText()});
 *   <li>{@link OffsetAttribute}: the token's {@code [start, end)} in the original text, passed
 *       through {@link #correctOffset(int)} so that char filters before this tokenizer are undone;
 *   <li>{@link PositionIncrementAttribute}: 1 per token, or 1 per piece
 *       ({@link SubwordSettings#positions()});
 *   <li>{@link TypeAttribute}: the {@link PieceClass#type()} of the token's text;
 *   <li>{@link TokenIdAttribute}: the token id; with {@link SubwordSettings#idPayload()} also a
 *       4-byte big-endian payload.
 * </ul>
 * Tokens added by framing, reserved tokens and padding never reach the stream; every content token
 * does, whitespace pieces included, so the stream's ids equal the content ids of {@code encode}.
 *
 * <h2>Reading</h2>
 * The input is read into a buffer of {@link SubwordSettings#chunkLength()} chars and encoded chunk
 * by chunk. A chunk ends only where cutting changes no token (a single space between two plain
 * characters, or after a line feed: see the package's {@code ChunkCuts}), so the tokens and
 * offsets equal those of encoding the whole text at once, and a field of any size is read with a
 * bounded buffer. A stretch without such a place (or any input under the splitting {@code none})
 * is read whole; past the Morsel tokenizer's {@code maxInputLength} the stream fails with an
 * {@link IllegalArgumentException} naming the offset.
 *
 * <p>One instance serves one stream at a time, as every Lucene tokenizer; the Morsel tokenizer it
 * wraps is shared and thread-safe. Per token nothing is allocated; per chunk, one {@code String}
 * and one {@link Tokens}.
 *
 * @since 0.1.0
 */
public final class SubwordTokenizer extends Tokenizer {

  // ------------------------------------------------------------------ configuration

  private static final int NO_CUT = -1;

  private final dev.morsel.tokenize.Tokenizer morsel;
  private final SubwordSettings settings;
  private final boolean original;
  private final boolean perPiece;
  private final boolean cuttable;
  private final int maxBuffer;

  // ------------------------------------------------------------------ attributes

  private final CharTermAttribute termAtt = addAttribute(CharTermAttribute.class);
  private final OffsetAttribute offsetAtt = addAttribute(OffsetAttribute.class);
  private final PositionIncrementAttribute posIncAtt = addAttribute(PositionIncrementAttribute.class);
  private final TypeAttribute typeAtt = addAttribute(TypeAttribute.class);
  private final TokenIdAttribute idAtt = addAttribute(TokenIdAttribute.class);
  private final PayloadAttribute payloadAtt;
  private final byte[] payloadBytes;
  private final BytesRef payload;

  // ------------------------------------------------------------------ state

  /** Input chars read and not yet dropped; the current chunk is {@code buffer[0, chunkLength)}. */
  private char[] buffer;
  private int buffered;
  private boolean eof;
  /** Chars of the current chunk (0 before the first one). */
  private int chunkLength;
  /** Offset of {@code buffer[0]} in the input. */
  private int chunkBase;
  /** Positions of {@code buffer} below this are known to be no cut (kept across chunks). */
  private int scanFloor;
  private Tokens tokens = Tokens.empty();
  private int next;
  private boolean firstOfChunk;
  /** Original offsets (chunk-relative) of the pieces of the chunk, for {@link SubwordSettings.Positions#PER_PIECE}. */
  private int[] pieceStarts = new int[16];
  private int pieceCount;
  private int nextPiece;
  private NormalizedText normalized;
  private final PieceSink pieceSink = this::addPiece;

  // ------------------------------------------------------------------ life-cycle

  /** A tokenizer over {@code morsel} with the default settings. */
  public SubwordTokenizer(dev.morsel.tokenize.Tokenizer morsel) {
    this(DEFAULT_TOKEN_ATTRIBUTE_FACTORY, morsel, SubwordSettings.defaults());
  }

  /** A tokenizer over {@code morsel}. */
  public SubwordTokenizer(dev.morsel.tokenize.Tokenizer morsel, SubwordSettings settings) {
    this(DEFAULT_TOKEN_ATTRIBUTE_FACTORY, morsel, settings);
  }

  /** A tokenizer over {@code morsel} whose attributes come from {@code factory}. */
  public SubwordTokenizer(AttributeFactory factory, dev.morsel.tokenize.Tokenizer morsel, SubwordSettings settings) {
    super(factory);
    this.morsel = Objects.requireNonNull(morsel, "morsel");
    this.settings = Objects.requireNonNull(settings, "settings");
    this.original = settings.termText() == SubwordSettings.TermText.ORIGINAL;
    this.perPiece = settings.positions() == SubwordSettings.Positions.PER_PIECE;
    this.cuttable = morsel.pipeline().splitting().mode() != Splitting.Mode.NONE;
    this.maxBuffer = Math.max(settings.chunkLength(), morsel.limits().maxInputLength());
    if (settings.idPayload()) {
      payloadAtt = addAttribute(PayloadAttribute.class);
      payloadBytes = new byte[Integer.BYTES];
      payload = new BytesRef(payloadBytes);
    } else {
      payloadAtt = null;
      payloadBytes = null;
      payload = null;
    }
    this.buffer = new char[settings.chunkLength()];
  }

  @Override
  public void reset() throws IOException {
    super.reset();
    if (buffer.length > settings.chunkLength()) {
      buffer = new char[settings.chunkLength()]; // a long stretch without a cut does not stay in memory
    }
    buffered = 0;
    eof = false;
    chunkLength = 0;
    chunkBase = 0;
    scanFloor = 0;
    tokens = Tokens.empty();
    next = 0;
    pieceCount = 0;
    nextPiece = 0;
  }

  @Override
  public void close() throws IOException {
    super.close();
    tokens = Tokens.empty();
    normalized = null;
  }

  // ------------------------------------------------------------------ API

  /** The Morsel tokenizer this stream encodes with. */
  public dev.morsel.tokenize.Tokenizer morsel() {
    return morsel;
  }

  /** The settings. */
  public SubwordSettings settings() {
    return settings;
  }

  @Override
  public boolean incrementToken() throws IOException {
    clearAttributes();
    while (true) {
      final Tokens t = tokens;
      while (next < t.size()) {
        int i = next++;
        if (isContent(t, i)) {
          emit(t, i);
          return true;
        }
      }
      if (!nextChunk()) {
        return false;
      }
    }
  }

  @Override
  public void end() throws IOException {
    super.end();
    int last = correctOffset(chunkBase + buffered);
    offsetAtt.setOffset(last, last);
  }

  // ------------------------------------------------------------------ internals

  /**
   * Whether token {@code i} is content: not reserved (matched or framed in), not a framing marker,
   * not padding. The one place that reads the result's flags.
   */
  private static boolean isContent(Tokens t, int i) {
    return (t.flags(i) & (Tokens.RESERVED | Tokens.FRAME | Tokens.PADDING)) == 0;
  }

  private void emit(Tokens t, int i) {
    int id = t.id(i);
    int start = t.start(i);
    int end = t.end(i);
    if (original) {
      termAtt.copyBuffer(buffer, start, end - start);
    } else {
      termAtt.setEmpty().append(morsel.token(id));
    }
    offsetAtt.setOffset(correctOffset(chunkBase + start), correctOffset(chunkBase + end));
    int increment = 1;
    if (perPiece) {
      boolean fresh = firstOfChunk;
      while (nextPiece < pieceCount && pieceStarts[nextPiece] <= start) {
        fresh = true;
        nextPiece++;
      }
      increment = fresh ? 1 : 0;
    }
    firstOfChunk = false;
    posIncAtt.setPositionIncrement(increment);
    typeAtt.setType(PieceClass.of(buffer, start, end).type());
    idAtt.setId(id);
    if (payloadAtt != null) {
      payloadBytes[0] = (byte) (id >>> 24);
      payloadBytes[1] = (byte) (id >>> 16);
      payloadBytes[2] = (byte) (id >>> 8);
      payloadBytes[3] = (byte) id;
      payloadAtt.setPayload(payload);
    }
  }

  /** Drops the finished chunk, reads on and encodes the next chunk; false at the end of input. */
  private boolean nextChunk() throws IOException {
    if (chunkLength > 0) {
      System.arraycopy(buffer, chunkLength, buffer, 0, buffered - chunkLength);
      buffered -= chunkLength;
      chunkBase += chunkLength;
      scanFloor = Math.max(0, scanFloor - chunkLength);
      chunkLength = 0;
    }
    while (true) {
      fill();
      if (buffered == 0) {
        return false;
      }
      int cut = eof ? buffered : cuttable ? ChunkCuts.lastCut(buffer, buffered, scanFloor) : NO_CUT;
      if (cut > 0) {
        // every position above the cut was checked; the last one again once more text is read
        scanFloor = buffered - 1 - cut;
        encode(cut);
        return true;
      }
      scanFloor = Math.max(0, buffered - 1);
      grow();
    }
  }

  private void fill() throws IOException {
    while (!eof && buffered < buffer.length) {
      int n = input.read(buffer, buffered, buffer.length - buffered);
      if (n < 0) {
        eof = true;
      } else {
        buffered += n;
      }
    }
  }

  private void grow() {
    if (buffer.length >= maxBuffer) {
      throw new IllegalArgumentException("input from offset " + chunkBase + " runs " + buffered
          + " chars without a place to cut it (a single space between letters, digits, punctuation or"
          + " symbols, or a line feed), over the Morsel tokenizer's maxInputLength=" + morsel.limits().maxInputLength()
          + " (raise it with Limits.withMaxInputLength and Tokenizer.withLimits)");
    }
    buffer = Arrays.copyOf(buffer, (int) Math.min(maxBuffer, 2L * buffer.length));
  }

  private void encode(int length) {
    String text = new String(buffer, 0, length);
    tokens = morsel.encode(text);
    next = 0;
    chunkLength = length;
    firstOfChunk = true;
    if (perPiece) {
      pieceCount = 0;
      nextPiece = 0;
      normalized = morsel.pipeline().normalization().apply(text);
      String n = normalized.text();
      morsel.pipeline().splitting().split(n, 0, n.length(), pieceSink);
      normalized = null;
    }
  }

  private void addPiece(int start, int end) {
    if (pieceCount == pieceStarts.length) {
      pieceStarts = Arrays.copyOf(pieceStarts, pieceCount * 2);
    }
    pieceStarts[pieceCount++] = normalized.originalStart(start);
  }
}
