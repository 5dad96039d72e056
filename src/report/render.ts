// Serialisation: pdfmake's printer, the chart canvas and the fonts, in one place. Everything else
// in the report is pure layout. The PDF info dates come from the document definition (the project
// date), so the same definition gives the same bytes; pdfkit's /ID is an MD5 of that info.

import PdfPrinter from 'pdfmake';
import type { TDocumentDefinitions } from 'pdfmake/interfaces.js';
import { ChartJSNodeCanvas } from 'chartjs-node-canvas';
import type { Chart, Plugin } from 'chart.js';
import { FONT, TABLE_LAYOUTS } from './layout.js';
import { indexedPng } from './png.js';
import { CHART_FONT, CHART_HEIGHT, CHART_WIDTH, type MarksOptions, type SheetChart } from './charts.js';
import { fontFiles, readFonts, type FontFace } from './assets.js';
import { toolFingerprint } from './cache.js';
import { GLYPH_INTS, codePointsOf, type ShapedWords } from './shaped-words.js';
import { createHash } from 'node:crypto';
import { createRequire } from 'node:module';
import path from 'node:path';

/** What the build needs from a renderer (a test may inject one that fails). */
export interface Renderer {
  chart(config: SheetChart): Buffer;
  pdf(doc: TDocumentDefinitions, images?: Record<string, Buffer>): Promise<Buffer>;
}

/** Draws the shaded current range and the vertical markers of a chart (options.plugins.fsMarks). */
const marksPlugin: Plugin<'scatter', MarksOptions> = {
  id: 'fsMarks',
  beforeDatasetsDraw(chart: Chart, _args: unknown, opts: MarksOptions) {
    const area = chart.chartArea;
    const x = chart.scales.x;
    const ctx = chart.ctx;
    for (const band of opts?.bands ?? []) {
      if (!(band.to > band.from)) continue;
      const x0 = Math.max(area.left, x.getPixelForValue(band.from));
      const x1 = Math.min(area.right, x.getPixelForValue(band.to));
      if (x1 <= x0) continue;
      ctx.save();
      ctx.fillStyle = band.color;
      ctx.fillRect(x0, area.top, x1 - x0, area.bottom - area.top);
      ctx.fillStyle = '#7a4a00';
      ctx.font = `13px ${CHART_FONT}`;
      ctx.textAlign = 'center';
      ctx.textBaseline = 'top';
      const label = band.label;
      const width = ctx.measureText(label).width;
      const cx = Math.min(Math.max((x0 + x1) / 2, area.left + width / 2 + 2), area.right - width / 2 - 2);
      ctx.fillText(label, cx, area.top + 4);
      ctx.restore();
    }
  },
  afterDatasetsDraw(chart: Chart, _args: unknown, opts: MarksOptions) {
    const area = chart.chartArea;
    const x = chart.scales.x;
    const ctx = chart.ctx;
    const lines = [...(opts?.lines ?? [])]
      .map((l) => ({ ...l, px: x.getPixelForValue(l.x) }))
      .filter((l) => Number.isFinite(l.px) && l.px >= area.left - 0.5 && l.px <= area.right + 0.5)
      .sort((a, b) => a.px - b.px);
    // labels run upwards beside their line; close neighbours alternate sides and heights
    let lastPx = -Infinity;
    let lastSide = -1;
    let stagger = 0;
    for (const l of lines) {
      ctx.save();
      ctx.strokeStyle = l.color;
      ctx.lineWidth = 2;
      ctx.setLineDash(l.dash ?? []);
      ctx.beginPath();
      ctx.moveTo(l.px, area.top);
      ctx.lineTo(l.px, area.bottom);
      ctx.stroke();
      const close = l.px - lastPx < 34;
      const side = close ? -lastSide : l.px > area.right - 24 ? -1 : 1;
      stagger = close ? stagger + 1 : 0;
      ctx.setLineDash([]);
      ctx.fillStyle = l.color;
      ctx.font = `bold 13px ${CHART_FONT}`;
      ctx.translate(l.px + side * 5, area.bottom - 8 - (stagger % 2) * 150);
      ctx.rotate(-Math.PI / 2);
      ctx.textAlign = 'left';
      ctx.textBaseline = side > 0 ? 'top' : 'bottom';
      ctx.fillText(l.label, 0, 0);
      ctx.restore();
      lastPx = l.px;
      lastSide = side;
    }
  },
};

