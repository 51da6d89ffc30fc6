package dev.morsel.tokenize.spark;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.spark.internal.Columns;
import dev.morsel.tokenize.spark.internal.EncodeFunction;
import java.util.Objects;
import java.util.regex.Pattern;
import org.apache.spark.SparkContext;
import org.apache.spark.api.java.JavaSparkContext;
import org.apache.spark.broadcast.Broadcast;
import org.apache.spark.sql.Column;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.expressions.UserDefinedFunction;
import org.apache.spark.sql.functions;

/**
 * Encodes a text column on Apache Spark into columns of token ids and, optionally, start and end
 * offsets, giving for every row exactly what {@link Tokenizer#encode(CharSequence,
 * dev.morsel.tokenize.Trust)} gives in one JVM. Immutable and thread-safe; build one with
 * {@link #builder(Tokenizer)} or {@link #builder(byte[], String)}.
 *
 * <h2>How the model travels</h2>
 * The model file's bytes are broadcast once per Spark context (the broadcast is reused by later
 * calls on the same context). On each executor JVM the first task that needs the model loads it
 * and caches it under its fingerprint; every later task and row in that JVM reuses it. The
 * segmenter's module (for example {@code tokenize-bpe}) must be on the executors' class path.
 *
 * <h2>Columns</h2>
 * {@link #encode(Dataset, String)} adds {@code idsColumn} (default {@value #DEFAULT_IDS_COLUMN}),
 * an {@code array<int>}; with {@link Builder#offsets(boolean) offsets} on it also adds
 * {@code startsColumn} and {@code endsColumn} (defaults {@value #DEFAULT_STARTS_COLUMN},
 * {@value #DEFAULT_ENDS_COLUMN}), the {@code [start, end)} of each token in UTF-16 units of the
 * original text. A column of the same name is replaced, as {@code withColumn} does.
 *
 * <h2>Trust</h2>
 * Text is untrusted by default: reserved-token spellings in it are encoded as ordinary text. Only
 * when the column holds text the caller wrote should {@link Builder#trusted(boolean) trusted} be on.
 *
 * <h2>Null and bad input</h2>
 * <ul>
 *   <li>A null text gives null ids (and null starts and ends): null in, null out, as SQL functions do.
 *   <li>A column that does not exist, or is not a string column, is an
 *       {@link IllegalArgumentException} naming the column, thrown on the driver before any job.
 *   <li>Model bytes that do not load, or that load to another fingerprint than the declared one, fail
 *       the first task that loads them with an {@link IllegalArgumentException} naming the declared
 *       fingerprint (Spark reports it wrapped in its job failure). The declared fingerprint is the
 *       model's identity: an executor that already holds a model of that fingerprint uses it and
 *       never reads the new bytes, so its rows are still those of the declared model.
 *   <li>A text beyond the tokenizer's input limit fails its task as {@code encode} does.
 * </ul>
 *
 * <h2>SQL</h2>
 * {@link #register(SparkSession, String)} registers the same function for SQL. It returns
 * {@code array<int>} ids, or with offsets on a {@code struct<ids, starts, ends>} of three
 * {@code array<int>}.
 *
 * @since 0.1.0
 */
public final class SparkEncoder {
  // ---------------------------------------------------------------- configuration

  /** Default name of the ids column. */
  public static final String DEFAULT_IDS_COLUMN = "token_ids";
  /** Default name of the start offsets column. */
  public static final String DEFAULT_STARTS_COLUMN = "token_starts";
  /** Default name of the end offsets column. */
  public static final String DEFAULT_ENDS_COLUMN = "token_ends";

  private static final Pattern FINGERPRINT = Pattern.compile("[0-9a-f]{64}");
  /** Temporary struct column between the function and the three output columns. */
  private static final String STRUCT_COLUMN = "__morsel_encoded__";

  private final byte[] model;
  private final String fingerprint;
  private final boolean trusted;
  private final boolean offsets;
  private final String idsColumn;
  private final String startsColumn;
  private final String endsColumn;

  // ---------------------------------------------------------------- state

  private SparkContext broadcastContext; // guarded by this
  private Broadcast<byte[]> broadcast; // guarded by this

  // ---------------------------------------------------------------- life-cycle

  private SparkEncoder(Builder b) {
    this.model = b.model;
    this.fingerprint = b.fingerprint;
    this.trusted = b.trusted;
    this.offsets = b.offsets;
    this.idsColumn = b.idsColumn;
    this.startsColumn = b.startsColumn;
    this.endsColumn = b.endsColumn;
  }

  /** A builder for encoding with {@code tokenizer}: its model bytes and fingerprint travel to the executors. */
  public static Builder builder(Tokenizer tokenizer) {
    Objects.requireNonNull(tokenizer, "tokenizer");
    return new Builder(tokenizer.toBytes(), tokenizer.fingerprint());
  }

  /**
   * A builder for encoding with the model file {@code model} (copied), which the caller declares to
   * have {@code fingerprint}. The bytes are not parsed on the driver: they are loaded on the
   * executors, where bytes that do not load or do not match the fingerprint fail the job with an
   * error naming the fingerprint.
   *
   * @throws IllegalArgumentException if {@code fingerprint} is not 64 lowercase hex digits
   */
  public static Builder builder(byte[] model, String fingerprint) {
    Objects.requireNonNull(model, "model");
    Objects.requireNonNull(fingerprint, "fingerprint");
    if (!FINGERPRINT.matcher(fingerprint).matches()) {
      throw new IllegalArgumentException("fingerprint '" + fingerprint
          + "' is not a SHA-256 fingerprint (64 lowercase hex digits, as Tokenizer.fingerprint() gives)");
    }
    return new Builder(model.clone(), fingerprint);
  }

