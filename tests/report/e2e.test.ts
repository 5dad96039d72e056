// End to end on the demo project folders: load, solve, build; the PDFs must agree with results.json.
import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadProject } from '../../src/model/load.js';
import { solveProject } from '../../src/calc/solve.js';
import { resultsDocument } from '../../src/calc/results-json.js';
import { buildDossier, sheetFileName } from '../../src/report/build.js';
import { kiloamps } from '../../src/report/format.js';
import type { Project } from '../../src/model/types.js';
import type { ProjectResult } from '../../src/calc/types.js';
import { pdfImages, pdfPages, pdfText } from './helpers.js';

const demos = path.resolve(import.meta.dirname, '../../projects-demo');
const root = mkdtempSync(path.join(tmpdir(), 'fs-e2e-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

async function build(name: string): Promise<{ project: Project; result: ProjectResult; out: string }> {
  const loaded = await loadProject(path.join(demos, name));
  if (!loaded.ok) throw new Error(`demo ${name} does not load: ${JSON.stringify(loaded.issues.slice(0, 3))}`);
  const result = solveProject(loaded.project);
  const out = path.join(root, name, 'out');
  await buildDossier(loaded.project, result, resultsDocument(loaded.project, result), out);
  return { project: loaded.project, result, out };
}

describe('demo iec-400v', () => {
  let b: Awaited<ReturnType<typeof build>>;
  beforeAll(async () => {
    b = await build('iec-400v');
  });

  it('writes a sheet per circuit, the summary, the dossier and results.json', () => {
    const expected = [...b.result.circuits.map((c) => sheetFileName(c.id)), 'dossier.pdf', 'results.json', 'summary.pdf'].sort();
    expect(readdirSync(b.out).sort()).toEqual(['.faultsheet-cache', ...expected]);
    expect(JSON.parse(readFileSync(path.join(b.out, 'results.json'), 'utf8'))).toEqual(JSON.parse(JSON.stringify(resultsDocument(b.project, b.result))));
  });

  it('prints on each sheet the fault currents results.json gives, in kA to 3 figures', () => {
    const json = JSON.parse(readFileSync(path.join(b.out, 'results.json'), 'utf8')) as {
      circuits: Array<{ id: string; origin: { ik3max_a: number }; end: { ik1min_a: number } }>;
    };
    for (const c of json.circuits.slice(0, 4)) {
      const file = path.join(b.out, sheetFileName(c.id));
      const text = pdfText(file);
      expect(text).toContain(c.id);
      expect(text).toContain(`I″k3max = ${kiloamps(c.origin.ik3max_a)}`);
      expect(text).toContain(`I″k1min = ${kiloamps(c.end.ik1min_a)}`);
      for (const w of ['Prepared', 'Checked', 'Approved']) expect(text).toContain(w);
      expect(pdfPages(file)).toBeGreaterThanOrEqual(2);
      expect(pdfImages(file)).toBe(3);
    }
  });

  it('makes the dossier the summary then every sheet, and names every circuit in the summary', () => {
    const sheets = b.result.circuits.reduce((n, c) => n + pdfPages(path.join(b.out, sheetFileName(c.id))), 0);
    expect(pdfPages(path.join(b.out, 'dossier.pdf'))).toBe(pdfPages(path.join(b.out, 'summary.pdf')) + sheets);
    const summary = pdfText(path.join(b.out, 'summary.pdf'));
    for (const c of b.result.circuits) expect(summary).toContain(c.id);
    for (const board of b.result.boards) expect(summary).toContain(board.id);
  });
});

describe('demo nec-480v', () => {
  it('builds, with conductor sizes as the project writes them', async () => {
    const b = await build('nec-480v');
    expect(readdirSync(b.out)).toHaveLength(b.result.circuits.length + 4);
    const awg = b.project.circuits.find((c) => c.cable.size.system !== 'metric');
    if (awg) expect(pdfText(path.join(b.out, sheetFileName(awg.id)))).toContain(awg.cable.size.label);
  });
});
