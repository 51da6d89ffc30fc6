/**
 * WordPiece: greedy longest-match-first segmentation of each piece against a vocabulary of
 * word-initial and continuation tokens, encoded in linear time with LinMaxMatch, and a
 * likelihood-based trainer that learns the vocabulary by merging pairs.
 *
 * <p>Entry points: {@link dev.morsel.tokenize.wordpiece.WordPieceSegmenter} (load or build a
 * vocabulary), {@link dev.morsel.tokenize.wordpiece.WordPieceLearner} (learn one) and
 * {@link dev.morsel.tokenize.wordpiece.WordPieceSettings} (marker, unknown token, piece limit).
 */
package dev.morsel.tokenize.wordpiece;
