package dev.morsel.tokenize.spark.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import org.apache.spark.broadcast.Broadcast;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.api.java.UDF1;
import org.apache.spark.sql.types.DataType;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;

/**
 * The function Spark runs per row: encodes one text with the tokenizer cached in this JVM under the
 * declared fingerprint. Returns {@code int[]} ids, or a {@link Row} of ids, starts and ends when
 * offsets are wanted; null for a null text.
 *
 * <p>Serialized with the broadcast handle of the model bytes, never the bytes themselves; the
 * tokenizer is looked up once per deserialized copy (once per task).
 *
 * <p>Internal: not part of the public API.
 */
public final class EncodeFunction implements UDF1<String, Object> {
  private static final long serialVersionUID = 1L;

  /** Field names of the struct returned when offsets are wanted. */
  public static final String IDS = "ids";
  /** Field name of the start offsets in the struct. */
  public static final String STARTS = "starts";
  /** Field name of the end offsets in the struct. */
  public static final String ENDS = "ends";

  private static final DataType INTS = DataTypes.createArrayType(DataTypes.IntegerType, false);

  private final Broadcast<byte[]> model;
  private final String fingerprint;
  private final boolean trusted;
  private final boolean offsets;
  private transient Tokenizer tokenizer;

  /**
   * @param model the broadcast bytes of the model file
   * @param fingerprint the fingerprint the caller declared for the bytes
   * @param trusted whether reserved-token spellings in the text become reserved tokens
   * @param offsets whether to return starts and ends as well as ids
   */
  public EncodeFunction(Broadcast<byte[]> model, String fingerprint, boolean trusted, boolean offsets) {
    this.model = model;
    this.fingerprint = fingerprint;
    this.trusted = trusted;
    this.offsets = offsets;
  }

  /** The SQL type this function returns: {@code array<int>}, or the struct of three of them. */
  public static DataType returnType(boolean offsets) {
    if (!offsets) {
      return INTS;
    }
    return new StructType()
        .add(IDS, INTS, false)
        .add(STARTS, INTS, false)
        .add(ENDS, INTS, false);
  }

  @Override
  public Object call(String text) {
    if (text == null) {
      return null;
    }
    Tokenizer t = tokenizer;
    if (t == null) {
      t = ModelCache.get(fingerprint, model::value);
      tokenizer = t;
    }
    Tokens tokens = t.encode(text, trusted ? Trust.TRUSTED : Trust.UNTRUSTED);
    return offsets ? RowFactory.create(tokens.ids(), tokens.starts(), tokens.ends()) : tokens.ids();
  }
}
