// The dossier: the summary and every sheet joined page for page into one PDF, with a PDF outline
// (bookmarks: the summary, then one entry per circuit), the summary's links to sheet files turned
// into jumps to the sheets' first pages, and the dossier's own page number under each page.
//
// The parts are read one at a time from the files already written and their objects are copied,
// renumbered, straight into the output file (src/report/pdf-file.ts): nothing is laid out again and
// only one part is in memory at a time, whatever the size of the project. The bytes depend only on
// the parts and the metadata (no clock, no random id), so two builds of one project are identical.

import { closeSync, openSync, readFileSync, readSync, writevSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { Encodings, Font, FontNames } from '@pdf-lib/standard-fonts';
import { dictDelete, dictGet, dictSet, literalText, readPdf, serialize, textString, type PdfValue } from './pdf-file.js';

export interface DossierPart {
  /** The part's PDF file (a file of this build). */
  path: string;
  /** Its pages (known from rendering, so the page numbers can be stamped in one pass). */
  pages: number;
  /** Outline entry, plain text. */
  title: string;
  /**
   * The part's own file name. A sheet's: links to it from the front parts become jumps inside the
   * dossier. With `key`, it lets a later dossier copy this part's bytes (PartRecord).
   */
  file?: string;
  /** The part's cache key (the content of its file). */
  key?: string;
}

export interface DossierMeta {
  title: string;
  subject: string;
  date: Date;
  summaryTitle: string;
  sheetsTitle: string;
  /** "Dossier page {n} of {total}", stamped under each page's footer. */
  pageLabel?: string;
  /** Write the outline (bookmarks); default true. summary.pdf, joined from its parts, has none. */
  outline?: boolean;
}

/** Buffered sequential writes to a file, tracking the offset of each object for the xref table. */
class PdfSink {
  private fd: number;
  private chunks: Buffer[] = [];
  private buffered = 0;
  offset = 0;
  readonly offsets: number[] = [0]; // by object number; 0 is the free head
  private nextNum = 1;

  constructor(path: string) {
    this.fd = openSync(path, 'wx');
  }

  allocate(): number {
    return this.nextNum++;
  }

  get size(): number {
    return this.nextNum;
  }

  write(data: string | Uint8Array): void {
    const buf = typeof data === 'string' ? Buffer.from(data, 'latin1') : Buffer.from(data.buffer, data.byteOffset, data.byteLength);
    this.chunks.push(buf);
    this.buffered += buf.length;
    this.offset += buf.length;
    if (this.buffered >= 1 << 20) this.flush();
  }

  object(num: number, body: string, stream?: Uint8Array): void {
    this.offsets[num] = this.offset;
    this.write(`${num} 0 obj\n${body}\n`);
    if (stream) {
      this.write(stream);
      this.write('\n');
    }
    this.write('endobj\n');
  }

  flush(): void {
    if (!this.buffered) return;
    // the chunks as they are (no copy into one buffer); a short write continues where it stopped
    let chunks = this.chunks;
    let left = this.buffered;
    while (left > 0) {
      let done = writevSync(this.fd, chunks.slice(0, 1024));
      left -= done;
      let i = 0;
      while (i < chunks.length && done >= chunks[i].length) done -= chunks[i++].length;
      chunks = chunks.slice(i);
      if (done > 0) chunks[0] = chunks[0].subarray(done);
    }
    this.chunks = [];
    this.buffered = 0;
  }

  close(): void {
    try {
      this.flush();
    } finally {
      closeSync(this.fd);
    }
  }
}

const atom = (text: string): PdfValue => ({ k: 'atom', text });

/** PDF date string (7.9.4) of a date, in UTC. */
function pdfDate(d: Date): string {
  const p = (n: number, w = 2): string => String(n).padStart(w, '0');
  return `(D:${p(d.getUTCFullYear(), 4)}${p(d.getUTCMonth() + 1)}${p(d.getUTCDate())}${p(d.getUTCHours())}${p(d.getUTCMinutes())}${p(d.getUTCSeconds())}Z)`;
}

/**
 * Helvetica, one of the standard fonts of PDF (32000-1:2008 9.6.2.2), in WinAnsi encoding: widths
 * and kerning from its Adobe font metrics (@pdf-lib/standard-fonts). Characters outside WinAnsi
 * print as "?".
 */
class Helvetica {
  private readonly font = Font.load(FontNames.Helvetica);
  private readonly encoding = Encodings.WinAnsi;

  safe(text: string): string {
    return [...text].map((ch) => (this.encoding.canEncodeUnicodeCodePoint(ch.codePointAt(0)!) ? ch : '?')).join('');
  }

  private glyphs(text: string): Array<{ code: number; name: string }> {
    return [...text].map((ch) => this.encoding.encodeUnicodeCodePoint(ch.codePointAt(0)!));
  }

  /** Width of `text` at `size` points, kerned. */
  width(text: string, size: number): number {
    const glyphs = this.glyphs(text);
    let total = 0;
    glyphs.forEach((g, i) => {
      const next = glyphs[i + 1]?.name;
      total += (this.font.getWidthOfGlyph(g.name) || 250) + ((next !== undefined ? this.font.getXAxisKerningForPair(g.name, next) : 0) || 0);
    });
    return (total * size) / 1000;
  }

  /** `text` as a PDF hex string of its WinAnsi codes. */
  hex(text: string): string {
    return `<${this.glyphs(text)
      .map((g) => g.code.toString(16).padStart(2, '0').toUpperCase())
      .join('')}>`;
  }
}

/**
 * Write the dossier to `outPath` (a new file): the front parts' pages (the summary), then each
 * sheet's, in order. Returns the pages written and where each part lies (for the next build).
 */
export function writeDossier(outPath: string, front: DossierPart[], sheets: DossierPart[], meta: DossierMeta, reuse?: DossierReuse): DossierWritten {
  const writer = new DossierWriter(outPath, sheets, front.reduce((n, p) => n + p.pages, 0), meta, reuse);
  try {
    return writer.finish(front, sheets) ?? internalStale();
  } finally {
    writer.close();
  }
}

function internalStale(): never {
  throw new Error('internal error: the dossier was written with the page counts it was given, and they changed');
}

/**
 * Where one part's objects lie in a dossier file. A sheet's bytes in the dossier depend only on its
 * own file, the first object number it is given, its first page number and the page total: where all
 * four are as they were in the previous dossier, its byte range is copied from there as it is. A
 * front part (the summary's) also depends on where the sheets it links to begin (`links`).
 */
export interface PartRecord {
  key: string; // the part's cache key (its file's content)
  links: string; // front parts: a hash of every sheet's file and first page object; '' for sheets
  base: number; // first object number
  count: number; // objects
  pageOffset: number; // pages before it in the dossier
  total: number; // pages in the dossier
  start: number; // byte range in the dossier file
  end: number;
  rel: number[]; // offset of each object from start, by number - base
  kids: number[]; // its page objects
}

/** The previous dossier and where its sheets lie (from the build cache). */
export interface DossierReuse {
  path: string;
  records: ReadonlyMap<string, PartRecord>; // by recordName()
}

export interface DossierWritten {
  pages: number;
  records: Record<string, PartRecord>; // by recordName()
  reused: number; // sheets copied from the previous dossier
  reusedFront: number; // front parts copied from it
}

/** The name a part's record is kept under: front parts and sheets apart (a circuit id may look like a summary part's file). */
function recordName(part: DossierPart, front: boolean): string | undefined {
  if (part.file === undefined || part.key === undefined) return undefined;
  return front ? `front:${part.file}` : part.file;
}

/**
 * A dossier written in two steps, so that the sheets that are ready (an incremental build's kept
 * ones) go into the file while others still render: `advance` writes sheets in order up to one not
 * ready, `finish` writes the rest, the front parts and the trailer. Every page carries the page
 * total, and a sheet's place depends on the front's length: the writer starts from counts it is
 * given (the last build's, for sheets still rendering and for the front), and `finish` returns null
 * when the parts as they came out have other counts; the caller then writes the file again.
 */
export class DossierWriter {
  private readonly sink: PdfSink;
  private readonly totalPages: number;
  private readonly pagesNum: number;
  private readonly catalogNum: number;
  private readonly outlinesNum: number;
  private readonly infoNum: number;
  private readonly stamp: Helvetica | null;
  private fontNum = 0;
  private saveNum = 0;
  private restoreNum = 0;
  private readonly old: number | null;
  private readonly sheetFiles = new Map<string, number>(); // sheet file -> its first page object
  private readonly records: Record<string, PartRecord> = {};
  private readonly written: DossierPart[] = []; // the sheets written so far, as they were given
  private readonly sheetKids: number[][] = [];
  private frontKids: number[][] = [];
  private reused = 0;
  private reusedFront = 0;
  private links = '';
  private pageNo: number; // pages before the next sheet
  private closed = false;

  /** Open `outPath` (a new file) for a dossier of `sheets` after `frontPages` pages of front parts. */
  constructor(
    outPath: string,
    sheets: readonly DossierPart[],
    private readonly frontPages: number,
    private readonly meta: DossierMeta,
    private readonly reuse?: DossierReuse,
  ) {
    this.totalPages = frontPages + sheets.reduce((n, p) => n + p.pages, 0);
    this.pageNo = frontPages;
    const sink = (this.sink = new PdfSink(outPath));
    try {
      sink.write('%PDF-1.7\n%\xe2\xe3\xcf\xd3\n');
      this.catalogNum = sink.allocate();
      this.pagesNum = sink.allocate();
      this.outlinesNum = meta.outline !== false ? sink.allocate() : 0;
      this.infoNum = sink.allocate();
      this.stamp = meta.pageLabel ? new Helvetica() : null;
      if (this.stamp) {
        // Helvetica is one of the standard fonts of PDF (32000-1:2008 9.6.2.2): nothing is embedded.
        this.fontNum = sink.allocate();
        sink.object(this.fontNum, '<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica /Encoding /WinAnsiEncoding >>');
        // Each page's own content is wrapped in q ... Q, so the stamp starts from the default state.
        this.saveNum = sink.allocate();
        sink.object(this.saveNum, '<< /Length 1 >>\nstream', Buffer.from('q\nendstream', 'latin1'));
        this.restoreNum = sink.allocate();
        sink.object(this.restoreNum, '<< /Length 1 >>\nstream', Buffer.from('Q\nendstream', 'latin1'));
      }
      this.old = reuse ? openSync(reuse.path, 'r') : null;
    } catch (err) {
      sink.close();
      throw err;
    }
  }

  /**
   * Write the sheets from the next one up to sheets[end - 1]. The sheets are written first and the
   * front parts last (the page order is still the front's first): a change in the summary's
   * objects then moves no sheet's object numbers, and the summary's links can name the sheets'
   * first pages directly.
   */
  advance(sheets: readonly DossierPart[], end: number): void {
    for (let i = this.written.length; i < end; i++) {
      const part = sheets[i];
      const kids = this.place(part, false, this.pageNo);
      this.sheetKids.push(kids);
      this.written.push(part);
      this.pageNo += part.pages;
      if (part.file !== undefined) this.sheetFiles.set(part.file, kids[0]);
    }
  }

  /**
   * Write the sheets not yet written, the front parts, the page tree, outline and trailer. Null when
   * the parts have other page counts than those the writer started from (nothing more is written).
   */
  finish(front: readonly DossierPart[], sheets: readonly DossierPart[]): DossierWritten | null {
    const frontPages = front.reduce((n, p) => n + p.pages, 0);
    const totalPages = frontPages + sheets.reduce((n, p) => n + p.pages, 0);
    const same = (a: DossierPart, b: DossierPart): boolean => a.path === b.path && a.pages === b.pages && a.key === b.key && a.file === b.file && a.title === b.title;
    if (frontPages !== this.frontPages || totalPages !== this.totalPages || this.written.length > sheets.length || this.written.some((p, i) => !same(p, sheets[i]))) return null;
    this.advance(sheets, sheets.length);
    this.links = front.length ? createHash('sha256').update(JSON.stringify([...this.sheetFiles])).digest('hex') : '';
    let pageNo = 0;
    this.frontKids = front.map((part) => {
      const kids = this.place(part, true, pageNo);
      pageNo += part.pages;
      return kids;
    });
    this.trailer(front, sheets);
    return { pages: totalPages, records: this.records, reused: this.reused, reusedFront: this.reusedFront };
  }

  /** Close the file (written or not) and the last dossier read from; again, nothing. */
  close(): void {
    if (this.closed) return;
    this.closed = true;
    try {
      this.sink.close();
    } finally {
      if (this.old !== null) closeSync(this.old);
    }
  }

  /** Write one part, first page pageNo + 1: copied from the previous dossier if nothing about it moved. */
  private place(part: DossierPart, isFront: boolean, pageNo: number): number[] {
    const { sink, old, reuse } = this;
    const name = recordName(part, isFront);
    const rec = name !== undefined ? reuse?.records.get(name) : undefined;
    const base = sink.size;
    const start = sink.offset;
    const partLinks = isFront ? this.links : '';
    let kids: number[];
    if (old !== null && rec && rec.key === part.key && rec.links === partLinks && rec.base === base && rec.pageOffset === pageNo && rec.total === this.totalPages && rec.kids.length === part.pages) {
      const bytes = Buffer.allocUnsafe(rec.end - rec.start);
      let got = 0;
      while (got < bytes.length) {
        const n = readSync(old, bytes, got, bytes.length - got, rec.start + got);
        if (n === 0) throw new Error(`internal error: ${reuse!.path} is shorter than its cache says`);
        got += n;
      }
      for (let k = 0; k < rec.count; k++) sink.offsets[sink.allocate()] = start + rec.rel[k];
      sink.write(bytes);
      kids = rec.kids;
      if (isFront) this.reusedFront++;
      else this.reused++;
    } else kids = this.copyPart(part, pageNo, isFront);
    if (name !== undefined)
      this.records[name] = {
        key: part.key!,
        links: partLinks,
        base,
        count: sink.size - base,
        pageOffset: pageNo,
        total: this.totalPages,
        start,
        end: sink.offset,
        rel: sink.offsets.slice(base, sink.size).map((o) => o - start),
        kids,
      };
    return kids;
  }

  /** Copy one part's objects, renumbered, with its pages stamped from page pageOffset + 1; returns its page objects. */
  private copyPart(part: DossierPart, pageOffset: number, isFront: boolean): number[] {
    const { sink, stamp, meta, sheetFiles, pagesNum, fontNum, saveNum, restoreNum, totalPages } = this;
    const pdf = readPdf(readFileSync(part.path));
    if (pdf.pages.length !== part.pages) throw new Error(`internal error: ${part.path} has ${pdf.pages.length} pages, ${part.pages} expected`);
    const skip = new Set<number>([pdf.catalog, ...pdf.pageTreeNodes]);
    if (pdf.info !== null) skip.add(pdf.info);
    // the summary's links to sheet files: URI actions naming a sheet of the dossier give way to
    // destinations inside it, so the actions themselves are not copied
    const actionFile = new Map<number, string>();
    if (isFront)
      for (const [num, o] of pdf.objects) {
        const s = dictGet(o.value, '/S');
        const file = s?.k === 'atom' && s.text === '/URI' ? literalText(dictGet(o.value, '/URI')) : undefined;
        if (file !== undefined && sheetFiles.has(file)) {
          actionFile.set(num, file);
          skip.add(num);
        }
      }
    const map = new Map<number, number>();
    for (const num of [...pdf.objects.keys()].sort((a, b) => a - b)) if (!skip.has(num)) map.set(num, sink.allocate());
    const renumber = (n: number): number => {
      const m = map.get(n);
      if (m === undefined) throw new Error(`internal error: ${part.path}: object ${n} is referenced but not copied`);
      return m;
    };
    const pageSet = new Set(pdf.pages);
    const resourcesOfPages = new Set<number>();
    const pageObjects: number[] = [];
    let pageNo = pageOffset;
    for (const page of pdf.pages) {
      const value = pdf.objects.get(page)!.value;
      pageObjects.push(renumber(page));
      dictSet(value, '/Parent', atom(`${pagesNum} 0 R`)); // a dossier number already, like the stamp's
      const res = dictGet(value, '/Resources');
      if (stamp) {
        pageNo++;
        const text = stamp.safe(meta.pageLabel!.replace('{n}', String(pageNo)).replace('{total}', String(totalPages)));
        const size = 6.5;
        const width = dictGet(value, '/MediaBox');
        const pageWidth = width?.k === 'array' && width.items[2]?.k === 'atom' ? Number(width.items[2].text) : 595.28;
        const x = (pageWidth - stamp.width(text, size)) / 2;
        const hex = stamp.hex(text);
        const content = `BT\n/FSpg ${size} Tf\n0.45 0.5 0.56 rg\n${x.toFixed(3)} 14 Td\n${hex} Tj\nET`;
        const stampNum = sink.allocate();
        sink.object(stampNum, `<< /Length ${Buffer.byteLength(content, 'latin1')} >>\nstream`, Buffer.from(`${content}\nendstream`, 'latin1'));
        const contents = dictGet(value, '/Contents');
        const own = contents?.k === 'array' ? contents.items : contents ? [contents] : [];
        // renumber now: the stamp objects are already dossier numbers
        dictSet(value, '/Contents', { k: 'array', items: [{ k: 'atom', text: `${saveNum} 0 R` }, ...own.map((c) => (c.k === 'ref' ? atom(`${renumber(c.num)} 0 R`) : c)), atom(`${restoreNum} 0 R`), atom(`${stampNum} 0 R`)] });
        if (res?.k === 'ref') resourcesOfPages.add(res.num);
        else if (res?.k === 'dict') addStampFont(res, fontNum);
        else dictSet(value, '/Resources', { k: 'dict', entries: [['/Font', { k: 'dict', entries: [['/FSpg', atom(`${fontNum} 0 R`)]] }]] });
      }
    }
    for (const num of [...map.keys()]) {
      const o = pdf.objects.get(num)!;
      if (pageSet.has(num)) {
        sink.object(map.get(num)!, serialize(o.value, renumber));
        continue;
      }
      if (resourcesOfPages.has(num)) addStampFont(o.value, fontNum);
      const action = dictGet(o.value, '/A');
      const file = action?.k === 'ref' ? actionFile.get(action.num) : undefined;
      if (file !== undefined) {
        dictDelete(o.value, '/A');
        dictSet(o.value, '/Dest', { k: 'array', items: [atom(`${sheetFiles.get(file)!} 0 R`), atom('/Fit')] });
      }
      const body = serialize(o.value, renumber);
      if (o.stream) sink.object(map.get(num)!, body, pdf.bytes.subarray(o.stream.start, o.stream.end));
      else sink.object(map.get(num)!, body);
    }
    return pageObjects;
  }


  /** The page tree, the outline, the catalog, the document information and the cross-reference table. */
  private trailer(front: readonly DossierPart[], sheets: readonly DossierPart[]): void {
    const { sink, meta, pagesNum, catalogNum, outlinesNum, infoNum } = this;
    const outline = meta.outline !== false;
    const kids = [...this.frontKids.flat(), ...this.sheetKids.flat()];
    const parts = [...front, ...sheets];
    sink.object(pagesNum, `<< /Type /Pages /Kids [${kids.map((k) => `${k} 0 R`).join(' ')}] /Count ${kids.length} >>`);
    if (outline) {
      const f = front.length;
      writeOutline(sink, outlinesNum, [
        ...(f ? [{ title: meta.summaryTitle, page: this.frontKids[0][0], children: [] }] : []),
        ...(sheets.length ? [{ title: meta.sheetsTitle, page: this.sheetKids[0][0], children: sheets.map((s, i) => ({ title: s.title, page: this.sheetKids[i][0], children: [] })) }] : []),
      ]);
      sink.object(catalogNum, `<< /Type /Catalog /Pages ${pagesNum} 0 R /Outlines ${outlinesNum} 0 R /PageMode /UseOutlines >>`);
    } else sink.object(catalogNum, `<< /Type /Catalog /Pages ${pagesNum} 0 R >>`);
    const date = pdfDate(meta.date);
    sink.object(infoNum, `<< /Title ${textString(meta.title)} /Subject ${textString(meta.subject)} /Creator (faultsheet) /Producer (faultsheet) /CreationDate ${date} /ModDate ${date} >>`);

    // a front part's file is a cache name (it changes with the tool): not part of the document's id
    const id = createHash('md5')
      .update(JSON.stringify({ meta: { ...meta, date: meta.date.toISOString() }, parts: parts.map((p, i) => [p.title, p.pages, i < front.length ? '' : (p.file ?? '')]) }))
      .digest('hex');
    const xrefAt = sink.offset;
    let xref = `xref\n0 ${sink.size}\n0000000000 65535 f \n`;
    for (let n = 1; n < sink.size; n++) {
      const at = sink.offsets[n];
      if (at === undefined || at < 0) throw new Error(`internal error: dossier object ${n} was not written`);
      xref += `${String(at).padStart(10, '0')} 00000 n \n`;
    }
    sink.write(xref);
    sink.write(`trailer\n<< /Size ${sink.size} /Root ${catalogNum} 0 R /Info ${infoNum} 0 R /ID [<${id}> <${id}>] >>\nstartxref\n${xrefAt}\n%%EOF\n`);
  }
}

/** Add the stamp's font to a resource dictionary (once). */
function addStampFont(resources: PdfValue, fontNum: number): void {
  let fonts = dictGet(resources, '/Font');
  if (fonts?.k === 'ref') throw new Error('internal error: a page font dictionary by reference is not supported');
  if (fonts?.k !== 'dict') {
    fonts = { k: 'dict', entries: [] };
    dictSet(resources, '/Font', fonts);
  }
  if (!dictGet(fonts, '/FSpg')) dictSet(fonts, '/FSpg', atom(`${fontNum} 0 R`));
}

interface OutlineNode {
  title: string;
  page: number;
  children: OutlineNode[];
}

/** Write /Outlines (PDF 32000-1:2008, 12.3.3), every level open. */
function writeOutline(sink: PdfSink, rootNum: number, nodes: OutlineNode[]): void {
  const build = (items: OutlineNode[], parent: number): { first: number; last: number; count: number } => {
    const nums = items.map(() => sink.allocate());
    let count = 0;
    items.forEach((item, i) => {
      let body = `<< /Title ${textString(item.title)} /Parent ${parent} 0 R`;
      if (i > 0) body += ` /Prev ${nums[i - 1]} 0 R`;
      if (i < items.length - 1) body += ` /Next ${nums[i + 1]} 0 R`;
      body += ` /Dest [${item.page} 0 R /Fit]`;
      count += 1;
      if (item.children.length) {
        const sub = build(item.children, nums[i]);
        body += ` /First ${sub.first} 0 R /Last ${sub.last} 0 R /Count ${sub.count}`;
        count += sub.count;
      }
      sink.object(nums[i], `${body} >>`);
    });
    return { first: nums[0], last: nums[nums.length - 1], count };
  };
  let root = '<< /Type /Outlines';
  if (nodes.length) {
    const top = build(nodes, rootNum);
    root += ` /First ${top.first} 0 R /Last ${top.last} 0 R /Count ${top.count}`;
  }
  sink.object(rootNum, `${root} >>`);
}
