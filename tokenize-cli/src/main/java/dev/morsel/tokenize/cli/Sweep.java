package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Pipeline;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.train.PieceCounter;
import dev.morsel.tokenize.train.PieceCounts;
import dev.morsel.tokenize.train.TrainingListener;
import com.ibm.icu.lang.UScript;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;

/**
 * The vocabulary-size sweep: for each scheme and size, train on the training lines and measure the
 * held-out lines, per group (input file) and overall. The split is deterministic: within each group,
 * line {@code i} (0-based) is held out when {@code i % every == every - 1}. A cell that cannot be
 * trained (a size below what the scheme needs on this corpus) is recorded as not feasible with its
 * reason, and the sweep goes on.
 */
final class Sweep {
  /**
   * One measurement row; {@code note} is empty for a feasible cell, else the reason it is not. Speed
   * and training time are measured on all held-out text of the cell and are NaN on per-group rows.
   */
  record Row(String scheme, int requestedSize, int vocabularySize, String group, long texts, long words, long chars,
      long bytes, long tokens, long unknown, int distinctIds, double trainSeconds, double mbPerSecond, String warmup,
      String note) {
    boolean feasible() {
      return note.isEmpty();
    }

    double tokensPerWord() {
      return words == 0 ? 0 : (double) tokens / words;
    }

    double tokensPer1000Chars() {
      return chars == 0 ? 0 : 1000.0 * tokens / chars;
    }

    double bytesPerToken() {
      return tokens == 0 ? 0 : (double) bytes / tokens;
    }

    /** Unknown tokens per 1,000 characters of held-out text: unlike a share of tokens, it does not rise as tokens get longer. */
    double unknownPer1000Chars() {
      return chars == 0 ? 0 : 1000.0 * unknown / chars;
    }

    double vocabularyUsed() {
      return vocabularySize == 0 ? 0 : (double) distinctIds / vocabularySize;
    }

    static Row infeasible(String scheme, int size, String group, String reason) {
      return new Row(scheme, size, 0, group, 0, 0, 0, 0, 0, 0, 0, Double.NaN, Double.NaN, "", reason);
    }
  }

  /**
   * One scheme, size and Unicode script (ICU {@code UScript}, from the character property) of the
   * held-out text: characters of the script, tokens (each counted for the script of its first
   * character that is not Common or Inherited, or Common if it has none), characters that became the
   * unknown token, and characters spelled with byte tokens (a token whose bytes are not a whole
   * UTF-8 character).
   */
  record ScriptRow(String scheme, int requestedSize, int vocabularySize, String script, long chars, long tokens,
      long unknownChars, long byteChars) {
    double tokensPerChar() {
      return chars == 0 ? 0 : (double) tokens / chars;
    }

    /** Share of the script's characters that are unknown or spelled with byte tokens. */
    double unknownOrByteRate() {
      return chars == 0 ? 0 : (double) (unknownChars + byteChars) / chars;
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

  /**
   * Runs the sweep; {@code listener} hears one "sweep" step per cell, {@code notes} one line per
   * cell that is not feasible; the per-script figures of every feasible cell go to {@code scripts}.
   *
   * @param options {@code [SCHEME:]NAME=VALUE} scheme options (see {@link Schemes#plan})
   */
  static List<Row> run(Map<String, List<String>> groups, int every, Pipeline pipeline, List<String> schemes, List<Integer> sizes,
      List<String> options, int threads, TrainingListener listener, java.io.PrintWriter notes, long maxWarmupNanos,
      List<ScriptRow> scripts) {
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
        step++;
        long t0 = System.nanoTime();
        Tokenizer t;
        try {
          t = Schemes.plan(scheme, size, List.of(), options, threads).train(counts, TrainingListener.NONE);
        } catch (IllegalArgumentException | Morsel.UsageException e) {
          String reason = e.getMessage();
          notes.printf("morsel sweep: %s at %d is not feasible: %s%n", scheme, size, reason);
          notes.flush();
          for (String g : held.keySet()) {
            rows.add(Row.infeasible(scheme, size, g, reason));
          }
          rows.add(Row.infeasible(scheme, size, ALL, reason));
          continue;
        }
        double trainSeconds = (System.nanoTime() - t0) / 1e9;
        rows.addAll(measureAll(t, scheme, size, held, allHeld, trainSeconds, maxWarmupNanos));
        scripts.addAll(byScript(t, scheme, size, allHeld));
      }
    }
    listener.progress("sweep", steps, steps, "done");
    return rows;
  }

