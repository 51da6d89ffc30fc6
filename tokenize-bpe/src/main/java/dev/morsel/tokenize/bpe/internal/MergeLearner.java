package dev.morsel.tokenize.bpe.internal;

import dev.morsel.tokenize.format.ReviewText;
import dev.morsel.tokenize.train.TrainingListener;
import it.unimi.dsi.fastutil.ints.IntArrayList;
import it.unimi.dsi.fastutil.longs.Long2LongOpenHashMap;
import it.unimi.dsi.fastutil.longs.Long2ObjectOpenHashMap;
import it.unimi.dsi.fastutil.longs.LongOpenHashSet;
import it.unimi.dsi.fastutil.objects.ObjectOpenHashSet;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Set;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;

/**
 * Learns BPE merges [1] over weighted words (byte strings), incrementally.
 *
 * <p>State: each word's current symbols ({@code int[]}, shrinking in place) and weight; a map from
 * each adjacent pair (packed into a long) to its weighted count, counting overlapping occurrences
 * (in "aaa" the pair (a, a) occurs twice); an index from each pair to the ascending, duplicate-free
 * list of words that contained it when it was indexed (entries may go stale; a stale word is skipped
 * when scanned); a binary heap of (count, pair) with lazy invalidation.
 *
 * <p>Choice of the next merge: highest count; ties go to the pair whose concatenated bytes are
 * smallest in unsigned lexicographic order; remaining ties (same bytes) to the shorter left operand.
 * A pair is never chosen if its token would exceed {@code maxTokenBytes}, if its bytes are already a
 * token, or if its display spelling equals a reserved spelling; such pairs are set aside for good (their
 * bytes never change). Learning stops at the merge budget, or when the best count is below
 * {@code minPairCount}, or when no pair is eligible.
 *
 * <p>Lazy invalidation is exact because a pair's count can only fall after it first appears: a merge
 * of (L, R) into M only removes occurrences of pairs without M and adds pairs with M, which are new.
 * So a heap entry's count is an upper bound; a popped entry whose count is stale is pushed back with
 * the current count, and the first popped entry whose count is current is the true best.
 *
 * <p>Applying merge (L, R): for each word in the pair's index that still holds it, subtract the
 * word's adjacent pairs, replace (L, R) left to right without overlap, add the new word's pairs, and
 * index the word under the new pairs (those containing M). Work is proportional to the length of the
 * affected words, not the corpus.
 *
 * <p>Memory: the words (4 bytes per byte of distinct piece), the weights (8 bytes per distinct piece),
 * the pair counts (one entry per distinct pair alive), and the index: at most the number of initial
 * symbol positions plus two entries per replaced occurrence, so at most three ints per input byte.
 *
 * <p>[1] Sennrich, Haddow, Birch (2016), "Neural Machine Translation of Rare Words with Subword
 * Units", section 3.2, Algorithm 1.
 */
public final class MergeLearner {
  private final int k;
  private final int[][] words;
  private final int[] lens;
  private final long[] weights;
  private final int maxMerges;
  private final long minPairCount;
  private final int maxTokenBytes;
  private final Set<String> reserved;
  private final TrainingListener listener;

  private final List<byte[]> tokenBytes = new ArrayList<>(); // by id - k
  private final Set<String> known = new ObjectOpenHashSet<>(); // token bytes as ISO-8859-1 strings
  private final Long2LongOpenHashMap counts = new Long2LongOpenHashMap();
  private Long2ObjectOpenHashMap<IntArrayList> where = new Long2ObjectOpenHashMap<>();
  private final IntArrayList leftOut = new IntArrayList();
  private final IntArrayList rightOut = new IntArrayList();

  // heap of (count, pair)
  private long[] heapPair = new long[1024];
  private long[] heapCount = new long[1024];
  private int heapSize;

