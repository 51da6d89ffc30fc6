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
    return t;
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
