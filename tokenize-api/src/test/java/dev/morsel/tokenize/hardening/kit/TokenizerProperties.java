package dev.morsel.tokenize.hardening.kit;

import dev.morsel.tokenize.Decoding;
import dev.morsel.tokenize.StreamDecoder;
import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokens;
import dev.morsel.tokenize.testkit.OffsetInvariants;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.SplittableRandom;

/**
 * The properties every tokenizer must have on every input, checked case by case; each check that
 * fails reports the property, the seed and the escaped input ({@link HardText#replay}).
 *
 * <ol>
 *   <li><b>offsets</b>: the rules of {@link Tokens} (monotone, inside the text, never inside a
 *       surrogate pair), checked by the test-kit's {@link OffsetInvariants}; span conversion to code
 *       points and UTF-8 succeeds.
 *   <li><b>bytes inside span</b>: the decoded bytes of every content token (not reserved, not the
 *       unknown token) occur, contiguously, in the UTF-8 of the normalization of the token's own
 *       original span: an offset that points at the wrong characters fails this.
 *   <li><b>warm</b>: encoding the same text again on the same (now warm) instance gives the same
 *       result; <b>variants</b>: every variant of the subject (cache off, tiny cache, saved and
 *       loaded, ...) gives the same result.
 *   <li><b>round trip</b>: decoding without reserved tokens gives the normalized text, always for a
 *       lossless scheme, otherwise whenever the result holds no unknown token; strict decoding of
 *       such a result does not throw.
 *   <li><b>untrusted text</b>: no token but the framing markers is a reserved token.
 *   <li><b>lenient decode</b>: any id sequence decodes without an exception under
 *       {@link Decoding#REPLACE}; a {@link StreamDecoder} fed the same ids one at a time gives the
 *       same text.
 *   <li><b>bytes in</b>: the text's UTF-8 (from the JDK's encoder, lone surrogates as U+FFFD),
 *       encoded from a {@code byte[]} at an offset and from a direct {@code ByteBuffer}, gives the
 *       ids of the {@code String} path on the JDK's decoding of those bytes, and offsets equal to that
 *       result's {@link Tokens#utf8Spans UTF-8 spans}. The same bytes with ill-formed sequences
 *       spliced in give, under {@link Decoding#REPLACE}, the ids of the {@code String} path on the
 *       JDK's replacing decoder (maximal subparts, Unicode section 3.9; see {@link #jdkReplace}) and spans whose bytes decode
 *       to the token's text wherever it holds no U+FFFD; under {@link Decoding#STRICT} they throw,
 *       naming the byte offset where the JDK's reporting decoder finds the first malformed input.
 * </ol>
 */
public final class TokenizerProperties {
  private TokenizerProperties() {}

  /** Property names, as counted. */
  public static final String OFFSETS = "offsets monotone, in range, not inside a surrogate pair";
  public static final String BYTES_IN_SPAN = "token bytes inside the normalized original span";
  public static final String WARM = "same ids cold and warm";
  public static final String VARIANT = "same ids in variant: ";
  public static final String ROUND_TRIP = "round trip to the normalized text";
  public static final String ROUND_TRIP_SKIPPED = "round trip not applicable (unknown token)";
  public static final String NO_RESERVED = "untrusted text gives no reserved token";
  public static final String LENIENT_DECODE = "lenient decode of random ids never throws";
  public static final String STREAM_DECODE = "stream decode equals batch decode";
  public static final String BYTES_PATH = "bytes in: same ids as the String path, UTF-8 offsets";
  public static final String BYTES_ILL_FORMED = "bytes in: ill-formed UTF-8 by the policy";

  /** Ill-formed fragments spliced into bytes-in inputs (lone continuation, truncated, overlong, surrogate, out of range). */
  private static final byte[][] BAD = {
      {(byte) 0x80}, {(byte) 0xBF, (byte) 0x80}, {(byte) 0xC0, (byte) 0xAF}, {(byte) 0xC2},
      {(byte) 0xE0, (byte) 0x80, (byte) 0x80}, {(byte) 0xE2, (byte) 0x82}, {(byte) 0xED, (byte) 0xA0, (byte) 0x80},
      {(byte) 0xF0, (byte) 0x90, (byte) 0x80}, {(byte) 0xF4, (byte) 0x90, (byte) 0x80, (byte) 0x80}, {(byte) 0xF5},
      {(byte) 0xFF}, {(byte) 0xFE, (byte) 0xFE}};

