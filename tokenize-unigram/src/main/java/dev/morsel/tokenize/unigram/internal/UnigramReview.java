package dev.morsel.tokenize.unigram.internal;

import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ReviewDocument;
import dev.morsel.tokenize.format.ReviewText;
import dev.morsel.tokenize.format.ReviewWriter;
import java.util.ArrayList;
import java.util.List;

/**
 * The unigram section of a review text (see {@code docs/format.md}, "Review text format").
 *
 * <pre>
 * § vocabulary  id  kind  token  score
 *   reserved rows (ids 0..k-1), then, when uncovered characters fall back to bytes, 256 byte rows,
 *   then the unknown row, then one piece row per piece with its log-probability
 * </pre>
 * Only piece rows carry a score; the other rows leave the column empty (the unknown token's penalty
 * is derived from the lowest piece score). Rows may come in any order; ids are explicit and must
 * cover {@code 0..n-1} once each. Whether the model falls back to bytes is read from the byte rows.
 */
final class UnigramReview {
  static final String VOCABULARY = "vocabulary";
  private static final String[] COLUMNS = {"id", "kind", "token", "score"};
  private static final String RESERVED = "reserved";
  private static final String BYTE = "byte";
  private static final String UNKNOWN = "unknown";
  private static final String PIECE = "piece";

  private UnigramReview() {}

  static void write(ReviewWriter out, UnigramSegmenter m) {
    out.section(VOCABULARY, COLUMNS);
    int id = 0;
    for (int i = 0; i < m.reservedCount(); i++, id++) {
      out.row(Integer.toString(id), RESERVED, ReviewText.escape(m.token(id)), "");
    }
    if (m.byteSpelling()) {
      for (int b = 0; b < 256; b++, id++) {
        out.row(Integer.toString(id), BYTE, ReviewText.escape(new byte[] {(byte) b}), "");
      }
    }
    out.row(Integer.toString(id), UNKNOWN, ReviewText.escape(m.token(id)), "");
    for (id++; id < m.vocabularySize(); id++) {
      out.row(Integer.toString(id), PIECE, ReviewText.escape(m.token(id)), ReviewWriter.decimal(m.score(id)));
    }
  }

  static UnigramSegmenter read(ReviewDocument doc) {
    ReviewDocument.Section vs = doc.section(VOCABULARY, COLUMNS);
    int n = vs.rows().size();
    ReviewDocument.Row[] byId = vs.byIndex(0);
    List<String> reserved = new ArrayList<>();
    int id = 0;
    while (id < n && byId[id].word(1, RESERVED, BYTE, UNKNOWN, PIECE).equals(RESERVED)) {
      reserved.add(byId[id].text(2));
      empty(byId[id]);
      id++;
    }
    boolean byteSpelling = id < n && byId[id].raw(1).equals(BYTE);
    if (byteSpelling) {
      for (int b = 0; b < 256; b++, id++) {
        if (id >= n || !byId[id].word(1, RESERVED, BYTE, UNKNOWN, PIECE).equals(BYTE)) {
          throw (id >= n ? vs.fail("ends inside the 256 byte rows") : byId[id].fail(1, "expected byte row " + b
              + " of 256 (the byte rows follow the reserved rows as one block)"));
        }
        byte[] v = byId[id].bytes(2);
        if (v.length != 1 || (v[0] & 0xFF) != b) {
          throw byId[id].fail(2, "byte row " + b + " must hold the single byte " + ReviewText.escape(new byte[] {(byte) b}));
        }
        empty(byId[id]);
      }
    }
    if (id >= n || !byId[id].word(1, RESERVED, BYTE, UNKNOWN, PIECE).equals(UNKNOWN)) {
      throw id >= n ? vs.fail("has no unknown row") : byId[id].fail(1, "expected the unknown row at id " + id
          + " (after the reserved" + (byteSpelling ? " and byte" : "") + " rows)");
    }
    String unknown = byId[id].text(2);
    empty(byId[id]);
    int first = ++id;
    String[] pieces = new String[n - first];
    double[] scores = new double[n - first];
    for (; id < n; id++) {
      ReviewDocument.Row r = byId[id];
      if (!r.word(1, RESERVED, BYTE, UNKNOWN, PIECE).equals(PIECE)) {
        throw r.fail(1, "id " + id + " follows the unknown row, so it must be a piece");
      }
      pieces[id - first] = r.text(2);
      scores[id - first] = r.decimal(3);
    }
    int reservedCount = reserved.size();
    return new UnigramSegmenter(reserved.toArray(new String[0]), byteSpelling, unknown, pieces, scores,
        (what, index, message) -> {
          int at = what.equals("piece") ? first + index : what.equals("reserved token") ? index
              : what.equals("byte token") ? reservedCount + index : first - 1;
          ModelFormatException e = byId[at].fail(2, message);
          return e;
        });
  }

  private static void empty(ReviewDocument.Row r) {
    if (!r.raw(3).isEmpty()) {
      throw r.fail(3, "only piece rows have a score; leave it empty");
    }
  }
}
