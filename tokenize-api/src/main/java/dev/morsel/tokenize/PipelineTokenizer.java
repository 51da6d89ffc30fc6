package dev.morsel.tokenize;

import dev.morsel.tokenize.format.ModelFile;
import dev.morsel.tokenize.format.ModelWriter;
import dev.morsel.tokenize.format.SectionWriter;
import dev.morsel.tokenize.normalize.NormalizedText;
import dev.morsel.tokenize.spi.PieceSegmentation;
import dev.morsel.tokenize.spi.Segmenter;
import dev.morsel.tokenize.spi.TokenSink;
import dev.morsel.tokenize.spi.Workspace;
import dev.morsel.tokenize.spi.WorkspacePool;
import dev.morsel.tokenize.split.PieceSink;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CompletionException;
import java.util.concurrent.Executor;
import java.util.concurrent.ForkJoinPool;

/**
 * The one {@link Tokenizer} implementation: reserved-token scan, normalization with alignment,
 * splitting, segmentation, assembly of original offsets, framing. Immutable and thread-safe; all
 * per-call state lives in an encode {@link Context} drawn from a bounded pool that this tokenizer
 * owns (and shares with its {@code withTemplate}/{@code withLimits} copies, which have the same
 * segmenter): no thread keeps anything, and a dropped tokenizer is garbage with its pool.
 */
final class PipelineTokenizer implements Tokenizer {
  /** Model section tags written by the api (see docs/format.md). */
  static final String SCHEME = ModelFile.TAG_SCHEME;
  static final String PIPE = ModelFile.TAG_PIPELINE;
  static final String RSRV = ModelFile.TAG_RESERVED;
  static final String FRAM = ModelFile.TAG_FRAMING;

  // ------------------------------------------------------------------ configuration

  private final Pipeline pipeline;
  private final Segmenter segmenter;
  private final ReservedTokens reserved;
  private final Template template;
  private final Limits limits;
  private final int maxPieceLength; // copied from limits for the per-piece check
  private final int[] beginIds;
  private final int[] separatorIds;
  private final int[] endIds;
  private final byte[][] reservedBytes;

  // ------------------------------------------------------------------ state

  private volatile String fingerprint;
  /** Encode contexts, shared by the copies that share the segmenter. */
  private final WorkspacePool<Context> contexts;

  // ------------------------------------------------------------------ life-cycle

  PipelineTokenizer(Pipeline pipeline, Segmenter segmenter, ReservedTokens reserved, Template template, Limits limits,
      String fingerprint) {
    this(pipeline, segmenter, reserved, template, limits, fingerprint, null);
  }

  private PipelineTokenizer(Pipeline pipeline, Segmenter segmenter, ReservedTokens reserved, Template template,
      Limits limits, String fingerprint, WorkspacePool<Context> contexts) {
    this.contexts = contexts != null ? contexts : WorkspacePool.of(() -> new Context(segmenter));
    this.pipeline = Objects.requireNonNull(pipeline, "pipeline");
    this.segmenter = Objects.requireNonNull(segmenter, "segmenter");
    this.reserved = Objects.requireNonNull(reserved, "reservedTokens");
    this.template = Objects.requireNonNull(template, "template");
    this.limits = Objects.requireNonNull(limits, "limits");
    this.maxPieceLength = limits.maxPieceLength();
    this.fingerprint = fingerprint;
    int v = segmenter.vocabularySize();
    this.reservedBytes = new byte[v][];
    for (String s : reserved.spellings()) {
      int id = reserved.id(s);
      if (id >= v) {
        throw new IllegalArgumentException("reserved token '" + s + "' has id " + id + ", outside the vocabulary of "
            + v + " ids");
      }
      reservedBytes[id] = s.getBytes(StandardCharsets.UTF_8);
    }
    this.beginIds = resolve(template.begin(), "begin");
    this.separatorIds = resolve(template.separator(), "separator");
    this.endIds = resolve(template.end(), "end");
  }

