/**
 * Morsel's training input: {@link dev.morsel.tokenize.train.PieceCounter} counts the pieces of a
 * corpus through a {@link dev.morsel.tokenize.Pipeline}, in parallel and within a memory budget,
 * into {@link dev.morsel.tokenize.train.PieceCounts}, the input every learner takes; and the learner
 * service interface: each segmenter module provides a {@link dev.morsel.tokenize.train.LearnerProvider},
 * found by scheme name through {@link dev.morsel.tokenize.train.Learners}; and the alphabet policy every
 * learner applies ({@link dev.morsel.tokenize.train.AlphabetPolicy}, reported as an
 * {@link dev.morsel.tokenize.train.Alphabet}).
 */
module dev.morsel.tokenize.train {
  requires transitive dev.morsel.tokenize;
  requires it.unimi.dsi.fastutil.core;

  exports dev.morsel.tokenize.train;

  uses dev.morsel.tokenize.train.LearnerProvider;
}
