package dev.morsel.tokenize.hardening.kit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import java.util.List;

/**
 * {@link Tokenizer#count} and {@link Tokenizer#cutToFit} checked against {@link Tokenizer#encode},
 * the oracle, on each text: the count equals the size of the encoding; for budgets of one content
 * token, half the content tokens and all but one, the cut is a token boundary of the whole encoding,
 * the prefix encodes within the budget, and the next token boundary of the whole encoding within the
 * budget's tokens would not fit (the cut is the longest one).
 */
public final class TokenBudgets {
  private TokenBudgets() {}

  /** Checks every text; returns the number of cuts checked. */
  public static int check(Tokenizer tk, List<String> texts, String what) {
    int markers = tk.template().begin().size() + tk.template().end().size();
    int cuts = 0;
    for (int i = 0; i < texts.size(); i++) {
      String text = texts.get(i);
      String where = what + " text " + i;
      Tokens full = tk.encode(text);
      int count = tk.count(text);
      if (count != full.size()) {
        assertEquals(full.size(), count, where + ": count");
      }
      int n = full.size() - markers; // content tokens
      if (n < 2) {
        continue;
      }
      for (int keep : new int[] {1, n / 2, n - 1}) {
        int budget = markers + keep;
        int cut = tk.cutToFit(text, budget);
        if (cut < 0 || cut > text.length()
            || (cut > 0 && cut < text.length() && Character.isHighSurrogate(text.charAt(cut - 1))
                && Character.isLowSurrogate(text.charAt(cut)))) {
          fail(where + ": cut " + cut + " for budget " + budget + " is outside the text or inside a surrogate pair");
        }
        Tokens prefix = tk.encode(text.substring(0, cut));
        if (prefix.size() > budget) {
          fail(where + ": prefix [0, " + cut + ") encodes to " + prefix.size() + " tokens, budget " + budget);
        }
        // the cut is a token boundary of the whole encoding: the start of a content token that shares
        // no source span with the token before it, or the end of the text
        int b = tk.template().begin().size();
        int kept = -1;
        for (int j = 0; j < n && kept < 0; j++) {
          if (full.start(b + j) == cut && (j == 0 || full.end(b + j - 1) <= cut)) {
            kept = j;
          }
        }
        if (kept < 0 && cut != 0) {
          fail(where + ": cut " + cut + " for budget " + budget + " is not a token boundary of the whole encoding");
        }
        kept = Math.max(kept, 0);
        // the next boundary of the whole encoding (where no two tokens share a source span) that keeps
        // at most `keep` of its tokens must not fit
        int j = kept + 1;
        while (j < n && full.start(b + j) < full.end(b + j - 1)) {
          j++;
        }
        if (j > keep) {
          cuts++;
          continue;
        }
        int next = full.start(b + j);
        assertTrue(next > cut, where + ": next boundary " + next + " after the cut " + cut);
        int nextSize = tk.encode(text.substring(0, next)).size();
        if (nextSize <= budget) {
          fail(where + ": the longer prefix [0, " + next + ") also fits budget " + budget + " (" + nextSize
              + " tokens, count " + tk.count(text.substring(0, next)) + "), but the cut was " + cut + "; whole: "
              + full.size() + " tokens; token " + (b + kept) + " [" + full.start(b + kept) + ", " + full.end(b + kept) + ") next ["
              + full.start(b + kept + 1) + ", " + full.end(b + kept + 1) + "); near: \"" + text.substring(Math.max(0, cut - 30), cut)
              + "|" + text.substring(cut, Math.min(text.length(), cut + 10)) + "\"");
        }
        cuts++;
      }
    }
    return cuts;
  }
}