  private int[] resolve(List<String> spellings, String where) {
    int[] out = new int[spellings.size()];
    for (int i = 0; i < out.length; i++) {
      int id = reserved.id(spellings.get(i));
      if (id < 0) {
        throw new IllegalArgumentException("template " + where + " marker '" + spellings.get(i)
            + "' is not a registered reserved token (registered: " + reserved.spellings() + ")");
      }
      out[i] = id;
    }
    return out;
  }

  // ------------------------------------------------------------------ encode

  @Override
  public Tokens encode(CharSequence text, Trust trust) {
    return encode(text, trust, null);
  }

  /** Like {@link #encode(CharSequence, Trust)}, each piece segmented by {@code how}. */
  Tokens encodeWith(CharSequence text, Trust trust, PieceSegmentation how) {
    return encode(text, trust, Objects.requireNonNull(how, "how"));
  }

  /** One text, framed; each piece segmented by {@code how}, or by the segmenter when it is null. */
  private Tokens encode(CharSequence text, Trust trust, PieceSegmentation how) {
    limits.checkText(text, "text");
    Objects.requireNonNull(trust, "trust");
    Context s = take();
    s.how = how;
    try {
      Tokens.Builder b = s.builder;
      frame(b, beginIds, 0, 0);
      content(s, text, trust, 0);
      frame(b, endIds, text.length(), 0);
      return b.build();
    } finally {
      give(s);
    }
  }

  @Override
  public Tokens encodePair(CharSequence first, CharSequence second, Trust trust) {
    limits.checkText(first, "first");
    limits.checkText(second, "second");
    Objects.requireNonNull(trust, "trust");
    Context s = take();
    try {
      Tokens.Builder b = s.builder;
      frame(b, beginIds, 0, 0);
      content(s, first, trust, 0);
      frame(b, separatorIds, first.length(), 0);
      content(s, second, trust, 1);
      frame(b, endIds, second.length(), 1);
      return b.build();
    } finally {
      give(s);
    }
  }

  @Override
  public Tokens encodeUtf8(byte[] utf8, int offset, int length, Trust trust, Decoding decoding) {
    Objects.requireNonNull(utf8, "utf8");
    Objects.checkFromIndexSize(offset, length, utf8.length);
    Objects.requireNonNull(trust, "trust");
    Objects.requireNonNull(decoding, "decoding");
    Context s = take();
    try {
      return utf8(s, utf8, offset, length, trust, decoding);
    } finally {
      give(s);
    }
  }

  @Override
  public Tokens encodeUtf8(java.nio.ByteBuffer utf8, Trust trust, Decoding decoding) {
    Objects.requireNonNull(utf8, "utf8");
    Objects.requireNonNull(trust, "trust");
    Objects.requireNonNull(decoding, "decoding");
    int pos = utf8.position();
    int n = utf8.remaining();
    Context s = take();
    try {
      if (utf8.hasArray()) {
        return utf8(s, utf8.array(), utf8.arrayOffset() + pos, n, trust, decoding);
      }
      return utf8(s, s.input().copyOf(utf8, pos, n), 0, n, trust, decoding);
    } finally {
      give(s);
    }
  }

  /** Decodes into the context, encodes, and maps every span to byte offsets (one array read per offset). */
  private Tokens utf8(Context s, byte[] bytes, int offset, int length, Trust trust, Decoding decoding) {
    Utf8Input in = s.input();
    String text = in.decode(bytes, offset, length, decoding);
    limits.checkText(text, "text");
    Tokens.Builder b = s.builder;
    frame(b, beginIds, 0, 0);
    content(s, text, trust, 0);
    frame(b, endIds, text.length(), 0);
    final int[] at = in.byteAt;
    final int[] st = b.starts;
    final int[] en = b.ends;
    for (int i = 0, n = b.size; i < n; i++) {
      st[i] = at[st[i]];
      en[i] = at[en[i]];
    }
    return b.build();
  }