  /**
   * @param k number of reserved tokens (byte b is id k+b)
   * @param words UTF-8 of each distinct piece
   * @param weights count of each piece
   */
  public MergeLearner(int k, List<byte[]> words, long[] weights, int maxMerges, long minPairCount, int maxTokenBytes,
      List<String> reserved, TrainingListener listener) {
    this(k, byteSymbols(k, words), weights, List.of(), maxMerges, minPairCount, maxTokenBytes, reserved, listener);
  }

  /**
   * Continues learning after existing merges [1]: {@code words} are already written in the existing
   * vocabulary (each piece as the ids the existing merges give it), {@code mergedBytes} holds the
   * bytes of the existing merges in rank order (ids {@code k+256..}), and new merges get the ids
   * after them. No pair of {@code words} is an existing merge (encoding applied them all), so the
   * merges learned here are exactly those the new corpus asks for on top of the old ones.
   *
   * @param words the symbols of each word (ids of the existing vocabulary); the arrays are taken over
   * @param mergedBytes bytes of each existing merge, in rank order
   */
  public static MergeLearner continuing(int k, int[][] words, long[] weights, List<byte[]> mergedBytes, int maxMerges,
      long minPairCount, int maxTokenBytes, List<String> reserved, TrainingListener listener) {
    return new MergeLearner(k, words, weights, mergedBytes, maxMerges, minPairCount, maxTokenBytes, reserved, listener);
  }

  private static int[][] byteSymbols(int k, List<byte[]> words) {
    int[][] out = new int[words.size()][];
    for (int w = 0; w < out.length; w++) {
      byte[] b = words.get(w);
      int[] s = new int[b.length];
      for (int i = 0; i < b.length; i++) {
        s[i] = k + (b[i] & 0xFF);
      }
      out[w] = s;
    }
    return out;
  }

  private MergeLearner(int k, int[][] words, long[] weights, List<byte[]> mergedBytes, int maxMerges,
      long minPairCount, int maxTokenBytes, List<String> reserved, TrainingListener listener) {
    this.k = k;
    this.words = words;
    this.lens = new int[words.length];
    for (int w = 0; w < words.length; w++) {
      this.lens[w] = words[w].length;
    }
    this.weights = weights;
    this.maxMerges = maxMerges;
    this.minPairCount = minPairCount;
    this.maxTokenBytes = maxTokenBytes;
    this.reserved = Set.copyOf(reserved);
    this.listener = listener;
    counts.defaultReturnValue(0);
    for (int b = 0; b < 256; b++) {
      byte[] one = {(byte) b};
      tokenBytes.add(one);
      known.add(key(one));
    }
    for (byte[] m : mergedBytes) {
      tokenBytes.add(m);
      known.add(key(m));
    }
  }

  private static String key(byte[] b) {
    return new String(b, StandardCharsets.ISO_8859_1);
  }

  private byte[] bytesOf(int id) {
    return tokenBytes.get(id - k);
  }

  /** Runs; returns {left[], right[]} in rank order. */
  public int[][] run(int threads) {
    countInitial(threads);
    long[] keys = counts.keySet().toLongArray();
    Arrays.sort(keys);
    for (long p : keys) {
      long c = counts.get(p);
      if (c >= minPairCount) {
        push(p, c);
      }
    }
    LongOpenHashSet fresh = new LongOpenHashSet();
    while (leftOut.size() < maxMerges && heapSize > 0) {
      long pair = heapPair[0];
      long stored = heapCount[0];
      pop();
      long current = counts.get(pair);
      if (current != stored) {
        if (current >= minPairCount) {
          push(pair, current);
        }
        continue;
      }
      if (current < minPairCount) {
        break;
      }
      int a = (int) (pair >>> 32);
      int b = (int) pair;
      byte[] la = bytesOf(a);
      byte[] lb = bytesOf(b);
      if (la.length + lb.length > maxTokenBytes) {
        continue;
      }
      byte[] merged = Arrays.copyOf(la, la.length + lb.length);
      System.arraycopy(lb, 0, merged, la.length, lb.length);
      if (known.contains(key(merged))
          || (!reserved.isEmpty() && reserved.contains(ReviewText.escape(merged)))) {
        continue;
      }
      int id = k + tokenBytes.size();
      leftOut.add(a);
      rightOut.add(b);
      tokenBytes.add(merged);
      known.add(key(merged));
      apply(pair, a, b, id, fresh);
      // the new token first, as text (halves of a multi-byte character show as escaped bytes, their
      // merge reads as the character), then its halves and its count
      listener.progress("merges", leftOut.size(), maxMerges, "'" + ReviewText.escape(merged) + "' = '"
          + ReviewText.escape(la) + "' + '" + ReviewText.escape(lb) + "' (" + current + ")");
    }
    return new int[][] {leftOut.toIntArray(), rightOut.toIntArray()};
  }

