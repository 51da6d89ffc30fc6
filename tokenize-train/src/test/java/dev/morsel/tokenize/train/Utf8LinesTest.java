package dev.morsel.tokenize.train;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.zip.GZIPOutputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Line reading for {@link PieceCounter#countFiles}: strict UTF-8, CRLF, gzip, exact error offsets. */
class Utf8LinesTest {
  @TempDir Path dir;

  static byte[] utf8(String s) {
    return s.getBytes(StandardCharsets.UTF_8);
  }

  static byte[] concat(byte[]... parts) {
    ByteArrayOutputStream b = new ByteArrayOutputStream();
    for (byte[] p : parts) {
      b.writeBytes(p);
    }
    return b.toByteArray();
  }

  Path write(String name, byte[] content) throws IOException {
    Path p = dir.resolve(name);
    if (name.endsWith(".gz")) {
      try (OutputStream out = new GZIPOutputStream(Files.newOutputStream(p))) {
        out.write(content);
      }
    } else {
      Files.write(p, content);
    }
    return p;
  }

  static List<String> read(Path... files) {
    List<String> out = new ArrayList<>();
    try (Utf8Lines lines = new Utf8Lines(List.of(files))) {
      lines.forEachRemaining(l -> out.add(l.toString()));
    }
    return out;
  }

  @Test
  void linesEndWithLfOrCrlfAndLastLineNeedsNoLf() throws IOException {
    Path a = write("a.txt", utf8("Pier 4 closed\r\nFerry to Skarv\u00F8y \uD83D\uDEA2\n\nlast"));
    assertEquals(List.of("Pier 4 closed", "Ferry to Skarv\u00F8y \uD83D\uDEA2", "", "last"), read(a));
    Path b = write("b.txt", utf8("one\n"));
    assertEquals(List.of("one"), read(b));
    Path empty = write("empty.txt", new byte[0]);
    assertEquals(List.of(), read(empty));
    assertEquals(List.of("Pier 4 closed", "Ferry to Skarv\u00F8y \uD83D\uDEA2", "", "last", "one"), read(a, empty, b));
  }

  @Test
  void gzByNameAndOnlyByName() throws IOException {
    byte[] text = utf8("Boarding at gate B\nDelayed 20 min\n");
    assertEquals(List.of("Boarding at gate B", "Delayed 20 min"), read(write("m.txt.gz", text)));
    // a plain file named without .gz is not sniffed; a gz file under another name is read raw and fails UTF-8
    Path disguised = dir.resolve("m.txt");
    Files.copy(dir.resolve("m.txt.gz"), disguised);
    assertThrows(CorpusException.class, () -> read(disguised));
  }

  @Test
  void longContentCrossesBuffersIntact() throws IOException {
    StringBuilder b = new StringBuilder();
    List<String> want = new ArrayList<>();
    for (int i = 0; i < 20_000; i++) {
      String line = "Sailing " + i + " \u00E6\u00F8\u00E5 \u6E2F \uD83D\uDEA2";
      want.add(line);
      b.append(line).append(i % 3 == 0 ? "\r\n" : "\n");
    }
    assertEquals(want, read(write("long.txt", utf8(b.toString()))));
    assertEquals(want, read(write("long.txt.gz", utf8(b.toString()))));
  }

  @Test
  void malformedByteGivesFileOffsetAndLine() throws IOException {
    // 0xC3 0x28: a lead byte followed by a non-continuation byte (RFC 3629, section 3)
    byte[] content = concat(utf8("ferry one\nsecond \u00F8 "), new byte[] {(byte) 0xC3, 0x28}, utf8(" rest\n"));
    int offset = utf8("ferry one\nsecond \u00F8 ").length;
    Path p = write("bad.txt", content);
    CorpusException e = assertThrows(CorpusException.class, () -> read(p));
    assertEquals(offset, e.byteOffset());
    assertEquals(2, e.line());
    assertEquals(p, e.file());
    assertTrue(e.getMessage().contains(p.toString()) && e.getMessage().contains("byte offset " + offset)
        && e.getMessage().contains("line 2"), e.getMessage());
    // the same bytes gzipped: offset counts decompressed bytes
    Path gz = write("bad.txt.gz", content);
    CorpusException g = assertThrows(CorpusException.class, () -> read(gz));
    assertEquals(offset, g.byteOffset());
  }

  @Test
  void badBytesFarIntoTheFileAndAtTheEnd() throws IOException {
    byte[] prefix = utf8("x".repeat(99) + "\n"); // 100 bytes a line
    ByteArrayOutputStream b = new ByteArrayOutputStream();
    for (int i = 0; i < 1_500; i++) {
      b.writeBytes(prefix);
    }
    b.writeBytes(utf8("abc"));
    b.write(0xFF); // never valid in UTF-8 (RFC 3629, section 1)
    Path p = write("far.txt", b.toByteArray());
    CorpusException e = assertThrows(CorpusException.class, () -> read(p));
    assertEquals(150_003, e.byteOffset());
    assertEquals(1_501, e.line());
    // a sequence cut short by the end of the file: E2 82 is the start of a 3-byte sequence
    Path cut = write("cut.txt", concat(utf8("ok\n"), new byte[] {(byte) 0xE2, (byte) 0x82}));
    CorpusException c = assertThrows(CorpusException.class, () -> read(cut));
    assertEquals(3, c.byteOffset());
    assertEquals(2, c.line());
    // an encoded surrogate (ED A0 80 = U+D800) is not valid UTF-8 (RFC 3629, section 3)
    Path sur = write("sur.txt", concat(utf8("a"), new byte[] {(byte) 0xED, (byte) 0xA0, (byte) 0x80}));
    assertEquals(1, assertThrows(CorpusException.class, () -> read(sur)).byteOffset());
  }

  @Test
  void missingFileIsUncheckedIo() {
    Path nowhere = dir.resolve("nowhere.txt");
    UncheckedIOException e = assertThrows(UncheckedIOException.class, () -> read(nowhere));
    assertTrue(e.getMessage().contains("nowhere.txt"), e.getMessage());
  }

  @Test
  void linesBeforeABadByteAreReturnedAndLineNumbersAreExact() throws IOException {
    // 3,000 lines of 40 bytes span several 64 KiB read buffers; the bad byte sits on line 2,501
    ByteArrayOutputStream b = new ByteArrayOutputStream();
    for (int i = 1; i <= 3000; i++) {
      b.writeBytes(utf8(String.format("line %04d of the Harrowmere timetable ..%n", i)));
      if (i == 2500) {
        b.write(0xC3); // a lead byte followed by a newline: malformed
      }
    }
    Path p = write("deep.txt", b.toByteArray());
    List<Long> numbers = new ArrayList<>();
    try (Utf8Lines lines = new Utf8Lines(List.of(p))) {
      CorpusException e = assertThrows(CorpusException.class, () -> {
        while (lines.hasNext()) {
          lines.next();
          numbers.add(lines.line());
        }
      });
      assertEquals(2501, e.line());
      assertEquals(2500L * 41, e.byteOffset());
      assertEquals(p.toString(), e.source());
    }
    assertEquals(2500, numbers.size(), "every line before the bad one is returned");
    assertEquals(2500L, numbers.get(numbers.size() - 1));
  }

  @Test
  void replaceAndSkipPoliciesCountTheLinesTheyTouch() throws IOException {
    byte[] content = concat(utf8("Oskevik\n"), utf8("Brisholm "), new byte[] {(byte) 0xFF, (byte) 0xFE}, utf8(" pier\n"),
        utf8("Tern\n"), new byte[] {(byte) 0x80});
    List<String> replaced = new ArrayList<>();
    List<Long> at = new ArrayList<>();
    try (Utf8Lines l = Utf8Lines.of(new java.io.ByteArrayInputStream(content), "standard input", Utf8Lines.Malformed.REPLACE)) {
      while (l.hasNext()) {
        replaced.add(l.next());
        at.add(l.line());
      }
      assertEquals(2, l.malformedLines());
      assertEquals("standard input", l.source());
      assertEquals(content.length, l.bytesRead());
    }
    assertEquals(List.of("Oskevik", "Brisholm \uFFFD\uFFFD pier", "Tern", "\uFFFD"), replaced);
    assertEquals(List.of(1L, 2L, 3L, 4L), at);
    List<String> kept = new ArrayList<>();
    List<Long> keptAt = new ArrayList<>();
    try (Utf8Lines l = Utf8Lines.open(List.of(write("skip.txt", content)), Utf8Lines.Malformed.SKIP)) {
      while (l.hasNext()) {
        kept.add(l.next());
        keptAt.add(l.line());
      }
      assertEquals(2, l.malformedLines());
    }
    assertEquals(List.of("Oskevik", "Tern"), kept);
    assertEquals(List.of(1L, 3L), keptAt, "line numbers stay those of the file");
  }
}