  private static void frame(Tokens.Builder b, int[] ids, int at, int segment) {
    for (int id : ids) {
      b.add(id, at, at, segment, Tokens.RESERVED | Tokens.FRAME);
    }
  }

  /** Encodes one text's content into the scratch builder. */
  private void content(Context s, CharSequence text, Trust trust, int segment) {
    s.segment = segment;
    int n = text.length();
    if (trust == Trust.TRUSTED && !reserved.isEmpty()) {
      int at = 0;
      int[] hit = s.hit;
      while (at < n) {
        int found = reserved.find(text, at, n, hit);
        int stop = found < 0 ? n : found;
        if (stop > at) {
          plain(s, text, at, stop);
        }
        if (found < 0) {
          break;
        }
        s.builder.add(hit[0], found, hit[1], segment, Tokens.RESERVED);
        at = hit[1];
      }
    } else if (n > 0) {
      plain(s, text, 0, n);
    }
  }

  /** Normalizes, splits and segments {@code text[from, to)}, which holds no reserved token. */
  private void plain(Context s, CharSequence text, int from, int to) {
    NormalizedText norm = pipeline.normalization().apply(text, from, to);
    s.norm = norm;
    s.cursor.reset(norm);
    String t = norm.text();
    s.normalized = t;
    if (!t.isEmpty()) {
      pipeline.splitting().split(t, 0, t.length(), s.pieceSink);
    }
    s.norm = null;
    s.cursor.reset(null);
    s.normalized = null;
  }

  @Override
  public List<Tokens> encodeAll(List<? extends CharSequence> texts) {
    return encodeAll(texts, Trust.UNTRUSTED, ForkJoinPool.commonPool());
  }

  @Override
  public List<Tokens> encodeAll(List<? extends CharSequence> texts, Trust trust, Executor executor) {
    Objects.requireNonNull(texts, "texts");
    Objects.requireNonNull(trust, "trust");
    Objects.requireNonNull(executor, "executor");
    limits.checkBatch(texts.size());
    int n = texts.size();
    Tokens[] out = new Tokens[n];
    // chunks of ~64 texts (or fewer when the batch is small) keep task overhead low and both cores busy
    int chunk = Math.max(1, Math.min(64, n / 16));
    List<CompletableFuture<Void>> tasks = new ArrayList<>();
    for (int start = 0; start < n; start += chunk) {
      int from = start;
      int to = Math.min(n, start + chunk);
      tasks.add(CompletableFuture.runAsync(() -> {
        for (int i = from; i < to; i++) {
          CharSequence t = texts.get(i);
          if (t == null) {
            throw new NullPointerException("text " + i + " of the batch is null");
          }
          out[i] = encode(t, trust);
        }
      }, executor));
    }
    try {
      CompletableFuture.allOf(tasks.toArray(new CompletableFuture<?>[0])).join();
    } catch (CompletionException e) {
      Throwable c = e.getCause();
      if (c instanceof RuntimeException) {
        throw (RuntimeException) c;
      }
      if (c instanceof Error) {
        throw (Error) c;
      }
      throw e;
    }
    return Arrays.asList(out);
  }

  @Override
  public List<Tokens> encodeWindows(CharSequence text, int size, int step) {
    limits.checkText(text, "text");
    if (size < 1 || step < 1 || step > size) {
      throw new IllegalArgumentException("windows need 0 < step <= size, got size=" + size + ", step=" + step);
    }
    Tokens all;
    Context s = take();
    try {
      content(s, text, Trust.UNTRUSTED, 0);
      all = s.builder.build();
    } finally {
      give(s);
    }
    int n = all.size();
    List<Tokens> out = new ArrayList<>();
    for (int start = 0; ; start += step) {
      int end = Math.min(n, start + size);
      Tokens.Builder b = new Tokens.Builder(end - start + template.markers(1));
      int first = start < n ? all.start(start) : text.length();
      frame(b, beginIds, start == 0 ? 0 : first, 0);
      for (int i = start; i < end; i++) {
        b.add(all.id(i), all.start(i), all.end(i), 0, all.flags(i));
      }
      int last = end == n ? text.length() : (end > start ? all.end(end - 1) : first);
      frame(b, endIds, last, 0);
      out.add(b.build());
      if (end >= n) {
        break;
      }
    }
    return out;
  }

