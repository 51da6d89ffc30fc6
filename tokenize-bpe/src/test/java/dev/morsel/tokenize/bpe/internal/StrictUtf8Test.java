package dev.morsel.tokenize.bpe.internal;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The allocation-free strict UTF-8 decoder behind the whole-piece table, against an oracle that
 * shares no code with it: the JDK's strict decoder (java.nio.charset, REPORT on malformed input;
 * RFC 3629 section 3 defines the well-formed sequences both must accept).
 */
class StrictUtf8Test {

  /** Random bytes biased toward UTF-8 lead and continuation bytes, plus encoded random code points. */
  private static byte[] randomBytes(SplittableRandom r) {
    int n = r.nextInt(0, 13);
    byte[] b = new byte[n];
    for (int i = 0; i < n; i++) {
      switch (r.nextInt(5)) {
        case 0: b[i] = (byte) r.nextInt(0x80); break;
        case 1: b[i] = (byte) (0x80 | r.nextInt(0x40)); break;
        case 2: b[i] = (byte) (0xC0 | r.nextInt(0x20)); break;
        case 3: b[i] = (byte) (0xE0 | r.nextInt(0x10)); break;
        default: b[i] = (byte) (0xF0 | r.nextInt(0x10)); break;
      }
    }
    if (r.nextBoolean()) {
      int cp = r.nextInt(0x110000);
      if (cp >= 0xD800 && cp < 0xE000) {
        cp = 0x1F6F3; // a ferry, not a surrogate
      }
      return new String(Character.toChars(cp)).getBytes(StandardCharsets.UTF_8);
    }
    return b;
  }

  @ParameterizedTest
  @ValueSource(longs = {0x5EA_F00DL, 0xB0A7L, 0x7E55E1L})
  void strictDecodingMatchesTheJdkDecoder(long seed) {
    SplittableRandom r = new SplittableRandom(seed);
    CharsetDecoder jdk = StandardCharsets.UTF_8.newDecoder().onMalformedInput(CodingErrorAction.REPORT)
        .onUnmappableCharacter(CodingErrorAction.REPORT);
    char[] out = new char[8];
    int accepted = 0;
    for (int k = 0; k < 20_000; k++) {
      byte[] b = randomBytes(r);
      String expected;
      try {
        expected = jdk.decode(ByteBuffer.wrap(b)).toString();
      } catch (CharacterCodingException e) {
        expected = null;
      }
      if (expected != null && expected.length() > out.length) {
        expected = null; // longer than the output buffer: rejected by contract
      }
      int n = Utf8.decodeStrict(b, 0, b.length, out);
      String got = n < 0 ? null : new String(out, 0, n);
      assertEquals(expected, got, "seed " + seed + ", case " + k + ", bytes " + java.util.Arrays.toString(b));
      accepted += expected != null ? 1 : 0;
    }
    assertTrue(accepted > 1000, "seed " + seed + ": too few well-formed cases to mean anything (" + accepted + ")");
  }
}
