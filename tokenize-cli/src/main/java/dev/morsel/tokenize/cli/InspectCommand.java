package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import dev.morsel.tokenize.Tokens;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code morsel inspect}: what a model holds, and why a text segments the way it does. */
@Command(name = "inspect", mixinStandardHelpOptions = true, separator = " ",
    description = "Summarize a model (scheme, vocabulary, fingerprint, normalization, splitting, reserved tokens),"
        + " list its most frequent and longest tokens, and explain how a text is segmented.",
    footer = {"", "Examples:", "  morsel inspect --model ferry.morsel",
        "  morsel inspect --model ferry.morsel --sample messages.txt --top 30",
        "  morsel inspect --model ferry.morsel --explain 'Harrowmere ferry'"})
final class InspectCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Option(names = {"-m", "--model"}, required = true, paramLabel = "FILE", description = "The model file.")
  Path model;

  @Option(names = "--top", paramLabel = "N", defaultValue = "15", description = "How many tokens each list shows (default: ${DEFAULT-VALUE}).")
  int top;

  @Option(names = "--sample", paramLabel = "FILE", description = "Count token frequencies on this text file (one text a line) for the most-frequent list.")
  Path sample;

  @Option(names = "--explain", paramLabel = "TEXT", description = "Explain the segmentation of this text.")
  String explain;

  @picocli.CommandLine.Mixin
  Corpus.BadUtf8 badUtf8;

  @Override
  public Integer call() throws Exception {
    if (top < 0) {
      throw new Morsel.UsageException("--top must not be negative, got " + top);
    }
    Tokenizer t = Tokenizers.load(model);
    PrintWriter o = spec.commandLine().getOut();
    o.printf(Locale.ROOT, "scheme           %s%n", t.scheme());
    o.printf(Locale.ROOT, "vocabulary       %,d ids%n", t.vocabularySize());
    o.printf(Locale.ROOT, "fingerprint      %s%n", t.fingerprint());
    o.printf(Locale.ROOT, "normalization    %s%n", t.pipeline().normalization().spec());
    o.printf(Locale.ROOT, "splitting        %s%n", t.pipeline().splitting().spec());
    o.printf(Locale.ROOT, "reserved tokens  %s%n", t.reservedTokens().isEmpty() ? "none" : describeReserved(t));
    o.printf(Locale.ROOT, "unknown token    %s%n", t.unknownId() < 0 ? "none (every input is representable)"
        : t.unknownId() + " " + quote(t.token(t.unknownId())));
    t.lineage().ifPresent(l -> o.printf(Locale.ROOT, "extends          %s (ids 0..%,d kept from its %,d)%n",
        l.baseFingerprint(), l.baseVocabularySize() - 1, l.baseVocabularySize()));
    dev.morsel.tokenize.format.AlphabetRecord alphabet =
        dev.morsel.tokenize.format.AlphabetRecord.read(dev.morsel.tokenize.format.ModelFile.read(model));
    o.printf(Locale.ROOT, "alphabet         %s%n", alphabet == null ? "not recorded" : alphabet.summary());
    o.printf(Locale.ROOT, "file size        %,d bytes%n", Files.size(model));
    if (top > 0) {
      o.println();
      if (sample != null) {
        long[] freq = new long[t.vocabularySize()];
        long total = 0;
        dev.morsel.tokenize.train.Utf8Lines.Malformed policy = badUtf8.policy();
        try (dev.morsel.tokenize.train.Utf8Lines r = Corpus.open(List.of(sample), policy)) {
          while (r.hasNext()) {
            Tokens x = t.encode(r.next());
            for (int i = 0; i < x.size(); i++) {
              freq[x.id(i)]++;
            }
            total += x.size();
          }
          Corpus.summary(spec.commandLine().getErr(), "inspect", r.malformedLines(), policy);
        }
        o.printf(Locale.ROOT, "most frequent tokens on %s (%,d tokens):%n", sample, total);
        List<Integer> ids = ids(t.vocabularySize());
        ids.sort(Comparator.<Integer>comparingLong(i -> -freq[i]).thenComparingInt(i -> i));
        for (int k = 0; k < Math.min(top, ids.size()) && freq[ids.get(k)] > 0; k++) {
          int id = ids.get(k);
          o.printf(Locale.ROOT, "  %8d  %6.2f%%  %s%n", id, 100.0 * freq[id] / Math.max(1, total), quote(t.token(id)));
        }
      } else {
        o.println("earliest learned multi-character tokens (a proxy for frequency; use --sample FILE to count):");
        int shown = 0;
        for (int id = 0; id < t.vocabularySize() && shown < top; id++) {
          if (t.reservedTokens().isReserved(id) || id == t.unknownId()) {
            continue;
          }
          String s = new String(t.tokenBytes(id), java.nio.charset.StandardCharsets.UTF_8);
          if (s.codePointCount(0, s.length()) > 1) {
            o.printf(Locale.ROOT, "  %8d  %s%n", id, quote(t.token(id)));
            shown++;
          }
        }
      }
      o.println();
      o.println("longest tokens (UTF-8 bytes):");
      List<Integer> ids = ids(t.vocabularySize());
      int[] len = new int[t.vocabularySize()];
      for (int id = 0; id < len.length; id++) {
        len[id] = t.reservedTokens().isReserved(id) ? -1 : t.tokenBytes(id).length;
      }
      ids.sort(Comparator.<Integer>comparingInt(i -> -len[i]).thenComparingInt(i -> i));
      for (int k = 0; k < Math.min(top, ids.size()); k++) {
        int id = ids.get(k);
        o.printf(Locale.ROOT, "  %8d  %3d  %s%n", id, len[id], quote(t.token(id)));
      }
    }
    if (explain != null) {
      o.println();
      o.println("explain " + quote(explain) + ":");
      for (String line : t.explain(explain)) {
        o.println("  " + line);
      }
      Tokens x = t.encode(explain);
      o.println("  result:");
      for (int i = 0; i < x.size(); i++) {
        o.printf(Locale.ROOT, "    %8d  %-20s [%d, %d) %s%n", x.id(i), quote(t.token(x.id(i))), x.start(i), x.end(i),
            quote(explain.substring(x.start(i), x.end(i))));
      }
    }
    o.flush();
    return 0;
  }

  private static List<Integer> ids(int n) {
    List<Integer> ids = new ArrayList<>(n);
    for (int i = 0; i < n; i++) {
      ids.add(i);
    }
    return ids;
  }

  private static String describeReserved(Tokenizer t) {
    StringBuilder sb = new StringBuilder();
    for (String s : t.reservedTokens().spellings()) {
      if (sb.length() > 0) {
        sb.append(", ");
      }
      sb.append(t.reservedTokens().id(s)).append('=').append(quote(s));
    }
    return sb.toString();
  }

  /** Quotes a token for display, making spaces and line breaks visible. */
  static String quote(String s) {
    StringBuilder sb = new StringBuilder("\"");
    for (int i = 0; i < s.length(); i++) {
      char c = s.charAt(i);
      switch (c) {
        case '\n': sb.append("\\n"); break;
        case '\r': sb.append("\\r"); break;
        case '\t': sb.append("\\t"); break;
        case '"': sb.append("\\\""); break;
        default: sb.append(c);
      }
    }
    return sb.append('"').toString();
  }
}
