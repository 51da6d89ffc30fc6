package dev.morsel.tokenize.lucene;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.StringReader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;
import org.apache.lucene.analysis.TokenizerFactory;
import org.apache.lucene.analysis.custom.CustomAnalyzer;
import org.apache.lucene.util.ClasspathResourceLoader;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The factory: found by its SPI name, parameters read and checked, the model loaded once and shared. */
class SubwordTokenizerFactoryTest {
  @TempDir
  Path dir;

  private Path model() {
    Path p = dir.resolve("ferry.morsel");
    if (!Files.exists(p)) {
      TestModels.handMade().save(p);
    }
    return p;
  }

  private static Map<String, String> args(String... kv) {
    Map<String, String> m = new HashMap<>();
    for (int i = 0; i < kv.length; i += 2) {
      m.put(kv[i], kv[i + 1]);
    }
    return m;
  }

  @Test
  void isFoundByItsNameThroughLucenesServiceLoader() {
    assertTrue(TokenizerFactory.availableTokenizers().contains(SubwordTokenizerFactory.NAME));
    assertEquals(SubwordTokenizerFactory.class, TokenizerFactory.lookupClass(SubwordTokenizerFactory.NAME));
    assertEquals(SubwordTokenizerFactory.NAME, TokenizerFactory.findSPIName(SubwordTokenizerFactory.class));
  }

  @Test
  void readsEveryParameter() throws IOException {
    TokenizerFactory f = TokenizerFactory.forName(SubwordTokenizerFactory.NAME, args("model", model().toString(),
        "termText", "original", "positions", "piece", "idPayload", "true", "chunkLength", "64"));
    SubwordSettings s = ((SubwordTokenizerFactory) f).settings();
    assertEquals(SubwordSettings.builder().termText(SubwordSettings.TermText.ORIGINAL)
        .positions(SubwordSettings.Positions.PER_PIECE).idPayload(true).chunkLength(64).build(), s);
    assertEquals(SubwordSettings.defaults(),
        new SubwordTokenizerFactory(args("model", model().toString())).settings());
  }

  @Test
  void loadsTheModelOnceAndSharesItAcrossTokenizers() throws IOException {
    SubwordTokenizerFactory f = new SubwordTokenizerFactory(args("model", model().toString()));
    assertThrows(IllegalStateException.class, f::morsel);
    f.inform(new ClasspathResourceLoader(getClass()));
    SubwordTokenizer a = (SubwordTokenizer) f.create();
    SubwordTokenizer b = (SubwordTokenizer) f.create();
    assertSame(a.morsel(), b.morsel());
    assertEquals(TestModels.handMade().fingerprint(), a.morsel().fingerprint());
    a.setReader(new StringReader("ferry"));
    a.close();
  }

  @Test
  void resolvesARelativeModelInTheConfigurationDirectory() throws IOException {
    model();
    try (CustomAnalyzer a = CustomAnalyzer.builder(dir).withTokenizer(SubwordTokenizerFactory.NAME,
        "model", "ferry.morsel", "positions", "piece").build()) {
      assertEquals(SubwordTokenizerFactory.class, a.getTokenizerFactory().getClass());
      assertEquals(SubwordSettings.Positions.PER_PIECE,
          ((SubwordTokenizerFactory) a.getTokenizerFactory()).settings().positions());
    }
  }

  @Test
  void badParametersAreNamed() {
    IllegalArgumentException missing = assertThrows(IllegalArgumentException.class,
        () -> new SubwordTokenizerFactory(args("termText", "original")));
    assertTrue(missing.getMessage().contains("model"), missing.getMessage());
    IllegalArgumentException unknown = assertThrows(IllegalArgumentException.class,
        () -> new SubwordTokenizerFactory(args("model", "m", "vocabularyFile", "x")));
    assertTrue(unknown.getMessage().contains("vocabularyFile") && unknown.getMessage().contains("chunkLength"),
        unknown.getMessage());
    IllegalArgumentException value = assertThrows(IllegalArgumentException.class,
        () -> new SubwordTokenizerFactory(args("model", "m", "positions", "word")));
    assertTrue(value.getMessage().contains("positions"), value.getMessage());
    IllegalArgumentException small = assertThrows(IllegalArgumentException.class,
        () -> new SubwordTokenizerFactory(args("model", "m", "chunkLength", "2")));
    assertTrue(small.getMessage().contains("chunkLength=2"), small.getMessage());
  }

  @Test
  void aMissingModelFileFailsWhenInformed() {
    SubwordTokenizerFactory f = new SubwordTokenizerFactory(args("model", "no-such-model.morsel"));
    assertThrows(IOException.class, () -> f.inform(new ClasspathResourceLoader(getClass())));
  }
}
