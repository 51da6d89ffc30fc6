package dev.morsel.tokenize.cli;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonToken;
import dev.morsel.tokenize.Decoding;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code morsel decode}: ids back to text. */
@Command(name = "decode", mixinStandardHelpOptions = true,
    description = "Decode ids into text. Each input line is space-separated ids, or a JSON object with an \"ids\" array"
        + " (as 'morsel encode --format json' writes).",
    footer = {"", "Examples:", "  morsel decode --model ferry.morsel 412 88 1093",
        "  morsel encode --model ferry.morsel --format json < in.txt | morsel decode --model ferry.morsel"})
final class DecodeCommand implements Callable<Integer> {
  @Spec
  CommandSpec spec;

  @Option(names = {"-m", "--model"}, required = true, description = "The model file.")
  Path model;

  @Parameters(paramLabel = "ID", description = "Ids to decode as one sequence; without any, lines are read from standard input.")
  List<String> ids = new ArrayList<>();

  @Option(names = "--drop-reserved", description = "Leave out reserved tokens and padding.")
  boolean dropReserved;

  @Option(names = "--strict", description = "Fail on ill-formed UTF-8 instead of writing U+FFFD.")
  boolean strict;

  private static final JsonFactory JSON = new JsonFactory();

  @Override
  public Integer call() throws Exception {
    Tokenizer t = Tokenizers.load(model);
    PrintWriter out = spec.commandLine().getOut();
    Decoding d = strict ? Decoding.STRICT : Decoding.REPLACE;
    if (!ids.isEmpty()) {
      out.println(decode(t, parse(String.join(" ", ids), "arguments"), d));
    } else {
      BufferedReader r = Lines.stdin();
      String line;
      long n = 0;
      while ((line = r.readLine()) != null) {
        n++;
        out.println(decode(t, parse(line, "standard input line " + n), d));
      }
    }
    out.flush();
    return 0;
  }

  private String decode(Tokenizer t, int[] seq, Decoding d) {
    return t.decode(seq, dropReserved, d);
  }

  /** Parses one line of ids; the error names the line and the bad field. */
  static int[] parse(String line, String where) {
    String s = line.strip();
    IntArrayList out = new IntArrayList();
    if (s.startsWith("{")) {
      try (JsonParser p = JSON.createParser(s)) {
        if (p.nextToken() != JsonToken.START_OBJECT) {
          throw new IllegalArgumentException(where + ": expected a JSON object");
        }
        boolean found = false;
        while (p.nextToken() == JsonToken.FIELD_NAME) {
          String name = p.currentName();
          JsonToken v = p.nextToken();
          if (name.equals("ids")) {
            if (v != JsonToken.START_ARRAY) {
              throw new IllegalArgumentException(where + ": \"ids\" is not an array");
            }
            while (p.nextToken() != JsonToken.END_ARRAY) {
              if (p.currentToken() != JsonToken.VALUE_NUMBER_INT) {
                throw new IllegalArgumentException(where + ": \"ids\" holds '" + p.getText() + "', not an integer id");
              }
              out.add(p.getIntValue());
            }
            found = true;
          } else {
            p.skipChildren();
          }
        }
        if (!found) {
          throw new IllegalArgumentException(where + ": the JSON object has no \"ids\" array");
        }
      } catch (IOException e) {
        throw new IllegalArgumentException(where + ": malformed JSON: " + e.getMessage(), e);
      }
      return out.toIntArray();
    }
    if (s.isEmpty()) {
      return new int[0];
    }
    int field = 0;
    for (String f : s.split("[\\s,]+")) {
      field++;
      try {
        out.add(Integer.parseInt(f));
      } catch (NumberFormatException e) {
        throw new IllegalArgumentException(where + ": field " + field + " ('" + f + "') is not an integer id");
      }
    }
    return out.toIntArray();
  }
}