  private void apply(long pair, int a, int b, int id, LongOpenHashSet fresh) {
    IntArrayList list = where.remove(pair);
    fresh.clear();
    if (list != null) {
      int[] ws = list.elements();
      int nw = list.size();
      for (int x = 0; x < nw; x++) {
        int w = ws[x];
        int[] s = words[w];
        int n = lens[w];
        boolean has = false;
        for (int i = 0; i + 1 < n; i++) {
          if (s[i] == a && s[i + 1] == b) {
            has = true;
            break;
          }
        }
        if (!has) {
          continue;
        }
        long wt = weights[w];
        for (int i = 0; i + 1 < n; i++) {
          long p = Vocab.pair(s[i], s[i + 1]);
          if (counts.addTo(p, -wt) == wt) {
            counts.remove(p);
          }
        }
        int out = 0;
        for (int i = 0; i < n; ) {
          if (i + 1 < n && s[i] == a && s[i + 1] == b) {
            s[out++] = id;
            i += 2;
          } else {
            s[out++] = s[i++];
          }
        }
        lens[w] = out;
        for (int i = 0; i + 1 < out; i++) {
          long p = Vocab.pair(s[i], s[i + 1]);
          counts.addTo(p, wt);
          if (s[i] == id || s[i + 1] == id) {
            IntArrayList l = where.get(p);
            if (l == null) {
              l = new IntArrayList(4);
              where.put(p, l);
            }
            if (l.isEmpty() || l.getInt(l.size() - 1) != w) {
              l.add(w);
            }
            fresh.add(p);
          }
        }
      }
    }
    counts.remove(pair);
    long[] fk = fresh.toLongArray();
    for (long p : fk) {
      long c = counts.get(p);
      if (c >= minPairCount) {
        push(p, c);
      }
    }
  }

  // ------------------------------------------------------------------ initial counting (parallel)

  private static final class Partial {
    final Long2LongOpenHashMap counts = new Long2LongOpenHashMap();
    final Long2ObjectOpenHashMap<IntArrayList> where = new Long2ObjectOpenHashMap<>();
  }

  private Partial countRange(int from, int to) {
    Partial p = new Partial();
    for (int w = from; w < to; w++) {
      int[] s = words[w];
      int n = lens[w];
      long wt = weights[w];
      for (int i = 0; i + 1 < n; i++) {
        long key = Vocab.pair(s[i], s[i + 1]);
        p.counts.addTo(key, wt);
        IntArrayList l = p.where.get(key);
        if (l == null) {
          l = new IntArrayList(4);
          p.where.put(key, l);
        }
        if (l.isEmpty() || l.getInt(l.size() - 1) != w) {
          l.add(w);
        }
      }
    }
    return p;
  }