  @Override
  public int count(CharSequence text, Trust trust) {
    limits.checkText(text, "text");
    Objects.requireNonNull(trust, "trust");
    Context s = take();
    s.counting = true;
    s.counted = 0;
    try {
      content(s, text, trust, 0);
      return beginIds.length + s.builder.size + s.counted + endIds.length;
    } finally {
      s.counting = false;
      give(s);
    }
  }

  @Override
  public int cutToFit(CharSequence text, int budget, Trust trust) {
    limits.checkText(text, "text");
    Objects.requireNonNull(trust, "trust");
    int markers = beginIds.length + endIds.length;
    if (budget < markers) {
      throw new IllegalArgumentException("budget=" + budget + " is smaller than the " + markers
          + " framing markers of one text");
    }
    int n;
    int[] starts;
    int[] ends;
    Context s = take();
    try {
      content(s, text, trust, 0);
      Tokens.Builder b = s.builder;
      n = b.size;
      if (budget - markers >= n) {
        return text.length();
      }
      // copies: the context goes back to the pool before the counts below
      starts = Arrays.copyOf(b.starts, n);
      ends = Arrays.copyOf(b.ends, n);
    } finally {
      give(s);
    }
    int k = budget - markers;
    k = boundaryAtOrBefore(k, starts, ends);
    // A prefix usually encodes to exactly the first k tokens, but a splitting rule that looks past
    // the cut (the last space of a run joins the next word) can segment its last piece differently:
    // verify, and move back one token boundary at a time (after 32 misses, by doubling steps, so the
    // work stays O(n log n) even for rules that never agree).
    int misses = 0;
    while (k > 0) {
      int cut = starts[k];
      if (count(text.subSequence(0, cut), trust) <= budget) {
        return cut;
      }
      misses++;
      k = boundaryAtOrBefore(Math.max(0, k - (misses <= 32 ? 1 : 1 << Math.min(30, misses - 32))), starts, ends);
    }
    int cut = starts[0];
    return cut == 0 || count(text.subSequence(0, cut), trust) <= budget ? cut : 0;
  }

  /** The largest token index {@code <= k} where no two tokens share a source span across the cut. */
  private static int boundaryAtOrBefore(int k, int[] starts, int[] ends) {
    while (k > 0 && starts[k] < ends[k - 1]) {
      k--;
    }
    return k;
  }

  @Override
  public List<String> explain(CharSequence text) {
    limits.checkText(text, "text");
    NormalizedText norm = pipeline.normalization().apply(text, 0, text.length());
    String t = norm.text();
    List<String> out = new ArrayList<>();
    out.add("normalized (" + pipeline.normalization().spec() + "): \"" + t + "\"");
    List<int[]> pieces = new ArrayList<>();
    if (!t.isEmpty()) {
      pipeline.splitting().split(t, 0, t.length(), (s, e) -> pieces.add(new int[] {s, e}));
    }
    out.add(pieces.size() + " piece(s) (" + pipeline.splitting().spec() + ")");
    for (int[] p : pieces) {
      out.add("piece \"" + t.substring(p[0], p[1]) + "\" from original [" + norm.spanStart(p[0]) + ", "
          + norm.spanEnd(p[1]) + ")");
      for (String line : segmenter.explain(t, p[0], p[1])) {
        out.add("  " + line);
      }
    }
    return out;
  }

  // ------------------------------------------------------------------ decode

