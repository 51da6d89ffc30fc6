package dev.morsel.tokenize.spi;

import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.ReviewWriter;

/**
 * Splits one piece of normalized text into vocabulary tokens. Implementations are immutable and
 * thread-safe and allocate nothing per token in steady state. Mutable working memory lives in a
 * {@link Workspace} the caller passes in ({@link #segment(CharSequence, int, int, TokenSink,
 * Workspace)}): the tokenizer draws one from a pool it owns for each encode call, so no state is kept
 * per thread and nothing outlives the tokenizer.
 *
 * <p>A segmenter owns a vocabulary of {@link #vocabularySize()} ids, {@code 0..size-1}. Reserved
 * tokens reserved by a learner are part of that vocabulary, but {@link #segment} never produces them
 * from ordinary text: only the tokenizer's reserved-token scan and framing do.
 *
 * @since 0.1.0
 */
public interface Segmenter {
  /** The scheme name that finds this segmenter's {@link SegmenterProvider}, for example {@code "bpe"}. */
  String scheme();

  /**
   * The spellings of the reserved tokens this segmenter's vocabulary holds at ids {@code 0..k-1}, in
   * id order, as a learner reserved them; none by default. {@link
   * dev.morsel.tokenize.Tokenizers#of(dev.morsel.tokenize.Pipeline, Segmenter)} registers them.
   */
  default java.util.List<String> reservedSpellings() {
    return java.util.List.of();
  }

  /** Number of ids in the vocabulary. */
  int vocabularySize();

  /**
   * The display spelling of a token: unique per id, readable, and stable across save and load. Byte
   * tokens that are not complete UTF-8 use the segmenter's own escape convention.
   *
   * @throws IndexOutOfBoundsException if {@code id} is not in the vocabulary
   */
  String token(int id);

  /** The id whose {@link #token display spelling} is {@code token}, or -1. */
  int id(String token);

  /**
   * The id of the unknown token, or -1 if this segmenter never produces one (byte-level schemes).
   */
  default int unknownId() {
    return -1;
  }

  /**
   * Segments {@code text[start, end)}, one piece, into tokens reported to {@code sink} in order. Token
   * spans are absolute indices into {@code text} and cover {@code [start, end)} without gaps, except
   * that tokens holding parts of one character share that character's span.
   */
  void segment(CharSequence text, int start, int end, TokenSink sink);

  /**
   * A new, empty working memory for {@link #segment(CharSequence, int, int, TokenSink, Workspace)},
   * or null if this segmenter needs none (the default). It should start small (a few KiB) and grow
   * on demand: a tokenizer makes one for every encode call that runs while all pooled ones are busy.
   *
   * @since 0.2.0
   */
  default Workspace newWorkspace() {
    return null;
  }

  /**
   * As {@link #segment(CharSequence, int, int, TokenSink)}, with working memory from {@link
   * #newWorkspace()} that the caller lends to this one call (one thread at a time). The result is the
   * same for every workspace, new or reused. The default ignores the workspace.
   *
   * @param workspace a workspace of this segmenter, or null (then the segmenter finds its own)
   * @since 0.2.0
   */
  default void segment(CharSequence text, int start, int end, TokenSink sink, Workspace workspace) {
    segment(text, start, end, sink);
  }

  /**
   * Writes the UTF-8 bytes that token {@code id} contributes to decoded text (for example without a
   * continuation marker, or the raw byte of a byte token).
   *
   * @throws IndexOutOfBoundsException if {@code id} is not in the vocabulary
   */
  void decodeToken(int id, ByteSink out);

  /**
   * Explains, one line each, why {@code text[start, end)} (one piece) segments the way it does: for
   * example the merges applied in order, the matches and back-offs, or the best and runner-up paths.
   * For people, not machines; the default lists the tokens.
   */
  default java.util.List<String> explain(CharSequence text, int start, int end) {
    java.util.List<String> out = new java.util.ArrayList<>();
    segment(text, start, end, (id, s, e) -> out.add("token " + id + " '" + token(id) + "' for ["
        + s + ", " + e + ")"));
    return out;
  }

  /** Writes this segmenter's sections of the model file. */
  void write(ModelWriter out);

  /**
   * Writes this segmenter's sections of a review text (see {@code docs/format.md}, "Review text
   * format"): everything {@link #write} puts in the model file, one entry a row, so that its
   * provider's {@link SegmenterProvider#readReview} rebuilds a segmenter that writes the same bytes.
   * The api writes the header and its own sections around them.
   *
   * @throws UnsupportedOperationException by default: the segmenter has no review text form
   */
  default void writeReview(ReviewWriter out) {
    throw new UnsupportedOperationException("segmenters of scheme " + scheme() + " have no review text form");
  }
}
