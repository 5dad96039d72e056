// The whole build on the fixture project: files, PDF text (pdftotext), determinism and atomicity.
import { mkdtempSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { PDFArray, PDFDict, PDFDocument, PDFHexString, PDFName, PDFNumber, PDFRef, PDFString } from 'pdf-lib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OutputPlanError, TemplateError, buildDossier } from '../../src/report/build.js';
import { defaultRenderer, type Renderer } from '../../src/report/render.js';
import { fixtureProject, fixtureResult, fixtureResultsJson } from '../fixtures/report/project.js';
import { pdfImages, pdfPages, pdfText } from './helpers.js';
import { sheetInputHash } from '../../src/report/fingerprint.js';

const root = mkdtempSync(path.join(tmpdir(), 'fs-build-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const project = fixtureProject();
const result = fixtureResult();
const json = fixtureResultsJson(project, result);
const outA = path.join(root, 'a', 'out');
const outB = path.join(root, 'b', 'out');
let files: string[] = [];
const progress: Array<[number, number, string]> = [];

// the files of a build (the cache folder is the build's own bookkeeping, not an output)
const snapshot = (dir: string): Record<string, Buffer> =>
  Object.fromEntries(
    readdirSync(dir)
      .filter((f) => f !== '.faultsheet-cache')
      .sort()
      .map((f) => [f, readFileSync(path.join(dir, f))]),
  );

beforeAll(async () => {
  files = (await buildDossier(project, result, json, outA, { onProgress: (d, t, id) => progress.push([d, t, id]) })).files;
  await buildDossier(fixtureProject(), fixtureResult(), json, outB);
});

describe('build', () => {
  it('writes one sheet per circuit, summary.pdf, dossier.pdf and results.json', () => {
    expect(readdirSync(outA).sort()).toEqual(['.faultsheet-cache', 'DB-1-C3.pdf', 'MSB-Q1.pdf', 'MSB-Q4.pdf', 'MSB-Q7.pdf', 'dossier.pdf', 'results.json', 'summary.pdf']);
    expect(files.map((f) => path.basename(f))).toEqual(['DB-1-C3.pdf', 'MSB-Q1.pdf', 'MSB-Q4.pdf', 'MSB-Q7.pdf', 'summary.pdf', 'dossier.pdf', 'results.json']);
    expect(readFileSync(path.join(outA, 'results.json'), 'utf8')).toBe(JSON.stringify(json, null, 2) + '\n');
    expect(progress).toEqual([
      [1, 4, 'DB-1-C3'],
      [2, 4, 'MSB-Q1'],
      [3, 4, 'MSB-Q4'],
      [4, 4, 'MSB-Q7'],
    ]);
    expect(readdirSync(path.dirname(outA))).toEqual(['out']); // no staging folder left
  });

  it('gives byte-identical files for the same inputs', () => {
    const a = snapshot(outA);
    const b = snapshot(outB);
    expect(Object.keys(b)).toEqual(Object.keys(a));
    for (const f of Object.keys(a)) expect(b[f].equals(a[f]), f).toBe(true);
  });

  it('dates the PDFs from the project date and names no version', () => {
    const raw = readFileSync(path.join(outA, 'MSB-Q1.pdf')).toString('latin1');
    expect(raw).toContain('D:20260314000000Z'); // project.date 2026-03-14
    expect(raw).not.toMatch(/pdfmake|PDFKit|pdf-lib/i);
    const dossier = readFileSync(path.join(outA, 'dossier.pdf')).toString('latin1');
    expect(dossier).toContain('D:20260314000000Z');
    expect(dossier).not.toMatch(/pdf-lib|pdfmake/i);
  });

  it('prints a sheet with the circuit, k, the origin fault current, the threshold length and the sign-off', () => {
    const file = path.join(outA, 'MSB-Q4.pdf');
    const text = pdfText(file);
    expect(text).toContain('MSB-Q4');
    // k of copper/XLPE: 143, IEC 60364-5-54:2011 Table A.54 (the fixture's k = 143.08 from IEC 60949)
    expect(text).toMatch(/^k\s+= K √\(ln.*=\s*143\s*$/m);
    // I''k3max at the origin, the fixture's hand calculation 25 318 A, shown as 25.3 kA
    expect(text).toContain('At the origin (board MSB): I″k3max = 25.3 kA');
    expect(text).toMatch(/Threshold \(minimum\) length\s+3\.7 m/);
    for (const s of ['A. Marlowe', 'J. Okonkwo-Reyes', 'S. Lindqvist', 'Prepared', 'Checked', 'Approved']) expect(text).toContain(s);
    expect(pdfPages(file)).toBeGreaterThanOrEqual(2);
    expect(pdfImages(file)).toBe(3);
  });

  it('puts the title block on every page of a sheet', () => {
    const file = path.join(outA, 'DB-1-C3.pdf');
    const n = pdfPages(file);
    const own = sheetInputHash(project, result.circuits.find((c) => c.id === 'DB-1-C3')!).slice(0, 12);
    for (let p = 1; p <= n; p++) {
      const text = pdfText(file, { first: p, last: p });
      expect(text).toContain('Harbourview Cold Store');
      expect(text).toContain(`${p} of ${n}`);
      expect(text).toContain(own);
    }
  });

  it('gives the summary a board tree and an index, failing circuits first, with their dossier pages', () => {
    const text = pdfText(path.join(outA, 'summary.pdf'));
    expect(text).toContain('Boards and fault levels');
    expect(text).toMatch(/MSB\s+25\.3 kA\s+57\.0 kA\s+22\.7 kA/);
    const order = ['DB-1-C3', 'MSB-Q4', 'MSB-Q7', 'MSB-Q1'].map((id) => text.indexOf(id, text.indexOf('Index of circuits')));
    expect(order).toEqual([...order].sort((a, b) => a - b)); // fail, fail, undetermined, pass
    // the page the index gives for MSB-Q4 is where its sheet starts in the dossier
    const row = new RegExp('MSB-Q4\\s.*?(\\d+)\\s*$', 'm').exec(text.slice(text.indexOf('Index of circuits')))!;
    const page = Number(row[1]);
    expect(pdfText(path.join(outA, 'dossier.pdf'), { first: page, last: page })).toMatch(/MSB-Q4 — Feeder to process MCC-1[\s\S]*1 of \d+/);
  });

  it('makes the dossier the summary then every sheet, with one bookmark per circuit', async () => {
    const pages = ['summary.pdf', 'DB-1-C3.pdf', 'MSB-Q1.pdf', 'MSB-Q4.pdf', 'MSB-Q7.pdf'].reduce((s, f) => s + pdfPages(path.join(outA, f)), 0);
    expect(pdfPages(path.join(outA, 'dossier.pdf'))).toBe(pages);
    const doc = await PDFDocument.load(readFileSync(path.join(outA, 'dossier.pdf')));
    const outlines = doc.catalog.lookup(PDFName.of('Outlines'), PDFDict);
    const titles: string[] = [];
    const walk = (ref: PDFRef | undefined): void => {
      for (let r = ref; r; ) {
        const item = doc.context.lookup(r, PDFDict);
        titles.push((item.lookup(PDFName.of('Title')) as PDFHexString).decodeText());
        walk(item.get(PDFName.of('First')) as PDFRef | undefined);
        r = item.get(PDFName.of('Next')) as PDFRef | undefined;
      }
    };
    walk(outlines.get(PDFName.of('First')) as PDFRef);
    expect(titles).toEqual([
      'Project summary',
      'Calculation sheets',
      'DB-1-C3 — Socket-outlet circuit, cold room corridor',
      'MSB-Q1 — Feeder to distribution board DB-1',
      'MSB-Q4 — Feeder to process MCC-1 (selective, short-time delay)',
      'MSB-Q7 — Yard lighting and gate supply',
    ]);
    expect((outlines.get(PDFName.of('Count')) as PDFNumber).asNumber()).toBe(6);
  });
});

describe('links from the index of circuits', () => {
  /** Every link annotation of a PDF's pages: the page it is on, and its URI or destination page. */
  const links = async (file: string) => {
    const doc = await PDFDocument.load(readFileSync(file));
    const pageOf = new Map(doc.getPages().map((p, i) => [p.ref.toString(), i + 1]));
    const found: Array<{ on: number; uri?: string; to?: number }> = [];
    doc.getPages().forEach((page, i) => {
      const annots = page.node.lookupMaybe(PDFName.of('Annots'), PDFArray);
      for (let k = 0; k < (annots?.size() ?? 0); k++) {
        const a = annots!.lookup(k, PDFDict);
        const uri = a.lookupMaybe(PDFName.of('A'), PDFDict)?.lookupMaybe(PDFName.of('URI'), PDFString, PDFHexString);
        const dest = a.lookupMaybe(PDFName.of('Dest'), PDFArray);
        found.push({ on: i + 1, uri: uri?.decodeText(), to: dest ? pageOf.get(String(dest.get(0))) : undefined });
      }
    });
    return found;
  };
  it('summary.pdf links each circuit to its own sheet file', async () => {
    const uris = (await links(path.join(outA, 'summary.pdf'))).map((l) => l.uri);
    for (const f of ['DB-1-C3.pdf', 'MSB-Q1.pdf', 'MSB-Q4.pdf', 'MSB-Q7.pdf']) expect(uris).toContain(f);
  });
  it('prints the dossier page number on every dossier page, so the index can be followed on paper', () => {
    const total = pdfPages(path.join(outA, 'dossier.pdf'));
    for (const page of [1, total]) {
      expect(pdfText(path.join(outA, 'dossier.pdf'), { first: page, last: page })).toContain(`Dossier page ${page} of ${total}`);
    }
    expect(pdfText(path.join(outA, 'summary.pdf'))).not.toContain('Dossier page');
  });

  it('in the dossier each link jumps to the first page of its sheet instead', async () => {
    const dossier = await links(path.join(outA, 'dossier.pdf'));
    expect(dossier.length).toBeGreaterThan(0);
    expect(dossier.every((l) => l.uri === undefined && l.to !== undefined)).toBe(true);
    const summaryPages = pdfPages(path.join(outA, 'summary.pdf'));
    const q4 = summaryPages + pdfPages(path.join(outA, 'DB-1-C3.pdf')) + pdfPages(path.join(outA, 'MSB-Q1.pdf')) + 1;
    expect(dossier.map((l) => l.to)).toContain(q4);
    expect(pdfText(path.join(outA, 'dossier.pdf'), { first: q4, last: q4 })).toContain('MSB-Q4 — Feeder to process MCC-1');
  });
});

describe('a project without circuits', () => {
  it('still gets its summary, a dossier of the summary alone, and results.json', async () => {
    const p = fixtureProject();
    const r = fixtureResult();
    p.circuits = [];
    r.circuits = [];
    const out = path.join(root, 'empty', 'out');
    await buildDossier(p, r, { circuits: [] }, out);
    expect(readdirSync(out).sort()).toEqual(['.faultsheet-cache', 'dossier.pdf', 'results.json', 'summary.pdf']);
    expect(pdfPages(path.join(out, 'dossier.pdf'))).toBe(pdfPages(path.join(out, 'summary.pdf')));
    expect(pdfText(path.join(out, 'summary.pdf'))).toContain('None: every check of every circuit passes');
  });
});

describe('a failed build', () => {
  const previous = (dir: string): Record<string, Buffer> => {
    mkdirSync(dir, { recursive: true });
    writeFileSync(path.join(dir, 'OLD-1.pdf'), 'previous sheet');
    writeFileSync(path.join(dir, 'results.json'), '{"previous": true}\n');
    return snapshot(dir);
  };

  it('leaves a previous OUT untouched when rendering fails midway', async () => {
    const out = path.join(root, 'fail', 'out');
    const before = previous(out);
    const real = defaultRenderer();
    let sheets = 0;
    const failing: Renderer = {
      chart: (c) => real.chart(c),
      pdf: async (doc, images) => {
        if (++sheets === 3) throw new Error('renderer broke on the third sheet');
        return real.pdf(doc, images);
      },
    };
    await expect(buildDossier(fixtureProject(), fixtureResult(), json, out, { renderer: failing })).rejects.toThrow('renderer broke');
    expect(snapshot(out)).toEqual(before);
    expect(readdirSync(path.dirname(out))).toEqual(['out']);
  });

  it('reports colliding output names before writing anything', async () => {
    const out = path.join(root, 'collide', 'out');
    const before = previous(out);
    const p = fixtureProject();
    const r = fixtureResult();
    p.circuits[0].id = r.circuits[0].id = 'MSB/Q1'; // -> MSB_Q1.pdf
    p.circuits[1].id = r.circuits[1].id = 'MSB_Q1';
    await expect(buildDossier(p, r, json, out)).rejects.toThrow(OutputPlanError);
    await expect(buildDossier(p, r, json, out)).rejects.toThrow(/would both be written as MSB_Q1\.pdf/);
    expect(snapshot(out)).toEqual(before);
    expect(readdirSync(path.dirname(out))).toEqual(['out']);
    expect(statSync(out).isDirectory()).toBe(true);
  });

  it('reports a project template that does not compile, naming it, before writing anything', async () => {
    const out = path.join(root, 'tpl', 'out');
    const before = previous(out);
    const p = fixtureProject();
    p.dir = path.join(root, 'tpl');
    p.templatesDir = path.join(p.dir, 'templates');
    mkdirSync(path.join(p.templatesDir, 'sheet'), { recursive: true });
    writeFileSync(path.join(p.templatesDir, 'sheet', 'verdict.hbs'), '# 1 Verdict\n{{#if verdict.pass}}unclosed\n');
    const err = await buildDossier(p, fixtureResult(), json, out).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(TemplateError);
    expect((err as TemplateError).message).toContain(path.join(p.templatesDir, 'sheet/verdict.hbs'));
    expect(snapshot(out)).toEqual(before);
    expect(readdirSync(path.dirname(out)).sort()).toEqual(['out', 'templates']);
  });
});
