package dev.morsel.tokenize;

import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelFormatException;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.ReviewDocument;
import dev.morsel.tokenize.format.ReviewText;
import dev.morsel.tokenize.format.ReviewWriter;
import dev.morsel.tokenize.format.SectionReader;
import dev.morsel.tokenize.format.SectionWriter;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.SegmenterProvider;
import dev.morsel.tokenize.split.Splitting;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The api's sections of a review text ({@code pipeline}, {@code reserved}, {@code framing},
 * {@code metadata}) and the assembly of a whole review text from a tokenizer and back into a model
 * file; the segmenter's own sections come from {@link Segmenter#writeReview} and {@link
 * SegmenterProvider#readReview}. See {@code docs/format.md}, "Review text format".
 */
final class Review {
  static final String PIPELINE = "pipeline";
  static final String RESERVED = "reserved";
  static final String FRAMING = "framing";
  static final String METADATA = "metadata";
  private static final String[] PIPELINE_COLUMNS = {"setting", "value"};
  private static final String[] RESERVED_COLUMNS = {"id", "token"};
  private static final String[] FRAMING_COLUMNS = {"place", "position", "token"};
  private static final String[] METADATA_COLUMNS = {"key", "value"};
  private static final String[] PLACES = {"begin", "separator", "end"};
  /** Most metadata entries read from a model file (reason: a forged count must not drive allocation). */
  private static final int MAX_METADATA = 1 << 16;

  private Review() {}

  // ------------------------------------------------------------------ export

  /** Writes the review text of {@code t}, then {@code metadata} (key to value, in order) if not null. */
  static void write(PipelineTokenizer t, Map<String, String> metadata, Appendable out) {
    Segmenter segmenter = t.segmenter();
    ReviewWriter w = ReviewWriter.start(out, segmenter.scheme());
    w.note("model fingerprint " + t.fingerprint());
    w.section(PIPELINE, PIPELINE_COLUMNS);
    w.row("normalization", ReviewText.escape(t.pipeline().normalization().spec()));
    w.row("splitting", ReviewText.escape(t.pipeline().splitting().spec()));
    w.section(RESERVED, RESERVED_COLUMNS);
    ReservedTokens reserved = t.reservedTokens();
    for (String s : reserved.spellings()) {
      w.row(Integer.toString(reserved.id(s)), ReviewText.escape(s));
    }
    w.section(FRAMING, FRAMING_COLUMNS);
    Template template = t.template();
    List<List<String>> lists = List.of(template.begin(), template.separator(), template.end());
    for (int p = 0; p < PLACES.length; p++) {
      for (int i = 0; i < lists.get(p).size(); i++) {
        w.row(PLACES[p], Integer.toString(i), ReviewText.escape(lists.get(p).get(i)));
      }
    }
    segmenter.writeReview(w);
    if (metadata != null) {
      w.section(METADATA, METADATA_COLUMNS);
      metadata.forEach((k, v) -> w.row(ReviewText.escape(k), ReviewText.escape(v)));
    }
  }

  /** The metadata entries of section META, in stored order; null without that section. */
  static Map<String, String> metadata(ModelSections sections) {
    if (!sections.has(ModelFile.TAG_METADATA)) {
      return null;
    }
    SectionReader r = sections.reader(ModelFile.TAG_METADATA);
    int n = r.getCount("metadata entries", MAX_METADATA, 8);
    Map<String, String> out = new LinkedHashMap<>();
    for (int i = 0; i < n; i++) {
      String key = r.getString("metadata key " + i);
      String value = r.getString("metadata value " + i);
      if (out.putIfAbsent(key, value) != null) {
        throw r.fail("metadata key '" + key + "' repeats");
      }
    }
    r.expectEnd();
    return out;
  }

  // ------------------------------------------------------------------ import