/** White page under the chart (the canvas is opaque RGB24, so "destination-over" fills do nothing). */
const whitePlugin: Plugin = {
  id: 'fsWhite',
  beforeDraw(chart: Chart) {
    const ctx = chart.ctx;
    ctx.save();
    ctx.globalCompositeOperation = 'source-over';
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, chart.width, chart.height);
    ctx.restore();
  },
};

let shared: Renderer | null = null;

/** The process-wide renderer (one printer, one chart canvas, fonts read once). */
export function defaultRenderer(): Renderer {
  if (!shared) shared = createRenderer();
  return shared;
}

/** The parts of fontkit used here. */
interface FontkitModule {
  create: (buf: Buffer, name?: string) => unknown;
  __faultsheetCache?: Map<Buffer, unknown>;
}

/** A parsed font as fontkit gives it (the few members read here; _cmapProcessor is fontkit's own). */
interface FontkitFont {
  numGlyphs: number;
  unitsPerEm: number;
  getGlyph(id: number, codePoints?: number[]): { id: number; advanceWidth: number; codePoints: number[] };
  characterSet: number[];
  _cmapProcessor: { lookup(codePoint: number): number };
}

/** The process's parsed font of a font file (set by reuseParsedFonts). */
let parsedFont: ((buf: Buffer) => FontkitFont) | null = null;

/**
 * pdfkit parses a font file anew for every document (a fifth of a sheet's time). Our four font
 * buffers never change, so their parsed fontkit fonts are kept and reused; each document still
 * makes its own subset. Only these buffers are cached; any other font goes the usual way.
 */
function reuseParsedFonts(buffers: Buffer[]): void {
  const require = createRequire(import.meta.url);
  const pdfkitMain = require.resolve('@foliojs-fork/pdfkit', { paths: [path.dirname(require.resolve('pdfmake'))] });
  const fontkit = createRequire(pdfkitMain)('@foliojs-fork/fontkit') as FontkitModule;
  parsedFont = (buf) => fontkit.create(buf) as FontkitFont;
  if (fontkit.__faultsheetCache) {
    for (const b of buffers) fontkit.__faultsheetCache.set(b, undefined);
    return;
  }
  const cache = new Map<Buffer, unknown>(buffers.map((b) => [b, undefined]));
  const create = fontkit.create.bind(fontkit);
  fontkit.__faultsheetCache = cache;
  fontkit.create = (buf: Buffer, name?: string) => {
    if (name !== undefined || !cache.has(buf)) return create(buf, name);
    let font = cache.get(buf);
    if (font === undefined) {
      font = create(buf);
      cache.set(buf, font);
    }
    return font;
  };
}

/** Words shaped once per process, per font (see shareLayoutCache); cleared when it grows past this. */
const SHARED_LAYOUTS_MAX = 200_000;

/**
 * pdfkit shapes each word with fontkit (OpenType substitution and positioning, about a seventh of a
 * sheet's time) and caches the result per document. The fonts are the same parsed fonts in every
 * document (reuseParsedFonts), and a shaped word depends only on the font and the text, so the
 * cache is kept per font for the whole process instead. pdfkit treats cached runs as read-only (it
 * clones a position before changing it), and the subset of each document is still built from the
 * glyphs that document uses, so the bytes written do not change.
 */
function shareLayoutCache(printer: PdfPrinter): void {
  const probe = printer.createPdfKitDocument({ content: [{ text: 'x' }], defaultStyle: { font: FONT } }) as unknown as { _font?: object; end(): void };
  const proto = probe._font ? (Object.getPrototypeOf(probe._font) as Record<string, unknown>) : null;
  probe.end();
  if (!proto || typeof proto.layoutRun !== 'function' || typeof proto.layoutCached !== 'function' || proto.__faultsheetShared) return;
  proto.__faultsheetShared = true;
  proto.layoutCached = function (this: { font: object; layoutRun(text: string): unknown }, text: string): unknown {
    let cache = sharedRuns.get(this.font);
    if (!cache) sharedRuns.set(this.font, (cache = new Map()));
    let run = cache.get(text);
    if (run === undefined) {
      if (cache.size >= SHARED_LAYOUTS_MAX) cache.clear(); // bounded memory on a very long build
      run = this.layoutRun(text);
      cache.set(text, run);
      if (freshRuns.length < FRESH_MAX) freshRuns.push({ font: this.font, text, run: run as PdfkitRun });
    }
    return run;
  };
}

