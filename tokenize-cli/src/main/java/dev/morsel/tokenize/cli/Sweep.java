package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The vocabulary-size sweep: for each scheme and size, train on the training lines and measure the
 * held-out lines, per group (input file) and overall. The split is deterministic: within each group,
 * line {@code i} (0-based) is held out when {@code i % every == every - 1}.
 */
final class Sweep {
  /** One measurement row. */
  record Row(String scheme, int requestedSize, int vocabularySize, String group, long texts, long words, long chars,
      long bytes, long tokens, long unknown, int distinctIds, double trainSeconds, double mbPerSecond) {
    double tokensPerWord() {
      return words == 0 ? 0 : (double) tokens / words;
    }

    double tokensPer1000Chars() {
      return chars == 0 ? 0 : 1000.0 * tokens / chars;
    }

    double bytesPerToken() {
      return tokens == 0 ? 0 : (double) bytes / tokens;
    }

    double unknownRate() {
      return tokens == 0 ? 0 : (double) unknown / tokens;
    }

    double vocabularyUsed() {
      return vocabularySize == 0 ? 0 : (double) distinctIds / vocabularySize;
    }
  }

  /** The overall group's name. */
  static final String ALL = "(all)";

  private Sweep() {}

  /** Splits each group's lines into training and held-out lines. */
  static void split(Map<String, List<String>> groups, int every, List<String> train, Map<String, List<String>> heldOut) {
    for (Map.Entry<String, List<String>> e : groups.entrySet()) {
      List<String> held = new ArrayList<>();
      List<String> lines = e.getValue();
      for (int i = 0; i < lines.size(); i++) {
        if (i % every == every - 1) {
          held.add(lines.get(i));
        } else {
          train.add(lines.get(i));
        }
      }
      heldOut.put(e.getKey(), held);
    }
  }

  /** Runs the sweep; {@code listener} hears one "sweep" step per trained model. */
  static List<Row> run(Map<String, List<String>> groups, int every, Pipeline pipeline, List<String> schemes, List<Integer> sizes,
      int threads, TrainingListener listener) {
    List<String> train = new ArrayList<>();
    Map<String, List<String>> held = new LinkedHashMap<>();
    split(groups, every, train, held);
    if (train.isEmpty()) {
      throw new IllegalArgumentException("no training lines: the corpus has too few lines for a held-out share of 1/" + every);
    }
    PieceCounts counts = PieceCounter.builder().pipeline(pipeline).threads(threads).build().count(train);
    List<String> allHeld = new ArrayList<>();
    held.values().forEach(allHeld::addAll);
    List<Row> rows = new ArrayList<>();
    long step = 0;
    long steps = (long) schemes.size() * sizes.size();
    for (String scheme : schemes) {
      for (int size : sizes) {
        listener.progress("sweep", step, steps, scheme + " " + size);
        long t0 = System.nanoTime();
        Tokenizer t = Schemes.train(scheme, counts, size, List.of(), threads, TrainingListener.NONE);
        double trainSeconds = (System.nanoTime() - t0) / 1e9;
        double mbps = throughput(t, allHeld);
        boolean[] usedAll = new boolean[t.vocabularySize()];
        long[] sums = new long[6];
        for (Map.Entry<String, List<String>> e : held.entrySet()) {
          boolean[] used = new boolean[t.vocabularySize()];
          Row r = measure(t, scheme, size, e.getKey(), e.getValue(), used, trainSeconds, mbps);
          rows.add(r);
          for (int i = 0; i < used.length; i++) {
            usedAll[i] |= used[i];
          }
          sums[0] += r.texts();
          sums[1] += r.words();
          sums[2] += r.chars();
          sums[3] += r.bytes();
          sums[4] += r.tokens();
          sums[5] += r.unknown();
        }
        int distinct = 0;
        for (boolean b : usedAll) {
          distinct += b ? 1 : 0;
        }
        rows.add(new Row(scheme, size, t.vocabularySize(), ALL, sums[0], sums[1], sums[2], sums[3], sums[4], sums[5], distinct,
            trainSeconds, mbps));
        step++;
      }
    }
    listener.progress("sweep", steps, steps, "done");
    return rows;
  }

  private static Row measure(Tokenizer t, String scheme, int size, String group, List<String> texts, boolean[] used,
      double trainSeconds, double mbps) {
    long words = 0;
    long chars = 0;
    long bytes = 0;
    long tokens = 0;
    long unknown = 0;
    int unk = t.unknownId();
    for (String s : texts) {
      words += words(s);
      chars += s.codePointCount(0, s.length());
      bytes += s.getBytes(java.nio.charset.StandardCharsets.UTF_8).length;
      Tokens x = t.encode(s);
      tokens += x.size();
      for (int i = 0; i < x.size(); i++) {
        int id = x.id(i);
        used[id] = true;
        if (id == unk) {
          unknown++;
        }
      }
    }
    int distinct = 0;
    for (boolean b : used) {
      distinct += b ? 1 : 0;
    }
    return new Row(scheme, size, t.vocabularySize(), group, texts.size(), words, chars, bytes, tokens, unknown, distinct,
        trainSeconds, mbps);
  }

  /** Whitespace-separated words. */
  static long words(String s) {
    long n = 0;
    boolean in = false;
    for (int i = 0; i < s.length(); i++) {
      boolean ws = Character.isWhitespace(s.charAt(i));
      if (!ws && !in) {
        n++;
      }
      in = !ws;
    }
    return n;
  }

  /** Encode throughput on one thread in MB/s of UTF-8: one warm-up pass, then the best of three timed passes. */
  private static double throughput(Tokenizer t, List<String> texts) {
    long bytes = 0;
    for (String s : texts) {
      bytes += s.getBytes(java.nio.charset.StandardCharsets.UTF_8).length;
    }
    long best = Long.MAX_VALUE;
    for (int pass = 0; pass < 4; pass++) {
      long t0 = System.nanoTime();
      long sink = 0;
      for (String s : texts) {
        sink += t.encode(s).size();
      }
      long dt = System.nanoTime() - t0;
      if (pass > 0 && sink >= 0) {
        best = Math.min(best, dt);
      }
    }
    return best <= 0 ? 0 : bytes / 1e6 / (best / 1e9);
  }
}
