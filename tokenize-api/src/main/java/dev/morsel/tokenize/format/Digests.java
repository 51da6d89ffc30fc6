package dev.morsel.tokenize.format;

import java.nio.ByteBuffer;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.Map;
import java.util.zip.CRC32C;

/**
 * Checksums and digests used by the container: CRC-32C for corruption detection and SHA-256 for the
 * model fingerprint. Stateless and thread-safe.
 *
 * <p>Note: CRC-32C is the Castagnoli polynomial 0x1EDC6F41 as specified in [1];
 * {@link java.util.zip.CRC32C} implements it. SHA-256 is specified in [2]; every conforming JDK ships
 * it ({@link MessageDigest} algorithm "SHA-256" is mandatory).
 * <ol>
 *   <li>RFC 3720, Internet Small Computer Systems Interface (iSCSI), Section 12.1 and Appendix B.4.
 *   <li>FIPS PUB 180-4, Secure Hash Standard (SHS), Section 6.2.
 * </ol>
 */
final class Digests {
  private static final char[] HEX = "0123456789abcdef".toCharArray();

  private Digests() {}

  /** CRC-32C of {@code buf}'s remaining bytes; {@code buf}'s position is not moved. */
  static int crc32c(ByteBuffer buf) {
    CRC32C crc = new CRC32C();
    crc.update(buf.duplicate());
    return (int) crc.getValue();
  }

  /** CRC-32C of {@code b[off, off + len)}. */
  static int crc32c(byte[] b, int off, int len) {
    CRC32C crc = new CRC32C();
    crc.update(b, off, len);
    return (int) crc.getValue();
  }

  /** SHA-256 of raw bytes as lowercase hex (64 characters). */
  static String sha256Hex(byte[] data) {
    MessageDigest md = sha256();
    md.update(data);
    return hex(md.digest());
  }

  /**
   * The model fingerprint: SHA-256 over, for each section but {@link ModelFile#TAG_METADATA} and
   * {@link AlphabetRecord#TAG} (records of how a model was made, not of how it encodes) in tag
   * order, the four tag bytes, the payload length as 8 bytes little-endian, then the payload.
   * {@code payloads} must iterate in tag order (a sorted map); payload positions are not moved.
   */
  static String fingerprint(Map<String, ByteBuffer> payloads) {
    MessageDigest md = sha256();
    byte[] head = new byte[12];
    for (Map.Entry<String, ByteBuffer> e : payloads.entrySet()) {
      if (e.getKey().equals(ModelFile.TAG_METADATA) || e.getKey().equals(AlphabetRecord.TAG)) {
        continue;
      }
      String tag = e.getKey();
      ByteBuffer p = e.getValue().duplicate();
      for (int i = 0; i < 4; i++) {
        head[i] = (byte) tag.charAt(i);
      }
      long len = p.remaining();
      for (int i = 0; i < 8; i++) {
        head[4 + i] = (byte) (len >>> (8 * i));
      }
      md.update(head);
      md.update(p);
    }
    return hex(md.digest());
  }

  static String hex(byte[] b) {
    char[] c = new char[2 * b.length];
    for (int i = 0; i < b.length; i++) {
      c[2 * i] = HEX[(b[i] >>> 4) & 0xF];
      c[2 * i + 1] = HEX[b[i] & 0xF];
    }
    return new String(c);
  }

  private static MessageDigest sha256() {
    try {
      return MessageDigest.getInstance("SHA-256");
    } catch (NoSuchAlgorithmException e) {
      throw new IllegalStateException("the JDK lacks SHA-256, which every Java SE platform must provide", e);
    }
  }
}
