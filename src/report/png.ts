// Charts as palette (indexed-colour) PNGs. A chart has a few flat colours plus the shades that
// anti-aliasing mixes at their edges: on the sheets' charts about a thousand colours, of which the
// 256 most used cover more than 99 % of the pixels. One byte a pixel instead of three compresses to
// less than half the bytes of an RGB PNG (measured: 22 against 51 kB a chart), and since every
// sheet's images are copied into the dossier, that is a third of the dossier's bytes.
//
// The palette is the image's own colours: all of them when there are at most 256; otherwise the
// FREQUENT most used (ties by colour value, so the same pixels always give the same bytes), then,
// one at a time, the colour whose pixels lie farthest from the palette so far. A pixel whose colour
// is not in it takes the nearest palette colour, by squared distance in RGB; such pixels are
// anti-aliased edge shades. An image with more colours than MAX_COLOURS is not a chart like ours,
// and the caller encodes it as RGB instead (null).

import { deflateSync } from 'node:zlib';

/** Above this many distinct colours, indexedPng gives up (null) and the caller keeps RGB. */
export const MAX_COLOURS = 8192;
/** Palette entries given to the most used colours; the rest go to the colours farthest from them. */
const FREQUENT = 192;
const SLOTS = 1 << 14; // open-addressing table, at most half full
const SLOT_SHIFT = 32 - 14;

interface Scratch {
  keys: Int32Array;
  counts: Float64Array;
  runEnds: Int32Array;
  runSlots: Uint16Array;
  rows: Uint8Array;
}
let scratch: Scratch | null = null;

/** Working arrays, kept from one image to the next (a sheet's charts are all one size). */
function scratchFor(width: number, height: number): Scratch {
  const n = width * height;
  if (!scratch || scratch.runEnds.length < n || scratch.rows.length < n + height)
    scratch = { keys: new Int32Array(SLOTS), counts: new Float64Array(SLOTS), runEnds: new Int32Array(n), runSlots: new Uint16Array(n), rows: new Uint8Array(n + height) };
  return scratch;
}

const CRC_TABLE = (() => {
  const t = new Int32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c;
  }
  return t;
})();

/** CRC-32 (ISO 3309, as the PNG specification's chunk CRC) of bytes [start, end). */
export function crc32(bytes: Uint8Array, start = 0, end = bytes.length): number {
  let c = -1;
  for (let i = start; i < end; i++) c = CRC_TABLE[(c ^ bytes[i]) & 0xff] ^ (c >>> 8);
  return (c ^ -1) >>> 0;
}

function chunk(type: string, data: Uint8Array): Buffer {
  const b = Buffer.alloc(12 + data.length);
  b.writeUInt32BE(data.length, 0);
  b.write(type, 4, 'latin1');
  b.set(data, 8);
  b.writeUInt32BE(crc32(b, 4, 8 + data.length), 8 + data.length);
  return b;
}

const SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

/**
 * A palette PNG (8-bit indices, no transparency) of `width` x `height` pixels given as 32-bit
 * words 0x??RRGGBB in native byte order (cairo's RGB24 and ARGB32 layouts, as node-canvas's
 * toBuffer('raw') gives them; the top byte is ignored). Null when the image has more than
 * MAX_COLOURS colours.
 */
