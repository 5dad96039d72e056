// A small reader and writer of PDF objects, for the files our own renderer writes (pdfkit through
// pdfmake: a classic cross-reference table, no object streams, a flat page tree). The dossier is
// joined from the finished sheets with it, one file at a time, without laying anything out again.
//
// Values are parsed into a tree whose atoms (numbers, names, strings, keywords) keep their source
// text, so that writing a value back gives the same bytes except for the references, which the
// writer renumbers. Stream data is never parsed: it is copied as it is. PDF 32000-1:2008 section 7.3
// (objects) and 7.5 (file structure) are the grammar followed here.

export type PdfValue =
  | { k: 'dict'; entries: Array<[string, PdfValue]> }
  | { k: 'array'; items: PdfValue[] }
  | { k: 'ref'; num: number }
  | { k: 'atom'; text: string };

export interface PdfObject {
  num: number;
  value: PdfValue;
  /** Source offsets of "stream ... endstream" (inclusive of both keywords), if the object is a stream. */
  stream?: { start: number; end: number };
}

export interface PdfSource {
  bytes: Uint8Array;
  /** Objects by number. */
  objects: Map<number, PdfObject>;
  catalog: number;
  info: number | null;
  /** Page tree nodes (the /Pages dictionaries), which a joined file replaces with its own. */
  pageTreeNodes: Set<number>;
  /** Page objects in page order. */
  pages: number[];
}

/** The file is not one this reader understands (a bug or a changed renderer, never the user's input). */
export class PdfFormatError extends Error {
  constructor(message: string) {
    super(`internal error: ${message}`);
    this.name = 'PdfFormatError';
  }
}

const WHITESPACE = new Set([0x00, 0x09, 0x0a, 0x0c, 0x0d, 0x20]);
const DELIMITER = new Set([0x28, 0x29, 0x3c, 0x3e, 0x5b, 0x5d, 0x7b, 0x7d, 0x2f, 0x25]); // ( ) < > [ ] { } / %

class Scanner {
  pos: number;
  constructor(
    readonly b: Uint8Array,
    start: number,
  ) {
    this.pos = start;
  }

  skipSpace(): void {
    const b = this.b;
    for (;;) {
      while (this.pos < b.length && WHITESPACE.has(b[this.pos])) this.pos++;
      if (b[this.pos] !== 0x25) return; // % comment to the end of the line
      while (this.pos < b.length && b[this.pos] !== 0x0a && b[this.pos] !== 0x0d) this.pos++;
    }
  }

  text(from: number, to: number): string {
    return Buffer.from(this.b.buffer, this.b.byteOffset + from, to - from).toString('latin1');
  }

  /** A regular token (number, keyword) at pos. */
  regular(): string {
    const start = this.pos;
    while (this.pos < this.b.length && !WHITESPACE.has(this.b[this.pos]) && !DELIMITER.has(this.b[this.pos])) this.pos++;
    if (this.pos === start) throw new PdfFormatError(`unexpected byte ${this.b[start]} at offset ${start}`);
    return this.text(start, this.pos);
  }

