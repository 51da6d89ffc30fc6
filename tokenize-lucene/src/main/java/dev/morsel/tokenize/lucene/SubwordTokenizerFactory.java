package dev.morsel.tokenize.lucene;

import dev.morsel.tokenize.Tokenizers;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.InvalidPathException;
import java.nio.file.Path;
import java.nio.file.Paths;
import java.util.Arrays;
import java.util.Locale;
import java.util.Map;
import org.apache.lucene.analysis.TokenizerFactory;
import org.apache.lucene.util.AttributeFactory;
import org.apache.lucene.util.ResourceLoader;
import org.apache.lucene.util.ResourceLoaderAware;

/**
 * Creates {@link SubwordTokenizer}s by name: SPI name {@value #NAME}, for Lucene's
 * {@code CustomAnalyzer} and for search-server configuration files.
 *
 * <table>
 *   <caption>Parameters</caption>
 *   <tr><th>name</th><th>value</th><th>default</th></tr>
 *   <tr><td>{@code model}</td><td>the model file: an absolute path, or a name the resource loader
 *       resolves (relative to the configuration directory, or on the class path)</td><td>required</td></tr>
 *   <tr><td>{@code termText}</td><td>{@code vocabulary} or {@code original}</td><td>{@code vocabulary}</td></tr>
 *   <tr><td>{@code positions}</td><td>{@code token} or {@code piece}</td><td>{@code token}</td></tr>
 *   <tr><td>{@code idPayload}</td><td>{@code true} or {@code false}</td><td>{@code false}</td></tr>
 *   <tr><td>{@code chunkLength}</td><td>UTF-16 units, at least {@value SubwordSettings#MIN_CHUNK_LENGTH}</td>
 *       <td>{@value SubwordSettings#DEFAULT_CHUNK_LENGTH}</td></tr>
 * </table>
 * See {@link SubwordSettings} for what each does. The model is loaded once, when Lucene informs the
 * factory of its resource loader, and shared by every tokenizer the factory creates, on any thread.
 *
 * @since 0.1.0
 */
public final class SubwordTokenizerFactory extends TokenizerFactory implements ResourceLoaderAware {
  /** The SPI name. */
  public static final String NAME = "morselSubword";

  private static final String MODEL = "model";
  private static final String VALID = "model, termText, positions, idPayload, chunkLength";

  private final String model;
  private final SubwordSettings settings;
  private volatile dev.morsel.tokenize.Tokenizer morsel;

  /**
   * Reads the parameters (see the class comment).
   *
   * @throws IllegalArgumentException if {@code model} is missing, a value is invalid or a parameter
   *     is unknown, naming it and the valid ones
   */
  public SubwordTokenizerFactory(Map<String, String> args) {
    super(args);
    this.model = require(args, MODEL);
    SubwordSettings.Builder b = SubwordSettings.builder();
    String termText = get(args, "termText", Arrays.asList("vocabulary", "original"), "vocabulary", false);
    b.termText(SubwordSettings.TermText.valueOf(termText.toUpperCase(Locale.ROOT)));
    String positions = get(args, "positions", Arrays.asList("token", "piece"), "token", false);
    b.positions(positions.equalsIgnoreCase("piece") ? SubwordSettings.Positions.PER_PIECE : SubwordSettings.Positions.PER_TOKEN);
    b.idPayload(getBoolean(args, "idPayload", false));
    b.chunkLength(getInt(args, "chunkLength", SubwordSettings.DEFAULT_CHUNK_LENGTH));
    this.settings = b.build();
    if (!args.isEmpty()) {
      throw new IllegalArgumentException("unknown parameters for " + NAME + ": " + args.keySet() + " (valid: " + VALID + ")");
    }
  }

  /** For the service loader only: Lucene creates factories through the parameter constructor. */
  public SubwordTokenizerFactory() {
    throw defaultCtorException();
  }

  /**
   * Loads the model: an absolute path that names a file is read directly, anything else through
   * {@code loader}.
   *
   * @throws IOException if the model cannot be read
   * @throws dev.morsel.tokenize.format.ModelFormatException if it is not a valid model
   */
  @Override
  public void inform(ResourceLoader loader) throws IOException {
    Path path = absoluteFile(model);
    if (path != null) {
      morsel = Tokenizers.load(path);
    } else {
      try (InputStream in = loader.openResource(model)) {
        morsel = Tokenizers.load(in.readAllBytes());
      }
    }
  }

  /** The settings read from the parameters. */
  public SubwordSettings settings() {
    return settings;
  }

  /**
   * The loaded Morsel tokenizer.
   *
   * @throws IllegalStateException before {@link #inform(ResourceLoader)}
   */
  public dev.morsel.tokenize.Tokenizer morsel() {
    dev.morsel.tokenize.Tokenizer m = morsel;
    if (m == null) {
      throw new IllegalStateException(NAME + " model '" + model + "' is not loaded: inform(ResourceLoader) was not called");
    }
    return m;
  }

  @Override
  public org.apache.lucene.analysis.Tokenizer create(AttributeFactory factory) {
    return new SubwordTokenizer(factory, morsel(), settings);
  }

  private static Path absoluteFile(String name) {
    try {
      Path p = Paths.get(name);
      return p.isAbsolute() && Files.isRegularFile(p) ? p : null;
    } catch (InvalidPathException e) {
      return null;
    }
  }
}