export function indexedPng(raw: Uint8Array, width: number, height: number): Buffer | null {
  if (raw.byteLength !== width * height * 4) throw new Error(`internal error: ${raw.byteLength} bytes given for ${width} x ${height} pixels`);
  const words = raw.byteOffset % 4 === 0 ? raw : raw.slice();
  const px = new Uint32Array(words.buffer, words.byteOffset, width * height);
  const { keys, counts, runEnds, runSlots, rows } = scratchFor(width, height);
  keys.fill(-1);
  counts.fill(0);
  let distinct = 0;

  // 1. count each colour, a run of equal pixels at a time (runs end at row ends), and keep the
  // runs for step 3. The loops are written out: closures over the running values were slower.
  let runs = 0;
  for (let y = 0, i = 0; y < height; y++) {
    const end = i + width;
    while (i < end) {
      const c = px[i] & 0xffffff;
      let j = i + 1;
      while (j < end && (px[j] & 0xffffff) === c) j++;
      let s = Math.imul(c, 0x9e3779b1) >>> SLOT_SHIFT;
      while (keys[s] !== c && keys[s] !== -1) s = (s + 1) & (SLOTS - 1);
      if (keys[s] === -1) {
        if (++distinct > MAX_COLOURS) return null;
        keys[s] = c;
      }
      counts[s] += j - i;
      runEnds[runs] = j;
      runSlots[runs++] = s;
      i = j;
    }
  }

  // 2. the palette: the FREQUENT most used colours (ties by colour value), then, one at a time,
  // the colour whose pixels lie farthest from the palette so far (distance times pixel count), so
  // that a rare but distinct shade (a thin line's colour) is not lost to a near shade of white
  const used: number[] = [];
  for (let s = 0; s < SLOTS; s++) if (keys[s] !== -1) used.push(s);
  used.sort((a, b) => counts[b] - counts[a] || keys[a] - keys[b]);
  const size = Math.min(256, used.length);
  const frequent = Math.min(FREQUENT, size);
  const pr = new Int32Array(size);
  const pg = new Int32Array(size);
  const pb = new Int32Array(size);
  const indexOf = new Uint8Array(SLOTS);
  const take = (u: number, i: number): void => {
    const c = keys[used[u]];
    pr[i] = (c >> 16) & 0xff;
    pg[i] = (c >> 8) & 0xff;
    pb[i] = c & 0xff;
  };
  for (let i = 0; i < frequent; i++) take(i, i);
  // nearest palette entry and its squared distance, for every colour not (yet) in the palette
  const rest = used.length - frequent;
  const nearest = new Uint8Array(rest);
  const distance = new Float64Array(rest);
  const closer = (k: number, from: number, to: number): void => {
    const c = keys[used[frequent + k]];
    const r = (c >> 16) & 0xff;
    const g = (c >> 8) & 0xff;
    const b = c & 0xff;
    for (let j = from; j < to; j++) {
      const dr = pr[j] - r;
      const dg = pg[j] - g;
      const db = pb[j] - b;
      const e = dr * dr + dg * dg + db * db;
      if (e < distance[k]) {
        distance[k] = e;
        nearest[k] = j;
      }
    }
  };
  distance.fill(Infinity);
  for (let k = 0; k < rest; k++) closer(k, 0, frequent);
  for (let i = frequent; i < size; i++) {
    let pick = -1;
    let worst = -1;
    for (let k = 0; k < rest; k++) {
      const cost = distance[k] * counts[used[frequent + k]];
      if (cost > worst) {
        worst = cost;
        pick = k;
      }
    }
    take(frequent + pick, i);
    distance[pick] = 0;
    nearest[pick] = i;
    for (let k = 0; k < rest; k++) if (distance[k] > 0) closer(k, i, i + 1);
  }
  for (let i = 0; i < frequent; i++) indexOf[used[i]] = i;
  for (let k = 0; k < rest; k++) indexOf[used[frequent + k]] = nearest[k];

  // 3. rows of indices, each after its filter byte (0, none), a run at a time
  for (let r = 0, start = 0, o = 0; r < runs; r++) {
    if (start % width === 0) rows[o++] = 0;
    const end = runEnds[r];
    rows.fill(indexOf[runSlots[r]], o, o + end - start);
    o += end - start;
    start = end;
  }

  const plte = new Uint8Array(size * 3);
  for (let i = 0; i < size; i++) {
    plte[i * 3] = pr[i];
    plte[i * 3 + 1] = pg[i];
    plte[i * 3 + 2] = pb[i];
  }
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 3; // colour type: palette
  // zlib level 6: on these charts' index rows 19 kB in 3 ms; level 3 is 21 kB in 1.4 ms, 9 is
  // 17 kB in 22 ms (measured on a time-current chart, 900 x 500)
  return Buffer.concat([SIGNATURE, chunk('IHDR', ihdr), chunk('PLTE', plte), chunk('IDAT', deflateSync(rows.subarray(0, (width + 1) * height), { level: 6 })), chunk('IEND', new Uint8Array(0))]);
}
