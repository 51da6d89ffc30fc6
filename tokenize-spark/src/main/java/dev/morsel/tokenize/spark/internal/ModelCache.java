package dev.morsel.tokenize.spark.internal;

import dev.morsel.tokenize.Tokenizer;
import dev.morsel.tokenize.Tokenizers;
import java.util.Iterator;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicLong;
import java.util.function.Supplier;

/**
 * The tokenizers loaded in this JVM (an executor, or the driver in local mode), keyed by the
 * fingerprint the caller declared for the model's bytes. A model is loaded once per JVM: concurrent
 * tasks asking for the same fingerprint wait for the one load. A model whose bytes do not load, or
 * load to another fingerprint, is never cached, and the error names the declared fingerprint.
 *
 * <p>At most {@value #MAX_MODELS} models are held; adding one more drops another (a job rarely
 * encodes with more than one or two models, and each may hold tens of megabytes).
 *
 * <p>Internal: not part of the public API. Public only so that tests in another package can read
 * {@link #loads()}.
 */
public final class ModelCache {
  /** Models held at once; see the class notes for the reason. */
  static final int MAX_MODELS = 8;

  private static final ConcurrentHashMap<String, Tokenizer> MODELS = new ConcurrentHashMap<>();
  private static final AtomicLong LOADS = new AtomicLong();

  private ModelCache() {}

  /**
   * The tokenizer for {@code fingerprint}, loading {@code bytes.get()} the first time in this JVM.
   *
   * @throws IllegalArgumentException naming {@code fingerprint} if the bytes are not a loadable model
   *     or load to a model with another fingerprint
   */
  public static Tokenizer get(String fingerprint, Supplier<byte[]> bytes) {
    Tokenizer t = MODELS.get(fingerprint);
    if (t != null) {
      return t;
    }
    if (MODELS.size() >= MAX_MODELS) {
      Iterator<String> it = MODELS.keySet().iterator();
      if (it.hasNext()) {
        it.next();
        it.remove();
      }
    }
    return MODELS.computeIfAbsent(fingerprint, fp -> load(fp, bytes));
  }

  /** How many models this JVM has loaded so far (for tests of the load-once promise). */
  public static long loads() {
    return LOADS.get();
  }

  private static Tokenizer load(String fingerprint, Supplier<byte[]> bytes) {
    Tokenizer t;
    try {
      t = Tokenizers.load(bytes.get());
    } catch (RuntimeException e) {
      throw new IllegalArgumentException("the model declared with fingerprint " + fingerprint
          + " cannot be loaded: " + e.getMessage(), e);
    }
    LOADS.incrementAndGet();
    if (!t.fingerprint().equals(fingerprint)) {
      throw new IllegalArgumentException("the model declared with fingerprint " + fingerprint
          + " loads to a model with fingerprint " + t.fingerprint() + "; the bytes and the declared fingerprint disagree");
    }
    return t;
  }
}
