package dev.morsel.tokenize.cli;

import dev.morsel.tokenize.Pipeline;
import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.Rectangle;
import java.awt.Shape;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Path2D;
import java.awt.geom.Rectangle2D;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.time.ZonedDateTime;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.function.ToDoubleFunction;
import org.jfree.chart.ChartFactory;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.AxisState;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTick;
import org.jfree.chart.axis.TickType;
import org.jfree.chart.plot.CategoryPlot;
import org.jfree.chart.plot.PlotOrientation;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.category.BarRenderer;
import org.jfree.chart.renderer.category.StandardBarPainter;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.category.DefaultCategoryDataset;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.svg.SVGGraphics2D;

/**
 * Writes a sweep's CSV and its self-contained HTML report with SVG charts. The charts put the
 * vocabulary size on a log axis (sweep sizes are usually geometric) with a tick at each size; each
 * scheme has its own colour from the Okabe–Ito palette (distinguishable with the common colour
 * vision deficiencies), marker shape and dash pattern, so lines that coincide stay readable. A cell
 * that is not feasible is drawn as a grey cross on the size axis and listed under the chart.
 */
final class Report {
  static final String CSV_HEADER = "scheme,requested_size,vocabulary_size,group,feasible,texts,words,chars,bytes,tokens,"
      + "unknown,tokens_per_word,tokens_per_1000_chars,bytes_per_token,unknown_per_1000_chars,vocabulary_used,"
      + "train_seconds,encode_mb_per_s,note";

  /** Okabe &amp; Ito (2008), "Color Universal Design": blue, vermillion, bluish green, reddish purple, orange, sky blue. */
  static final Color[] PALETTE = {new Color(0x0072B2), new Color(0xD55E00), new Color(0x009E73), new Color(0xCC79A7),
      new Color(0xE69F00), new Color(0x56B4E9)};
  private static final float[][] DASHES = {null, {9f, 5f}, {2f, 4f}, {12f, 4f, 2f, 4f}};
  private static final Color INFEASIBLE = new Color(0x777777);

  private Report() {}

