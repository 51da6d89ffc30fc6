/**
 * The unigram language model: {@link dev.morsel.tokenize.unigram.UnigramLearner} (seeding, EM,
 * pruning) learns a vocabulary into a tokenizer that encodes with Viterbi, and {@link
 * dev.morsel.tokenize.unigram.Unigram} reaches any unigram tokenizer's n-best lists ({@link
 * dev.morsel.tokenize.unigram.Segmentation}), sampling and token scores.
 */
package dev.morsel.tokenize.unigram;
