package dev.morsel.tokenize.lucene;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import java.nio.file.Path;
import java.util.Objects;
import org.apache.lucene.analysis.Analyzer;

/**
 * A Lucene {@link Analyzer} whose chain is one {@link SubwordTokenizer} over a Morsel tokenizer.
 * The Morsel tokenizer is shared by every field and thread; Lucene keeps one
 * {@code SubwordTokenizer} per thread (the analyzer's default reuse strategy). Put filters after it
 * with Lucene's {@code CustomAnalyzer} and {@link SubwordTokenizerFactory}.
 *
 * @since 0.1.0
 */
public final class SubwordAnalyzer extends Analyzer {
  private final Tokenizer morsel;
  private final SubwordSettings settings;

  private SubwordAnalyzer(Tokenizer morsel, SubwordSettings settings) {
    this.morsel = Objects.requireNonNull(morsel, "morsel");
    this.settings = Objects.requireNonNull(settings, "settings");
  }

  /** An analyzer over {@code morsel} with the default settings. */
  public static SubwordAnalyzer of(Tokenizer morsel) {
    return new SubwordAnalyzer(morsel, SubwordSettings.defaults());
  }

  /** An analyzer over {@code morsel}. */
  public static SubwordAnalyzer of(Tokenizer morsel, SubwordSettings settings) {
    return new SubwordAnalyzer(morsel, settings);
  }

  /**
   * An analyzer over the model file at {@code model}, loaded once now, with the default settings.
   *
   * @throws dev.morsel.tokenize.format.ModelFormatException if the file is not a valid model
   */
  public static SubwordAnalyzer load(Path model) {
    return new SubwordAnalyzer(Tokenizers.load(model), SubwordSettings.defaults());
  }

  /** An analyzer over the model file at {@code model}, loaded once now. */
  public static SubwordAnalyzer load(Path model, SubwordSettings settings) {
    return new SubwordAnalyzer(Tokenizers.load(model), settings);
  }

  /** The Morsel tokenizer. */
  public Tokenizer morsel() {
    return morsel;
  }

  /** The settings. */
  public SubwordSettings settings() {
    return settings;
  }

  @Override
  protected TokenStreamComponents createComponents(String fieldName) {
    return new TokenStreamComponents(new SubwordTokenizer(morsel, settings));
  }

  @Override
  public String toString() {
    return "SubwordAnalyzer[" + morsel.scheme() + " " + morsel.fingerprint().substring(0, 12) + ", " + settings + "]";
  }
}