/** The cache shareLayoutCache shares: per parsed font, each word's run. */
const sharedRuns = new WeakMap<object, Map<string, unknown>>();

/** A shaped run as pdfkit's font reads it (layout, encode): glyph ids, widths and meanings, positions. */
export interface PdfkitRun {
  glyphs: Array<{ id: number; advanceWidth: number; codePoints: number[] }>;
  positions: PdfkitPosition[];
  advanceWidth: number;
}

/** A glyph's position as pdfkit keeps it: fontkit's, scaled to its 1000-unit em, and the glyph's advance width. */
interface PdfkitPosition {
  xAdvance: number;
  yAdvance: number;
  xOffset: number;
  yOffset: number;
  advanceWidth: number;
}

/** Words shaped since takeShapedWords last looked (at most FRESH_MAX, for shaped.bin). */
const freshRuns: Array<{ font: object; text: string; run: PdfkitRun }> = [];
const FRESH_MAX = 20_000;

/** A face's parsed font, and the number of code points its character map sends to each glyph (once counted). */
interface FaceFont {
  face: FontFace;
  font: FontkitFont;
  sources?: Uint16Array;
}

let faces: FaceFont[] | null = null;
let shapesKey: string | null = null;

function faceFonts(): FaceFont[] {
  if (faces) return faces;
  if (!parsedFont || !faceBuffers) throw new Error('internal error: shaped words before the renderer');
  const make = parsedFont;
  faces = (Object.entries(faceBuffers) as Array<[FontFace, Buffer]>).map(([face, buf]) => ({ face, font: make(buf) }));
  return faces;
}

/** What the shapes depend on: the tool (its code, pdfkit's and fontkit's through pdfmake's version) and the font files. */
function shapedKey(): string {
  if (shapesKey) return shapesKey;
  const h = createHash('sha256').update(toolFingerprint());
  for (const [face, buf] of Object.entries(faceBuffers ?? {})) h.update(face).update(buf);
  return (shapesKey = h.digest('hex'));
}

/** How many code points the font's character map sends to each glyph. */
function glyphSources(entry: FaceFont): Uint16Array {
  if (entry.sources) return entry.sources;
  const counts = new Uint16Array(entry.font.numGlyphs);
  for (const cp of entry.font.characterSet) {
    const gid = entry.font._cmapProcessor.lookup(cp);
    if (gid > 0 && gid < counts.length && counts[gid] < 65535) counts[gid]++;
  }
  return (entry.sources = counts);
}

/**
 * True when shaping `text` substituted no glyph (shaped-words.ts): glyph i is the glyph the
 * character map gives code point i (`lookup`), no other code point maps to it (`sources`, code
 * points a glyph by id), and it stands for that code point alone.
 */
export function plainRun(text: string, run: PdfkitRun, lookup: (codePoint: number) => number, sources: ArrayLike<number>): boolean {
  const cps = codePointsOf(text);
  return (
    run.glyphs.length === cps.length &&
    run.positions.length === cps.length &&
    run.glyphs.every((g, i) => g.id > 0 && g.id === lookup(cps[i]) && sources[g.id] === 1 && g.codePoints.length === 1 && g.codePoints[0] === cps[i])
  );
}

/**
 * The words this process shaped since the last call that a later process may take as they are
 * (shaped-words.ts: no glyph substituted), or null if none.
 */