  /** Runs every property on {@code text}; returns the result of the main tokenizer. */
  public static Tokens check(Subject subject, long seed, String text, Counts counts) {
    Tokenizer tk = subject.main();
    Tokens t;
    try {
      t = tk.encode(text);
    } catch (RuntimeException e) {
      throw new AssertionError(HardText.replay(subject + " encode", seed, text) + ": threw " + e, e);
    }
    // offsets
    try {
      OffsetInvariants.check(t, text);
      t.codePointSpans(text);
      t.utf8Spans(text);
    } catch (AssertionError | RuntimeException e) {
      throw new AssertionError(HardText.replay(subject + " " + OFFSETS, seed, text) + ": " + e.getMessage(), e);
    }
    counts.add(OFFSETS);

    // bytes inside span, untrusted text gives no reserved token
    int unknown = tk.unknownId();
    boolean hasUnknown = false;
    for (int i = 0; i < t.size(); i++) {
      boolean frame = (t.flags(i) & Tokens.FRAME) != 0;
      if (!frame && (t.isReserved(i) || tk.reservedTokens().isReserved(t.id(i)))) {
        fail(subject + " " + NO_RESERVED, seed, text, "token " + i + " is reserved id " + t.id(i) + " in " + t);
      }
      if (frame || t.id(i) == unknown) {
        hasUnknown |= t.id(i) == unknown;
        continue;
      }
      String span = text.substring(t.start(i), t.end(i));
      byte[] spanBytes = tk.pipeline().normalization().apply(span).text().getBytes(StandardCharsets.UTF_8);
      byte[] tokenBytes = tk.tokenBytes(t.id(i));
      // After a run of 30 non-starters the normalizer cuts the run and puts U+034F (CGJ) at the start
      // of the next chunk (UAX #15 section 13, Stream-Safe Text Format); that chunk normalized alone
      // lacks it, so a token may also lie inside CGJ + normalize(span).
      byte[] cgjSpanBytes = ("\u034f" + tk.pipeline().normalization().apply(span).text()).getBytes(StandardCharsets.UTF_8);
      if (indexOf(spanBytes, tokenBytes) < 0 && indexOf(cgjSpanBytes, tokenBytes) < 0) {
        fail(subject + " " + BYTES_IN_SPAN, seed, text, "token " + i + " (id " + t.id(i) + ", bytes "
            + hex(tokenBytes) + ") is not inside its span [" + t.start(i) + ", " + t.end(i) + ") = \""
            + HardText.escape(span, 200) + "\" (normalized bytes " + hex(spanBytes) + ")");
      }
    }
    counts.add(NO_RESERVED);
    counts.add(BYTES_IN_SPAN);

    // warm and variants
    Tokens again = tk.encode(text);
    if (!again.equals(t)) {
      fail(subject + " " + WARM, seed, text, "first " + t + ", then " + again);
    }
    counts.add(WARM);
    for (int v = 0; v < subject.variants().size(); v++) {
      Tokens other = subject.variants().get(v).encode(text);
      if (!other.equals(t)) {
        fail(subject + " " + VARIANT + subject.variantNames().get(v), seed, text, "main " + t + ", variant " + other);
      }
      counts.add(VARIANT + subject.variantNames().get(v));
    }

    // round trip
    int[] ids = t.ids();
    if (subject.lossless() || !hasUnknown) {
      String expected = tk.pipeline().normalization().apply(text).text();
      String decoded = tk.decode(ids, true, Decoding.REPLACE);
      if (!expected.equals(decoded)) {
        fail(subject + " " + ROUND_TRIP, seed, text, "decoded \"" + HardText.escape(decoded, 2000)
            + "\", expected \"" + HardText.escape(expected, 2000) + "\"");
      }
      String strict = tk.decode(ids, true, Decoding.STRICT);
      if (!expected.equals(strict)) {
        fail(subject + " " + ROUND_TRIP + " (strict)", seed, text, "decoded \"" + HardText.escape(strict, 2000) + "\"");
      }
      counts.add(ROUND_TRIP);
    } else {
      counts.add(ROUND_TRIP_SKIPPED);
    }

    // lenient decode of random ids, and stream decode
    SplittableRandom rnd = new SplittableRandom(seed ^ 0x5EED_DEC0DEL);
    int[] random = new int[rnd.nextInt(17)];
    for (int i = 0; i < random.length; i++) {
      random[i] = rnd.nextInt(tk.vocabularySize());
    }
    for (int[] seq : new int[][] {random, ids}) {
      for (boolean drop : new boolean[] {false, true}) {
        String batch;
        try {
          batch = tk.decode(seq, drop, Decoding.REPLACE);
        } catch (RuntimeException e) {
          throw new AssertionError(HardText.replay(subject + " " + LENIENT_DECODE, seed, text) + ": ids "
              + Arrays.toString(seq) + " threw " + e, e);
        }
        StreamDecoder sd = tk.streamDecoder(drop, Decoding.REPLACE);
        StringBuilder streamed = new StringBuilder();
        for (int id : seq) {
          streamed.append(sd.accept(id));
        }
        streamed.append(sd.flush());
        if (!batch.contentEquals(streamed)) {
          fail(subject + " " + STREAM_DECODE, seed, text, "ids " + Arrays.toString(seq) + " (dropReserved=" + drop
              + "): batch \"" + HardText.escape(batch, 500) + "\", stream \"" + HardText.escape(streamed, 500) + "\"");
        }
      }
    }
    counts.add(LENIENT_DECODE);
    counts.add(STREAM_DECODE);

    bytesIn(subject, tk, seed, text, rnd, counts);
    return t;
  }

