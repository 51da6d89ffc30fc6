package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.train.TrainingListener;
import java.io.PrintStream;
import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.util.Locale;
import java.util.function.LongSupplier;
import me.tongfei.progressbar.ConsoleProgressBarConsumer;
import me.tongfei.progressbar.ProgressBar;
import me.tongfei.progressbar.ProgressBarBuilder;
import me.tongfei.progressbar.ProgressBarStyle;

/**
 * Draws one progress bar per phase of long work on standard error, updated in place: counting (in
 * MB read of the total when the inputs are files), merges, and for unigram one bar for the seed and
 * one for all EM and pruning rounds together. The detail text has a fixed width and is cut at a word
 * boundary, so the bar never jumps. Suppressed when standard error is not a terminal, so logs and
 * pipes stay clean.
 */
final class Progress implements TrainingListener, AutoCloseable {
  /** Width of the detail text in characters: fits an 80-column line beside the bar and the rate. */
  static final int DETAIL_WIDTH = 28;

  private final boolean enabled;
  private ProgressBar bar;
  private String phase;
  private LongSupplier bytesRead;
  private long bytesTotal;

  private Progress(boolean enabled) {
    this.enabled = enabled;
  }

  /** A progress display, enabled only when there is a terminal. */
  static Progress onTerminal() {
    return new Progress(System.console() != null);
  }

  /** A progress display that draws nothing. */
  static Progress off() {
    return new Progress(false);
  }

  /** While counting, show {@code read} bytes of {@code total} (-1: unknown) instead of texts; null stops it. */
  synchronized void bytes(LongSupplier read, long total) {
    this.bytesRead = read;
    this.bytesTotal = total;
  }

  /** The phase a stage belongs to: EM and pruning rounds alternate within one phase. */
  static String phase(String stage) {
    switch (stage) {
      case "em":
      case "prune":
        return "EM + pruning";
      case "count":
        return "counting";
      default:
        return stage;
    }
  }

  @Override
  public synchronized void progress(String stage, long done, long total, String detail) {
    if (!enabled) {
      return;
    }
    String p = phase(stage);
    boolean counting = stage.equals("count") && bytesRead != null;
    if (bar == null || !p.equals(phase)) {
      close();
      phase = p;
      ProgressBarBuilder b = new ProgressBarBuilder().setTaskName(p).setStyle(ProgressBarStyle.ASCII)
          .setConsumer(new ConsoleProgressBarConsumer(new PrintStream(System.err, true), 80))
          .setUpdateIntervalMillis(250).setMaxRenderedLength(80);
      if (counting) {
        b.setUnit(" MB", 1_000_000).setInitialMax(bytesTotal).showSpeed(rate("#,##0.0"));
      } else {
        b.setInitialMax(total).showSpeed(rate("#,##0"));
      }
      bar = b.build();
    }
    if (counting) {
      bar.stepTo(bytesRead.getAsLong());
    } else {
      if (total >= 0 && bar.getMax() != total) {
        bar.maxHint(total);
      }
      bar.stepTo(done);
    }
    bar.setExtraMessage(" " + fit(detail == null ? "" : detail, DETAIL_WIDTH));
  }

  private static DecimalFormat rate(String pattern) {
    return new DecimalFormat(pattern, DecimalFormatSymbols.getInstance(Locale.ROOT));
  }

  /** {@code s} cut at the last word boundary within {@code width} (with an ellipsis) and padded to it. */
  static String fit(String s, int width) {
    String t = s.strip();
    if (t.length() > width) {
      int cut = t.lastIndexOf(' ', width - 1);
      t = (cut > width / 2 ? t.substring(0, cut) : t.substring(0, width - 1)).stripTrailing() + "…";
    }
    StringBuilder sb = new StringBuilder(t);
    while (sb.length() < width) {
      sb.append(' ');
    }
    return sb.toString();
  }

  @Override
  public synchronized void close() {
    if (bar != null) {
      bar.close();
      bar = null;
      phase = null;
    }
  }
}
