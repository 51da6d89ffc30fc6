package dev.morsel.tokenize;

import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Executor;

/**
 * Turns text into token ids with offsets into the original text, and ids back into text. One
 * interface over every segmenter (byte-level BPE, WordPiece, unigram).
 *
 * <p>Implementations are immutable and thread-safe: share one instance across threads. Encoding
 * never throws a checked exception; bad arguments give an unchecked exception that names the
 * argument and the limit.
 *
 * <p>Encoding runs: reserved-token scan (only for {@link Trust#TRUSTED} text), normalization with
 * alignment, splitting into pieces, segmentation of each piece, framing by the {@link Template}.
 *
 * @since 0.1.0
 */
public interface Tokenizer {

  // ------------------------------------------------------------------ encode

  /** Encodes untrusted text: reserved-token spellings in it are ordinary text. */
  default Tokens encode(CharSequence text) {
    return encode(text, Trust.UNTRUSTED);
  }

  /** Encodes text, matching reserved tokens only if {@code trust} is {@link Trust#TRUSTED}. */
  Tokens encode(CharSequence text, Trust trust);

  /** Encodes two untrusted texts (segments 0 and 1), framed as {@code begin first separator second end}. */
  default Tokens encodePair(CharSequence first, CharSequence second) {
    return encodePair(first, second, Trust.UNTRUSTED);
  }

  /** Encodes two texts (segments 0 and 1), framed as {@code begin first separator second end}. */
  Tokens encodePair(CharSequence first, CharSequence second, Trust trust);

  /**
   * Encodes untrusted UTF-8 text straight from bytes (what a service reads off the wire), with ill-
   * formed input replaced ({@link Decoding#REPLACE}). Same as {@link #encodeUtf8(byte[], int, int,
   * Trust, Decoding) encodeUtf8(utf8, 0, utf8.length, UNTRUSTED, REPLACE)}.
   *
   * @since 0.2.0
   */
  default Tokens encodeUtf8(byte[] utf8) {
    return encodeUtf8(utf8, 0, utf8.length, Trust.UNTRUSTED, Decoding.REPLACE);
  }

  /**
   * Encodes the UTF-8 text {@code utf8[offset, offset + length)}. The ids are those of {@link
   * #encode(CharSequence, Trust)} on the decoded text; the offsets are <b>UTF-8 byte offsets</b>
   * relative to {@code offset} (0 is the first byte given), on code point boundaries, so
   * {@code [start(i), end(i))} slices the input bytes.
   *
   * <p>Ill-formed UTF-8 follows {@code decoding}: {@link Decoding#REPLACE} turns each maximal
   * ill-formed subpart into one U+FFFD (Unicode Standard, section 3.9), whose tokens span exactly the
   * bad bytes; {@link Decoding#STRICT} throws an {@link IllegalArgumentException} naming the byte
   * offset (relative to {@code offset}) where the first ill-formed sequence starts. The input is
   * never changed.
   *
   * @throws IndexOutOfBoundsException if the range is outside {@code utf8}
   * @throws IllegalArgumentException if the decoded text exceeds {@link Limits#maxInputLength()}, or
   *     for ill-formed input under {@link Decoding#STRICT}
   * @since 0.2.0
   */
  Tokens encodeUtf8(byte[] utf8, int offset, int length, Trust trust, Decoding decoding);

  /**
   * As {@link #encodeUtf8(byte[], int, int, Trust, Decoding)} over the buffer's remaining bytes
   * ({@code position()} to {@code limit()}); offsets are relative to {@code position()}. The buffer's
   * position, limit and contents are left as they were; direct and read-only buffers work too.
   *
   * @since 0.2.0
   */
  Tokens encodeUtf8(java.nio.ByteBuffer utf8, Trust trust, Decoding decoding);

  /** Encodes untrusted texts in parallel on the common pool; results in input order. */
  List<Tokens> encodeAll(List<? extends CharSequence> texts);

  /** Encodes texts in parallel on {@code executor}; results in input order. */
  List<Tokens> encodeAll(List<? extends CharSequence> texts, Trust trust, Executor executor);

  /**
   * Encodes a long untrusted text as windows of at most {@code size} content tokens, each framed by
   * the template. {@code step} is the number of content tokens from one window's start to the next
   * window's start, so consecutive windows share {@code size - step} tokens ({@code step == size}:
   * no overlap). Window {@code w} holds content tokens {@code [w * step, min(w * step + size, n))}
   * of the text's {@code n}; the last window is the first one that reaches token {@code n}. A text
   * with no content tokens gives one window holding only the markers. Offsets still point into
   * {@code text}.
   *
   * <p>Worked example: 10 content tokens, {@code size = 4}, {@code step = 3} give three windows,
   * tokens {@code [0, 4)}, {@code [3, 7)} and {@code [6, 10)}; neighbours share 1 token.
   *
   * @param size most content tokens per window
   * @param step content tokens from one window's start to the next
   * @throws IllegalArgumentException unless {@code 0 < step <= size}
   */
  List<Tokens> encodeWindows(CharSequence text, int size, int step);

