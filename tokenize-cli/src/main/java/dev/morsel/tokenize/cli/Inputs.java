package dev.morsel.tokenize.cli;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.FileSystems;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.PathMatcher;
import java.nio.file.Paths;
import java.util.ArrayList;
import java.util.List;
import java.util.TreeSet;
import java.util.stream.Stream;

/** Expands corpus arguments: files, folders (every regular file below, sorted), globs, {@code -} for standard input. */
final class Inputs {
  private Inputs() {}

  /** Whether the arguments name standard input. */
  static boolean isStdin(List<String> args) {
    return args.isEmpty() || (args.size() == 1 && args.get(0).equals("-"));
  }

  /** The files the arguments name, in a stable order; a name that matches nothing is an error. */
  static List<Path> expand(List<String> args) {
    List<Path> out = new ArrayList<>();
    for (String a : args) {
      if (a.equals("-")) {
        throw new Morsel.UsageException("'-' (standard input) cannot be mixed with files");
      }
      if (a.contains("*") || a.contains("?") || a.contains("[")) {
        out.addAll(glob(a));
        continue;
      }
      Path p = Paths.get(a);
      if (Files.isDirectory(p)) {
        try (Stream<Path> s = Files.walk(p)) {
          s.filter(Files::isRegularFile).sorted().forEach(out::add);
        } catch (IOException e) {
          throw new UncheckedIOException("cannot list folder " + p + ": " + e.getMessage(), e);
        }
      } else if (Files.isRegularFile(p)) {
        out.add(p);
      } else {
        throw new IllegalArgumentException("corpus file " + p + ": " + (Files.exists(p) ? "not a regular file" : "no such file"));
      }
    }
    if (out.isEmpty()) {
      throw new IllegalArgumentException("the corpus arguments " + args + " name no file");
    }
    return out;
  }

  private static List<Path> glob(String pattern) {
    // the folder part before the first wildcard is walked; the whole pattern is matched against paths
    int wild = pattern.length();
    for (char c : new char[] {'*', '?', '['}) {
      int i = pattern.indexOf(c);
      if (i >= 0) {
        wild = Math.min(wild, i);
      }
    }
    int slash = pattern.lastIndexOf('/', wild);
    Path base = slash < 0 ? Paths.get(".") : Paths.get(pattern.substring(0, slash + 1));
    PathMatcher m = FileSystems.getDefault().getPathMatcher("glob:" + pattern);
    TreeSet<Path> found = new TreeSet<>();
    try (Stream<Path> s = Files.walk(base)) {
      s.filter(Files::isRegularFile).forEach(p -> {
        Path rel = slash < 0 ? base.relativize(p) : p;
        if (m.matches(rel) || m.matches(p.normalize())) {
          found.add(p);
        }
      });
    } catch (IOException e) {
      throw new UncheckedIOException("cannot expand " + pattern + ": " + e.getMessage(), e);
    }
    if (found.isEmpty()) {
      throw new IllegalArgumentException("the pattern " + pattern + " matches no file");
    }
    return new ArrayList<>(found);
  }
}
