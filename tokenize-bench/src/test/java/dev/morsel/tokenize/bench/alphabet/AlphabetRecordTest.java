package dev.morsel.tokenize.bench.alphabet;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.format.AlphabetRecord;
import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelSections;
import dev.morsel.tokenize.train.LearnerSettings;
import dev.morsel.tokenize.train.Learners;
import dev.morsel.tokenize.train.PieceCounts;
import java.io.BufferedReader;
import java.io.StringReader;
import java.nio.ByteBuffer;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The model file records what the alphabet policy did (section ALPH), through save and load and
 * through the review text; the record stays outside the fingerprint, and a file without it (as
 * written before alphabets were recorded) still loads.
 */
class AlphabetRecordTest {
  static final List<String> FERRY = List.of("The 07:40 ferry from Oskevik to Harrowmere is late.",
      "Harrowmere harbour office: the ferry leaves at 08:15.", "渡轮 from Oskevik leaves at 09:00.",
      "Ω is not on the timetable.");

  @ParameterizedTest
  @ValueSource(strings = {"bpe", "wordpiece", "unigram"})
  void theRecordSurvivesSaveLoadAndReviewAndStaysOutOfTheFingerprint(String scheme) {
    PieceCounts counts = Mix.counts(FERRY);
    Tokenizer t = Learners.learner(scheme, LearnerSettings.of(scheme.equals("wordpiece") ? 200 : 400).withThreads(1),
        "alphabet-coverage=0.99").train(counts);
    byte[] file = t.toBytes();
    AlphabetRecord r = AlphabetRecord.read(ModelFile.read(file));
    assertNotNull(r, scheme + " records its alphabet");
    assertEquals(0.99, r.coverage());
    assertTrue(r.coverageReached() >= 0.99 && r.coverageReached() < 1.0, r.summary());
    assertEquals(!scheme.equals("wordpiece"), r.byteSpelling());

    Tokenizer loaded = Tokenizers.load(file);
    assertArrayEquals(file, loaded.toBytes(), "load then save keeps the record");

    StringBuilder review = new StringBuilder();
    loaded.writeReview(review);
    assertTrue(review.toString().contains("§ alphabet\tsetting\tvalue"), review.toString());
    byte[] back = Tokenizers.modelFromReview(new BufferedReader(new StringReader(review.toString())), "review");
    assertArrayEquals(file, back, "the review text carries the record");

    // without the section: loads, encodes alike, same fingerprint
    ModelSections sections = ModelFile.read(file);
    Map<String, byte[]> without = new TreeMap<>();
    for (String tag : sections.tags()) {
      if (!tag.equals(AlphabetRecord.TAG)) {
        ByteBuffer p = sections.payload(tag);
        byte[] b = new byte[p.remaining()];
        p.get(b);
        without.put(tag, b);
      }
    }
    Tokenizer old = Tokenizers.load(ModelFile.write(without));
    assertNull(AlphabetRecord.read(ModelFile.read(old.toBytes())));
    assertEquals(t.fingerprint(), old.fingerprint());
    assertArrayEquals(t.encode(FERRY.get(2)).ids(), old.encode(FERRY.get(2)).ids());
  }
}
