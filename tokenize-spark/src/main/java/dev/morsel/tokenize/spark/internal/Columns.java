package dev.morsel.tokenize.spark.internal;

import java.util.Arrays;
import org.apache.spark.sql.AnalysisException;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.types.DataType;
import org.apache.spark.sql.types.StringType;

/**
 * Checks a text column before any job starts, so that a wrong name or type is an
 * {@link IllegalArgumentException} naming the column on the driver, not a task failure.
 *
 * <p>Internal: not part of the public API.
 */
public final class Columns {
  private Columns() {}

  /**
   * Resolves {@code column} in {@code data} the way {@code data.col(column)} does (nested fields and
   * the session's case sensitivity included) and checks that it holds strings.
   *
   * @throws IllegalArgumentException naming the column if it does not resolve or is not a string column
   */
  public static void requireStringColumn(Dataset<?> data, String column, String what) {
    if (column == null || column.isEmpty()) {
      throw new IllegalArgumentException(what + " must be a non-empty column name, got " + (column == null ? "null" : "''"));
    }
    DataType type;
    try {
      type = data.select(data.col(column)).schema().fields()[0].dataType();
    } catch (Exception e) {
      if (e instanceof AnalysisException) {
        throw new IllegalArgumentException(what + " '" + column + "' is not a column of the dataset; its columns are "
            + Arrays.toString(data.columns()), e);
      }
      throw e;
    }
    if (!(type instanceof StringType)) {
      throw new IllegalArgumentException(what + " '" + column + "' has type " + type.simpleString()
          + "; a string column is required");
    }
  }
}
