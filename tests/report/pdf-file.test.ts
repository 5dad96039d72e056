// The PDF object reader/writer that joins the dossier (src/report/pdf-file.ts, dossier.ts), against
// the grammar of PDF 32000-1:2008 section 7.3 and against poppler, an independent reader.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { PDFArray, PDFDict, PDFDocument, PDFName, PDFNumber, PDFRef } from 'pdf-lib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeDossier } from '../../src/report/dossier.js';
import { PdfFormatError, literalText, pdfPageCount, readPdf, serialize, textString } from '../../src/report/pdf-file.js';
import { defaultRenderer } from '../../src/report/render.js';
import { FONT } from '../../src/report/layout.js';

const root = mkdtempSync(path.join(tmpdir(), 'fs-pdf-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

/** A minimal PDF written by hand, with strings that look like references and a stream holding "endobj". */
function handMade(): Buffer {
  const objects = [
    '<< /Type /Catalog /Pages 2 0 R >>',
    '<< /Type /Pages /Kids [3 0 R] /Count 1 >>',
    '<< /Type /Page /Parent 2 0 R /MediaBox [0 0 200 100] /Contents 4 0 R /Resources << /Font << >> >> /Note (a (nested) string with 2 0 R and \\) inside) /Hex <48656c6c6f> >>',
    null, // the stream, below
  ];
  let body = '%PDF-1.3\n';
  const offsets: number[] = [];
  objects.forEach((o, i) => {
    offsets.push(body.length);
    if (o) body += `${i + 1} 0 obj\n${o}\nendobj\n`;
    else {
      const data = 'BT % endobj in a comment\n(endobj 4 0 R) Tj ET';
      body += `${i + 1} 0 obj\n<< /Length ${data.length} >>\nstream\n${data}\nendstream\nendobj\n`;
    }
  });
  const xref = body.length;
  body += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n${offsets.map((o) => `${String(o).padStart(10, '0')} 00000 n \n`).join('')}`;
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(body, 'latin1');
}

describe('reading PDF objects', () => {
  it('tells references from strings and stream data that look like them', () => {
    const pdf = readPdf(handMade());
    expect(pdf.pages).toEqual([3]);
    expect([...pdf.pageTreeNodes]).toEqual([2]);
    const page = pdf.objects.get(3)!.value;
    // renumbering adds 100 to every reference and touches nothing else
    expect(serialize(page, (n) => n + 100)).toBe(
      '<< /Type /Page /Parent 102 0 R /MediaBox [0 0 200 100] /Contents 104 0 R /Resources << /Font << >> >> /Note (a (nested) string with 2 0 R and \\) inside) /Hex <48656c6c6f> >>',
    );
    const stream = pdf.objects.get(4)!;
    expect(Buffer.from(pdf.bytes.subarray(stream.stream!.start, stream.stream!.end)).toString('latin1')).toBe('stream\nBT % endobj in a comment\n(endobj 4 0 R) Tj ET\nendstream');
  });

  it('decodes literal strings (7.3.4.2) and writes text strings as UTF-16BE with a byte-order mark (7.9.2.2)', () => {
    expect(literalText({ k: 'atom', text: '(a\\(b\\)c\\\\d\\101)' })).toBe('a(b)c\\dA'); // \101 octal = "A"
    expect(textString('Ω1')).toBe('<FEFF03A90031>'); // U+03A9, U+0031
  });

  it('refuses a file it does not understand with an internal error, not a wrong dossier', () => {
    expect(() => readPdf(Buffer.from('%PDF-1.4\nno cross-reference table here\n'))).toThrow(PdfFormatError);
    const broken = handMade().toString('latin1').replace('/Count 1', '/Count 1 /Kids (x)').replace('/Kids [3 0 R]', '');
    expect(() => readPdf(Buffer.from(broken, 'latin1'))).toThrow(PdfFormatError);
  });
});

describe('joining PDFs into a dossier', () => {
  let parts: Array<{ path: string; pages: number; title: string; file?: string }>;
  let dossier: string;
  beforeAll(async () => {
    const renderer = defaultRenderer();
    const doc = (text: string, pages: number, link?: string) => ({
      defaultStyle: { font: FONT },
      content: Array.from({ length: pages }, (_, i) => ({ text: `${text} page ${i + 1}`, ...(link && i === 0 ? { link } : {}), ...(i > 0 ? { pageBreak: 'before' as const } : {}) })),
    });
    const write = async (name: string, pages: number, text: string, link?: string) => {
      const file = path.join(root, name);
      writeFileSync(file, await renderer.pdf(doc(text, pages, link)));
      return file;
    };
    const summary = await write('summary.pdf', 2, 'Summary', 'B.pdf');
    parts = [
      { path: summary, pages: 2, title: 'Summary' },
      { path: await write('A.pdf', 3, 'Sheet A'), pages: 3, title: 'A — first', file: 'A.pdf' },
      { path: await write('B.pdf', 1, 'Sheet B'), pages: 1, title: 'B — ünïcode Ω', file: 'B.pdf' },
    ];
    dossier = path.join(root, 'dossier.pdf');
    writeDossier(dossier, [parts[0]], parts.slice(1), { title: 'Dossier', subject: 'Test', date: new Date(Date.UTC(2026, 10, 20)), summaryTitle: 'Summary', sheetsTitle: 'Sheets', pageLabel: 'Dossier page {n} of {total}' });
  });

  it('has every page of every part in order, each stamped with its dossier page number (read by poppler)', () => {
    expect(pdfPageCount(readFileSync(dossier))).toBe(6);
    const info = execFileSync('pdfinfo', [dossier], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
    expect(info).toMatch(/Pages:\s+6/);
    const text = execFileSync('pdftotext', ['-layout', dossier, '-'], { encoding: 'utf8' });
    const order = ['Summary page 1', 'Summary page 2', 'Sheet A page 1', 'Sheet A page 2', 'Sheet A page 3', 'Sheet B page 1'];
    let at = -1;
    for (const line of order) {
      const next = text.indexOf(line, at + 1);
      expect(next, line).toBeGreaterThan(at);
      at = next;
    }
    for (let n = 1; n <= 6; n++) expect(text).toContain(`Dossier page ${n} of 6`);
  });

  it('has one bookmark per part, and the summary link to a sheet file jumps to that sheet (read by pdf-lib)', async () => {
    const doc = await PDFDocument.load(readFileSync(dossier));
    const raw = readFileSync(dossier).toString('latin1');
    expect(raw).toContain(textString('B — ünïcode Ω'));
    expect(raw).not.toContain('/URI (B.pdf)');
    expect(doc.getPageCount()).toBe(6);
    // outline: Summary, Sheets (A, B) = 4 entries, every level open (12.3.3)
    const outlines = doc.catalog.lookup(PDFName.of('Outlines'), PDFDict);
    expect(outlines.lookup(PDFName.of('Count'), PDFNumber).asNumber()).toBe(4);
    const sheets = outlines.lookup(PDFName.of('Last'), PDFDict);
    const firstSheet = sheets.lookup(PDFName.of('First'), PDFDict);
    const lastSheet = sheets.lookup(PDFName.of('Last'), PDFDict);
    const pageOf = (d: PDFDict): number => doc.getPages().findIndex((p) => p.ref === (d.lookup(PDFName.of('Dest'), PDFArray).get(0) as PDFRef));
    expect([pageOf(firstSheet), pageOf(lastSheet)]).toEqual([2, 5]);
    // the summary's link to B.pdf is now a destination on B's first page (12.3.2)
    const annots = doc.getPage(0).node.lookup(PDFName.of('Annots'), PDFArray);
    const link = annots.lookup(0, PDFDict);
    expect(link.get(PDFName.of('A'))).toBeUndefined();
    expect(pageOf(link)).toBe(5);
    expect(doc.getTitle()).toBe('Dossier');
    expect(doc.getCreationDate()?.toISOString()).toBe('2026-11-20T00:00:00.000Z');
  });

  it('gives the same bytes for the same parts', () => {
    const again = path.join(root, 'again.pdf');
    writeDossier(again, [parts[0]], parts.slice(1), { title: 'Dossier', subject: 'Test', date: new Date(Date.UTC(2026, 10, 20)), summaryTitle: 'Summary', sheetsTitle: 'Sheets', pageLabel: 'Dossier page {n} of {total}' });
    expect(readFileSync(again).equals(readFileSync(dossier))).toBe(true);
  });

  it('refuses to overwrite an existing file', () => {
    expect(() => writeDossier(dossier, [parts[0]], [], { title: '', subject: '', date: new Date(0), summaryTitle: '', sheetsTitle: '' })).toThrow(/EEXIST/);
  });
});