  value(): PdfValue {
    this.skipSpace();
    const b = this.b;
    const c = b[this.pos];
    if (c === 0x3c && b[this.pos + 1] === 0x3c) {
      this.pos += 2;
      const entries: Array<[string, PdfValue]> = [];
      for (;;) {
        this.skipSpace();
        if (b[this.pos] === 0x3e && b[this.pos + 1] === 0x3e) {
          this.pos += 2;
          return { k: 'dict', entries };
        }
        const key = this.value();
        if (key.k !== 'atom' || !key.text.startsWith('/')) throw new PdfFormatError(`dictionary key expected at offset ${this.pos}`);
        entries.push([key.text, this.value()]);
      }
    }
    if (c === 0x5b) {
      this.pos++;
      const items: PdfValue[] = [];
      for (;;) {
        this.skipSpace();
        if (b[this.pos] === 0x5d) {
          this.pos++;
          return { k: 'array', items };
        }
        items.push(this.value());
      }
    }
    const start = this.pos;
    if (c === 0x28) {
      // literal string: balanced parentheses, backslash escapes (7.3.4.2)
      let depth = 0;
      for (; this.pos < b.length; this.pos++) {
        const d = b[this.pos];
        if (d === 0x5c) this.pos++;
        else if (d === 0x28) depth++;
        else if (d === 0x29 && --depth === 0) break;
      }
      if (this.pos >= b.length) throw new PdfFormatError(`unterminated string at offset ${start}`);
      this.pos++;
      return { k: 'atom', text: this.text(start, this.pos) };
    }
    if (c === 0x3c) {
      const end = b.indexOf(0x3e, this.pos);
      if (end < 0) throw new PdfFormatError(`unterminated hex string at offset ${start}`);
      this.pos = end + 1;
      return { k: 'atom', text: this.text(start, this.pos) };
    }
    if (c === 0x2f) {
      this.pos++;
      while (this.pos < b.length && !WHITESPACE.has(b[this.pos]) && !DELIMITER.has(b[this.pos])) this.pos++;
      return { k: 'atom', text: this.text(start, this.pos) };
    }
    const token = this.regular();
    if (/^\d+$/.test(token)) {
      // "num gen R" is a reference
      const save = this.pos;
      this.skipSpace();
      if (b[this.pos] >= 0x30 && b[this.pos] <= 0x39) {
        const gen = this.regular();
        this.skipSpace();
        if (/^\d+$/.test(gen) && b[this.pos] === 0x52 && (this.pos + 1 >= b.length || WHITESPACE.has(b[this.pos + 1]) || DELIMITER.has(b[this.pos + 1]))) {
          this.pos++;
          return { k: 'ref', num: Number(token) };
        }
      }
      this.pos = save;
    }
    return { k: 'atom', text: token };
  }

  expect(word: string): void {
    this.skipSpace();
    const got = this.regular();
    if (got !== word) throw new PdfFormatError(`"${word}" expected at offset ${this.pos - got.length}, found "${got.slice(0, 20)}"`);
  }
}

export function dictGet(v: PdfValue | undefined, key: string): PdfValue | undefined {
  if (v?.k !== 'dict') return undefined;
  for (const [k, x] of v.entries) if (k === key) return x;
  return undefined;
}

export function dictSet(v: PdfValue, key: string, value: PdfValue): void {
  if (v.k !== 'dict') throw new PdfFormatError('dictionary expected');
  const at = v.entries.findIndex(([k]) => k === key);
  if (at >= 0) v.entries[at] = [key, value];
  else v.entries.push([key, value]);
}

export function dictDelete(v: PdfValue, key: string): void {
  if (v.k === 'dict') v.entries = v.entries.filter(([k]) => k !== key);
}

/** Write a value; references go through `renumber`. */
export function serialize(v: PdfValue, renumber: (num: number) => number): string {
  switch (v.k) {
    case 'atom':
      return v.text;
    case 'ref':
      return `${renumber(v.num)} 0 R`;
    case 'array':
      return `[${v.items.map((x) => serialize(x, renumber)).join(' ')}]`;
    case 'dict':
      return `<<${v.entries.map(([k, x]) => ` ${k} ${serialize(x, renumber)}`).join('')} >>`;
  }
}

/** The text of a literal string atom (7.3.4.2), for the plain strings our renderer writes (link targets). */
export function literalText(v: PdfValue | undefined): string | undefined {
  if (v?.k !== 'atom' || !v.text.startsWith('(')) return undefined;
  return v.text.slice(1, -1).replace(/\\([nrtbf()\\]|[0-7]{1,3})/g, (_, e: string) => {
    const simple: Record<string, string> = { n: '\n', r: '\r', t: '\t', b: '\b', f: '\f', '(': '(', ')': ')', '\\': '\\' };
    return simple[e] ?? String.fromCharCode(parseInt(e, 8));
  });
}

/** A hex string of UTF-16BE text with its byte-order mark (7.9.2.2), for outline titles and info. */
export function textString(s: string): string {
  let hex = 'FEFF';
  for (let i = 0; i < s.length; i++) hex += s.charCodeAt(i).toString(16).toUpperCase().padStart(4, '0');
  return `<${hex}>`;
}

function lastIndexOfAscii(b: Uint8Array, word: string, before = b.length): number {
  return Buffer.from(b.buffer, b.byteOffset, b.byteLength).lastIndexOf(word, before, 'latin1');
}