export function takeShapedWords(): ShapedWords | null {
  if (freshRuns.length === 0) return null;
  const known = faceFonts();
  const texts: Record<string, string[]> = {};
  const ints: Record<string, number[]> = {};
  for (const { font, text, run } of freshRuns.splice(0)) {
    const entry = known.find((f) => f.font === font);
    if (!entry) continue;
    if (!plainRun(text, run, (cp) => entry.font._cmapProcessor.lookup(cp), glyphSources(entry))) continue;
    // back to font units, as fontkit gave them: kept only where scaling them again gives pdfkit's numbers
    const scale = 1000 / entry.font.unitsPerEm;
    const units: number[] = [];
    const exact = run.positions.every((p, i) => {
      const u = [p.xAdvance, p.yAdvance, p.xOffset, p.yOffset].map((x) => Math.round(x / scale));
      units.push(run.glyphs[i].id, ...u);
      return u[0] * scale === p.xAdvance && u[1] * scale === p.yAdvance && u[2] * scale === p.xOffset && u[3] * scale === p.yOffset && Math.abs(u[0]) < 2 ** 30;
    });
    if (!exact) continue;
    (texts[entry.face] ??= []).push(text);
    (ints[entry.face] ??= []).push(...units);
  }
  const faces = Object.fromEntries(Object.entries(texts).map(([face, list]) => [face, { texts: list, glyphs: Int32Array.from(ints[face]) }]));
  return Object.keys(faces).length > 0 ? { key: shapedKey(), faces } : null;
}

/**
 * Start this process's shared word cache with `words` (shaped by an earlier process under the same
 * key; otherwise nothing is taken), each run made as pdfkit makes one it shapes (layoutRun): the
 * positions scaled, the glyph's advance width added, the run's advance summed in order. Each glyph
 * is the font's own glyph object, made here for its one character as shaping would have made it:
 * a glyph object first made by a document's subset (for its outline, with no character) would
 * leave later documents no character for it. Returns the words taken.
 */
export function preloadShapedWords(words: ShapedWords): number {
  if (words.key !== shapedKey()) return 0;
  let taken = 0;
  for (const entry of faceFonts()) {
    const face = words.faces[entry.face];
    if (!face) continue;
    let cache = sharedRuns.get(entry.font);
    if (!cache) sharedRuns.set(entry.font, (cache = new Map()));
    const { font } = entry;
    const scale = 1000 / font.unitsPerEm;
    const g = face.glyphs;
    let at = 0;
    for (const text of face.texts) {
      const cps = codePointsOf(text);
      const start = at;
      at += cps.length * GLYPH_INTS;
      if (cache.has(text)) continue;
      let fits = true;
      for (let k = start; k < at; k += GLYPH_INTS) if (g[k] >= font.numGlyphs) fits = false;
      if (!fits) continue;
      const run: PdfkitRun = { glyphs: [], positions: [], advanceWidth: 0 };
      for (let i = 0, k = start; i < cps.length; i++, k += GLYPH_INTS) {
        const glyph = font.getGlyph(g[k], [cps[i]]);
        run.glyphs.push(glyph);
        run.positions.push({ xAdvance: g[k + 1] * scale, yAdvance: g[k + 2] * scale, xOffset: g[k + 3] * scale, yOffset: g[k + 4] * scale, advanceWidth: glyph.advanceWidth * scale });
      }
      let width = 0;
      for (const p of run.positions) width += p.xAdvance;
      run.advanceWidth = width;
      cache.set(text, run);
      taken++;
    }
  }
  return taken;
}

/** The font files of the faces, as the renderer read them. */
let faceBuffers: Record<FontFace, Buffer> | null = null;

export function createRenderer(): Renderer {
  const fonts = readFonts();
  faceBuffers ??= fonts;
  reuseParsedFonts([fonts.normal, fonts.bold, fonts.italics, fonts.bolditalics]);
  const printer = new PdfPrinter({ [FONT]: { normal: fonts.normal, bold: fonts.bold, italics: fonts.italics, bolditalics: fonts.bolditalics } });
  shareLayoutCache(printer);
  const canvas = new ChartJSNodeCanvas({
    width: CHART_WIDTH,
    height: CHART_HEIGHT,
    chartCallback: (chartJs) => {
      chartJs.register(whitePlugin, marksPlugin as unknown as Plugin);
      chartJs.defaults.font.family = CHART_FONT;
    },
  });
  // The charts use the font file the PDF embeds, not whatever the machine has installed.
  canvas.registerFont(fontFiles.normal, { family: CHART_FONT });
  canvas.registerFont(fontFiles.bold, { family: CHART_FONT, weight: 'bold' });
  opaquePng(canvas);
  return {
    chart: (config) => canvas.renderToBufferSync(config as never, 'image/png'),
    pdf: (doc, images = {}) =>
      new Promise<Buffer>((resolve, reject) => {
        try {
          // pdfmake's image dictionary takes data URLs (not buffers) in node
          const urls = Object.fromEntries(Object.entries(images).map(([k, v]) => [k, `data:image/png;base64,${v.toString('base64')}`]));
          const pdf = printer.createPdfKitDocument({ ...doc, images: { ...(doc.images ?? {}), ...urls } }, { tableLayouts: TABLE_LAYOUTS });
          const chunks: Buffer[] = [];
          pdf.on('data', (c: Buffer) => chunks.push(c));
          pdf.on('end', () => resolve(Buffer.concat(chunks)));
          pdf.on('error', reject);
          pdf.end();
        } catch (err) {
          reject(err);
        }
      }),
  };
}