  // ---------------------------------------------------------------- API

  /**
   * {@code data} with the ids column (and, with offsets on, the starts and ends columns) of
   * {@code textColumn} added.
   *
   * @throws IllegalArgumentException if {@code textColumn} is not a column of {@code data} or is
   *     not a string column
   */
  public Dataset<Row> encode(Dataset<?> data, String textColumn) {
    Objects.requireNonNull(data, "data");
    Columns.requireStringColumn(data, textColumn, "text column");
    Column encoded = udf(data.sparkSession()).apply(data.col(textColumn));
    if (!offsets) {
      return data.withColumn(idsColumn, encoded);
    }
    Dataset<Row> withStruct = data.withColumn(STRUCT_COLUMN, encoded);
    Column struct = withStruct.col(STRUCT_COLUMN);
    return withStruct
        .withColumn(idsColumn, struct.getField(EncodeFunction.IDS))
        .withColumn(startsColumn, struct.getField(EncodeFunction.STARTS))
        .withColumn(endsColumn, struct.getField(EncodeFunction.ENDS))
        .drop(STRUCT_COLUMN);
  }

  /**
   * The encoding function as a column function for {@code spark}: apply it to a string column to
   * get {@code array<int>} ids, or with offsets on a {@code struct<ids, starts, ends>}.
   */
  public UserDefinedFunction udf(SparkSession spark) {
    Objects.requireNonNull(spark, "spark");
    return functions.udf(new EncodeFunction(broadcast(spark.sparkContext()), fingerprint, trusted, offsets),
        EncodeFunction.returnType(offsets));
  }

  /**
   * Registers the encoding function under {@code name} for SQL in {@code spark}, replacing a
   * function of that name; returns it.
   *
   * @throws IllegalArgumentException if {@code name} is empty
   */
  public UserDefinedFunction register(SparkSession spark, String name) {
    Objects.requireNonNull(name, "name");
    if (name.isEmpty()) {
      throw new IllegalArgumentException("the SQL function name must not be empty");
    }
    return spark.udf().register(name, udf(spark));
  }

  /** The fingerprint declared for the model (the one that keys the executors' cache). */
  public String fingerprint() {
    return fingerprint;
  }

  /** Whether reserved-token spellings in the text become reserved tokens. */
  public boolean trusted() {
    return trusted;
  }

  /** Whether start and end offsets are produced as well as ids. */
  public boolean offsets() {
    return offsets;
  }

  /** The name of the ids column. */
  public String idsColumn() {
    return idsColumn;
  }

  /** The name of the start offsets column. */
  public String startsColumn() {
    return startsColumn;
  }

  /** The name of the end offsets column. */
  public String endsColumn() {
    return endsColumn;
  }

  // ---------------------------------------------------------------- internals

  private synchronized Broadcast<byte[]> broadcast(SparkContext sc) {
    if (broadcast == null || broadcastContext != sc || sc.isStopped()) {
      broadcast = JavaSparkContext.fromSparkContext(sc).broadcast(model);
      broadcastContext = sc;
    }
    return broadcast;
  }

  // ---------------------------------------------------------------- builder

  /**
   * Builder; not thread-safe. Defaults: untrusted text, ids only, columns
   * {@value #DEFAULT_IDS_COLUMN}, {@value #DEFAULT_STARTS_COLUMN}, {@value #DEFAULT_ENDS_COLUMN}.
   */
  public static final class Builder {
    private final byte[] model;
    private final String fingerprint;
    private boolean trusted;
    private boolean offsets;
    private String idsColumn = DEFAULT_IDS_COLUMN;
    private String startsColumn = DEFAULT_STARTS_COLUMN;
    private String endsColumn = DEFAULT_ENDS_COLUMN;

    private Builder(byte[] model, String fingerprint) {
      this.model = model;
      this.fingerprint = fingerprint;
    }

    /** Whether the text column is trusted, so that reserved-token spellings become reserved tokens; default false. */
    public Builder trusted(boolean trusted) {
      this.trusted = trusted;
      return this;
    }

    /** Whether to produce start and end offsets as well as ids; default false. */
    public Builder offsets(boolean offsets) {
      this.offsets = offsets;
      return this;
    }

    /** The name of the ids column; default {@value #DEFAULT_IDS_COLUMN}. */
    public Builder idsColumn(String name) {
      this.idsColumn = requireName(name, "idsColumn");
      return this;
    }

    /** The name of the start offsets column; default {@value #DEFAULT_STARTS_COLUMN}. */
    public Builder startsColumn(String name) {
      this.startsColumn = requireName(name, "startsColumn");
      return this;
    }

    /** The name of the end offsets column; default {@value #DEFAULT_ENDS_COLUMN}. */
    public Builder endsColumn(String name) {
      this.endsColumn = requireName(name, "endsColumn");
      return this;
    }

    /**
     * An encoder with these settings.
     *
     * @throws IllegalArgumentException if offsets are on and two output columns share a name
     */
    public SparkEncoder build() {
      if (offsets && (idsColumn.equals(startsColumn) || idsColumn.equals(endsColumn) || startsColumn.equals(endsColumn))) {
        throw new IllegalArgumentException("idsColumn, startsColumn and endsColumn must differ, got '" + idsColumn
            + "', '" + startsColumn + "', '" + endsColumn + "'");
      }
      return new SparkEncoder(this);
    }

    private static String requireName(String name, String setting) {
      if (name == null || name.isEmpty()) {
        throw new IllegalArgumentException(setting + " must be a non-empty column name");
      }
      return name;
    }
  }
}
