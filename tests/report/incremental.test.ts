// Incremental builds: a sheet is rendered again only when something it shows has changed; the
// rest are taken over from OUT. The files must be the same as a full build's, byte for byte.
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync, appendFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildDossier, type BuildReport } from '../../src/report/build.js';
import { fixtureProject, fixtureResult, fixtureResultsJson } from '../fixtures/report/project.js';
import { pdfText } from './helpers.js';
import { sheetInputHash } from '../../src/report/fingerprint.js';
import { defaultRenderer, type Renderer } from '../../src/report/render.js';

const root = mkdtempSync(path.join(tmpdir(), 'fs-incremental-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));
const out = path.join(root, 'out');

const outputs = (dir: string): Record<string, Buffer> =>
  Object.fromEntries(
    readdirSync(dir)
      .filter((f) => f !== '.faultsheet-cache')
      .sort()
      .map((f) => [f, readFileSync(path.join(dir, f))]),
  );

async function build(edit?: (p: ReturnType<typeof fixtureProject>, r: ReturnType<typeof fixtureResult>) => void, opts: { force?: boolean; dir?: string } = {}): Promise<BuildReport & { sheets: string[] }> {
  const p = fixtureProject();
  const r = fixtureResult();
  edit?.(p, r);
  const sheets: string[] = [];
  const report = await buildDossier(p, r, fixtureResultsJson(p, r), opts.dir ?? out, { force: opts.force, onProgress: (_d, _t, id) => sheets.push(id) });
  return { ...report, sheets };
}

const renamed = (p: ReturnType<typeof fixtureProject>, r: ReturnType<typeof fixtureResult>): void => {
  r.circuits[1].description = p.circuits[1].description = 'Chiller plant feeder, rerouted';
};

let first: Record<string, Buffer>;
beforeAll(async () => {
  const b = await build();
  expect(b.rendered).toBe(4);
  first = outputs(out);
});

describe('incremental build', () => {
  it('renders nothing when nothing changed, and writes the same files', async () => {
    const b = await build();
    expect([b.rendered, b.kept]).toEqual([0, 4]);
    expect(b.dossierReused).toBe(4);
    const again = outputs(out);
    expect(Object.keys(again)).toEqual(Object.keys(first));
    for (const f of Object.keys(first)) expect(again[f].equals(first[f]), f).toBe(true);
  });

  it('renders only the edited circuit, keeps the other files (the same inodes), and the dossier shows the edit', async () => {
    const before = Object.fromEntries(readdirSync(out).map((f) => [f, statSync(path.join(out, f)).ino]));
    const b = await build(renamed);
    expect(b.sheets).toEqual(['MSB-Q1']);
    expect([b.rendered, b.kept]).toEqual([1, 3]);
    expect(statSync(path.join(out, 'MSB-Q4.pdf')).ino).toBe(before['MSB-Q4.pdf']);
    expect(pdfText(path.join(out, 'dossier.pdf'))).toContain('Chiller plant feeder, rerouted');
    expect(pdfText(path.join(out, 'summary.pdf'))).toContain('Chiller plant feeder, rerouted');
    // the summary lays out again only its part that shows the edited row of the index
    expect(b.summaryParts.laidOut).toBe(1);
    // and the dossier copies the three unchanged sheets from the previous dossier as they were
    expect(b.dossierReused).toBe(3);
    expect(b.summaryParts.total).toBeGreaterThan(2);
  });

  it('gives, after an edit, the same bytes as a full build of the edited project', async () => {
    const full = path.join(root, 'full');
    const f = await build(renamed, { dir: full, force: true });
    expect(f.rendered).toBe(4);
    const a = outputs(out);
    const b = outputs(full);
    expect(Object.keys(a)).toEqual(Object.keys(b));
    for (const name of Object.keys(a)) expect(a[name].equals(b[name]), name).toBe(true);
  });

  it('--force renders every sheet', async () => {
    const b = await build(renamed, { force: true });
    expect([b.rendered, b.kept]).toEqual([4, 0]);
  });

  it('renders a sheet again when its file in OUT was changed by hand', async () => {
    appendFileSync(path.join(out, 'MSB-Q7.pdf'), '%edited\n');
    appendFileSync(path.join(out, 'dossier.pdf'), '%edited\n'); // its byte ranges are no longer trusted
    const b = await build(renamed);
    expect(b.sheets).toEqual(['MSB-Q7']);
    expect(b.dossierReused).toBe(0);
  });

  it('renders everything when the cache is deleted or unreadable, and builds as usual', async () => {
    rmSync(path.join(out, '.faultsheet-cache'), { recursive: true });
    expect((await build(renamed)).rendered).toBe(4);
    writeFileSync(path.join(out, '.faultsheet-cache', 'manifest.json'), '{"format": 1, "sheets": ');
    expect((await build(renamed)).rendered).toBe(4);
    expect(existsSync(path.join(out, 'dossier.pdf'))).toBe(true);
  });

  it('renders every sheet when the project header, which every sheet shows, changes', async () => {
    const b = await build((p, r) => {
      renamed(p, r);
      p.meta.revision = 'C';
    });
    expect(b.rendered).toBe(4);
  });

  it('lays out each summary part once when an edit gives the summary more parts, and its page count with them', async () => {
    const dir = path.join(root, 'more-parts');
    // every check of every circuit made to fail with a long explanation: the list of checks that
    // do not pass runs onto more pages
    const many = (_p: ReturnType<typeof fixtureProject>, r: ReturnType<typeof fixtureResult>): void => {
      for (const c of r.circuits) {
        c.verdict = 'fail';
        for (const k of c.checks) {
          k.status = 'fail';
          k.explanation = `${'A long explanation of why this check does not pass, written to fill the line and the next. '.repeat(8)}`;
        }
      }
    };
    const real = defaultRenderer();
    let documents = 0;
    const counting: Renderer = { chart: (c) => real.chart(c), pdf: (doc, images) => (documents++, real.pdf(doc, images)) };
    const run = (edit?: typeof many): Promise<BuildReport> => {
      const p = fixtureProject();
      const r = fixtureResult();
      edit?.(p, r);
      return buildDossier(p, r, fixtureResultsJson(p, r), dir, { renderer: counting });
    };
    const before = await run();
    documents = 0;
    const after = await run(many);
    expect(after.summaryParts.total).toBeGreaterThan(before.summaryParts.total); // the edit added parts
    // every sheet shows its checks, so all four render; every part's page numbers changed, so all
    // are laid out, each once (not once for the old page count and again for the new)
    expect(after.rendered).toBe(4);
    expect(documents).toBe(4 + after.summaryParts.total);
    expect(after.summaryParts.laidOut).toBe(after.summaryParts.total);
    // and the bytes are a full build's
    const full = path.join(root, 'more-parts-full');
    const p = fixtureProject();
    const r = fixtureResult();
    many(p, r);
    await buildDossier(p, r, fixtureResultsJson(p, r), full, { force: true });
    const a = outputs(dir);
    const b = outputs(full);
    for (const name of Object.keys(b)) expect(a[name]?.equals(b[name]), name).toBe(true);
  });

  it('renders every sheet when a template changes', async () => {
    const b = await build((p, r) => {
      renamed(p, r);
      p.templatesDir = path.join(root, 'templates');
      mkdirSync(path.join(p.templatesDir, 'sheet'), { recursive: true });
      writeFileSync(path.join(p.templatesDir, 'sheet', 'labels.hbs'), readFileSync(path.join(__dirname, '../../templates/sheet/labels.hbs'), 'utf8'));
      p.meta.revision = 'C';
    });
    expect(b.rendered).toBe(4);
  });

  it('prints on a kept sheet its own input hash, which the edit elsewhere did not change', async () => {
    await build(renamed); // back to the edited project as it was
    const p = fixtureProject();
    const r = fixtureResult();
    renamed(p, r);
    p.inputSha256 = 'f'.repeat(64); // an edit changes the project's hash of every input file
    const b = await buildDossier(p, r, fixtureResultsJson(p, r), out);
    expect(b.rendered).toBe(0);
    const own = sheetInputHash(p, r.circuits.find((c) => c.id === 'MSB-Q4')!).slice(0, 12);
    expect(pdfText(path.join(out, 'MSB-Q4.pdf'))).toContain(own);
    expect(pdfText(path.join(out, 'summary.pdf'))).toContain('f'.repeat(64)); // the cover's facts
  });

  it('fingerprints a sheet the same from the solver result and from the copy a worker thread gets', () => {
    const p = fixtureProject();
    const cr = fixtureResult().circuits[0];
    const copy = structuredClone({ ...cr, charts: cr.charts }); // what a worker thread receives
    expect(sheetInputHash(p, copy)).toBe(sheetInputHash(p, cr));
  });
});