/**
 * Charts are drawn on an opaque (RGB24) canvas so the PNG has no alpha channel: pdfkit then embeds
 * it as it is, instead of decoding it to split off the alpha (a large share of a sheet's time).
 * One canvas per size is drawn on again and again: a canvas's pixels live outside the JavaScript
 * heap and are freed only when the collector gets round to the canvas, so a new canvas per chart
 * let a long build's memory grow by megabytes a sheet. Every chart paints its whole area first
 * (fsWhite), so nothing of the previous chart shows through.
 * Uses chartjs-node-canvas's canvas factory; if that ever changes, charts stay correct, only slower.
 */
function opaquePng(canvas: ChartJSNodeCanvas): void {
  const target = canvas as unknown as { _createCanvas?: (w: number, h: number, type?: string) => unknown };
  const create = target._createCanvas;
  if (typeof create !== 'function') return;
  const kept = new Map<string, unknown>();
  target._createCanvas = (w: number, h: number, type?: string) => {
    const key = `${w}x${h}:${type ?? ''}`;
    const reuse = kept.get(key);
    if (reuse) return reuse;
    const c = create(w, h, type) as { getContext: (kind: string, attrs?: object) => unknown; toBuffer: (mime?: string, opts?: object) => Buffer; PNG_FILTER_NONE?: number };
    const getContext = c.getContext.bind(c);
    c.getContext = (kind: string, attrs?: object) => rememberMeasures(getContext(kind, { ...(attrs ?? {}), pixelFormat: 'RGB24' }));
    // A chart is written as a palette PNG (png.ts): on the benchmark's sheets 66 against 153 kB of
    // images a sheet, for about the CPU of libpng's RGB encoding (7 against 6 ms a chart, measured
    // on charts as drawn, and less for pdfkit to copy). A chart with too many colours for a palette
    // is written as RGB: no row filter, zlib level 6, a fifth smaller and twice as fast as libpng's
    // adaptive filters.
    const toBuffer = c.toBuffer.bind(c);
    const png = { compressionLevel: 6, filters: c.PNG_FILTER_NONE ?? 8 };
    const encode = (): Buffer => indexedPng(toBuffer('raw'), w, h) ?? toBuffer('image/png', png);
    c.toBuffer = (mime?: string, opts?: object) => (mime === 'image/png' && opts === undefined ? encode() : toBuffer(mime, opts));
    kept.set(key, c);
    return c;
  };
}

const MEASURES_MAX = 20_000;
const remembering = new WeakSet<object>();

/**
 * Chart.js measures every tick label and title again for each chart (its caches live in one chart),
 * and canvas's measureText asks Pango each time: the same few hundred texts measured on every sheet.
 * A text's measure depends only on the text and the context's font, baseline, alignment and
 * direction, so the context remembers them (the same numbers, so the same bytes).
 */
function rememberMeasures<T>(context: T): T {
  const ctx = context as { measureText?: (text: string) => unknown; font?: string; textBaseline?: string; textAlign?: string; direction?: string };
  if (typeof ctx.measureText !== 'function' || remembering.has(ctx)) return context;
  remembering.add(ctx);
  const measure = ctx.measureText.bind(ctx);
  const known = new Map<string, unknown>();
  ctx.measureText = (text: string) => {
    const key = `${ctx.font}\u0000${ctx.textBaseline}\u0000${ctx.textAlign}\u0000${ctx.direction}\u0000${text}`;
    let metrics = known.get(key);
    if (metrics === undefined) {
      if (known.size >= MEASURES_MAX) known.clear();
      metrics = measure(text);
      known.set(key, metrics);
    }
    return metrics;
  };
  return context;
}