function indexOfAscii(b: Uint8Array, word: string, from: number): number {
  return Buffer.from(b.buffer, b.byteOffset, b.byteLength).indexOf(word, from, 'latin1');
}

/** Read a PDF our renderer wrote: its objects, its catalog and its pages in order. */
export function readPdf(bytes: Uint8Array): PdfSource {
  const sx = lastIndexOfAscii(bytes, 'startxref');
  if (sx < 0) throw new PdfFormatError('no startxref');
  const sc = new Scanner(bytes, sx + 'startxref'.length);
  sc.skipSpace();
  const xrefAt = Number(sc.regular());
  const xs = new Scanner(bytes, xrefAt);
  xs.expect('xref');
  const offsets = new Map<number, number>();
  for (;;) {
    xs.skipSpace();
    const save = xs.pos;
    const first = xs.regular();
    if (first === 'trailer') break;
    if (!/^\d+$/.test(first)) throw new PdfFormatError(`bad cross-reference subsection at offset ${save}`);
    xs.skipSpace();
    const count = Number(xs.regular());
    for (let i = 0; i < count; i++) {
      xs.skipSpace();
      const offset = Number(xs.regular());
      xs.skipSpace();
      xs.regular(); // generation
      xs.skipSpace();
      const kind = xs.regular();
      if (kind === 'n') offsets.set(Number(first) + i, offset);
    }
  }
  const trailer = xs.value();
  const root = dictGet(trailer, '/Root');
  const info = dictGet(trailer, '/Info');
  if (root?.k !== 'ref') throw new PdfFormatError('trailer without /Root');

  const objects = new Map<number, PdfObject>();
  for (const [num, offset] of offsets) {
    const s = new Scanner(bytes, offset);
    s.skipSpace();
    const n = Number(s.regular());
    if (n !== num) throw new PdfFormatError(`object ${num} expected at offset ${offset}`);
    s.skipSpace();
    s.regular();
    s.expect('obj');
    const value = s.value();
    s.skipSpace();
    const object: PdfObject = { num, value };
    const save = s.pos;
    const word = s.regular();
    if (word === 'stream') {
      const length = dictGet(value, '/Length');
      if (length?.k !== 'atom' || !/^\d+$/.test(length.text)) throw new PdfFormatError(`stream ${num} without a direct /Length`);
      let data = s.pos;
      if (bytes[data] === 0x0d) data++;
      if (bytes[data] === 0x0a) data++;
      const endstream = indexOfAscii(bytes, 'endstream', data + Number(length.text));
      if (endstream < 0) throw new PdfFormatError(`stream ${num} without endstream`);
      object.stream = { start: save, end: endstream + 'endstream'.length };
    } else if (word !== 'endobj') throw new PdfFormatError(`endobj expected after object ${num}`);
    objects.set(num, object);
  }

  const catalog = objects.get(root.num);
  const pagesRef = dictGet(catalog?.value, '/Pages');
  if (pagesRef?.k !== 'ref') throw new PdfFormatError('catalog without /Pages');
  const pages: number[] = [];
  const pageTreeNodes = new Set<number>();
  const walk = (num: number, depth: number): void => {
    const node = objects.get(num);
    const type = dictGet(node?.value, '/Type');
    if (depth > 32 || !node || type?.k !== 'atom') throw new PdfFormatError(`bad page tree node ${num}`);
    if (type.text === '/Page') {
      pages.push(num);
      return;
    }
    if (type.text !== '/Pages') throw new PdfFormatError(`bad page tree node ${num}`);
    pageTreeNodes.add(num);
    const kids = dictGet(node.value, '/Kids');
    if (kids?.k !== 'array') throw new PdfFormatError(`page tree node ${num} without /Kids`);
    for (const kid of kids.items) {
      if (kid.k !== 'ref') throw new PdfFormatError(`page tree node ${num}: a kid is not a reference`);
      walk(kid.num, depth + 1);
    }
  };
  walk(pagesRef.num, 0);
  return { bytes, objects, catalog: root.num, info: info?.k === 'ref' ? info.num : null, pageTreeNodes, pages };
}

/** Pages of a PDF our renderer wrote (reads only the cross-reference table, the catalog and the page tree root). */
export function pdfPageCount(bytes: Uint8Array): number {
  const pdf = readPdf(bytes);
  return pdf.pages.length;
}
