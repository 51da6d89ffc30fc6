package dev.morsel.tokenize;

/**
 * What decoding does with byte sequences that are not well-formed UTF-8.
 *
 * @since 0.1.0
 */
public enum Decoding {
  /** Each maximal ill-formed subsequence becomes U+FFFD. The default. */
  REPLACE,
  /** Throw an {@link IllegalArgumentException} naming the token position where the bad sequence starts. */
  STRICT
}