  /**
   * Explains, for people, how {@code text} is encoded: the normalized text, each piece, and the
   * segmenter's own account of each piece (merges applied, matches and back-offs, best paths).
   * Treats the text as untrusted.
   */
  java.util.List<String> explain(CharSequence text);

  // ------------------------------------------------------------------ token budgets

  /**
   * The number of tokens {@link #encode(CharSequence)} gives for untrusted {@code text}, framing
   * markers included, without building a result: no offsets are mapped and no arrays are returned.
   */
  default int count(CharSequence text) {
    return count(text, Trust.UNTRUSTED);
  }

  /** The number of tokens {@link #encode(CharSequence, Trust)} gives, framing markers included. */
  int count(CharSequence text, Trust trust);

  /**
   * The length of the longest prefix of untrusted {@code text} (in UTF-16 units of the original
   * text, so {@code text.subSequence(0, cutToFit(text, budget))} is that prefix) that ends on a token
   * boundary of {@code encode(text)} within its first {@code budget} tokens and whose own encoding,
   * framing markers included, has at most {@code budget} tokens. A cut never separates tokens that
   * share one source chunk (the {@code f} and {@code i} of {@code ﬁ} under NFKC, the bytes of one
   * character), and text that yields no token right before the next token stays in the prefix. The
   * prefix normally encodes to exactly the first tokens of the whole encoding; where a splitting rule
   * looks past the cut (the last space of a run joins the next word) its last piece may segment
   * differently, and the cut then moves back until the prefix fits. Costs about two encodes.
   *
   * <p>Example: a model input framed by two markers and limited to 512 tokens sees exactly the
   * first {@code cutToFit(text, 512)} characters of the caller's text, so a caller can show which
   * part of a document the model read.
   *
   * @throws IllegalArgumentException if {@code budget} is smaller than the number of framing markers
   *     for one text
   */
  default int cutToFit(CharSequence text, int budget) {
    return cutToFit(text, budget, Trust.UNTRUSTED);
  }

  /** {@link #cutToFit(CharSequence, int)} with reserved-token matching as {@code trust} says. */
  int cutToFit(CharSequence text, int budget, Trust trust);

  // ------------------------------------------------------------------ decode

  /** Decodes ids to text, keeping reserved tokens' spellings; ill-formed UTF-8 becomes U+FFFD. */
  default String decode(int[] ids) {
    return decode(ids, false, Decoding.REPLACE);
  }

  /**
   * Decodes ids to text.
   *
   * @param dropReserved leave out reserved tokens and padding
   * @param decoding what to do with ill-formed UTF-8
   * @throws IllegalArgumentException for an id outside the vocabulary (naming its position), or
   *     ill-formed UTF-8 under {@link Decoding#STRICT}
   */
  String decode(int[] ids, boolean dropReserved, Decoding decoding);

  /** A decoder fed one id at a time (for generation); per-caller state, not thread-safe. */
  StreamDecoder streamDecoder(boolean dropReserved, Decoding decoding);

  // ------------------------------------------------------------------ vocabulary

  /** Number of ids. */
  int vocabularySize();

  /** The display spelling of token {@code id}. */
  String token(int id);

  /** The bytes token {@code id} contributes to decoded text (a copy). */
  byte[] tokenBytes(int id);

  /** The id of the token whose display spelling is {@code token}, or -1. */
  int id(String token);

  /** The id of the unknown token, or -1 if the segmenter never produces one. */
  int unknownId();

  /** The scheme, for example {@code "bpe"}. */
  String scheme();

  /** The registered reserved tokens. */
  ReservedTokens reservedTokens();

  /** The framing template. */
  Template template();

  /** Normalization and splitting. */
  Pipeline pipeline();

  /** This tokenizer with another template (reserved tokens it names must be registered). */
  Tokenizer withTemplate(Template template);

  /** The input limits. */
  Limits limits();

  /** This tokenizer with other input limits. */
  Tokenizer withLimits(Limits limits);

  // ------------------------------------------------------------------ model file

  /**
   * SHA-256 (lowercase hex) over the canonical content of the model: equal fingerprints mean the
   * same vocabulary, settings and reserved tokens, so a service and a batch job can prove they agree.
   */
  String fingerprint();

  /** The model file's bytes. */
  byte[] toBytes();

  /** Writes the model file. */
  void save(Path path);

  /**
   * Writes the model as a review text (UTF-8 when stored; see {@code docs/format.md}, "Review text
   * format"): pipeline settings, reserved tokens, framing and the segmenter's vocabulary with its
   * merge ranks or scores, one entry a row. {@link Tokenizers#modelFromReview} turns it back into a
   * model file with the same {@link #fingerprint()}.
   *
   * @throws UnsupportedOperationException if the segmenter has no review text form
   * @throws java.io.UncheckedIOException if {@code out} fails
   */
  void writeReview(Appendable out);
}