  private static void bytesIn(Subject subject, Tokenizer tk, long seed, String text, SplittableRandom rnd,
      Counts counts) {
    byte[] utf8;
    try {
      java.nio.ByteBuffer enc = StandardCharsets.UTF_8.newEncoder()
          .onMalformedInput(java.nio.charset.CodingErrorAction.REPLACE)
          .replaceWith(new byte[] {(byte) 0xEF, (byte) 0xBF, (byte) 0xBD})
          .encode(java.nio.CharBuffer.wrap(text));
      utf8 = Arrays.copyOf(enc.array(), enc.limit());
    } catch (java.nio.charset.CharacterCodingException e) {
      throw new AssertionError(e);
    }
    String decoded = new String(utf8, StandardCharsets.UTF_8);
    Tokens want = tk.encode(decoded);
    int[][] spans = want.utf8Spans(decoded);
    int pad = rnd.nextInt(4);
    byte[] padded = new byte[utf8.length + 2 * pad];
    Arrays.fill(padded, (byte) 0xFF); // ill-formed bytes outside the range must not be read
    System.arraycopy(utf8, 0, padded, pad, utf8.length);
    java.nio.ByteBuffer direct = java.nio.ByteBuffer.allocateDirect(padded.length).put(padded);
    direct.position(pad).limit(pad + utf8.length);
    Tokens[] got = {
        tk.encodeUtf8(padded, pad, utf8.length, dev.morsel.tokenize.Trust.UNTRUSTED, Decoding.STRICT),
        tk.encodeUtf8(direct, dev.morsel.tokenize.Trust.UNTRUSTED, Decoding.REPLACE)};
    if (direct.position() != pad || direct.limit() != pad + utf8.length) {
      fail(subject + " " + BYTES_PATH, seed, text, "the buffer's position or limit moved");
    }
    for (Tokens g : got) {
      if (!Arrays.equals(g.ids(), want.ids())) {
        fail(subject + " " + BYTES_PATH, seed, text, "bytes " + Arrays.toString(g.ids()) + ", String "
            + Arrays.toString(want.ids()));
      }
      for (int i = 0; i < g.size(); i++) {
        if (g.start(i) != spans[0][i] || g.end(i) != spans[1][i]) {
          fail(subject + " " + BYTES_PATH, seed, text, "token " + i + " has bytes [" + g.start(i) + ", " + g.end(i)
              + "), the String path's UTF-8 span is [" + spans[0][i] + ", " + spans[1][i] + ")");
        }
      }
    }
    counts.add(BYTES_PATH);

    // splice ill-formed fragments in at code point boundaries
    java.io.ByteArrayOutputStream bad = new java.io.ByteArrayOutputStream();
    int splices = 1 + rnd.nextInt(3);
    for (int i = 0; i <= utf8.length; i++) {
      boolean boundary = i == utf8.length || (utf8[i] & 0xC0) != 0x80;
      if (boundary && rnd.nextInt(Math.max(1, utf8.length / splices + 1)) == 0) {
        byte[] f = BAD[rnd.nextInt(BAD.length)];
        bad.write(f, 0, f.length);
      }
      if (i < utf8.length) {
        bad.write(utf8[i]);
      }
    }
    byte[] ill = bad.toByteArray();
    // the JDK's reporting decoder stops with its position at the start of the first malformed sequence
    int firstBad = -1;
    java.nio.ByteBuffer in = java.nio.ByteBuffer.wrap(ill);
    java.nio.charset.CoderResult r = StandardCharsets.UTF_8.newDecoder()
        .onMalformedInput(java.nio.charset.CodingErrorAction.REPORT)
        .onUnmappableCharacter(java.nio.charset.CodingErrorAction.REPORT)
        .decode(in, java.nio.CharBuffer.allocate(2 * ill.length + 2), true);
    if (r.isError()) {
      firstBad = in.position();
    }
    String replaced = jdkReplace(ill);
    Tokens wantIll = tk.encode(replaced);
    Tokens gotIll = tk.encodeUtf8(ill, 0, ill.length, dev.morsel.tokenize.Trust.UNTRUSTED, Decoding.REPLACE);
    if (!Arrays.equals(gotIll.ids(), wantIll.ids())) {
      fail(subject + " " + BYTES_ILL_FORMED, seed, text, "bytes " + hex(ill) + ": ids " + Arrays.toString(gotIll.ids())
          + ", String path on the JDK's replacement " + Arrays.toString(wantIll.ids()));
    }
    int last = 0;
    for (int i = 0; i < gotIll.size(); i++) {
      int a = gotIll.start(i);
      int b = gotIll.end(i);
      if (a < last || b < a || b > ill.length) {
        fail(subject + " " + BYTES_ILL_FORMED, seed, text, "token " + i + " span [" + a + ", " + b + ") of " + ill.length);
      }
      last = a;
      String own = replaced.substring(wantIll.start(i), wantIll.end(i));
      if ((gotIll.flags(i) & Tokens.FRAME) == 0 && own.indexOf('\ufffd') < 0
          && !own.equals(new String(ill, a, b - a, StandardCharsets.UTF_8))) {
        fail(subject + " " + BYTES_ILL_FORMED, seed, text, "token " + i + " bytes [" + a + ", " + b
            + ") do not hold its text \"" + HardText.escape(own, 100) + "\"");
      }
    }
    if (firstBad >= 0) {
      try {
        tk.encodeUtf8(ill, 0, ill.length, dev.morsel.tokenize.Trust.UNTRUSTED, Decoding.STRICT);
        fail(subject + " " + BYTES_ILL_FORMED, seed, text, "strict bytes-in accepted ill-formed " + hex(ill));
      } catch (IllegalArgumentException e) {
        if (!e.getMessage().contains("at byte " + firstBad + " ")) {
          fail(subject + " " + BYTES_ILL_FORMED, seed, text, "strict error '" + e.getMessage()
              + "' does not name byte " + firstBad);
        }
      }
    }
    counts.add(BYTES_ILL_FORMED);
  }

