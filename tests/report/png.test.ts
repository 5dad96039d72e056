// Palette PNGs of the charts (src/report/png.ts), decoded by libpng (node-canvas's loadImage) and
// by poppler, not by our own code.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import * as zlib from 'node:zlib';
import { createCanvas, loadImage, type Canvas } from 'canvas';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { MAX_COLOURS, crc32, indexedPng } from '../../src/report/png.js';
import { createRenderer } from '../../src/report/render.js';
import { sheetCharts } from '../../src/report/charts.js';
import { projectTemplates } from '../../src/report/build.js';
import { fixtureProject, fixtureResult } from '../fixtures/report/project.js';
import { pdfImageList } from './helpers.js';

// the pixels each chart gives the encoder, kept to compare with what libpng decodes
const seen = vi.hoisted(() => ({ raw: [] as Buffer[] }));
vi.mock('../../src/report/png.js', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/report/png.js')>();
  return {
    ...real,
    indexedPng: (raw: Uint8Array, w: number, h: number) => {
      seen.raw.push(Buffer.from(raw));
      return real.indexedPng(raw, w, h);
    },
  };
});

const tmp = mkdtempSync(path.join(tmpdir(), 'fs-png-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

/** An opaque canvas (cairo RGB24, as the charts are drawn on) of w x h. */
function opaque(w: number, h: number): { canvas: Canvas; ctx: CanvasRenderingContext2D } {
  const canvas = createCanvas(w, h);
  const ctx = canvas.getContext('2d', { pixelFormat: 'RGB24' } as never) as unknown as CanvasRenderingContext2D;
  return { canvas, ctx };
}

const raw = (canvas: Canvas): Buffer => canvas.toBuffer('raw');

/** RGB triples of a PNG as libpng decodes it. */
async function decode(png: Buffer): Promise<Uint8ClampedArray> {
  const img = await loadImage(png);
  const c = createCanvas(img.width, img.height);
  const ctx = c.getContext('2d');
  ctx.drawImage(img, 0, 0);
  return ctx.getImageData(0, 0, img.width, img.height).data;
}

const pixels = (canvas: Canvas): Uint8ClampedArray => canvas.getContext('2d').getImageData(0, 0, canvas.width, canvas.height).data;

/** How many pixels of two RGBA images differ, and by how much at most in one channel. */
function difference(a: Uint8ClampedArray, b: Uint8ClampedArray): { share: number; worst: number } {
  let changed = 0;
  let worst = 0;
  for (let i = 0; i < a.length; i += 4) {
    const d = Math.max(Math.abs(a[i] - b[i]), Math.abs(a[i + 1] - b[i + 1]), Math.abs(a[i + 2] - b[i + 2]));
    if (d > 0) changed++;
    worst = Math.max(worst, d);
  }
  return { share: changed / (a.length / 4), worst };
}

/** cairo's 0x00RRGGBB words (native order) as RGBA bytes. */
function rgba(raw: Buffer): Uint8ClampedArray {
  const words = new Uint32Array(new Uint8Array(raw).buffer);
  const out = new Uint8ClampedArray(words.length * 4);
  words.forEach((w, i) => out.set([(w >> 16) & 255, (w >> 8) & 255, w & 255, 255], i * 4));
  return out;
}

describe('palette PNG', () => {
  it('computes the PNG chunk CRC-32', () => {
    // 0xCBF43926: the check value of CRC-32 (ISO 3309 / ITU-T V.42, the CRC of PNG chunks) on the
    // nine bytes "123456789" (from memory; also compared with zlib's crc32 where Node has it)
    const check = Buffer.from('123456789', 'latin1');
    expect(crc32(check)).toBe(0xcbf43926);
    const bytes = Buffer.from(Array.from({ length: 1000 }, (_, i) => (i * 37 + 11) & 0xff));
    const zcrc = (zlib as unknown as { crc32?: (b: Uint8Array) => number }).crc32;
    if (zcrc) expect(crc32(bytes)).toBe(zcrc(bytes));
    expect(crc32(bytes, 10, 20)).toBe(crc32(bytes.subarray(10, 20)));
  });

  it('is lossless on an image of at most 256 colours, and libpng reads it', async () => {
    const { canvas, ctx } = opaque(64, 40);
    (ctx as unknown as { antialias: string }).antialias = 'none';
    for (let i = 0; i < 200; i++) {
      ctx.fillStyle = `rgb(${(i * 53) % 256}, ${(i * 97) % 256}, ${(i * 29) % 256})`;
      ctx.fillRect((i % 20) * 3, Math.floor(i / 20) * 4, 3 + (i % 3), 4);
    }
    const png = indexedPng(raw(canvas), 64, 40);
    expect(png).not.toBeNull();
    // signature, then IHDR: 64 x 40, bit depth 8, colour type 3 (palette), per the PNG specification
    expect(png!.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
    expect(png!.toString('latin1', 12, 16)).toBe('IHDR');
    expect([png!.readUInt32BE(16), png!.readUInt32BE(20), png![24], png![25]]).toEqual([64, 40, 8, 3]);
    expect(await decode(png!)).toEqual(pixels(canvas));
  });

  it('gives more than 256 colours their nearest palette colour, and keeps the 256 most used exact', async () => {
    const { canvas, ctx } = opaque(300, 20);
    (ctx as unknown as { antialias: string }).antialias = 'none';
    ctx.fillStyle = 'rgb(255, 255, 255)';
    ctx.fillRect(0, 0, 300, 20);
    // 299 shades of blue besides white, shade s in a column 1 px wide and (s < 150 ? 20 : 1) px tall
    for (let s = 1; s < 300; s++) {
      ctx.fillStyle = `rgb(0, 0, ${Math.round((s * 255) / 299)})`;
      ctx.fillRect(s, 0, 1, s < 150 ? 20 : 1);
    }
    const original = pixels(canvas);
    const decoded = await decode(indexedPng(raw(canvas), 300, 20)!);
    const key = (d: Uint8ClampedArray, i: number) => (d[i] << 16) | (d[i + 1] << 8) | d[i + 2];
    const palette = new Set<number>();
    for (let i = 0; i < decoded.length; i += 4) palette.add(key(decoded, i));
    expect(palette.size).toBeLessThanOrEqual(256);
    let exact = 0;
    for (let i = 0; i < original.length; i += 4) {
      const o = key(original, i);
      const d = key(decoded, i);
      if (o === d) {
        exact++;
        continue;
      }
      // no colour of the decoded image lies nearer the original than the one given
      const dist = (a: number, b: number) => ((a >> 16) - (b >> 16)) ** 2 + (((a >> 8) & 255) - ((b >> 8) & 255)) ** 2 + ((a & 255) - (b & 255)) ** 2;
      for (const p of palette) expect(dist(o, p)).toBeGreaterThanOrEqual(dist(o, d));
    }
    // the white and the 149 tall columns (20 px each) are among the most used, so exact
    const tall = 149 * 20;
    expect(exact).toBeGreaterThanOrEqual(tall + (300 - 150) * 19);
  });

  it('declines an image of more colours than MAX_COLOURS (the caller then writes RGB)', () => {
    const w = 128;
    const h = Math.ceil((MAX_COLOURS + 1) / w);
    const { canvas, ctx } = opaque(w, h);
    const img = ctx.createImageData(w, h);
    for (let i = 0; i < w * h; i++) {
      img.data[i * 4] = i & 0xff;
      img.data[i * 4 + 1] = (i >> 8) & 0xff;
      img.data[i * 4 + 2] = 7;
      img.data[i * 4 + 3] = 255;
    }
    ctx.putImageData(img, 0, 0);
    expect(indexedPng(raw(canvas), w, h)).toBeNull();
  });

  it('changes only edge shades of an anti-aliased drawing like a chart, each by a little', async () => {
    const { canvas, ctx } = opaque(900, 500);
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, 900, 500);
    ctx.strokeStyle = '#d9dde2';
    for (let x = 40.5; x < 900; x += 17.3) {
      ctx.beginPath();
      ctx.moveTo(x, 0);
      ctx.lineTo(x, 500);
      ctx.stroke();
    }
    ctx.fillStyle = 'rgba(232, 150, 30, 0.20)';
    ctx.fillRect(300, 0, 250, 500);
    const colours = ['#1f5fa8', '#b3261e', '#2e7d32', '#7b3fa0'];
    colours.forEach((colour, k) => {
      ctx.strokeStyle = colour;
      ctx.lineWidth = 2 + k;
      ctx.setLineDash(k % 2 ? [8, 4] : []);
      ctx.beginPath();
      for (let x = 0; x <= 900; x += 3) ctx.lineTo(x, 250 + 200 * Math.sin(x / (60 + 25 * k) + k));
      ctx.stroke();
    });
    ctx.fillStyle = '#333333';
    ctx.font = '14px sans-serif';
    for (let i = 0; i < 20; i++) ctx.fillText(`label ${i * 0.37}`, 30 + i * 42, 480 - (i % 3) * 15);
    const { share, worst } = difference(pixels(canvas), await decode(indexedPng(raw(canvas), 900, 500)!));
    // our own bar (no source): measured 3.5 % of pixels, by at most 36 of 255 in a channel; all
    // of them edge shades of anti-aliasing
    expect(share).toBeLessThan(0.05);
    expect(worst).toBeLessThanOrEqual(48);
  });

  it('writes the sheet charts as indexed images that poppler reads, each within a shade of what was drawn', async () => {
    const project = fixtureProject();
    const result = fixtureResult();
    const cr = result.circuits[0];
    const circuit = project.circuits.find((c) => c.id === cr.id)!;
    const charts = sheetCharts(cr, circuit, projectTemplates(project).labels('sheet/labels.hbs'));
    const renderer = createRenderer();
    const images: Record<string, Buffer> = {};
    for (const name of ['energy', 'time', 'length'] as const) {
      seen.raw.length = 0;
      const png = renderer.chart(charts[name]);
      expect(png[25]).toBe(3); // colour type 3, palette
      expect(renderer.chart(charts[name])).toEqual(png); // the same chart, the same bytes
      images[name] = png;
      // what was drawn against what libpng reads back
      const { share, worst } = difference(rgba(seen.raw[0]), await decode(png));
      // our own bar (no source): measured 0.7 to 1.4 % of pixels, by at most 30 of 255
      expect(share).toBeLessThan(0.02);
      expect(worst).toBeLessThanOrEqual(40);
    }

    const pdf = await renderer.pdf({ content: Object.keys(images).map((image) => ({ image, width: 400 })) }, images);
    const file = path.join(tmp, 'charts.pdf');
    writeFileSync(file, pdf);
    const list = pdfImageList(file);
    expect(list).toHaveLength(3);
    for (const row of list) expect(row.slice(3, 6)).toEqual(['900', '500', 'index']);
  });
});