  /** The model file that {@code doc} describes, through {@code provider} for the segmenter's sections. */
  static byte[] modelFile(ReviewDocument doc, SegmenterProvider provider) {
    ReviewDocument.Section ps = doc.section(PIPELINE, PIPELINE_COLUMNS);
    String norm = null;
    String split = null;
    ReviewDocument.Row normRow = null;
    ReviewDocument.Row splitRow = null;
    for (ReviewDocument.Row r : ps.rows()) {
      String key = r.word(0, "normalization", "splitting");
      if (key.equals("normalization")) {
        if (normRow != null) {
          throw r.fail(0, "normalization repeats line " + normRow.line());
        }
        normRow = r;
        norm = r.text(1);
      } else {
        if (splitRow != null) {
          throw r.fail(0, "splitting repeats line " + splitRow.line());
        }
        splitRow = r;
        split = r.text(1);
      }
    }
    if (normRow == null || splitRow == null) {
      throw ps.fail("needs a row for " + (normRow == null ? "normalization" : "splitting"));
    }
    Normalization normalization;
    Splitting splitting;
    try {
      normalization = Normalization.parse(norm);
    } catch (IllegalArgumentException e) {
      throw normRow.fail(1, e.getMessage());
    }
    try {
      splitting = Splitting.parse(split);
    } catch (IllegalArgumentException e) {
      throw splitRow.fail(1, e.getMessage());
    }

    ReviewDocument.Section rs = doc.section(RESERVED, RESERVED_COLUMNS);
    ReservedTokens.Builder rb = ReservedTokens.builder();
    List<ReviewDocument.Row> reservedRows = rs.rows();
    List<Integer> reservedIds = new ArrayList<>();
    for (ReviewDocument.Row r : reservedRows) {
      int id = (int) r.integer(0, 0, Integer.MAX_VALUE);
      String spelling = r.text(1);
      try {
        rb.add(spelling, id);
      } catch (IllegalArgumentException e) {
        throw r.fail(1, e.getMessage());
      }
      reservedIds.add(id);
    }
    ReservedTokens reserved = rb.build();

    ReviewDocument.Section fs = doc.section(FRAMING, FRAMING_COLUMNS);
    List<List<String>> lists = List.of(new ArrayList<>(), new ArrayList<>(), new ArrayList<>());
    for (ReviewDocument.Row r : fs.rows()) {
      String place = r.word(0, PLACES);
      List<String> list = lists.get(List.of(PLACES).indexOf(place));
      long position = r.integer(1, 0, Integer.MAX_VALUE);
      if (position != list.size()) {
        throw r.fail(1, "expected position " + list.size() + " of " + place + " (positions of a place count from 0"
            + " without gaps, in row order)");
      }
      String token = r.text(2);
      if (reserved.id(token) < 0) {
        throw r.fail(2, "'" + token + "' is not a reserved token of section " + RESERVED);
      }
      list.add(token);
    }

    Segmenter segmenter = provider.readReview(doc);
    for (int i = 0; i < reservedRows.size(); i++) {
      if (reservedIds.get(i) >= segmenter.vocabularySize()) {
        throw reservedRows.get(i).fail(0, "id " + reservedIds.get(i) + " is outside the vocabulary of "
            + segmenter.vocabularySize() + " tokens");
      }
    }
    Map<String, String> metadata = null;
    ReviewDocument.Section ms = doc.optionalSection(METADATA, METADATA_COLUMNS);
    if (ms != null) {
      metadata = new LinkedHashMap<>();
      Map<String, Long> lines = new LinkedHashMap<>();
      for (ReviewDocument.Row r : ms.rows()) {
        String key = r.text(0);
        Long first = lines.putIfAbsent(key, r.line());
        if (first != null) {
          throw r.fail(0, "key '" + key + "' repeats line " + first);
        }
        metadata.put(key, r.text(1));
      }
    }
    doc.expectNoOtherSections();

    PipelineTokenizer t;
    try {
      t = new PipelineTokenizer(Pipeline.of(normalization, splitting), segmenter, reserved,
          Template.of(lists.get(0), lists.get(1), lists.get(2)), Limits.defaults(), null);
    } catch (IllegalArgumentException e) {
      throw doc.fail(e.getMessage());
    }
    ModelWriter w = t.sections();
    if (metadata != null) {
      SectionWriter m = w.section(ModelFile.TAG_METADATA);
      m.putInt(metadata.size());
      metadata.forEach((k, v) -> m.putString(k).putString(v));
    }
    byte[] file = w.toModelFile();
    try {
      Tokenizers.load(file); // the same validation as any model file
    } catch (ModelFormatException e) {
      throw doc.fail("the model it describes is invalid: " + e.getMessage());
    }
    return file;
  }
}
