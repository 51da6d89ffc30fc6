package dev.morsel.tokenize.lucene;

import org.apache.lucene.util.AttributeImpl;
import org.apache.lucene.util.AttributeReflector;

/**
 * The implementation of {@link TokenIdAttribute} that Lucene's default attribute factory finds by
 * name. Not for direct use.
 *
 * @since 0.1.0
 */
public final class TokenIdAttributeImpl extends AttributeImpl implements TokenIdAttribute {
  private int id = NONE;

  /** Creates the attribute with {@link #NONE}. */
  public TokenIdAttributeImpl() {}

  @Override
  public int id() {
    return id;
  }

  @Override
  public void setId(int id) {
    this.id = id;
  }

  @Override
  public void clear() {
    id = NONE;
  }

  @Override
  public void reflectWith(AttributeReflector reflector) {
    reflector.reflect(TokenIdAttribute.class, "id", id);
  }

  @Override
  public void copyTo(AttributeImpl target) {
    ((TokenIdAttribute) target).setId(id);
  }

  @Override
  public boolean equals(Object o) {
    return o instanceof TokenIdAttributeImpl && ((TokenIdAttributeImpl) o).id == id;
  }

  @Override
  public int hashCode() {
    return id;
  }
}
