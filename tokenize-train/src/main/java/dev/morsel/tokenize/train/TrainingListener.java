package dev.morsel.tokenize.train;

/**
 * Progress of long work (counting, merges, EM rounds), for progress bars, and the alphabet each learner
 * chose ({@link #alphabet}). Called from the working
 * thread; implementations must be quick.
 *
 * @since 0.1.0
 */
@FunctionalInterface
public interface TrainingListener {
  /** Does nothing. */
  TrainingListener NONE = (stage, done, total, detail) -> {};

  /**
   * @param stage a short name of the current stage, for example {@code "merges"}
   * @param done units done so far
   * @param total units in all, or -1 if unknown
   * @param detail a short human-readable note (the current pair and its count, say), may be empty
   */
  void progress(String stage, long done, long total, String detail);

  /**
   * The alphabet a learner chose, once per training, before it learns tokens: its size, the coverage
   * reached and the characters left out ({@link Alphabet#summary()} says it in one line). The
   * default does nothing.
   *
   * @param scheme the learner's scheme, for example {@code "wordpiece"}
   */
  default void alphabet(String scheme, Alphabet alphabet) {}
}
