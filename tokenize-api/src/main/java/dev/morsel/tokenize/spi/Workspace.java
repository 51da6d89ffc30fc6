package dev.morsel.tokenize.spi;

/**
 * The working memory a {@link Segmenter} needs while it segments: buffers, small caches, a random
 * generator. A segmenter makes its own subclass ({@link Segmenter#newWorkspace()}); the tokenizer
 * keeps one per encode call in progress, draws it from a bounded {@link WorkspacePool} owned by the
 * tokenizer and hands it back to every {@link Segmenter#segment(CharSequence, int, int, TokenSink,
 * Workspace) segment} call of that encode. One workspace is used by one thread at a time, so its
 * fields need no synchronization, and nothing in it outlives the pool that holds it: a tokenizer that
 * is dropped takes its workspaces with it.
 *
 * <p>A workspace that grew for a huge piece should give the memory up before the call returns
 * (replace the large arrays with small ones), or answer false from {@link #keep()}, so a pool never
 * pins more than the ordinary working set.
 *
 * @since 0.2.0
 */
public abstract class Workspace {
  /** For subclasses. */
  protected Workspace() {}

  /**
   * Whether the pool may keep this workspace for the next call once the current one is done; true
   * by default. Answer false when the workspace holds more than its ordinary working set.
   */
  public boolean keep() {
    return true;
  }
}
