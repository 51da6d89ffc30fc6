package dev.morsel.tokenize.cli;

import java.awt.Color;
import java.awt.Rectangle;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.function.ToDoubleFunction;
import org.jfree.chart.ChartFactory;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.plot.PlotOrientation;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.data.category.DefaultCategoryDataset;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.svg.SVGGraphics2D;

/** Writes a sweep's CSV and its self-contained HTML report with SVG charts. */
final class Report {
  static final String CSV_HEADER = "scheme,requested_size,vocabulary_size,group,texts,words,chars,bytes,tokens,"
      + "tokens_per_word,tokens_per_1000_chars,bytes_per_token,unknown_rate,vocabulary_used,train_seconds,encode_mb_per_s";

  private Report() {}

  static void csv(List<Sweep.Row> rows, Path file) throws IOException {
    StringBuilder sb = new StringBuilder(CSV_HEADER).append('\n');
    for (Sweep.Row r : rows) {
      sb.append(String.format(Locale.ROOT, "%s,%d,%d,%s,%d,%d,%d,%d,%d,%.4f,%.2f,%.3f,%.5f,%.4f,%.2f,%.2f%n", r.scheme(),
          r.requestedSize(), r.vocabularySize(), csvField(r.group()), r.texts(), r.words(), r.chars(), r.bytes(), r.tokens(),
          r.tokensPerWord(), r.tokensPer1000Chars(), r.bytesPerToken(), r.unknownRate(), r.vocabularyUsed(),
          r.trainSeconds(), r.mbPerSecond()));
    }
    Files.write(file, sb.toString().getBytes(StandardCharsets.UTF_8));
  }

  private static String csvField(String s) {
    return s.contains(",") || s.contains("\"") ? "\"" + s.replace("\"", "\"\"") + "\"" : s;
  }

  /** The HTML report: three SVG charts and the overall table. */
  static void html(List<Sweep.Row> rows, Path file, String title) throws IOException {
    System.setProperty("java.awt.headless", "true");
    List<Sweep.Row> all = new ArrayList<>();
    for (Sweep.Row r : rows) {
      if (r.group().equals(Sweep.ALL)) {
        all.add(r);
      }
    }
    StringBuilder sb = new StringBuilder();
    sb.append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>").append(esc(title))
        .append("</title>\n<style>body{font-family:sans-serif;max-width:1000px;margin:2em auto;color:#222}"
            + "table{border-collapse:collapse}td,th{border:1px solid #bbb;padding:3px 8px;text-align:right}"
            + "th{background:#eee}figure{margin:1.5em 0}</style></head><body>\n");
    sb.append("<h1>").append(esc(title)).append("</h1>\n");
    sb.append("<p>Held-out text encoded with each scheme and vocabulary size. Fewer tokens per word means shorter"
        + " sequences; a larger vocabulary costs memory and rarer tokens.</p>\n");
    sb.append("<figure id=\"chart-length\">").append(lineChart(all, "Sequence length vs vocabulary size",
        "tokens per 1,000 characters", Sweep.Row::tokensPer1000Chars)).append("</figure>\n");
    sb.append("<figure id=\"chart-unknown\">").append(lineChart(all, "Unknown-token rate vs vocabulary size",
        "unknown tokens / tokens", Sweep.Row::unknownRate)).append("</figure>\n");
    sb.append("<figure id=\"chart-fertility\">").append(groupChart(rows)).append("</figure>\n");
    sb.append("<h2>Overall</h2>\n<table><tr><th>scheme</th><th>requested</th><th>vocabulary</th><th>tokens/word</th>"
        + "<th>tokens/1k chars</th><th>bytes/token</th><th>unknown rate</th><th>vocabulary used</th><th>train s</th>"
        + "<th>encode MB/s</th></tr>\n");
    for (Sweep.Row r : all) {
      sb.append(String.format(Locale.ROOT, "<tr><td>%s</td><td>%d</td><td>%d</td><td>%.3f</td><td>%.1f</td><td>%.2f</td>"
          + "<td>%.4f</td><td>%.1f%%</td><td>%.1f</td><td>%.1f</td></tr>%n", esc(r.scheme()), r.requestedSize(),
          r.vocabularySize(), r.tokensPerWord(), r.tokensPer1000Chars(), r.bytesPerToken(), r.unknownRate(),
          100 * r.vocabularyUsed(), r.trainSeconds(), r.mbPerSecond()));
    }
    sb.append("</table>\n</body></html>\n");
    Files.write(file, sb.toString().getBytes(StandardCharsets.UTF_8));
  }

  private static String lineChart(List<Sweep.Row> all, String title, String yLabel, ToDoubleFunction<Sweep.Row> y) {
    XYSeriesCollection data = new XYSeriesCollection();
    for (String scheme : schemes(all)) {
      XYSeries s = new XYSeries(scheme);
      for (Sweep.Row r : all) {
        if (r.scheme().equals(scheme)) {
          s.add(r.vocabularySize(), y.applyAsDouble(r));
        }
      }
      data.addSeries(s);
    }
    JFreeChart chart = ChartFactory.createXYLineChart(title, "vocabulary size", yLabel, data, PlotOrientation.VERTICAL,
        true, false, false);
    XYPlot plot = chart.getXYPlot();
    plot.setRenderer(new XYLineAndShapeRenderer(true, true));
    plot.setBackgroundPaint(Color.WHITE);
    plot.setRangeGridlinePaint(Color.LIGHT_GRAY);
    plot.setDomainGridlinePaint(Color.LIGHT_GRAY);
    org.jfree.chart.axis.NumberAxis range = (org.jfree.chart.axis.NumberAxis) plot.getRangeAxis();
    range.setAutoRangeIncludesZero(true);
    if (data.getRangeUpperBound(false) <= 0) {
      range.setRange(0, 0.01); // all zero (no unknown tokens): show a flat line at 0, not an axis around it
    }
    return svg(chart);
  }

  private static String groupChart(List<Sweep.Row> rows) {
    int largest = 0;
    for (Sweep.Row r : rows) {
      largest = Math.max(largest, r.requestedSize());
    }
    DefaultCategoryDataset data = new DefaultCategoryDataset();
    for (Sweep.Row r : rows) {
      if (r.requestedSize() == largest && !r.group().equals(Sweep.ALL)) {
        data.addValue(r.tokensPerWord(), r.scheme(), r.group());
      }
    }
    JFreeChart chart = ChartFactory.createBarChart("Tokens per word by input at vocabulary size " + largest, "input",
        "tokens per word", data, PlotOrientation.VERTICAL, true, false, false);
    chart.getCategoryPlot().setBackgroundPaint(Color.WHITE);
    chart.getCategoryPlot().setRangeGridlinePaint(Color.LIGHT_GRAY);
    return svg(chart);
  }

  private static String svg(JFreeChart chart) {
    SVGGraphics2D g = new SVGGraphics2D(900, 420);
    chart.draw(g, new Rectangle(0, 0, 900, 420));
    return g.getSVGElement();
  }

  private static Set<String> schemes(List<Sweep.Row> rows) {
    Set<String> s = new LinkedHashSet<>();
    for (Sweep.Row r : rows) {
      s.add(r.scheme());
    }
    return s;
  }

  static String esc(String s) {
    return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("\"", "&quot;");
  }
}