  /**
   * Measures {@code t} on each group of held-out texts and on all of them: one row per group, then
   * the {@link #ALL} row with the summed counts, the ids used anywhere, {@code trainSeconds} and the
   * encode speed on {@code allHeld}.
   */
  static List<Row> measureAll(Tokenizer t, String scheme, int size, Map<String, List<String>> held, List<String> allHeld,
      double trainSeconds, long maxWarmupNanos) {
    List<Row> rows = new ArrayList<>();
    double[] speed = new double[1];
    Steady.Warmup w = throughput(t, allHeld, speed, maxWarmupNanos);
    boolean[] usedAll = new boolean[t.vocabularySize()];
    long[] sums = new long[6];
    for (Map.Entry<String, List<String>> e : held.entrySet()) {
      boolean[] used = new boolean[t.vocabularySize()];
      Row r = measure(t, scheme, size, e.getKey(), e.getValue(), used);
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
        trainSeconds, speed[0], w.brief(), ""));
    return rows;
  }

  private static Row measure(Tokenizer t, String scheme, int size, String group, List<String> texts, boolean[] used) {
    long words = 0;
    long chars = 0;
    long bytes = 0;
    long tokens = 0;
    long unknown = 0;
    int unk = t.unknownId();
    for (String s : texts) {
      words += words(s);
      chars += s.codePointCount(0, s.length());
      bytes += s.getBytes(StandardCharsets.UTF_8).length;
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
        Double.NaN, Double.NaN, "", "");
  }

  /** The per-script figures of one tokenizer on {@code texts}, scripts in name order. */
  static List<ScriptRow> byScript(Tokenizer t, String scheme, int size, List<String> texts) {
    boolean[] partial = partialTokens(t);
    int unk = t.unknownId();
    Map<String, long[]> by = new TreeMap<>(); // chars, tokens, unknown chars, byte-spelled chars
    for (String s : texts) {
      for (int i = 0; i < s.length(); ) {
        int cp = s.codePointAt(i);
        by.computeIfAbsent(scriptName(cp), k -> new long[4])[0]++;
        i += Character.charCount(cp);
      }
      Tokens x = t.encode(s);
      int lastByteStart = -1;
      for (int i = 0; i < x.size(); i++) {
        int start = x.start(i);
        int end = x.end(i);
        by.computeIfAbsent(tokenScript(s, start, end), k -> new long[4])[1]++;
        int id = x.id(i);
        boolean unknown = id == unk;
        boolean bytes = !unknown && partial[id] && start != lastByteStart;
        if (bytes) {
          lastByteStart = start;
        }
        if (unknown || bytes) {
          for (int k = start; k < end; ) {
            int cp = s.codePointAt(k);
            by.computeIfAbsent(scriptName(cp), n -> new long[4])[unknown ? 2 : 3]++;
            k += Character.charCount(cp);
          }
        }
      }
    }
    List<ScriptRow> out = new ArrayList<>();
    for (Map.Entry<String, long[]> e : by.entrySet()) {
      long[] v = e.getValue();
      out.add(new ScriptRow(scheme, size, t.vocabularySize(), e.getKey(), v[0], v[1], v[2], v[3]));
    }
    return out;
  }

  private static String scriptName(int cp) {
    return UScript.getName(UScript.getScript(cp));
  }

  /** The script of the first character of text[start, end) that is not Common or Inherited, else Common. */
  private static String tokenScript(String text, int start, int end) {
    for (int k = start; k < end; ) {
      int cp = text.codePointAt(k);
      int sc = UScript.getScript(cp);
      if (sc != UScript.COMMON && sc != UScript.INHERITED) {
        return UScript.getName(sc);
      }
      k += Character.charCount(cp);
    }
    return UScript.getName(UScript.COMMON);
  }

  /** Which ids hold bytes that are not well-formed UTF-8 on their own: part of a character, a byte token. */
  static boolean[] partialTokens(Tokenizer t) {
    boolean[] partial = new boolean[t.vocabularySize()];
    for (int id = 0; id < partial.length; id++) {
      try {
        StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
            .onUnmappableCharacter(CodingErrorAction.REPORT).decode(ByteBuffer.wrap(t.tokenBytes(id)));
      } catch (CharacterCodingException e) {
        partial[id] = true;
      }
    }
    return partial;
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

  /** Least warm-up per cell: 0.5 s (the most is a setting, {@code --max-warmup}). */
  static final long MIN_WARMUP_NANOS = 500_000_000L;
  /** A round repeats passes over the held-out text for at least 50 ms, so a pause of the machine is a small part of it. */
  static final long ROUND_NANOS = 50_000_000L;
  /** Timed rounds after the warm-up; the median is reported. */
  static final int TIMED_ROUNDS = 5;

  /**
   * Encode throughput on one thread in MB/s of UTF-8 into {@code mbps[0]}: warm up until three
   * consecutive rounds agree within 5 % ({@link Steady}), then the median of five timed rounds.
   */
  static Steady.Warmup throughput(Tokenizer t, List<String> texts, double[] mbps, long maxWarmupNanos) {
    long bytes = 0;
    for (String s : texts) {
      bytes += s.getBytes(StandardCharsets.UTF_8).length;
    }
    long b = bytes;
    Steady.Warmup w = Steady.warmUp(() -> round(t, texts, b), Steady.DEFAULT_TOLERANCE,
        Math.min(MIN_WARMUP_NANOS, maxWarmupNanos), maxWarmupNanos);
    double[] timed = new double[TIMED_ROUNDS];
    for (int i = 0; i < timed.length; i++) {
      timed[i] = round(t, texts, b);
    }
    java.util.Arrays.sort(timed);
    mbps[0] = timed[timed.length / 2];
    return w;
  }

  /** MB/s of one round: whole passes over the texts until {@link #ROUND_NANOS} have passed. */
  private static double round(Tokenizer t, List<String> texts, long bytes) {
    long t0 = System.nanoTime();
    long passes = 0;
    long dt;
    do {
      pass(t, texts);
      passes++;
      dt = System.nanoTime() - t0;
    } while (dt < ROUND_NANOS);
    return bytes * passes / 1e6 / (dt / 1e9);
  }

  private static long sink;

  private static void pass(Tokenizer t, List<String> texts) {
    long s = 0;
    for (String x : texts) {
      s += t.encode(x).size();
    }
    sink += s;
  }
}