  /** Appends the bytes of {@code id}; returns false if it was dropped. */
  boolean appendToken(int id, boolean dropReserved, Utf8Decoding.ByteRun out, long position) {
    if (id < 0 || id >= reservedBytes.length) {
      throw new IllegalArgumentException("id " + id + " at position " + position + " is outside the vocabulary of "
          + reservedBytes.length + " ids");
    }
    byte[] c = reservedBytes[id];
    if (c != null) {
      if (dropReserved) {
        return false;
      }
      out.write(c, 0, c.length);
      return true;
    }
    segmenter.decodeToken(id, out);
    return true;
  }

  @Override
  public String decode(int[] ids, boolean dropReserved, Decoding decoding) {
    Objects.requireNonNull(ids, "ids");
    Objects.requireNonNull(decoding, "decoding");
    Utf8Decoding.ByteRun run = new Utf8Decoding.ByteRun();
    int[] starts = decoding == Decoding.STRICT ? new int[ids.length] : null;
    int kept = 0;
    for (int i = 0; i < ids.length; i++) {
      int before = run.size;
      if (appendToken(ids[i], dropReserved, run, i) && starts != null) {
        starts[kept++] = before;
      }
    }
    return Utf8Decoding.decode(run.bytes, run.size, decoding, starts, kept, 0);
  }

  @Override
  public StreamDecoder streamDecoder(boolean dropReserved, Decoding decoding) {
    return new GraphemeStream(new Utf8Decoding.Stream(this, dropReserved, Objects.requireNonNull(decoding, "decoding")));
  }

  // ------------------------------------------------------------------ vocabulary

  @Override
  public int vocabularySize() {
    return reservedBytes.length;
  }

  @Override
  public String token(int id) {
    Objects.checkIndex(id, reservedBytes.length);
    String c = reserved.spelling(id);
    return c != null ? c : segmenter.token(id);
  }

  @Override
  public byte[] tokenBytes(int id) {
    Utf8Decoding.ByteRun run = new Utf8Decoding.ByteRun();
    appendToken(id, false, run, 0);
    return Arrays.copyOf(run.bytes, run.size);
  }

  @Override
  public int id(String token) {
    int c = reserved.id(token);
    return c >= 0 ? c : segmenter.id(token);
  }

  @Override
  public int unknownId() {
    return segmenter.unknownId();
  }

  @Override
  public String scheme() {
    return segmenter.scheme();
  }

  @Override
  public ReservedTokens reservedTokens() {
    return reserved;
  }

  @Override
  public Template template() {
    return template;
  }

  @Override
  public Pipeline pipeline() {
    return pipeline;
  }

  @Override
  public Limits limits() {
    return limits;
  }

  @Override
  public Tokenizer withTemplate(Template t) {
    return new PipelineTokenizer(pipeline, segmenter, reserved, t, limits, null, contexts);
  }

  @Override
  public Tokenizer withLimits(Limits l) {
    return new PipelineTokenizer(pipeline, segmenter, reserved, template, l, fingerprint, contexts);
  }

  /** The segmenter (for modules that need their own segmenter's extra features). */
  Segmenter segmenter() {
    return segmenter;
  }

  // ------------------------------------------------------------------ model file

  ModelWriter sections() {
    ModelWriter w = new ModelWriter();
    w.section(SCHEME).putString(segmenter.scheme());
    w.section(PIPE).putString(pipeline.normalization().spec()).putString(pipeline.splitting().spec())
        .putString(Pipeline.unicodeVersion());
    SectionWriter c = w.section(RSRV);
    List<String> spellings = reserved.spellings();
    c.putInt(spellings.size());
    for (String s : spellings) {
      c.putInt(reserved.id(s)).putString(s);
    }
    SectionWriter f = w.section(FRAM);
    for (List<String> list : List.of(template.begin(), template.separator(), template.end())) {
      f.putInt(list.size());
      for (String s : list) {
        f.putString(s);
      }
    }
    segmenter.write(w);
    return w;
  }

