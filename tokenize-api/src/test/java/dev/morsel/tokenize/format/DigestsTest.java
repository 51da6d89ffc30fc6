package dev.morsel.tokenize.format;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.ByteBuffer;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The container's checksum and digest against published check values and an independent bitwise
 * CRC-32C written here (shares no code with {@link Digests}).
 */
class DigestsTest {

  // RFC 3720 (iSCSI), Appendix B.4 "CRC Examples"; the value for the ASCII digits "123456789" is the
  // standard check value of CRC-32C.
  @Test
  void crc32cOfDigitsIsTheStandardCheckValue() {
    byte[] digits = "123456789".getBytes(StandardCharsets.US_ASCII);
    assertEquals(0xE3069283, Digests.crc32c(digits, 0, digits.length));
    assertEquals(0xE3069283, Digests.crc32c(ByteBuffer.wrap(digits)));
    assertEquals(0xE3069283, bitwiseCrc32c(digits));
  }

  // RFC 3720, Appendix B.4: 32 bytes of zeros, of 0xFF, ascending 0..31 and descending 31..0.
  // from memory: the RFC prints the CRC bytes in transmission order ("aa 36 91 8a"); as a
  // little-endian u32 that is 0x8A9136AA.
  @Test
  void crc32cMatchesTheIscsiExamples() {
    byte[] zeros = new byte[32];
    byte[] ones = new byte[32];
    Arrays.fill(ones, (byte) 0xFF);
    byte[] up = new byte[32];
    byte[] down = new byte[32];
    for (int i = 0; i < 32; i++) {
      up[i] = (byte) i;
      down[i] = (byte) (31 - i);
    }
    assertEquals(0x8A9136AA, Digests.crc32c(zeros, 0, 32));
    assertEquals(0x62A8AB43, Digests.crc32c(ones, 0, 32));
    assertEquals(0x46DD794E, Digests.crc32c(up, 0, 32));
    assertEquals(0x113FDB5C, Digests.crc32c(down, 0, 32));
  }

  /** The JDK's CRC-32C against a bitwise implementation of the Castagnoli polynomial, on random data. */
  @Test
  void crc32cAgreesWithBitwiseOracle() {
    SplittableRandom rnd = new SplittableRandom(20260302L);
    for (int t = 0; t < 200; t++) {
      byte[] b = new byte[rnd.nextInt(0, 300)];
      rnd.nextBytes(b);
      int off = b.length == 0 ? 0 : rnd.nextInt(b.length);
      int len = b.length - off;
      assertEquals(bitwiseCrc32c(Arrays.copyOfRange(b, off, off + len)), Digests.crc32c(b, off, len),
          "seed 20260302 case " + t + " length " + b.length);
      ByteBuffer direct = ByteBuffer.allocateDirect(b.length).put(b).flip().position(off);
      assertEquals(Digests.crc32c(b, off, len), Digests.crc32c(direct), "direct buffer, case " + t);
      assertEquals(off, direct.position(), "position untouched");
    }
  }

  // FIPS PUB 180-4 example "abc" (NIST "Example Algorithms", SHA-256, one-block message).
  // from memory: the digest value.
  @Test
  void sha256OfAbcMatchesTheFipsExample() {
    assertEquals("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad",
        Digests.sha256Hex("abc".getBytes(StandardCharsets.US_ASCII)));
  }

  // FIPS PUB 180-4 example, two-block message "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq".
  // from memory: the digest value.
  @Test
  void sha256OfTwoBlockMessageMatchesTheFipsExample() {
    assertEquals("248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1",
        Digests.sha256Hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq"
            .getBytes(StandardCharsets.US_ASCII)));
  }

  /** Bit-at-a-time CRC-32C: reflected polynomial 0x82F63B78, initial value and final xor all ones. */
  static int bitwiseCrc32c(byte[] data) {
    int crc = 0xFFFFFFFF;
    for (byte b : data) {
      crc ^= b & 0xFF;
      for (int k = 0; k < 8; k++) {
        crc = (crc & 1) != 0 ? (crc >>> 1) ^ 0x82F63B78 : crc >>> 1;
      }
    }
    return ~crc;
  }
}
