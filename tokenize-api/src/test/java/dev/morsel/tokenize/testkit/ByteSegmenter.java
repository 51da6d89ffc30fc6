package dev.morsel.tokenize.testkit;

import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.SectionReader;
import dev.morsel.tokenize.spi.ByteSink;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.SegmenterProvider;
import dev.morsel.tokenize.spi.TokenSink;
import java.nio.charset.StandardCharsets;

/**
 * A test segmenter with no learning at all: token {@code b} is the UTF-8 byte {@code b} (ids 0..255),
 * ids 256.. are free for reserved tokens. Lossless, so it isolates the pipeline (normalization,
 * splitting, reserved tokens, framing, offsets, decoding) from any real segmenter. Kind
 * {@code "test-bytes"}, registered as a service in the test resources.
 */
public final class ByteSegmenter implements Segmenter {
  /** The kind name. */
  public static final String SCHEME = "test-bytes";

  private final int vocabularySize;

  /** A segmenter with 256 byte ids plus {@code extra} free ids for reserved tokens. */
  public ByteSegmenter(int extra) {
    this.vocabularySize = 256 + extra;
  }

  @Override
  public String scheme() {
    return SCHEME;
  }

  @Override
  public int vocabularySize() {
    return vocabularySize;
  }

  @Override
  public String token(int id) {
    java.util.Objects.checkIndex(id, vocabularySize);
    return id < 256 ? String.format("b%02x", id) : "free" + id;
  }

  @Override
  public int id(String token) {
    if (token.length() == 3 && token.charAt(0) == 'b') {
      return Integer.parseInt(token.substring(1), 16);
    }
    return -1;
  }

  @Override
  public void segment(CharSequence text, int start, int end, TokenSink sink) {
    int i = start;
    while (i < end) {
      int cp = Character.codePointAt(text, i);
      int len = Character.charCount(cp);
      if (Character.isSurrogate(text.charAt(i)) && len == 1) {
        cp = 0xFFFD;
      }
      byte[] b = new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8);
      for (byte x : b) {
        sink.token(x & 0xFF, i, i + len);
      }
      i += len;
    }
  }

  @Override
  public void decodeToken(int id, ByteSink out) {
    java.util.Objects.checkIndex(id, vocabularySize);
    if (id < 256) {
      out.write(new byte[] {(byte) id}, 0, 1);
    }
  }

  @Override
  public void write(ModelWriter out) {
    out.section("TBYT").putInt(vocabularySize - 256);
  }

  /** Reads the segmenter back. */
  public static final class Provider implements SegmenterProvider {
    @Override
    public String scheme() {
      return SCHEME;
    }

    @Override
    public Segmenter read(ModelSections sections, dev.morsel.tokenize.format.ModelLimits limits) {
      SectionReader r = sections.reader("TBYT");
      int extra = limits.readVocabularyCount(r, "extra ids", 0);
      r.expectEnd();
      return new ByteSegmenter(extra);
    }
  }
}
