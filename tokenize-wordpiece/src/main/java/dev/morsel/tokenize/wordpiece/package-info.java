/**
 * WordPiece: greedy longest-match-first segmentation of each piece against a vocabulary of
 * word-initial and continuation tokens, encoded in linear time with LinMaxMatch, and a
 * likelihood-based learner that learns the vocabulary by merging pairs.
 *
 * <p>Entry points: {@link dev.morsel.tokenize.wordpiece.WordPieceLearner} (learn a vocabulary into a
 * tokenizer) and {@link dev.morsel.tokenize.wordpiece.WordPiece} (what a WordPiece tokenizer offers
 * beyond {@link dev.morsel.tokenize.Tokenizer}). Models load with {@link
 * dev.morsel.tokenize.Tokenizers#load(java.nio.file.Path)} under kind {@code "wordpiece"}.
 */
package dev.morsel.tokenize.wordpiece;
