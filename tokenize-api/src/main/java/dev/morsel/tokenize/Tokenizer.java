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
 * <p>Encoding runs: control-token scan (only for {@link Trust#TRUSTED} text), normalization with
 * alignment, splitting into pieces, segmentation of each piece, framing by the {@link Template}.
 *
 * @since 0.1.0
 */
public interface Tokenizer {

  // ------------------------------------------------------------------ encode

  /** Encodes untrusted text: control-token spellings in it are ordinary text. */
  default Tokens encode(CharSequence text) {
    return encode(text, Trust.UNTRUSTED);
  }

  /** Encodes text, matching control tokens only if {@code trust} is {@link Trust#TRUSTED}. */
  Tokens encode(CharSequence text, Trust trust);

  /** Encodes a pair of untrusted texts (segments 0 and 1), framed by the template's pair form. */
  default Tokens encodePair(CharSequence first, CharSequence second) {
    return encodePair(first, second, Trust.UNTRUSTED);
  }

  /** Encodes a pair of texts (segments 0 and 1), framed by the template's pair form. */
  Tokens encodePair(CharSequence first, CharSequence second, Trust trust);

  /** Encodes untrusted texts in parallel on the common pool; results in input order. */
  List<Tokens> encodeAll(List<? extends CharSequence> texts);

  /** Encodes texts in parallel on {@code executor}; results in input order. */
  List<Tokens> encodeAll(List<? extends CharSequence> texts, Trust trust, Executor executor);

  /**
   * Encodes a long untrusted text as overlapping windows of at most {@code size} content tokens,
   * each window starting {@code stride} content tokens after the previous one, each framed by the
   * template. Offsets still point into {@code text}.
   *
   * @throws IllegalArgumentException unless {@code 0 < stride <= size}
   */
  List<Tokens> encodeWindows(CharSequence text, int size, int stride);

  /**
   * Explains, for people, how {@code text} is encoded: the normalized text, each piece, and the
   * segmenter's own account of each piece (merges applied, matches and back-offs, best paths).
   * Treats the text as untrusted.
   */
  java.util.List<String> explain(CharSequence text);

  // ------------------------------------------------------------------ decode

  /** Decodes ids to text, keeping control tokens' spellings; ill-formed UTF-8 becomes U+FFFD. */
  default String decode(int[] ids) {
    return decode(ids, false, Decoding.REPLACE);
  }

  /**
   * Decodes ids to text.
   *
   * @param dropControl leave out control tokens and padding
   * @param decoding what to do with ill-formed UTF-8
   * @throws IllegalArgumentException for an id outside the vocabulary (naming its position), or
   *     ill-formed UTF-8 under {@link Decoding#STRICT}
   */
  String decode(int[] ids, boolean dropControl, Decoding decoding);

  /** A decoder fed one id at a time (for generation); per-caller state, not thread-safe. */
  StreamDecoder streamDecoder(boolean dropControl, Decoding decoding);

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

  /** The segmenter kind, for example {@code "bpe"}. */
  String kind();

  /** The registered control tokens. */
  ControlTokens controlTokens();

  /** The framing template. */
  Template template();

  /** Normalization and splitting. */
  Pipeline pipeline();

  /** This tokenizer with another template (control tokens it names must be registered). */
  Tokenizer withTemplate(Template template);

  /** The input limits. */
  Limits limits();

  /** This tokenizer with other input limits. */
  Tokenizer withLimits(Limits limits);

  // ------------------------------------------------------------------ model file

  /**
   * SHA-256 (lowercase hex) over the canonical content of the model: equal fingerprints mean the
   * same vocabulary, settings and control tokens, so a service and a batch job can prove they agree.
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
