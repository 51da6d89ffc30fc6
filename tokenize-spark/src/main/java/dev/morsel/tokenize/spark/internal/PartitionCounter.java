package dev.morsel.tokenize.spark.internal;

import dev.morsel.tokenize.normalize.Normalization;
import dev.morsel.tokenize.split.PieceSink;
import dev.morsel.tokenize.split.Splitting;
import it.unimi.dsi.fastutil.objects.Object2LongMap;
import it.unimi.dsi.fastutil.objects.Object2LongOpenHashMap;
import it.unimi.dsi.fastutil.objects.ObjectIterator;
import java.util.Iterator;
import java.util.NoSuchElementException;
import org.apache.spark.api.java.function.PairFlatMapFunction;
import scala.Tuple2;

/**
 * Counts the pieces of one Spark partition of texts, exactly as the single-JVM piece counter does:
 * {@code normalization.apply(text).text()}, then {@code splitting.split(...)} over the whole
 * normalized text, one count per reported piece.
 *
 * <p>Travels to executors as its two spec strings (the pipeline itself is not serializable); the
 * steps are parsed once per partition. Counts go into a local primitive map; when it holds more
 * than {@code flushAt} distinct pieces its contents are handed downstream and it starts afresh, so
 * the counts stay exact (the shuffle adds the parts up) while the executor's memory stays bounded.
 * Null texts are skipped.
 *
 * <p>Besides the pieces, each flush emits the number of non-null texts read since the previous
 * flush under the key {@link #TEXTS_KEY}, the empty string, which no splitting mode ever reports as
 * a piece (pieces are non-empty by the contract of {@link Splitting}).
 *
 * <p>Internal: not part of the public API.
 */
public final class PartitionCounter implements PairFlatMapFunction<Iterator<String>, String, Long> {
  private static final long serialVersionUID = 1L;

  /** The key under which the number of texts travels; never a piece. */
  public static final String TEXTS_KEY = "";

  private final String normalizationSpec;
  private final String splittingSpec;
  private final int flushAt;

  /**
   * @param normalizationSpec {@link Normalization#spec()} of the pipeline
   * @param splittingSpec {@link Splitting#spec()} of the pipeline
   * @param flushAt distinct pieces in the local map that trigger a flush downstream
   */
  public PartitionCounter(String normalizationSpec, String splittingSpec, int flushAt) {
    this.normalizationSpec = normalizationSpec;
    this.splittingSpec = splittingSpec;
    this.flushAt = flushAt;
  }

  @Override
  public Iterator<Tuple2<String, Long>> call(Iterator<String> texts) {
    return new Counting(texts, Normalization.parse(normalizationSpec), Splitting.parse(splittingSpec), flushAt);
  }

  /** A lazy iterator: reads texts until the map is full or the input ends, then streams the map out. */
  private static final class Counting implements Iterator<Tuple2<String, Long>>, PieceSink {
    private final Iterator<String> texts;
    private final Normalization normalization;
    private final Splitting splitting;
    private final int flushAt;
    private final Object2LongOpenHashMap<String> map = new Object2LongOpenHashMap<>();
    private ObjectIterator<Object2LongMap.Entry<String>> out;
    private long textsSinceFlush;
    private boolean textsPending;
    private String text;

    Counting(Iterator<String> texts, Normalization normalization, Splitting splitting, int flushAt) {
      this.texts = texts;
      this.normalization = normalization;
      this.splitting = splitting;
      this.flushAt = flushAt;
    }

    @Override
    public boolean hasNext() {
      while (true) {
        if (out != null) {
          if (out.hasNext()) {
            return true;
          }
          out = null;
          map.clear();
        }
        if (textsPending) {
          return true;
        }
        if (!texts.hasNext()) {
          return false;
        }
        fill();
      }
    }

    @Override
    public Tuple2<String, Long> next() {
      if (!hasNext()) {
        throw new NoSuchElementException();
      }
      if (out != null && out.hasNext()) {
        Object2LongMap.Entry<String> e = out.next();
        return new Tuple2<>(e.getKey(), e.getLongValue());
      }
      textsPending = false;
      long n = textsSinceFlush;
      textsSinceFlush = 0;
      return new Tuple2<>(TEXTS_KEY, n);
    }

    /** Reads texts until the map passes {@code flushAt} or the input ends; then exposes the map. */
    private void fill() {
      while (texts.hasNext() && map.size() <= flushAt) {
        String raw = texts.next();
        if (raw == null) {
          continue;
        }
        String t = normalization.apply(raw).text();
        text = t;
        splitting.split(t, 0, t.length(), this);
        text = null;
        textsSinceFlush++;
      }
      out = map.object2LongEntrySet().fastIterator();
      textsPending = textsSinceFlush > 0;
    }

    @Override
    public void piece(int start, int end) {
      map.addTo(text.substring(start, end), 1);
    }
  }
}
