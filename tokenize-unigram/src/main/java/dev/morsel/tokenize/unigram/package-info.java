/**
 * The unigram language-model segmenter: {@link dev.morsel.tokenize.unigram.UnigramModel} (Viterbi,
 * n-best, sampling) and {@link dev.morsel.tokenize.unigram.UnigramLearner} (seeding, EM, pruning).
 */
package dev.morsel.tokenize.unigram;
