/**
 * Apache Lucene analysis over any Morsel tokenizer: {@link dev.morsel.tokenize.lucene.SubwordTokenizer},
 * {@link dev.morsel.tokenize.lucene.SubwordAnalyzer} and the factory named {@code morselSubword}.
 */
module dev.morsel.tokenize.lucene {
  requires transitive dev.morsel.tokenize;
  requires transitive org.apache.lucene.core;

  exports dev.morsel.tokenize.lucene;

  provides org.apache.lucene.analysis.TokenizerFactory with dev.morsel.tokenize.lucene.SubwordTokenizerFactory;
}
