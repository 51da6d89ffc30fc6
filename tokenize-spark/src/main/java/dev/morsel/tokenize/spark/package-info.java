/**
 * Morsel on Apache Spark: {@link dev.morsel.tokenize.spark.SparkPieceCounter} counts training pieces
 * across a cluster with the single-JVM counts, and {@link dev.morsel.tokenize.spark.SparkEncoder}
 * adds token id (and offset) columns to a dataset with the single-JVM encoding. Spark itself is a
 * provided dependency: the cluster supplies it.
 */
package dev.morsel.tokenize.spark;
