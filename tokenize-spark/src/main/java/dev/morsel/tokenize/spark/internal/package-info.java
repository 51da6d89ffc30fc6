/** Executor-side functions and caches behind the Spark API; not part of the public API. */
package dev.morsel.tokenize.spark.internal;
