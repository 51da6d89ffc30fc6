package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.train.TrainingListener;
import java.io.PrintStream;
import me.tongfei.progressbar.ProgressBar;
import me.tongfei.progressbar.ProgressBarBuilder;
import me.tongfei.progressbar.ProgressBarStyle;

/**
 * Draws a progress bar with rate and ETA on standard error for each stage of long work (counting,
 * merges, EM rounds). Suppressed when standard error is not a terminal, so logs and pipes stay clean.
 */
final class Progress implements TrainingListener, AutoCloseable {
  private final boolean enabled;
  private ProgressBar bar;
  private String stage;

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

  @Override
  public synchronized void progress(String stage, long done, long total, String detail) {
    if (!enabled) {
      return;
    }
    if (bar == null || !stage.equals(this.stage)) {
      close();
      this.stage = stage;
      bar = new ProgressBarBuilder().setTaskName(stage).setInitialMax(total).setStyle(ProgressBarStyle.ASCII)
          .setConsumer(new me.tongfei.progressbar.ConsoleProgressBarConsumer(new PrintStream(System.err, true)))
          .showSpeed().setUpdateIntervalMillis(250).build();
    }
    if (total >= 0 && bar.getMax() != total) {
      bar.maxHint(total);
    }
    bar.stepTo(done);
    if (detail != null && !detail.isEmpty()) {
      bar.setExtraMessage(" " + (detail.length() > 30 ? detail.substring(0, 30) : detail));
    }
  }

  @Override
  public synchronized void close() {
    if (bar != null) {
      bar.close();
      bar = null;
    }
  }
}
