package dev.morsel.tokenize.train;

import dev.morsel.tokenize.Tokenizer;

/**
 * Learns a vocabulary of one scheme from piece counts and returns a tokenizer that encodes with it.
 * Implementations are immutable and thread-safe, check every setting when they are built, and are
 * deterministic: equal counts give equal tokenizers (equal {@link Tokenizer#fingerprint()
 * fingerprints}).
 *
 * <p>The tokenizer is bound to the pipeline the counts were made with ({@link
 * PieceCounts#pipeline()}) and to the learner's reserved tokens, and has no framing ({@link
 * Tokenizer#withTemplate} adds some): it encodes text exactly as the counted pieces were cut.
 *
 * <p>Get one by scheme name from {@link Learners}, or from a scheme's own builder.
 *
 * @since 0.1.0
 */
public interface Learner {
  /** The scheme name, for example {@code "bpe"}; also the {@link Tokenizer#scheme()} of the result. */
  String scheme();

  /**
   * Learns from {@code counts}.
   *
   * @throws IllegalArgumentException if the counts cannot give a vocabulary of the wanted size (for
   *     example no piece is left after the minimum count), with a message naming the setting
   */
  Tokenizer train(PieceCounts counts);
}