  /**
   * The JDK's replacing decoder, which substitutes maximal subparts as Unicode section 3.9 asks,
   * except for an encoded surrogate ({@code ED A0..BF ..}): the JDK replaces the whole sequence
   * once, Unicode's Table 3-8 once per byte (the lead byte {@code ED} is a maximal subpart of its
   * own, since {@code A0..BF} may not follow it). So the input is cut after each such {@code ED}.
   */
  static String jdkReplace(byte[] b) {
    StringBuilder out = new StringBuilder();
    int from = 0;
    for (int i = 0; i + 1 < b.length; i++) {
      if ((b[i] & 0xFF) == 0xED && (b[i + 1] & 0xFF) >= 0xA0 && (b[i + 1] & 0xFF) <= 0xBF) {
        out.append(new String(b, from, i - from, StandardCharsets.UTF_8)).append('\ufffd');
        from = i + 1;
      }
    }
    return out.append(new String(b, from, b.length - from, StandardCharsets.UTF_8)).toString();
  }

  static void fail(String property, long seed, String text, String detail) {
    throw new AssertionError(HardText.replay(property, seed, text) + ": " + detail);
  }

  /** First index of {@code needle} in {@code hay}, or -1 (naive search; both are short). */
  public static int indexOf(byte[] hay, byte[] needle) {
    outer:
    for (int i = 0; i + needle.length <= hay.length; i++) {
      for (int j = 0; j < needle.length; j++) {
        if (hay[i + j] != needle[j]) {
          continue outer;
        }
      }
      return i;
    }
    return -1;
  }

  /** Lowercase hex of {@code b}, space separated. */
  public static String hex(byte[] b) {
    StringBuilder sb = new StringBuilder();
    for (int i = 0; i < b.length && i < 64; i++) {
      sb.append(i == 0 ? "" : " ").append(String.format("%02x", b[i] & 0xFF));
    }
    return b.length > 64 ? sb + " ..." : sb.toString();
  }
}
