package dev.morsel.tokenize.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.Trust;
import dev.morsel.tokenize.bpe.BpeSegmenter;
import dev.morsel.tokenize.bpe.BpeLearner;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.Paths;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The README's usage example, compiled and run here; the test also checks that the README shows
 * exactly the lines between the region markers, so the README cannot drift from the API.
 */
class ReadmeExampleTest {
  @TempDir
  Path dir;

  @Test
  void readmeExampleRunsAndMatchesTheReadme() throws Exception {
    Path corpus = dir.resolve("messages-en.txt");
    try (InputStream in = ReadmeExampleTest.class.getResourceAsStream("demo/messages-en.txt")) {
      Files.copy(in, corpus);
    }
    Path modelFile = dir.resolve("ferry.morsel");

    // @start region="readme"
    // Count pieces with the same pipeline that encoding will use (NFC, class-run splitting).
    Pipeline pipeline = Pipeline.defaults();
    PieceCounts counts = PieceCounter.builder().pipeline(pipeline).build().countFiles(List.of(corpus));

    // Train byte-level BPE with one reserved token of your own spelling, and save the model.
    BpeSegmenter bpe = BpeLearner.builder().vocabularySize(2000).reservedTokens(List.of("⟨agent⟩"))
        .build().train(counts);
    Tokenizer tokenizer = Tokenizers.of(pipeline, bpe);
    tokenizer.save(modelFile);

    // Encode: ids plus [start, end) offsets into the original text.
    String text = "Is the 07:40 from Oskevik late? ⟨agent⟩";
    Tokens tokens = tokenizer.encode(text);          // untrusted: the spelling stays ordinary text
    for (int i = 0; i < tokens.size(); i++) {
      System.out.println(tokens.id(i) + " " + text.substring(tokens.start(i), tokens.end(i)));
    }
    String back = tokenizer.decode(tokens.ids());     // equals the normalized text
    Tokens withReserved = tokenizer.encode(text, Trust.TRUSTED);  // only for text you wrote yourself

    // A batch job loads the same file and proves it has the same vocabulary.
    Tokenizer loaded = Tokenizers.load(modelFile);
    boolean same = loaded.fingerprint().equals(tokenizer.fingerprint());
    // @end region="readme"

    assertEquals(text, back);
    assertTrue(same);
    assertFalse(tokens.isReserved(tokens.size() - 1));
    assertTrue(withReserved.isReserved(withReserved.size() - 1));
    assertEquals(0, withReserved.id(withReserved.size() - 1));

    String source = Files.readString(Paths.get("src/test/java/dev/morsel/tokenize/cli/ReadmeExampleTest.java"));
    String region = source.substring(source.indexOf("// @start region=\"readme\"\n") + 26, source.indexOf("    // @end region"));
    String readme = Files.readString(Paths.get("../README.md"));
    for (String line : region.split("\n")) {
      assertTrue(readme.contains(line.strip()), "README.md lacks the example line: " + line.strip());
    }
  }
}
