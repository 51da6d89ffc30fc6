package dev.morsel.tokenize.wordpiece.internal;

import dev.morsel.tokenize.format.ReviewDocument;
import dev.morsel.tokenize.format.ReviewText;
import dev.morsel.tokenize.format.ReviewWriter;
import java.util.List;

/**
 * The WordPiece sections of a review text (see {@code docs/format.md}, "Review text format").
 *
 * <pre>
 * § settings    setting  value     marker, unknown, max-piece-length (a number, or "derived")
 * § vocabulary  id  kind  token    kind: reserved | unknown | initial | continuation
 * </pre>
 * Vocabulary rows may come in any order; ids are explicit and must cover {@code 0..n-1} once each.
 * The kind column is checked against the layout (reserved tokens first, then the unknown token) and
 * against the spelling (a continuation token is spelled with the marker in front), so a reviewer sees
 * each token's role and an edit that contradicts it is refused.
 */
final class WordPieceReview {
  static final String SETTINGS = "settings";
  static final String VOCABULARY = "vocabulary";
  private static final String[] SETTINGS_COLUMNS = {"setting", "value"};
  private static final String[] VOCABULARY_COLUMNS = {"id", "kind", "token"};
  private static final String MARKER = "marker";
  private static final String UNKNOWN = "unknown";
  private static final String LIMIT = "max-piece-length";
  private static final String DERIVED = "derived";
  private static final String BYTES = "byte-spelling";
  /** Kind words by the segmenter's kind codes. */
  private static final String[] KINDS = {"reserved", "unknown", "initial", "continuation", "byte"};

  private WordPieceReview() {}

  static void write(ReviewWriter out, WordPieceSettings settings, String[] spellings, byte[] kinds) {
    out.section(SETTINGS, SETTINGS_COLUMNS);
    out.row(MARKER, ReviewText.escape(settings.marker()));
    out.row(UNKNOWN, ReviewText.escape(settings.unknownToken()));
    out.row(LIMIT, settings.maxPieceLength() == WordPieceSettings.DERIVED_PIECE_LENGTH ? DERIVED
        : Integer.toString(settings.maxPieceLength()));
    if (settings.byteSpelling()) {
      out.row(BYTES, "true");
    }
    out.section(VOCABULARY, VOCABULARY_COLUMNS);
    for (int i = 0; i < spellings.length; i++) {
      out.row(Integer.toString(i), KINDS[kinds[i]], ReviewText.escape(spellings[i]));
    }
  }

  /** What {@link #read} finds. */
  static final class Read {
    final List<String> tokens;
    final int reservedCount;
    final WordPieceSettings settings;
    final ReviewDocument.Row[] rows;
    final ReviewDocument.Section section;

    Read(List<String> tokens, int reservedCount, WordPieceSettings settings, ReviewDocument.Row[] rows,
        ReviewDocument.Section section) {
      this.tokens = tokens;
      this.reservedCount = reservedCount;
      this.settings = settings;
      this.rows = rows;
      this.section = section;
    }
  }

  static Read read(ReviewDocument doc) {
    ReviewDocument.Section ss = doc.section(SETTINGS, SETTINGS_COLUMNS);
    WordPieceSettings settings = WordPieceSettings.defaults();
    ReviewDocument.Row[] seen = new ReviewDocument.Row[4];
    for (ReviewDocument.Row r : ss.rows()) {
      String key = r.word(0, MARKER, UNKNOWN, LIMIT, BYTES);
      int k = key.equals(MARKER) ? 0 : key.equals(UNKNOWN) ? 1 : key.equals(LIMIT) ? 2 : 3;
      if (seen[k] != null) {
        throw r.fail(0, key + " repeats line " + seen[k].line());
      }
      seen[k] = r;
      try {
        if (k == 0) {
          settings = settings.withMarker(r.text(1));
        } else if (k == 1) {
          settings = settings.withUnknownToken(r.text(1));
        } else if (k == 3) {
          settings = settings.withByteSpelling(r.word(1, "true", "false").equals("true"));
        } else {
          settings = settings.withMaxPieceLength(r.raw(1).equals(DERIVED) ? WordPieceSettings.DERIVED_PIECE_LENGTH
              : (int) r.integer(1, 1, WordPieceSettings.MAX_MAX_PIECE_LENGTH));
        }
      } catch (IllegalArgumentException e) {
        throw r.fail(1, e.getMessage());
      }
    }
    for (int k = 0; k < 3; k++) {
      if (seen[k] == null) {
        throw ss.fail("needs a row for " + new String[] {MARKER, UNKNOWN, LIMIT}[k]);
      }
    }

    ReviewDocument.Section vs = doc.section(VOCABULARY, VOCABULARY_COLUMNS);
    int n = vs.rows().size();
    if (n > WordPieceSegmenter.MAX_VOCABULARY_SIZE) {
      throw vs.fail("holds " + n + " tokens; at most " + WordPieceSegmenter.MAX_VOCABULARY_SIZE);
    }
    ReviewDocument.Row[] byId = vs.byIndex(0);
    String[] tokens = new String[n];
    int reserved = 0;
    String marker = settings.marker();
    for (int id = 0; id < n; id++) {
      ReviewDocument.Row r = byId[id];
      String kind = r.word(1, KINDS);
      String t = r.text(2);
      tokens[id] = t;
      String expected;
      if (kind.equals(KINDS[WordPieceSegmenter.RESERVED]) && reserved == id) {
        reserved++;
        continue;
      } else if (id == reserved) {
        expected = KINDS[WordPieceSegmenter.UNKNOWN];
      } else if (settings.byteSpelling() && id <= reserved + 256) {
        expected = KINDS[WordPieceSegmenter.BYTE];
      } else {
        expected = t.length() > marker.length() && t.startsWith(marker) ? KINDS[WordPieceSegmenter.CONTINUATION]
            : KINDS[WordPieceSegmenter.INITIAL];
      }
      if (!kind.equals(expected)) {
        throw r.fail(1, "id " + id + " is " + expected + " here, not " + kind + " (reserved tokens come first, then"
            + " the unknown token, then with byte-spelling the 256 byte tokens; a continuation token is spelled with the marker " + marker + " in front)");
      }
    }
    if (n == reserved) {
      throw vs.fail("needs the unknown token after the " + reserved + " reserved tokens");
    }
    return new Read(List.of(tokens), reserved, settings, byId, vs);
  }
}