  /** What the report records about its inputs and the machine. */
  record Meta(List<String> files, String heldOut, String pipeline, String options, String version, String date,
      String machine, List<String> models) {
    /** These facts with the models compared named, one line each (a comparison has no scheme options). */
    Meta withModels(List<String> described) {
      return new Meta(files, heldOut, pipeline, "", version, date, machine, List.copyOf(described));
    }

    static Meta of(List<Path> paths, int every, Pipeline pipeline, String options) throws IOException {
      return of(paths, String.format(Locale.ROOT, "line i (0-based) of each file is held out when i %% %d = %d;"
          + " the other lines train", every, every - 1), pipeline, options);
    }

    /** As {@link #of(List, int, Pipeline, String)} with the held-out text described in words. */
    static Meta of(List<Path> paths, String heldOut, Pipeline pipeline, String options) throws IOException {
      List<String> files = new ArrayList<>();
      for (Path p : paths) {
        files.add(String.format(Locale.ROOT, "%s (%,d bytes)", p, Files.size(p)));
      }
      String v = new Morsel.Version().getVersion()[0];
      Runtime rt = Runtime.getRuntime();
      String machine = String.format(Locale.ROOT, "%s %s, %d cores, Java %s, max heap %,d MB", System.getProperty("os.name"),
          System.getProperty("os.arch"), rt.availableProcessors(), System.getProperty("java.version"),
          rt.maxMemory() / (1024 * 1024));
      return new Meta(files, heldOut, "normalization " + pipeline.normalization().spec()
          + ", splitting " + pipeline.splitting().spec(), options, v,
          ZonedDateTime.now().format(DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm z", Locale.ROOT)), machine, List.of());
    }
  }

  static void csv(List<Sweep.Row> rows, Path file) throws IOException {
    StringBuilder sb = new StringBuilder(CSV_HEADER).append('\n');
    for (Sweep.Row r : rows) {
      boolean all = r.group().equals(Sweep.ALL);
      if (r.feasible()) {
        sb.append(String.format(Locale.ROOT, "%s,%d,%d,%s,yes,%d,%d,%d,%d,%d,%d,%.4f,%.2f,%.3f,%.4f,%.4f,%s,%s,%n",
            r.scheme(), r.requestedSize(), r.vocabularySize(), csvField(r.group()), r.texts(), r.words(), r.chars(),
            r.bytes(), r.tokens(), r.unknown(), r.tokensPerWord(), r.tokensPer1000Chars(), r.bytesPerToken(),
            r.unknownPer1000Chars(), r.vocabularyUsed(), all ? fixed(r.trainSeconds(), 2) : "",
            all ? fixed(r.mbPerSecond(), 2) : ""));
      } else {
        sb.append(String.format(Locale.ROOT, "%s,%d,,%s,no,,,,,,,,,,,,,,%s%n", r.scheme(), r.requestedSize(),
            csvField(r.group()), csvField("not feasible: " + r.note())));
      }
    }
    Files.write(file, sb.toString().getBytes(StandardCharsets.UTF_8));
  }

  /** The header of {@code sweep-scripts.csv}. */
  static final String SCRIPTS_CSV_HEADER = "scheme,requested_size,vocabulary_size,script,chars,tokens,tokens_per_char,"
      + "unknown_chars,byte_spelled_chars,unknown_or_byte_rate";

  /** The per-script figures, one row per scheme, size and script. */
  static void scriptsCsv(List<Sweep.ScriptRow> rows, Path file) throws IOException {
    StringBuilder sb = new StringBuilder(SCRIPTS_CSV_HEADER).append('\n');
    for (Sweep.ScriptRow r : rows) {
      sb.append(String.format(Locale.ROOT, "%s,%d,%d,%s,%d,%d,%.4f,%d,%d,%.6f%n", r.scheme(), r.requestedSize(),
          r.vocabularySize(), csvField(r.script()), r.chars(), r.tokens(), r.tokensPerChar(), r.unknownChars(),
          r.byteChars(), r.unknownOrByteRate()));
    }
    Files.write(file, sb.toString().getBytes(StandardCharsets.UTF_8));
  }

  /** The HTML table of the per-script figures. */
  static String scriptsTable(List<Sweep.ScriptRow> rows) {
    StringBuilder sb = new StringBuilder();
    sb.append("<h2 id=\"by-script\">By script</h2>\n<p>Held-out characters grouped by their Unicode script (ICU"
        + " script property); a token counts for the script of its first character that is not Common or Inherited."
        + " A high share of unknown or byte-spelled characters shows a script the vocabulary serves badly.</p>\n"
        + "<table><tr><th class=\"t\">scheme</th><th>vocabulary</th><th class=\"t\">script</th><th>characters</th>"
        + "<th>tokens/char</th><th>unknown chars</th><th>byte-spelled chars</th><th>unknown or byte-spelled</th></tr>\n");
    for (Sweep.ScriptRow r : rows) {
      sb.append(String.format(Locale.ROOT, "<tr><td class=\"t\">%s</td><td>%s</td><td class=\"t\">%s</td><td>%s</td>"
          + "<td>%.3f</td><td>%s</td><td>%s</td><td>%.3f%%</td></tr>%n", esc(r.scheme()), num(r.vocabularySize()),
          esc(r.script()), num(r.chars()), r.tokensPerChar(), num(r.unknownChars()), num(r.byteChars()),
          100 * r.unknownOrByteRate()));
    }
    return sb.append("</table>\n").toString();
  }

  private static String fixed(double v, int digits) {
    return Double.isNaN(v) ? "" : String.format(Locale.ROOT, "%." + digits + "f", v);
  }

  private static String csvField(String s) {
    return s.contains(",") || s.contains("\"") || s.contains("\n") ? "\"" + s.replace("\"", "\"\"") + "\"" : s;
  }

  /** The HTML report: what was measured on what, three SVG charts, the overall and per-input tables. */
  static void html(List<Sweep.Row> rows, Path file, String title, Meta meta) throws IOException {
    html(rows, List.of(), file, title, meta);
  }

  /** The HTML report with the per-script table after the per-input one (none when {@code scripts} is empty). */
  static void html(List<Sweep.Row> rows, List<Sweep.ScriptRow> scripts, Path file, String title, Meta meta)
      throws IOException {
    System.setProperty("java.awt.headless", "true");
    List<Sweep.Row> all = new ArrayList<>();
    for (Sweep.Row r : rows) {
      if (r.group().equals(Sweep.ALL)) {
        all.add(r);
      }
    }
    TreeSet<Integer> sizes = new TreeSet<>();
    for (Sweep.Row r : all) {
      sizes.add(r.requestedSize());
    }
    StringBuilder sb = new StringBuilder();
    sb.append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>").append(esc(title))
        .append("</title>\n<style>body{font-family:sans-serif;max-width:1100px;margin:2em auto;padding:0 1em;color:#222;line-height:1.4}"
            + "table{border-collapse:collapse;margin:0.5em 0 1.5em}td,th{border:1px solid #bbb;padding:3px 8px}"
            + "td{text-align:right;font-variant-numeric:tabular-nums}td.t,th.t{text-align:left}td.w{white-space:nowrap}th{background:#eee}"
            + "th{font-size:0.92em}figure{margin:1.5em 0}figcaption{color:#444;font-size:0.92em;max-width:900px}"
            + "tr.no td{color:#777;font-style:italic}dl{display:grid;grid-template-columns:max-content 1fr;gap:2px 14px}"
            + "dt{font-weight:bold}dd{margin:0}</style></head><body>\n");
    sb.append("<h1>").append(esc(title)).append("</h1>\n");
    sb.append("<p>Held-out text encoded with each scheme and vocabulary size. Fewer tokens per word means shorter"
        + " sequences; a larger vocabulary costs memory and rarer tokens.</p>\n");
    sb.append("<h2>What was measured</h2>\n<dl>");
    sb.append("<dt>corpus</dt><dd>").append(esc(String.join("; ", meta.files()))).append("</dd>");
    sb.append("<dt>held out</dt><dd>").append(esc(meta.heldOut())).append("</dd>");
    sb.append("<dt>pipeline</dt><dd>").append(esc(meta.pipeline()));
    if (meta.models().isEmpty()) {
      sb.append("; scheme options ").append(esc(meta.options()));
    }
    sb.append("</dd>");
    for (String m : meta.models()) {
      sb.append("<dt>model</dt><dd>").append(esc(m)).append("</dd>");
    }
    sb.append("<dt>encode speed</dt><dd>one thread, median of ").append(Sweep.TIMED_ROUNDS)
        .append(" rounds (passes over the held-out text for at least 50 ms) after a warm-up until ").append(Steady.WINDOW)
        .append(" consecutive rounds agree within 5% (the warm-up of each cell is in the table)</dd>");
    sb.append("<dt>Morsel</dt><dd>").append(esc(meta.version())).append("</dd>");
    sb.append("<dt>date</dt><dd>").append(esc(meta.date())).append("</dd>");
    sb.append("<dt>machine</dt><dd>").append(esc(meta.machine())).append("</dd></dl>\n");

    List<String> infeasible = new ArrayList<>();
    for (Sweep.Row r : all) {
      if (!r.feasible()) {
        infeasible.add(r.scheme() + " at " + num(r.requestedSize()));
      }
    }
    String missing = infeasible.isEmpty() ? "" : " Not feasible (grey × on the size axis): " + String.join(", ", infeasible)
        + "; the reasons are in the table.";

    sb.append("<figure id=\"chart-length\">").append(lineChart(all, sizes, "Sequence length vs vocabulary size",
        "tokens per 1,000 characters", Sweep.Row::tokensPer1000Chars, null)).append("<figcaption>Tokens per 1,000"
        + " characters of held-out text; lower is shorter.").append(esc(missing)).append("</figcaption></figure>\n");
    boolean anyUnknown = false;
    for (Sweep.Row r : all) {
      anyUnknown |= r.feasible() && r.unknown() > 0;
    }
    String why = anyUnknown ? null : "No unknown token at any size: every line is at 0.";
    sb.append("<figure id=\"chart-unknown\">").append(lineChart(all, sizes, "Unknown tokens vs vocabulary size",
        "unknown tokens per 1,000 characters", Sweep.Row::unknownPer1000Chars, why)).append("<figcaption>")
        .append(anyUnknown ? "Unknown tokens per 1,000 characters of held-out text (a share of tokens would rise with"
            + " the size only because tokens get longer)."
            : "Every held-out character was encodable at every size, so no scheme produced an unknown token and"
            + " the chart is flat at 0.")
        .append(esc(missing)).append("</figcaption></figure>\n");
    sb.append("<figure id=\"chart-fertility\">").append(groupChart(rows)).append("</figure>\n");

    sb.append("<h2>Overall</h2>\n<table><tr><th class=\"t\">scheme</th><th>requested</th><th>vocabulary</th>"
        + "<th>tokens/word</th><th>tokens/1k chars</th><th>bytes/token</th><th>unknown</th><th>unknown/1k chars</th>"
        + "<th>vocabulary used</th><th>train (s)</th><th>encode MB/s</th><th class=\"t\">speed warm-up</th></tr>\n");
    for (Sweep.Row r : all) {
      if (r.feasible()) {
        sb.append(String.format(Locale.ROOT, "<tr><td class=\"t\">%s</td><td>%s</td><td>%s</td><td>%.3f</td><td>%.1f</td>"
            + "<td>%.2f</td><td>%s</td><td>%.3f</td><td>%.1f%%</td><td>%s</td><td>%.1f</td><td class=\"t w\">%s</td></tr>%n",
            esc(r.scheme()), num(r.requestedSize()), num(r.vocabularySize()), r.tokensPerWord(), r.tokensPer1000Chars(),
            r.bytesPerToken(), num(r.unknown()), r.unknownPer1000Chars(), 100 * r.vocabularyUsed(), fixed(r.trainSeconds(), 2),
            r.mbPerSecond(), esc(r.warmup())));
      } else {
        sb.append("<tr class=\"no\"><td class=\"t\">").append(esc(r.scheme())).append("</td><td>")
            .append(num(r.requestedSize())).append("</td><td colspan=\"10\" class=\"t\">not feasible: ")
            .append(esc(r.note())).append("</td></tr>\n");
      }
    }
    sb.append("</table>\n");
    sb.append("<h2>By input</h2>\n<table><tr><th class=\"t\">input</th><th class=\"t\">scheme</th><th>vocabulary</th>"
        + "<th>texts</th><th>words</th><th>tokens/word</th><th>tokens/1k chars</th><th>bytes/token</th>"
        + "<th>unknown/1k chars</th></tr>\n");
    for (Sweep.Row r : rows) {
      if (!r.group().equals(Sweep.ALL) && r.feasible()) {
        sb.append(String.format(Locale.ROOT, "<tr><td class=\"t\">%s</td><td class=\"t\">%s</td><td>%s</td><td>%s</td>"
            + "<td>%s</td><td>%.3f</td><td>%.1f</td><td>%.2f</td><td>%.3f</td></tr>%n", esc(r.group()), esc(r.scheme()),
            num(r.vocabularySize()), num(r.texts()), num(r.words()), r.tokensPerWord(), r.tokensPer1000Chars(),
            r.bytesPerToken(), r.unknownPer1000Chars()));
      }
    }
    sb.append("</table>\n");
    if (!scripts.isEmpty()) {
      sb.append(scriptsTable(scripts));
    }
    sb.append("</body></html>\n");
    Files.write(file, sb.toString().getBytes(StandardCharsets.UTF_8));
  }

  static String num(long v) {
    return String.format(Locale.ROOT, "%,d", v);
  }

  private static DecimalFormat format(String pattern) {
    return new DecimalFormat(pattern, DecimalFormatSymbols.getInstance(Locale.ROOT));
  }

  /** Marker shapes, one per scheme: circle, square, triangle, diamond. */
  private static Shape shape(int i) {
    double s = 7;
    switch (i % 4) {
      case 0: return new Ellipse2D.Double(-s / 2, -s / 2, s, s);
      case 1: return new Rectangle2D.Double(-s / 2, -s / 2, s, s);
      case 2: {
        Path2D.Double p = new Path2D.Double();
        p.moveTo(0, -s / 1.6);
        p.lineTo(s / 1.6, s / 2.2);
        p.lineTo(-s / 1.6, s / 2.2);
        p.closePath();
        return p;
      }
      default: {
        Path2D.Double p = new Path2D.Double();
        p.moveTo(0, -s / 1.5);
        p.lineTo(s / 1.5, 0);
        p.lineTo(0, s / 1.5);
        p.lineTo(-s / 1.5, 0);
        p.closePath();
        return p;
      }
    }
  }

  private static Shape cross() {
    Path2D.Double p = new Path2D.Double();
    double s = 5;
    p.moveTo(-s, -s);
    p.lineTo(s, s);
    p.moveTo(-s, s);
    p.lineTo(s, -s);
    return new BasicStroke(2f).createStrokedShape(p);
  }

  /** A log axis with one tick at each sweep size, labelled with thousands separators. */
  static LogAxis sizeAxis(TreeSet<Integer> sizes) {
    DecimalFormat f = format("#,##0");
    LogAxis x = new LogAxis("vocabulary size (log scale)") {
      private static final long serialVersionUID = 1L;

      @Override
      @SuppressWarnings("rawtypes")
      public List refreshTicks(Graphics2D g2, AxisState state, Rectangle2D dataArea, RectangleEdge edge) {
        List<NumberTick> ticks = new ArrayList<>();
        for (int s : sizes) {
          ticks.add(new NumberTick(TickType.MAJOR, s, f.format(s), TextAnchor.TOP_CENTER, TextAnchor.CENTER, 0.0));
        }
        return ticks;
      }
    };
    double lo = sizes.first();
    double hi = sizes.last();
    double pad = Math.max(1.15, Math.pow(hi / lo, 0.06));
    x.setRange(lo / pad, hi * pad);
    x.setNumberFormatOverride(f);
    return x;
  }

  private static String lineChart(List<Sweep.Row> all, TreeSet<Integer> sizes, String title, String yLabel,
      ToDoubleFunction<Sweep.Row> y, String emptyNote) {
    XYSeriesCollection data = new XYSeriesCollection();
    List<String> schemes = new ArrayList<>(schemes(all));
    for (String scheme : schemes) {
      XYSeries s = new XYSeries(scheme);
      for (Sweep.Row r : all) {
        if (r.scheme().equals(scheme) && r.feasible()) {
          s.add(r.requestedSize(), y.applyAsDouble(r));
        }
      }
      data.addSeries(s);
    }
    XYSeries missing = new XYSeries("not feasible");
    for (Sweep.Row r : all) {
      if (!r.feasible() && missing.indexOf(r.requestedSize()) < 0) {
        missing.add(r.requestedSize(), 0.0);
      }
    }
    if (!missing.isEmpty()) {
      data.addSeries(missing);
    }
    JFreeChart chart = ChartFactory.createXYLineChart(title, "vocabulary size", yLabel, data, PlotOrientation.VERTICAL,
        true, false, false);
    XYPlot plot = chart.getXYPlot();
    plot.setDomainAxis(sizeAxis(sizes));
    XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(true, true);
    for (int i = 0; i < schemes.size(); i++) {
      int k = Schemes.NAMES.indexOf(schemes.get(i)) < 0 ? i : Schemes.NAMES.indexOf(schemes.get(i));
      renderer.setSeriesPaint(i, PALETTE[k % PALETTE.length]);
      float[] dash = DASHES[k % DASHES.length];
      renderer.setSeriesStroke(i, dash == null ? new BasicStroke(2.2f)
          : new BasicStroke(2.2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_ROUND, 10f, dash, 0f));
      renderer.setSeriesShape(i, shape(k));
    }
    if (!missing.isEmpty()) {
      int m = schemes.size();
      renderer.setSeriesLinesVisible(m, false);
      renderer.setSeriesShape(m, cross());
      renderer.setSeriesPaint(m, INFEASIBLE);
    }
    renderer.setDrawSeriesLineAsPath(true);
    plot.setRenderer(renderer);
    // first scheme drawn first: the dashed and dotted lines of later schemes stay visible over a solid one they meet
    plot.setSeriesRenderingOrder(org.jfree.chart.plot.SeriesRenderingOrder.FORWARD);
    plot.setBackgroundPaint(Color.WHITE);
    plot.setRangeGridlinePaint(Color.LIGHT_GRAY);
    plot.setDomainGridlinePaint(Color.LIGHT_GRAY);
    NumberAxis range = (NumberAxis) plot.getRangeAxis();
    range.setAutoRangeIncludesZero(true);
    double top = data.getRangeUpperBound(false);
    // enough decimals that ticks of small values stay distinct (0.0004, not 0 and 0 and 0.001), never E-notation
    int decimals = top > 0 ? Math.max(0, (int) Math.ceil(-Math.log10(top))) + 2 : 1;
    range.setNumberFormatOverride(format("#,##0." + "#".repeat(decimals)));
    if (data.getRangeUpperBound(false) <= 0) {
      range.setRange(-0.05, 1); // all zero: a flat line at 0 inside the plot, not an axis squeezed around it
    }
    if (emptyNote != null) {
      TextTitle note = new TextTitle(emptyNote, new Font("SansSerif", Font.ITALIC, 13));
      note.setPaint(new Color(0x444444));
      chart.addSubtitle(note);
    }
    return svg(chart);
  }

  /**
   * Tokens per word per input, one bar per scheme at its largest feasible size: in a sweep all
   * schemes usually share that size (the title names it); in a comparison each model has its own.
   */
  private static String groupChart(List<Sweep.Row> rows) {
    Map<String, Integer> largest = new LinkedHashMap<>();
    for (Sweep.Row r : rows) {
      if (r.feasible()) {
        largest.merge(r.scheme(), r.requestedSize(), Math::max);
      }
    }
    DefaultCategoryDataset data = new DefaultCategoryDataset();
    for (Sweep.Row r : rows) {
      if (r.feasible() && r.requestedSize() == largest.get(r.scheme()) && !r.group().equals(Sweep.ALL)) {
        data.addValue(r.tokensPerWord(), r.scheme(), r.group());
      }
    }
    Set<Integer> sizes = new TreeSet<>(largest.values());
    String title = sizes.size() == 1 ? "Tokens per word by input at vocabulary size " + num(sizes.iterator().next())
        : "Tokens per word by input, each at its largest vocabulary size";
    JFreeChart chart = ChartFactory.createBarChart(title, "input",
        "tokens per word", data, PlotOrientation.VERTICAL, true, false, false);
    CategoryPlot plot = chart.getCategoryPlot();
    plot.setBackgroundPaint(Color.WHITE);
    plot.setRangeGridlinePaint(Color.LIGHT_GRAY);
    ((NumberAxis) plot.getRangeAxis()).setNumberFormatOverride(format("#,##0.##"));
    BarRenderer r = (BarRenderer) plot.getRenderer();
    r.setBarPainter(new StandardBarPainter());
    r.setShadowVisible(false);
    for (int i = 0; i < data.getRowCount(); i++) {
      r.setSeriesPaint(i, PALETTE[Schemes.NAMES.indexOf((String) data.getRowKey(i)) < 0 ? i % PALETTE.length
          : Schemes.NAMES.indexOf((String) data.getRowKey(i))]);
    }
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
