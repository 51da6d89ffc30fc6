package dev.morsel.tokenize;

import java.util.Arrays;

/**
 * UTF-8 decoding for {@link Tokenizer#decode} and {@link StreamDecoder}: one U+FFFD per maximal
 * ill-formed subpart (Unicode Standard, section 3.9), or, in strict mode, an exception naming the
 * token where the bad sequence starts.
 */
final class Utf8Decoding {
  private Utf8Decoding() {}

  /** Growable byte buffer that also remembers at which byte each token started. */
  static final class ByteRun implements dev.morsel.tokenize.spi.ByteSink {
    byte[] bytes = new byte[64];
    int size;

    @Override
    public void write(byte[] b, int off, int len) {
      if (size + len > bytes.length) {
        bytes = Arrays.copyOf(bytes, Math.max(bytes.length * 2, size + len));
      }
      System.arraycopy(b, off, bytes, size, len);
      size += len;
    }
  }

  /**
   * Decodes {@code bytes[0, size)}. Replacement substitutes one U+FFFD for each maximal subpart of an
   * ill-formed sequence (Unicode Standard, section 3.9, "U+FFFD Substitution of Maximal Subparts",
   * Table 3-7 for the well-formed byte ranges), a rule that depends only on the bytes up to the
   * subpart's end, so streaming and batch decoding agree for every cut. In strict mode an ill-formed
   * sequence throws, naming the token whose bytes hold its first byte ({@code tokenStarts[i]} = first
   * byte of token {@code i}).
   */
  static String decode(byte[] bytes, int size, Decoding decoding, int[] tokenStarts, int tokenCount, int tokenBase) {
    char[] out = new char[size]; // every code point takes at least as many bytes as UTF-16 units
    int o = 0;
    int i = 0;
    while (i < size) {
      int b0 = bytes[i] & 0xFF;
      if (b0 < 0x80) {
        out[o++] = (char) b0;
        i++;
        continue;
      }
      long seq = Utf8Input.sequence(bytes, i, size);
      int cp = (int) seq;
      int j = (int) (seq >>> 32);
      if (cp < 0) {
        if (decoding == Decoding.STRICT) {
          throwIllFormed(i, tokenStarts, tokenCount, tokenBase);
        }
        out[o++] = '\ufffd';
        i += j; // the maximal subpart: the lead byte and the continuation bytes that were still valid
        continue;
      }
      if (cp >= 0x10000) {
        out[o++] = Character.highSurrogate(cp);
        out[o++] = Character.lowSurrogate(cp);
      } else {
        out[o++] = (char) cp;
      }
      i += j;
    }
    return new String(out, 0, o);
  }

  private static void throwIllFormed(int at, int[] tokenStarts, int tokenCount, int tokenBase) {
    int token = tokenAt(tokenStarts, tokenCount, at);
    throw new IllegalArgumentException("ill-formed UTF-8 at byte " + at + " of the decoded text, in the token at position "
        + (token + tokenBase) + " (strict decoding; use Decoding.REPLACE to substitute U+FFFD)");
  }

  private static int tokenAt(int[] starts, int count, int byteOffset) {
    int lo = 0;
    int hi = count - 1;
    int ans = 0;
    while (lo <= hi) {
      int mid = (lo + hi) >>> 1;
      if (starts[mid] <= byteOffset) {
        ans = mid;
        lo = mid + 1;
      } else {
        hi = mid - 1;
      }
    }
    return ans;
  }

  /**
   * Length of the tail of {@code b[0, n)} that is a proper prefix of a well-formed UTF-8 sequence
   * (and so may still be completed by later bytes); 0 if none.
   */
  static int incompleteTail(byte[] b, int n) {
    for (int back = 1; back <= 3 && back <= n; back++) {
      int p = n - back;
      int lead = b[p] & 0xFF;
      int need = lead >= 0xC2 && lead <= 0xDF ? 2 : lead >= 0xE0 && lead <= 0xEF ? 3 : lead >= 0xF0 && lead <= 0xF4 ? 4 : 0;
      if (need == 0) {
        if ((lead & 0xC0) == 0x80) {
          continue; // continuation byte: look further back for the lead
        }
        return 0;
      }
      if (back >= need) {
        return 0; // the sequence at p is complete (or ill-formed), nothing to hold
      }
      for (int k = 1; k < back; k++) {
        int c = b[p + k] & 0xFF;
        int lo = 0x80;
        int hi = 0xBF;
        if (k == 1) {
          if (lead == 0xE0) {
            lo = 0xA0;
          } else if (lead == 0xED) {
            hi = 0x9F;
          } else if (lead == 0xF0) {
            lo = 0x90;
          } else if (lead == 0xF4) {
            hi = 0x8F;
          }
        }
        if (c < lo || c > hi) {
          return 0;
        }
      }
      return back;
    }
    return 0;
  }

  /** The streaming decoder: holds an incomplete tail, emits everything before it. */
  static final class Stream implements StreamDecoder {
    private final PipelineTokenizer tokenizer;
    private final boolean dropReserved;
    private final Decoding decoding;
    private final ByteRun run = new ByteRun();
    private final int[] starts = new int[5];
    private int held; // tokens whose bytes are still held (at most 4 bytes, so at most 4 tokens + the new one)
    private long position;

    Stream(PipelineTokenizer tokenizer, boolean dropReserved, Decoding decoding) {
      this.tokenizer = tokenizer;
      this.dropReserved = dropReserved;
      this.decoding = decoding;
    }

    @Override
    public String accept(int id) {
      int before = run.size;
      if (!tokenizer.appendToken(id, dropReserved, run, position)) {
        position++;
        return "";
      }
      if (held == starts.length) {
        compactStarts();
      }
      starts[held++] = before;
      position++;
      int tail = incompleteTail(run.bytes, run.size);
      int emit = run.size - tail;
      if (emit == 0) {
        return "";
      }
      String s = decode(run.bytes, emit, decoding, starts, held, (int) (position - held));
      System.arraycopy(run.bytes, emit, run.bytes, 0, tail);
      run.size = tail;
      if (tail == 0) {
        held = 0;
      } else {
        // the held tail started in the newest token whose start <= emit
        int keep = 0;
        for (int i = held - 1; i >= 0; i--) {
          if (starts[i] <= emit) {
            keep = i;
            break;
          }
        }
        int shift = held - keep;
        for (int i = 0; i < shift; i++) {
          starts[i] = Math.max(0, starts[keep + i] - emit);
        }
        held = shift;
      }
      return s;
    }

    private void compactStarts() {
      // cannot happen with at most 3 held bytes, kept for safety
      System.arraycopy(starts, 1, starts, 0, starts.length - 1);
      held--;
    }

    @Override
    public String flush() {
      if (run.size == 0) {
        return "";
      }
      String s = decode(run.bytes, run.size, decoding, starts, held, (int) (position - held));
      run.size = 0;
      held = 0;
      return s;
    }
  }
}
