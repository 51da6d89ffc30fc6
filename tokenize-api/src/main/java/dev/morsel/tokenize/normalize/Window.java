package dev.morsel.tokenize.normalize;

/**
 * A re-pointable read-only view of {@code seq[offset, offset + length)}, so that ICU's whole-sequence
 * quick check can run from any position without copying. One per call, re-pointed as the scan
 * advances; never escapes.
 */
final class Window implements CharSequence {
  private CharSequence seq;
  private int offset;
  private int length;

  Window set(CharSequence seq, int start, int end) {
    this.seq = seq;
    this.offset = start;
    this.length = end - start;
    return this;
  }

  @Override
  public int length() {
    return length;
  }

  @Override
  public char charAt(int index) {
    if (index < 0 || index >= length) {
      throw new IndexOutOfBoundsException("index " + index + " outside [0, " + length + ")");
    }
    return seq.charAt(offset + index);
  }

  @Override
  public CharSequence subSequence(int start, int end) {
    if (start < 0 || end > length || start > end) {
      throw new IndexOutOfBoundsException("range [" + start + ", " + end + ") outside [0, " + length + "]");
    }
    return seq.subSequence(offset + start, offset + end);
  }

  @Override
  public String toString() {
    return seq.subSequence(offset, offset + length).toString();
  }
}
