package dev.morsel.tokenize.spi;

import java.util.Objects;
import java.util.concurrent.atomic.AtomicReferenceArray;
import java.util.function.Supplier;

/**
 * A small, bounded, lock-free pool of reusable objects (encode workspaces): {@link #take()} returns a
 * pooled object or a new one, {@link #give(Object)} returns it for reuse, or lets it go when the pool
 * is full. Objects are owned by the pool, not by threads: a thread that takes one and ends, or a
 * virtual thread that runs one request, leaves nothing behind, and a pool that is dropped is garbage
 * with everything in it.
 *
 * <p>The pool holds at most {@link #capacity()} idle objects, twice the number of processors by
 * default (reason: an encode call does not block, so no more calls than processors run at once;
 * the factor 2 covers a thread preempted while it holds one). Taking and giving cost one atomic
 * exchange each when the pool is not empty (respectively full): about as much as a {@code ThreadLocal}
 * lookup, and far less than the encode of one short text.
 *
 * @param <T> the pooled type
 * @since 0.2.0
 */
public final class WorkspacePool<T> {
  /** Default capacity: twice the processors, at least 4 and at most 64. */
  public static final int DEFAULT_CAPACITY =
      Math.max(4, Math.min(64, 2 * Runtime.getRuntime().availableProcessors()));

  private final AtomicReferenceArray<T> slots;
  private final Supplier<? extends T> factory;

  private WorkspacePool(int capacity, Supplier<? extends T> factory) {
    this.slots = new AtomicReferenceArray<>(capacity);
    this.factory = factory;
  }

  /** A pool of {@link #DEFAULT_CAPACITY} objects made by {@code factory} when the pool is empty. */
  public static <T> WorkspacePool<T> of(Supplier<? extends T> factory) {
    return of(DEFAULT_CAPACITY, factory);
  }

  /**
   * A pool of at most {@code capacity} idle objects made by {@code factory}.
   *
   * @throws IllegalArgumentException if {@code capacity} is outside [1, 1024]
   */
  public static <T> WorkspacePool<T> of(int capacity, Supplier<? extends T> factory) {
    Objects.requireNonNull(factory, "factory");
    if (capacity < 1 || capacity > 1024) {
      throw new IllegalArgumentException("capacity=" + capacity + " is outside [1, 1024]");
    }
    return new WorkspacePool<>(capacity, factory);
  }

  /** Most idle objects kept. */
  public int capacity() {
    return slots.length();
  }

  /** A pooled object, or a new one from the factory when none is idle. Never null. */
  public T take() {
    final AtomicReferenceArray<T> s = slots;
    for (int i = 0, n = s.length(); i < n; i++) {
      if (s.getPlain(i) != null) {
        T t = s.getAndSet(i, null);
        if (t != null) {
          return t;
        }
      }
    }
    T t = factory.get();
    if (t == null) {
      throw new NullPointerException("the workspace factory returned null");
    }
    return t;
  }

  /** Returns {@code t} (taken from this pool) for reuse; it is dropped when the pool is full. */
  public void give(T t) {
    if (t == null) {
      return;
    }
    final AtomicReferenceArray<T> s = slots;
    for (int i = 0, n = s.length(); i < n; i++) {
      if (s.getPlain(i) == null && s.compareAndSet(i, null, t)) {
        return;
      }
    }
  }

  /** Idle objects now in the pool (a snapshot; for tests and diagnostics). */
  public int idle() {
    int c = 0;
    for (int i = 0; i < slots.length(); i++) {
      if (slots.get(i) != null) {
        c++;
      }
    }
    return c;
  }
}
