/**
 * Morsel tokenizers in Apache Lucene analysis chains.
 *
 * <p>{@link dev.morsel.tokenize.lucene.SubwordTokenizer} is a Lucene {@code Tokenizer} over any
 * Morsel {@link dev.morsel.tokenize.Tokenizer}: one Lucene token per content token, with offsets
 * into the original text (corrected through char filters), the token id in a
 * {@link dev.morsel.tokenize.lucene.TokenIdAttribute}, and the class of its text as the type.
 * {@link dev.morsel.tokenize.lucene.SubwordAnalyzer} wraps it for code;
 * {@link dev.morsel.tokenize.lucene.SubwordTokenizerFactory} (SPI name {@code morselSubword}) for
 * {@code CustomAnalyzer} and configuration files. {@link dev.morsel.tokenize.lucene.SubwordSettings}
 * holds the options.
 */
package dev.morsel.tokenize.lucene;
