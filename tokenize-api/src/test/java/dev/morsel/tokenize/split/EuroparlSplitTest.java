package dev.morsel.tokenize.split;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.morsel.tokenize.testkit.Europarl;
import java.util.List;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Every mode is lossless on real multilingual text: the 17,597 bodies of the Europarl sample
 * (Koehn 2005, "Europarl: A Parallel Corpus for Statistical Machine Translation"), raw, no
 * normalization.
 */
class EuroparlSplitTest {

  @ParameterizedTest
  @ValueSource(strings = {"runs:space=next,digits=whole", "runs:space=next,digits=3", "runs:space=own,digits=whole", "runs:space=previous,digits=whole", "words", "whitespace", "none"})
  void splitThenJoinGivesBackEveryBody(String spec) {
    Splitting s = Splitting.parse(spec);
    List<String> bodies = Europarl.bodies();
    assertEquals(Europarl.LINES, bodies.size());
    StringBuilder joined = new StringBuilder();
    long pieces = 0;
    for (int i = 0; i < bodies.size(); i++) {
      String body = bodies.get(i);
      joined.setLength(0);
      int[] count = {0};
      s.split(body, 0, body.length(), (a, b) -> {
        joined.append(body, a, b);
        count[0]++;
      });
      if (!joined.toString().equals(body)) {
        assertEquals(body, joined.toString(), spec + ": body " + i + " not rebuilt");
      }
      pieces += count[0];
    }
    System.out.printf("Europarl %s: %d bodies, %d pieces%n", spec, bodies.size(), pieces);
    assertTrue(pieces >= bodies.size() - countEmpty(bodies), spec + ": every non-empty body yields a piece");
  }

  private static long countEmpty(List<String> bodies) {
    return bodies.stream().filter(String::isEmpty).count();
  }
}
