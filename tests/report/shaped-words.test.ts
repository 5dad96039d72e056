// The shaped words kept between builds (src/report/shaped-words.ts, render.ts): the file is read
// back only when it is what was written, merged words keep the last build's first, and only words
// whose shaping substituted no glyph are taken. What a glyph stands for is the font's own character
// map (OpenType cmap table, ISO/IEC 14496-22 5.2.1, from memory); the rest is this project's design
// (common practice, no source).
import { serialize } from 'node:v8';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { GLYPH_INTS, SHAPED_MAX, mergeShapedWords, readShapedWords, shapedWordsBytes, type ShapedFace, type ShapedWords } from '../../src/report/shaped-words.js';
import { createRenderer, plainRun, takeShapedWords, type PdfkitRun } from '../../src/report/render.js';
import { renderCircuitSheet, projectTemplates } from '../../src/report/sheets.js';
import { fixtureProject, fixtureResult } from '../fixtures/report/project.js';

const position = (x: number) => ({ xAdvance: x, yAdvance: 0, xOffset: 0, yOffset: 0, advanceWidth: x });
/** A face's words, each glyph given an id from its place and an advance of 1229 units. */
const face = (list: string[]): ShapedFace => ({ texts: list, glyphs: Int32Array.from(list.flatMap((t) => [...t].flatMap((_c, i) => [10 + i, 1229, 0, 0, 0]))) });
const words = (key: string, faces: Record<string, string[]>): ShapedWords => ({ key, faces: Object.fromEntries(Object.entries(faces).map(([f, list]) => [f, face(list)])) });
const textsOf = (w: ShapedWords | null, f: string): string[] => w?.faces[f]?.texts ?? [];

describe('the shaped words file', () => {
  it('reads back what was written', () => {
    const w = words('k1', { normal: ['Cable', 'length'], bold: ['FAIL'] });
    expect(readShapedWords(shapedWordsBytes(w))).toEqual(w);
  });

  it('reads nothing from bytes that are not such a file', () => {
    const good = shapedWordsBytes(words('k1', { normal: ['Cable'] }));
    const broken: unknown[] = [
      { key: 1, faces: {} },
      { key: 'k', faces: [] },
      { key: 'k', faces: { normal: { texts: ['Cable'], glyphs: new Int32Array(GLYPH_INTS * 4) } } }, // a glyph short
      { key: 'k', faces: { normal: { texts: ['x'], glyphs: Int32Array.from([-1, 600, 0, 0, 0]) } } }, // no such glyph
      { key: 'k', faces: { normal: { texts: ['x'], glyphs: Int32Array.from([0, 600, 0, 0, 0]) } } }, // .notdef
      { key: 'k', faces: { normal: { texts: ['x'], glyphs: [5, 600, 0, 0, 0] } } }, // not the integers written
      { key: 'k', faces: { normal: { texts: [''], glyphs: new Int32Array(0) } } }, // an empty word
      { key: 'k', faces: { normal: [['x', [5], [position(1)], 1]] } }, // another layout
      'text',
      null,
    ];
    for (const value of broken) expect(readShapedWords(serialize(value))).toBeNull();
    expect(readShapedWords(good.subarray(0, good.length >> 1))).toBeNull();
    expect(readShapedWords(new Uint8Array(0))).toBeNull();
    expect(readShapedWords(Buffer.from('{"key":"k","faces":{}}'))).toBeNull(); // JSON text, not the file
  });

  it('never throws on damaged bytes (property test: random byte changes of a good file)', () => {
    const good = shapedWordsBytes(words('k1', { normal: ['Cable', 'length', '12.5'], bold: ['FAIL'] }));
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.nat(good.length - 1), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 8 }), (changes) => {
        const bytes = Buffer.from(good);
        for (const [at, v] of changes) bytes[at] = v;
        const read = readShapedWords(bytes);
        return read === null || typeof read.key === 'string';
      }),
      { numRuns: 500 },
    );
  });

  it('merges the last build\'s words first, each once, the workers\' after, at most SHAPED_MAX a face', () => {
    const previous = words('k1', { normal: ['Cable', 'length'] });
    const fresh = [words('k1', { normal: ['length', 'kA'], bold: ['FAIL'] }), words('k1', { normal: ['mm²'] })];
    const merged = mergeShapedWords(previous, fresh)!;
    expect(textsOf(merged, 'normal')).toEqual(['Cable', 'length', 'kA', 'mm²']);
    expect(textsOf(merged, 'bold')).toEqual(['FAIL']);
    // each word keeps its own glyphs: 'mm²' came last from the second worker, its glyphs ids 10, 11, 12
    expect(Array.from(merged.faces.normal.glyphs.subarray(-3 * GLYPH_INTS)).filter((_x, i) => i % GLYPH_INTS === 0)).toEqual([10, 11, 12]);
    expect(merged.faces.normal.glyphs).toHaveLength(GLYPH_INTS * 'Cablelengthkamm²'.length);
    expect(readShapedWords(shapedWordsBytes(merged))).toEqual(merged);
    const many = words('k1', { normal: Array.from({ length: SHAPED_MAX + 50 }, (_, i) => `w${i}`) });
    expect(textsOf(mergeShapedWords(previous, [many]), 'normal')).toHaveLength(SHAPED_MAX);
  });

  it('drops the last build\'s words when they were shaped under another key (another tool or font)', () => {
    const merged = mergeShapedWords(words('old', { normal: ['Cable'] }), [words('new', { normal: ['kA'] })])!;
    expect(merged.key).toBe('new');
    expect(textsOf(merged, 'normal')).toEqual(['kA']);
    expect(mergeShapedWords(words('old', { normal: ['Cable'] }), [])!.key).toBe('old');
    expect(mergeShapedWords(null, [])).toBeNull();
  });
});

