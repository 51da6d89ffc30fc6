package dev.morsel.tokenize.unigram.internal;

import dev.morsel.tokenize.format.AlphabetRecord;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelLimits;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.ReviewDocument;
import dev.morsel.tokenize.format.SectionReader;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.SegmenterProvider;

/**
 * Reads a unigram model from its two sections, validating every entry before anything is built.
 *
 * <pre>
 * UNST  u32 format version (1)
 *       u8  byte fallback (0 or 1)
 *       str unknown-token spelling          (str = u32 byte length + UTF-8)
 *       u32 reserved-token count k, then k × str
 * UNVO  u32 piece count m, then m × (str piece, f64 log-probability)
 * </pre>
 *
 * Errors are {@link ModelFormatException}s naming the section and the entry index.
 */
public final class UnigramProvider implements SegmenterProvider {
  /** Smallest encoded piece entry: a u32 length and an f64 (bytes); content is checked per entry. */
  private static final int MIN_PIECE_BYTES = 4 + 8;

  /** For {@link java.util.ServiceLoader}. */
  public UnigramProvider() {}

  @Override
  public String scheme() {
    return UnigramSegmenter.SCHEME;
  }

  @Override
  public Segmenter readReview(ReviewDocument review) {
    UnigramSegmenter s = UnigramReview.read(review);
    s.recordAlphabet(AlphabetRecord.readReview(review));
    return s;
  }

  @Override
  public Segmenter read(ModelSections sections, ModelLimits limits) {
    SectionReader st = sections.reader(UnigramSegmenter.SETTINGS);
    int version = st.getInt("format version");
    if (version != UnigramSegmenter.FORMAT_VERSION) {
      throw st.fail("format version " + version + " is not " + UnigramSegmenter.FORMAT_VERSION);
    }
    int flag = st.getByte("byte spelling flag");
    if (flag > 1) {
      throw st.fail("byte spelling flag " + flag + " is not 0 or 1");
    }
    String unknown = limits.readToken(st, "unknown token");
    int k = limits.readReservedCount(st, "reserved tokens", 4);
    String[] reserved = new String[k];
    for (int i = 0; i < k; i++) {
      reserved[i] = limits.readToken(st, "reserved token " + i);
    }
    st.expectEnd();

    SectionReader vo = sections.reader(UnigramSegmenter.PIECES);
    int m = limits.readVocabularyCount(vo, "pieces", MIN_PIECE_BYTES);
    String[] pieces = new String[m];
    double[] scores = new double[m];
    for (int i = 0; i < m; i++) {
      pieces[i] = limits.readToken(vo, "piece " + i);
      scores[i] = vo.getDouble("score of piece " + i);
    }
    vo.expectEnd();
    UnigramSegmenter s = new UnigramSegmenter(reserved, flag == 1, unknown, pieces, scores, (what, index, message) -> {
      String tag = what.equals("piece") ? UnigramSegmenter.PIECES : UnigramSegmenter.SETTINGS;
      return new ModelFormatException(tag, what + " " + index + ": " + message);
    });
    s.recordAlphabet(AlphabetRecord.read(sections));
    return s;
  }
}