  private void countInitial(int threads) {
    int n = words.length;
    int chunks = Math.max(1, Math.min(threads, n / 1024 + 1)); // below ~1k words a thread is not worth it
    List<Partial> parts = new ArrayList<>();
    if (chunks == 1) {
      parts.add(countRange(0, n));
    } else {
      ExecutorService pool = Executors.newFixedThreadPool(chunks, r -> {
        Thread t = new Thread(r, "bpe-pair-count");
        t.setDaemon(true);
        return t;
      });
      try {
        List<Future<Partial>> fs = new ArrayList<>();
        for (int c = 0; c < chunks; c++) {
          int from = (int) ((long) n * c / chunks);
          int to = (int) ((long) n * (c + 1) / chunks);
          fs.add(pool.submit(() -> countRange(from, to)));
        }
        for (Future<Partial> f : fs) {
          parts.add(f.get());
        }
      } catch (InterruptedException e) {
        Thread.currentThread().interrupt();
        throw new IllegalStateException("pair counting interrupted", e);
      } catch (ExecutionException e) {
        throw new IllegalStateException("pair counting failed", e.getCause());
      } finally {
        pool.shutdownNow();
      }
    }
    if (parts.size() == 1) {
      counts.putAll(parts.get(0).counts);
      where = parts.get(0).where;
      return;
    }
    for (Partial p : parts) { // chunk order keeps every index list ascending
      for (Long2LongOpenHashMap.Entry e : p.counts.long2LongEntrySet()) {
        counts.addTo(e.getLongKey(), e.getLongValue());
      }
      for (Long2ObjectOpenHashMap.Entry<IntArrayList> e : p.where.long2ObjectEntrySet()) {
        IntArrayList l = where.get(e.getLongKey());
        if (l == null) {
          where.put(e.getLongKey(), e.getValue());
        } else {
          l.addAll(e.getValue());
        }
      }
    }
  }

  // ------------------------------------------------------------------ heap

  /** Whether entry (pa, ca) goes before (pb, cb). */
  private boolean before(long pa, long ca, long pb, long cb) {
    if (ca != cb) {
      return ca > cb;
    }
    return compareMerged(pa, pb) < 0;
  }

  private int compareMerged(long pa, long pb) {
    byte[] a1 = bytesOf((int) (pa >>> 32));
    byte[] a2 = bytesOf((int) pa);
    byte[] b1 = bytesOf((int) (pb >>> 32));
    byte[] b2 = bytesOf((int) pb);
    int la = a1.length + a2.length;
    int lb = b1.length + b2.length;
    int n = Math.min(la, lb);
    for (int i = 0; i < n; i++) {
      int x = (i < a1.length ? a1[i] : a2[i - a1.length]) & 0xFF;
      int y = (i < b1.length ? b1[i] : b2[i - b1.length]) & 0xFF;
      if (x != y) {
        return x - y;
      }
    }
    if (la != lb) {
      return la - lb;
    }
    return a1.length - b1.length;
  }

  private void push(long pair, long count) {
    if (heapSize == heapPair.length) {
      heapPair = Arrays.copyOf(heapPair, heapSize * 2);
      heapCount = Arrays.copyOf(heapCount, heapSize * 2);
    }
    int i = heapSize++;
    while (i > 0) {
      int parent = (i - 1) >>> 1;
      if (!before(pair, count, heapPair[parent], heapCount[parent])) {
        break;
      }
      heapPair[i] = heapPair[parent];
      heapCount[i] = heapCount[parent];
      i = parent;
    }
    heapPair[i] = pair;
    heapCount[i] = count;
  }

  private void pop() {
    int size = --heapSize;
    if (size == 0) {
      return;
    }
    long p = heapPair[size];
    long c = heapCount[size];
    int i = 0;
    while (true) {
      int ch = 2 * i + 1;
      if (ch >= size) {
        break;
      }
      if (ch + 1 < size && before(heapPair[ch + 1], heapCount[ch + 1], heapPair[ch], heapCount[ch])) {
        ch++;
      }
      if (!before(heapPair[ch], heapCount[ch], p, c)) {
        break;
      }
      heapPair[i] = heapPair[ch];
      heapCount[i] = heapCount[ch];
      i = ch;
    }
    heapPair[i] = p;
    heapCount[i] = c;
  }
}