describe('which shaped words are kept', () => {
  // a made-up font: code point c maps to glyph c - 60 ('A' = 65 -> 5), and U+00A0 to glyph 0x20 - 60's
  const lookup = (cp: number): number => (cp === 0xa0 ? 32 - 60 + 100 : cp - 60);
  const sources = new Uint16Array(200).fill(1);
  const run = (glyphs: Array<[number, number[]]>): PdfkitRun => ({
    glyphs: glyphs.map(([id, codePoints]) => ({ id, advanceWidth: 500, codePoints })),
    positions: glyphs.map(() => position(500)),
    advanceWidth: 500 * glyphs.length,
  });

  it('keeps a word each of whose glyphs is the character map\'s glyph for its one character', () => {
    expect(plainRun('AB', run([[5, [65]], [6, [66]]]), lookup, sources)).toBe(true);
  });

  it('leaves out ligatures, substituted glyphs, glyphs shared by two characters and glyphs standing for another character', () => {
    expect(plainRun('fi', run([[150, [102, 105]]]), lookup, sources)).toBe(false); // two characters, one glyph
    expect(plainRun('AB', run([[5, [65]], [120, [66]]]), lookup, sources)).toBe(false); // B's glyph substituted
    const shared = Uint16Array.from(sources);
    shared[6] = 2; // a second code point maps to B's glyph
    expect(plainRun('AB', run([[5, [65]], [6, [66]]]), lookup, shared)).toBe(false);
    expect(plainRun('AB', run([[5, [65]], [6, [98]]]), lookup, sources)).toBe(false); // made first for 'b'
    expect(plainRun('A', run([[0, [65]]]), (cp) => (cp === 65 ? 0 : cp), sources)).toBe(false); // .notdef
  });

  it('takes the words of a sheet once, as shaped, for the faces the sheet uses', async () => {
    const renderer = createRenderer();
    takeShapedWords(); // words of other tests in this process
    const project = fixtureProject();
    const result = fixtureResult();
    await renderCircuitSheet(project, result.circuits[0], 0, result.circuits.length, projectTemplates(project), renderer);
    const taken = takeShapedWords();
    expect(taken?.key).toMatch(/^[0-9a-f]{64}$/);
    const normal = taken!.faces.normal;
    expect(normal.texts.length).toBeGreaterThan(50);
    expect(normal.glyphs.length).toBe(GLYPH_INTS * normal.texts.reduce((n, t) => n + [...t].length, 0));
    expect(normal.texts).toContain(`${project.meta.name.split(' ')[0]} `); // a word of the title, with its space
    expect(readShapedWords(shapedWordsBytes(taken!))).toEqual(taken); // what the file keeps
    await renderCircuitSheet(project, result.circuits[0], 0, result.circuits.length, projectTemplates(project), renderer);
    expect(takeShapedWords()).toBeNull(); // the same sheet again: every word already shaped
  });
});
