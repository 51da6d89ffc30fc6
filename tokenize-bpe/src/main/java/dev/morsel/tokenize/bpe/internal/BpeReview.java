package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.format.ReviewDocument;
import dev.morsel.tokenize.format.ReviewText;
import dev.morsel.tokenize.format.ReviewWriter;
import java.nio.ByteBuffer;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * The byte-level BPE sections of a review text (see {@code docs/format.md}, "Review text format").
 *
 * <pre>
 * § vocabulary  id  kind  token        reserved tokens (ids 0..k-1), then the 256 byte tokens (ids k..k+255)
 * § merges      rank  left  right  token   one row per merge; merge r makes id k+256+r
 * </pre>
 * Rows of either section may come in any order: ids and ranks are explicit, each must occur once and
 * together cover {@code 0..n-1}. A merge names its operands by their bytes (a byte token or the token
 * of a merge of lower rank); its token column must equal the two joined, so a hand edit that changes
 * one and not the other is refused.
 */
public final class BpeReview {
  /** Vocabulary section name. */
  public static final String VOCABULARY = "vocabulary";
  /** Merges section name. */
  public static final String MERGES = "merges";
  private static final String[] VOCABULARY_COLUMNS = {"id", "kind", "token"};
  private static final String[] MERGES_COLUMNS = {"rank", "left", "right", "token"};
  private static final String RESERVED = "reserved";
  private static final String BYTE = "byte";

  private BpeReview() {}

  /** Writes both sections. */
  public static void write(ReviewWriter out, Vocab v) {
    out.section(VOCABULARY, VOCABULARY_COLUMNS);
    int k = v.reservedCount();
    for (int i = 0; i < k; i++) {
      out.row(Integer.toString(i), RESERVED, ReviewText.escape(v.reserved().get(i)));
    }
    for (int b = 0; b < 256; b++) {
      out.row(Integer.toString(k + b), BYTE, ReviewText.escape(new byte[] {(byte) b}));
    }
    out.section(MERGES, MERGES_COLUMNS);
    for (int r = 0; r < v.mergeCount(); r++) {
      out.row(Integer.toString(r), ReviewText.escape(v.tokenBytes(v.left(r))),
          ReviewText.escape(v.tokenBytes(v.right(r))), ReviewText.escape(v.tokenBytes(k + 256 + r)));
    }
  }

  /**
   * Reads and validates both sections.
   *
   * @throws dev.morsel.tokenize.format.ModelFormatException naming the line and column
   */
  public static Vocab read(ReviewDocument doc) {
    ReviewDocument.Section vs = doc.section(VOCABULARY, VOCABULARY_COLUMNS);
    int n = vs.rows().size();
    ReviewDocument.Row[] byId = vs.byIndex(0);
    int k = n - 256;
    if (k < 0 || k > dev.morsel.tokenize.format.ModelLimits.DEFAULT_MAX_RESERVED_TOKENS) {
      throw vs.fail("holds " + n + " tokens; a BPE vocabulary section holds the reserved tokens and exactly 256"
          + " byte tokens");
    }
    List<String> reserved = new ArrayList<>(k);
    for (int id = 0; id < n; id++) {
      ReviewDocument.Row r = byId[id];
      String kind = r.word(1, RESERVED, BYTE);
      if (id < k) {
        if (!kind.equals(RESERVED)) {
          throw r.fail(1, "id " + id + " must be reserved: the " + k + " reserved tokens come first, then the 256"
              + " byte tokens");
        }
        String c = r.text(2);
        if (c.isEmpty()) {
          throw r.fail(2, "a reserved token cannot be empty");
        }
        for (int b = 0; b < 256; b++) {
          if (c.equals(ReviewText.escape(new byte[] {(byte) b}))) {
            throw r.fail(2, "reserved token '" + c + "' is spelled like byte token " + (k + b)
                + "; token spellings must be unique");
          }
        }
        if (reserved.contains(c)) {
          throw r.fail(2, "reserved token '" + c + "' repeats id " + reserved.indexOf(c));
        }
        reserved.add(c);
      } else {
        if (!kind.equals(BYTE)) {
          throw r.fail(1, "id " + id + " must be a byte token (ids " + k + ".." + (k + 255) + ")");
        }
        byte[] b = r.bytes(2);
        if (b.length != 1 || (b[0] & 0xFF) != id - k) {
          throw r.fail(2, "byte token " + id + " must hold the single byte " + (id - k) + ", written "
              + ReviewText.escape(new byte[] {(byte) (id - k)}));
        }
      }
    }

    ReviewDocument.Section ms = doc.section(MERGES, MERGES_COLUMNS);
    int m = ms.rows().size();
    if (m > dev.morsel.tokenize.format.ModelLimits.DEFAULT_MAX_MERGES) {
      throw ms.fail("holds " + m + " merges; at most " + dev.morsel.tokenize.format.ModelLimits.DEFAULT_MAX_MERGES);
    }
    ReviewDocument.Row[] byRank = ms.byIndex(0);
    Map<ByteBuffer, Integer> ids = new HashMap<>();
    for (int b = 0; b < 256; b++) {
      ids.put(ByteBuffer.wrap(new byte[] {(byte) b}), k + b);
    }
    int[] left = new int[m];
    int[] right = new int[m];
    for (int rank = 0; rank < m; rank++) {
      ReviewDocument.Row r = byRank[rank];
      byte[] a = r.bytes(1);
      byte[] b = r.bytes(2);
      Integer ia = ids.get(ByteBuffer.wrap(a));
      if (ia == null) {
        throw r.fail(1, "no byte token or merge of lower rank makes " + r.raw(1));
      }
      Integer ib = ids.get(ByteBuffer.wrap(b));
      if (ib == null) {
        throw r.fail(2, "no byte token or merge of lower rank makes " + r.raw(2));
      }
      byte[] t = r.bytes(3);
      byte[] joined = Arrays.copyOf(a, a.length + b.length);
      System.arraycopy(b, 0, joined, a.length, b.length);
      if (!Arrays.equals(t, joined)) {
        throw r.fail(3, "the token must be left and right joined, " + ReviewText.escape(joined));
      }
      if (joined.length > Vocab.MAX_TOKEN_BYTES) {
        throw r.fail(3, "token of " + joined.length + " bytes; the limit is MAX_TOKEN_BYTES=" + Vocab.MAX_TOKEN_BYTES);
      }
      Integer before = ids.putIfAbsent(ByteBuffer.wrap(joined), k + 256 + rank);
      if (before != null) {
        throw r.fail(3, "token " + r.raw(3) + " is already " + (before < k + 256 ? "byte token " + before
            : "made by rank " + (before - k - 256)) + ": token bytes must be unique");
      }
      left[rank] = ia;
      right[rank] = ib;
    }
    return Vocab.build(reserved, left, right, (index, msg) -> index < m ? byRank[index].fail(msg) : ms.fail(msg));
  }
}
