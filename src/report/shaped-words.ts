// Words already shaped, kept between builds in OUT/.faultsheet-cache/shaped.bin. Shaping a word
// (fontkit's OpenType substitution and positioning) costs more the first time a worker does it:
// a worker's first sheet shapes some fifteen hundred words, its later sheets only their new numbers.
// A worker of the next build starts with the words the last build shaped, so its first sheet goes
// about as fast as a later one (render.ts preloadShapedWords; the sheets' bytes do not change).
//
// Only words whose shaping substituted no glyph are kept: glyph i is the font's glyph for code
// point i of the word, and no other code point maps to it. Such a glyph stands for its one
// character wherever it appears, so the order in which a process meets words cannot change what a
// sheet says a glyph means (its ToUnicode entry).
//
// This module is the data alone (read, checked, merged, written), light enough for the main thread.
// It reads the file; the build writes it into the staging folder.

import { readFileSync } from 'node:fs';
import { deserialize, serialize } from 'node:v8';

export const SHAPED_FILE = 'shaped.bin';

/** Words kept a face at most (the common words of a sheet come first: its labels and headings). */
export const SHAPED_MAX = 4000;

/** A file larger than this is not read. */
const SHAPED_MAX_BYTES = 8 << 20;

/** Integers kept for each glyph: its id, then its xAdvance, yAdvance, xOffset and yOffset in font units. */
export const GLYPH_INTS = 5;

/**
 * One face's words: their texts, and for each character of each word in turn (a kept word has a
 * glyph a character) GLYPH_INTS integers. pdfkit scales the font units to its 1000-unit em as it
 * loads them, as it does a run it shapes itself.
 */
export interface ShapedFace {
  texts: string[];
  glyphs: Int32Array;
}

export interface ShapedWords {
  /** What the shapes depend on: the tool (and so its fontkit and pdfkit) and the font files. */
  key: string;
  /** By font face (assets.ts FontFace). */
  faces: Record<string, ShapedFace>;
}

/** A word's code points (a kept word has one glyph each). */
export const codePointsOf = (text: string): number[] => Array.from(text, (ch) => ch.codePointAt(0)!);

function isFace(f: unknown): f is ShapedFace {
  if (typeof f !== 'object' || f === null) return false;
  const { texts, glyphs } = f as { texts?: unknown; glyphs?: unknown };
  if (!Array.isArray(texts) || texts.length > SHAPED_MAX || !(glyphs instanceof Int32Array)) return false;
  let n = 0;
  for (const t of texts) {
    if (typeof t !== 'string' || t.length === 0 || t.length > 1000) return false;
    n += codePointsOf(t).length;
  }
  if (glyphs.length !== n * GLYPH_INTS) return false;
  for (let i = 0; i < glyphs.length; i += GLYPH_INTS) if (glyphs[i] <= 0 || glyphs[i] > 65535) return false;
  return true;
}

/** The words in `bytes` (a file written by shapedWordsBytes), or null for anything else. */
export function readShapedWords(bytes: Uint8Array): ShapedWords | null {
  if (bytes.length > SHAPED_MAX_BYTES) return null;
  let value: unknown;
  try {
    value = deserialize(bytes);
  } catch {
    return null;
  }
  if (typeof value !== 'object' || value === null) return null;
  const { key, faces } = value as { key?: unknown; faces?: unknown };
  if (typeof key !== 'string' || typeof faces !== 'object' || faces === null || Array.isArray(faces)) return null;
  const out: Record<string, ShapedFace> = {};
  for (const [face, words] of Object.entries(faces as Record<string, unknown>)) {
    if (!isFace(words)) return null;
    out[face] = words;
  }
  return { key, faces: out };
}

/** The words in the file `file` (a build's shaped.bin); null when it is missing, unreadable or not such a file. */
export function readShapedFile(file: string): ShapedWords | null {
  let bytes: Buffer;
  try {
    bytes = readFileSync(file);
  } catch {
    return null;
  }
  return readShapedWords(bytes);
}

export function shapedWordsBytes(words: ShapedWords): Buffer {
  return serialize(words);
}

/**
 * The last build's words (if shaped under the same key) and then those this build's workers
 * shaped, each word once, at most SHAPED_MAX a face. Null when there is nothing to keep.
 */
export function mergeShapedWords(previous: ShapedWords | null, fresh: readonly ShapedWords[]): ShapedWords | null {
  const key = fresh[0]?.key ?? previous?.key;
  if (key === undefined) return null;
  const texts = new Map<string, string[]>();
  const chunks = new Map<string, Int32Array[]>();
  const seen = new Map<string, Set<string>>();
  const add = (from: ShapedWords): void => {
    if (from.key !== key) return;
    for (const [face, { texts: words, glyphs }] of Object.entries(from.faces)) {
      let list = texts.get(face);
      if (!list) {
        texts.set(face, (list = []));
        chunks.set(face, []);
        seen.set(face, new Set());
      }
      const known = seen.get(face)!;
      const parts = chunks.get(face)!;
      let at = 0;
      for (const word of words) {
        const end = at + codePointsOf(word).length * GLYPH_INTS;
        if (list.length < SHAPED_MAX && !known.has(word)) {
          known.add(word);
          list.push(word);
          parts.push(glyphs.subarray(at, end));
        }
        at = end;
      }
    }
  };
  if (previous) add(previous);
  for (const f of fresh) add(f);
  const faces: Record<string, ShapedFace> = {};
  for (const [face, list] of texts) {
    if (list.length === 0) continue;
    const parts = chunks.get(face)!;
    const glyphs = new Int32Array(parts.reduce((n, p) => n + p.length, 0));
    let at = 0;
    for (const p of parts) {
      glyphs.set(p, at);
      at += p.length;
    }
    faces[face] = { texts: list, glyphs };
  }
  return Object.keys(faces).length > 0 ? { key, faces } : null;
}