  @Override
  public String fingerprint() {
    String f = fingerprint;
    if (f == null) {
      f = ModelFile.fingerprint(sections().payloads());
      fingerprint = f;
    }
    return f;
  }

  @Override
  public byte[] toBytes() {
    return ModelFile.write(sections().payloads());
  }

  @Override
  public void save(Path path) {
    Objects.requireNonNull(path, "path");
    try {
      Files.write(path, toBytes());
    } catch (IOException e) {
      throw new UncheckedIOException("cannot write model file " + path, e);
    }
  }

  @Override
  public void writeReview(Appendable out) {
    Objects.requireNonNull(out, "out");
    Review.write(this, null, out);
  }

  @Override
  public String toString() {
    return "Tokenizer[scheme=" + scheme() + ", vocabulary=" + vocabularySize() + ", " + pipeline + ", reserved tokens="
        + reserved.size() + "]";
  }

  // ------------------------------------------------------------------ internals

  /**
   * The state of one encode call: the result builder, the segmenter's workspace, the callbacks, made
   * once and reused through the pool. It holds no reference to a tokenizer or a text between calls,
   * so copies of a tokenizer can share one pool.
   */
  static final class Context {
    /** A builder grown past this many tokens (1.1 MB of arrays at 17 bytes a token) is replaced. */
    static final int RETAINED_TOKENS = 1 << 16;

    Tokens.Builder builder = new Tokens.Builder(64);
    final int[] hit = new int[2];
    final Workspace workspace;
    final Segmenter segmenter;
    PipelineTokenizer owner; // set while a call runs
    private Utf8Input input; // made on the first bytes-in call
    final NormalizedText.Cursor cursor = new NormalizedText.Cursor();
    NormalizedText norm;
    String normalized;
    int segment;
    boolean counting; // count() only: tokens are counted, not mapped or stored
    int counted;
    PieceSegmentation how; // encodeWith() only: segments each piece instead of the segmenter

    final TokenSink tokenSink;
    final PieceSink pieceSink;

    Context(Segmenter segmenter) {
      this.segmenter = segmenter;
      Workspace ws = segmenter.newWorkspace();
      this.workspace = ws;
      this.tokenSink = this::token;
      this.pieceSink = (start, end) -> {
        PipelineTokenizer t = owner;
        if (end - start > t.maxPieceLength) {
          NormalizedText n = norm;
          t.limits.throwPieceTooLong(end - start, n.spanStart(start), n.spanEnd(end));
        }
        PieceSegmentation h = how;
        if (h == null) {
          segmenter.segment(normalized, start, end, tokenSink, ws);
        } else {
          h.segment(segmenter, normalized, start, end, tokenSink, ws);
        }
      };
    }

    Utf8Input input() {
      Utf8Input in = input;
      if (in == null) {
        in = new Utf8Input();
        input = in;
      }
      return in;
    }

    private void token(int id, int start, int end) {
      if (counting) {
        counted++;
        return;
      }
      NormalizedText.Cursor c = cursor;
      builder.add(id, c.spanStart(start), c.spanEnd(end), segment, 0);
    }
  }

  /** A context from the pool, emptied and bound to this tokenizer. */
  private Context take() {
    Context s = contexts.take();
    s.builder.clear();
    s.owner = this;
    return s;
  }

  /** Returns {@code s} to the pool, unless it grew for a huge input (then it is left to the collector). */
  private void give(Context s) {
    s.owner = null;
    s.norm = null;
    s.cursor.reset(null);
    s.normalized = null;
    s.counting = false;
    s.how = null;
    if (s.input != null && s.input.oversized()) {
      s.input = null;
    }
    if (s.builder.ids.length > Context.RETAINED_TOKENS || (s.workspace != null && !s.workspace.keep())) {
      return;
    }
    contexts.give(s);
  }
}
