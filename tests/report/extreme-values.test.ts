// Extreme but accepted inputs through load, solve and layout: every text of the sheet and summary
// definitions (and of the chart configurations) is free of "NaN", "Infinity", "undefined" and
// "[object". Layout only (pdfmake definitions), no PDF rendered. Robustness, not engineering
// numbers: no value is checked against a reference.

import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadProject } from '../../src/model/load.js';
import type { Project } from '../../src/model/types.js';
import { solveProject } from '../../src/calc/solve.js';
import type { ProjectResult } from '../../src/calc/types.js';
import { sheetCharts } from '../../src/report/charts.js';
import { sheetDocument } from '../../src/report/sheet.js';
import { projectTemplates } from '../../src/report/sheets.js';
import { summaryDocument } from '../../src/report/summary.js';
import { fixtureProject, fixtureResult } from '../fixtures/report/project.js';
import { baseProject, circuitYaml, deviceYaml, projectYaml, writeTree, type Tree } from '../hostile/project-files.js';

const BAD = /NaN|Infinity|undefined|\[object/;

const root = mkdtempSync(path.join(os.tmpdir(), 'faultsheet-extreme-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

/** Every string reachable from `value` (functions such as header and footer are called for page 1 of 3). */
function strings(value: unknown, at = '$', out: Array<[string, string]> = [], seen = new Set<unknown>()): Array<[string, string]> {
  if (typeof value === 'string') out.push([at, value]);
  else if (typeof value === 'number') {
    if (!Number.isFinite(value)) out.push([at, String(value)]);
  } else if (typeof value === 'function') {
    if (value.length <= 3) strings((value as (a: number, b: number) => unknown)(1, 3), `${at}()`, out, seen);
  } else if (value && typeof value === 'object' && !seen.has(value)) {
    seen.add(value);
    if (ArrayBuffer.isView(value)) return out;
    for (const [k, v] of Object.entries(value)) strings(v, `${at}.${k}`, out, seen);
  }
  return out;
}

async function solved(name: string, tree: Tree): Promise<{ project: Project; result: ProjectResult }> {
  const dir = path.join(root, name);
  writeTree(dir, tree);
  const loaded = await loadProject(dir);
  if (!loaded.ok) throw new Error(`${name} does not load: ${JSON.stringify(loaded.issues.slice(0, 3))}`);
  return { project: loaded.project, result: solveProject(loaded.project) };
}

const network = (fault: string, xr: string) =>
  projectYaml().replace('fault_level: 200 MVA', `fault_level: ${fault}`).replace('fault_level_min: 120 MVA', `fault_level_min: ${fault}`).replace('x_over_r: 10', `x_over_r: ${xr}`);

const PROJECTS: Record<string, Tree> = {
  'a stiff network and circuits at the ends of the ranges': {
    'project.yaml': network('999000 MVA', '1e9'),
    'devices/devices.yaml': `devices:\n${deviceYaml()}${deviceYaml({ id: 'TINY', rating: '1 µA', breaking: '1 µA', letThrough: null })}${deviceYaml({ id: 'LT-ONLY', letThrough: '[[1e-3, 1e-6], [1e6, 1e12]]' })}`,
    'circuits/long.yaml': circuitYaml({ id: 'LONG', length: '999 km', load: '{ current: 999 MA, power_factor: 0.01 }' }),
    'circuits/short.yaml': circuitYaml({ id: 'SHORT', length: '0.002 mm', device: 'TINY', size: '0.5 mm2' }),
    'circuits/wide.yaml': circuitYaml({ id: 'WIDE', length: '1 m', device: 'LT-ONLY', size: '1000 mm2', load: null }),
  },
  'a weak network with X/R 0, a time-only device and TT earthing': {
    'project.yaml': network('0.001 MVA', '0').replace('earthing: TN-S', 'earthing: TT'),
    'devices/devices.yaml': `devices:\n${deviceYaml()}  - id: RELAY-DT
    kind: relay
    description: Definite-time relay (illustrative data)
    illustrative: true
    rating: 1 A
    breaking_capacity: 1 kA
    clearing_time: 1000 s
`,
    'circuits/a.yaml': circuitYaml({ id: 'A', device: 'RELAY-DT', length: '500 km' }),
    'circuits/b.yaml': circuitYaml({ id: 'B', length: '0.002 mm', load: '{ current: 1 µA, power_factor: 1 }' }),
  },
  'the base project': baseProject(),
};

describe('sheet and summary definitions for extreme projects', () => {
  it.each(Object.keys(PROJECTS))('%s: no NaN, Infinity, undefined or [object in any text', async (name) => {
    const { project, result } = await solved(name.replace(/[^A-Za-z0-9]+/g, '-'), PROJECTS[name]);
    const templates = projectTemplates(project);
    const labels = templates.labels('sheet/labels.hbs');
    const bad: string[] = [];
    const collect = (where: string, value: unknown): void => {
      for (const [at, text] of strings(value)) if (BAD.test(text)) bad.push(`${where} ${at}: ${text.slice(0, 120)}`);
    };
    result.circuits.forEach((cr, i) => {
      collect(`sheet ${cr.id}`, sheetDocument(project, cr, { templates, index: i + 1, count: result.circuits.length }));
      const circuit = project.circuits.find((c) => c.id === cr.id)!;
      collect(`charts ${cr.id}`, sheetCharts(cr, circuit, labels));
    });
    collect('summary', summaryDocument(project, result, { templates }));
    expect(result.circuits.length).toBeGreaterThan(0);
    expect(bad).toEqual([]);
  });
});

/** Set every traced quantity's value (and each circuit result's own numbers) in `result` to `bad`. */
function poison(result: ProjectResult, bad: number): void {
  const seen = new Set<unknown>();
  const walk = (o: unknown): void => {
    if (!o || typeof o !== 'object' || seen.has(o)) return;
    seen.add(o);
    const r = o as Record<string, unknown>;
    if ('symbol' in r && 'value' in r && typeof r.value === 'number') r.value = bad;
    for (const k of Object.keys(r)) {
      const d = Object.getOwnPropertyDescriptor(r, k);
      if (d && 'value' in d) walk(d.value); // lazy getters (chart series) are left alone
    }
  };
  walk(result);
  for (const cr of result.circuits) {
    const c = cr as unknown as Record<string, unknown>;
    for (const k of Object.keys(c)) if (typeof Object.getOwnPropertyDescriptor(c, k)?.value === 'number') c[k] = bad;
  }
}

describe('sheet and summary definitions for a result holding non-finite numbers', () => {
  it.each([[NaN], [Infinity], [-Infinity]])('%s is shown as undetermined or "—", never as its JavaScript name', (bad) => {
    const project = fixtureProject();
    const result = fixtureResult();
    poison(result, bad);
    const templates = projectTemplates(project);
    const found: string[] = [];
    let texts = 0;
    const collect = (where: string, value: unknown): void => {
      for (const [at, text] of strings(value)) {
        texts++;
        if (BAD.test(text)) found.push(`${where} ${at}: ${text.slice(0, 120)}`);
      }
    };
    result.circuits.forEach((cr, i) => collect(`sheet ${cr.id}`, sheetDocument(project, cr, { templates, index: i + 1, count: result.circuits.length })));
    collect('summary', summaryDocument(project, result, { templates }));
    expect(texts).toBeGreaterThan(100); // the walk reaches the texts
    expect(found).toEqual([]);
  });

  it('the walk finds a planted value (it can fail)', () => {
    const planted = strings({ content: [{ text: [{ text: 'I = NaN kA' }] }], header: () => ({ text: 'Infinity' }) });
    expect(planted.filter(([, t]) => BAD.test(t)).map(([at]) => at)).toEqual(['$.content.0.text.0.text', '$.header().text']);
  });
});
