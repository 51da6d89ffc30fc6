package dev.morsel.tokenize.cli;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.zip.GZIPInputStream;

/** Strict UTF-8 line readers for files ({@code .gz} by name) and standard input. */
final class Lines {
  private Lines() {}

  static BufferedReader stdin() {
    return reader(System.in);
  }

  static BufferedReader reader(InputStream in) {
    return new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8.newDecoder()
        .onMalformedInput(CodingErrorAction.REPORT).onUnmappableCharacter(CodingErrorAction.REPORT)), 1 << 16);
  }

  static BufferedReader open(Path p) {
    try {
      InputStream in = Files.newInputStream(p);
      if (p.getFileName().toString().endsWith(".gz")) {
        in = new GZIPInputStream(in, 1 << 16);
      }
      return reader(in);
    } catch (IOException e) {
      throw new UncheckedIOException("cannot read " + p + ": " + e.getMessage(), e);
    }
  }
}
