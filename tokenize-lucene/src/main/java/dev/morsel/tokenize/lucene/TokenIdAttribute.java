package dev.morsel.tokenize.lucene;

import org.apache.lucene.util.Attribute;

/**
 * The Morsel token id of the current Lucene token: the id {@link dev.morsel.tokenize.Tokenizer#encode}
 * gives the same token. Cleared to {@link #NONE}.
 *
 * @since 0.1.0
 */
public interface TokenIdAttribute extends Attribute {
  /** The value after {@code clear()}: no token. */
  int NONE = -1;

  /** The token id, or {@link #NONE}. */
  int id();

  /** Sets the token id. */
  void setId(int id);
}
