// Layout of the calculation sheet, read from its pdfmake document definition (no PDF rendered).
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { projectTemplates } from '../../src/report/build.js';
import { SHEET_IMAGES, assumptionsOf, quantityGroup, sheetDocument } from '../../src/report/sheet.js';
import { fixtureProject, fixtureResult } from '../fixtures/report/project.js';
import { docText, findNodes } from './helpers.js';
import { sheetInputHash } from '../../src/report/fingerprint.js';

const project = fixtureProject();
const result = fixtureResult();
const sheetOf = (id: string, p = project, r = result) => {
  const i = r.circuits.findIndex((c) => c.id === id);
  return sheetDocument(p, r.circuits[i], { templates: projectTemplates(p), index: i + 1, count: r.circuits.length });
};

const tmp: string[] = [];
afterAll(() => tmp.forEach((d) => rmSync(d, { recursive: true, force: true })));

describe('calculation sheet', () => {
  const doc = sheetOf('MSB-Q4');
  const text = docText(doc, { header: true });

  it('has every section of DESIGN.md in order', () => {
    const headings = findNodes(doc, (n) => n.style === 'h1').map((n) => docText({ content: n } as never).trim());
    expect(headings).toEqual([
      '1 Verdict',
      '2 Inputs as used',
      '3 Impedance build-up',
      '4 Fault currents',
      '5 Energy comparison',
      '6 Withstand against time',
      '7 Length and voltage drop',
      '8 Alternatives',
      '9 Assumptions',
      '10 Sign-off',
      '11 Cautions',
    ]);
  });

  it('carries the title block on every page: project, number, revision, date, circuit, sheet n of N, hash, sign-off', () => {
    const header = (doc.header as (p: number, n: number) => unknown)(2, 5);
    const h = docText({ content: header } as never);
    // the sheet's own input hash (what it is computed from), not the whole project's
    const own = sheetInputHash(fixtureProject(), fixtureResult().circuits.find((c) => c.id === 'MSB-Q4')!).slice(0, 12);
    expect(own).not.toBe('3f2a9c4be17d');
    for (const s of ['Harbourview Cold Store', 'HCS-2207', 'B', '2026-03-14', 'MSB-Q4 — Feeder to process MCC-1', '2 of 5', '3 of 4', own, 'Sheet inputs', 'A. Marlowe', 'J. Okonkwo-Reyes', 'S. Lindqvist'])
      expect(h).toContain(s);
    expect(h).not.toContain('3f2a9c4be17d');
    for (const w of ['Prepared', 'Checked', 'Approved']) expect(h).toContain(w);
  });

  it('states the failing check in words with its fix and governing case', () => {
    expect(text).toContain('Thermal withstand, k²S² ≥ I²t: FAIL.');
    expect(text).toContain('The smallest compliant size is 150 mm²');
    expect(text).toContain('fault at the origin (board MSB), I″k3max = 25.3 kA');
  });

  it('formats the numbers with units and significant figures', () => {
    expect(text).toContain('3.21 × 108 A²s'); // superscript exponent reads as 108 in plain text
    expect(text).toContain('25.3 kA'); // I''k3max at the origin, 3 s.f.
    expect(text).toContain('8.0 m'); // length, one decimal
    expect(text).toContain('3.7 m'); // threshold length
    // the impedance table in milliohm: R_Q = 0.1 X_Q = 0.0701 mohm of the 250 MVA feeder (hand calculation in the fixture)
    expect(text).toContain('0.0701');
  });

  it('marks defaults with a tag that refers to the numbered assumption', () => {
    const items = assumptionsOf(project, result.circuits[2], project.circuits[2], project.devices[3], project.supplies[0]);
    const reactance = items.find((a) => a.kind === 'default' && a.field.includes('cable.reactance'))!;
    expect(reactance).toBeDefined();
    expect(text).toContain(`0.0800 Ω/km (default) ${reactance.number}`);
    expect(text).toContain(`${reactance.number}.Default (circuit): cable.reactance = 0.08 Ω/km, from FORMAT default.`);
    expect(text).toMatch(/Network X.*10\.0 \(default\) A\d+/s);
  });

  it('references the three charts and carries the cautions', () => {
    const images = findNodes(doc, (n) => typeof n.image === 'string').map((n) => n.image);
    expect(images).toEqual([SHEET_IMAGES.energy, SHEET_IMAGES.time, SHEET_IMAGES.length]);
    expect(text).toContain('does not replace, the judgement of a competent person');
    expect(text).toContain('the authority having jurisdiction and licensed practice govern');
    expect(text).toContain("Device data must come from the maker's current datasheet");
    expect(text).toContain('The device data used here are illustrative');
  });

  it('prints "{{" in a description literally', () => {
    const p = fixtureProject();
    const r = fixtureResult();
    const desc = 'Pump set {{#each x}} {{> evil}} I\'\'k **not bold**';
    p.circuits.find((c) => c.id === 'MSB-Q1')!.description = desc;
    r.circuits.find((c) => c.id === 'MSB-Q1')!.description = desc;
    const t = docText(sheetOf('MSB-Q1', p, r));
    expect(t).toContain(`(${desc})`);
  });

  it('repeats lengths in feet where the author wrote the length in feet (1 ft = 0.3048 m, exact)', () => {
    const p = fixtureProject();
    const circuit = p.circuits.find((c) => c.id === 'MSB-Q1')!;
    circuit.cable = { ...circuit.cable, length: 45.72, lengthWritten: '150 ft' };
    const t = docText(sheetOf('MSB-Q1', p, result));
    expect(t).toContain('45.7 m (150 ft)');
    expect(docText(sheetOf('MSB-Q1'))).not.toContain(' ft)');
  });

  it('groups traced quantities by what they are', () => {
    const groups = result.circuits[1].quantities.map((q) => `${q.symbol}:${quantityGroup(q)}`);
    expect(groups).toContain("I''k3max:fault");
    expect(groups).toContain('k:energy');
    expect(groups).toContain('k^2 S^2:energy');
    expect(groups).toContain('t_op:time');
    expect(groups).toContain('L_thr:length');
  });

  it('takes a project template over the default, file by file', () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'fs-tpl-'));
    tmp.push(dir);
    mkdirSync(path.join(dir, 'templates', 'sheet'), { recursive: true });
    writeFileSync(path.join(dir, 'templates', 'sheet', 'verdict.hbs'), '# 1 Summary of checks (firm wording)\n\n@@banner\n@@checks\n');
    writeFileSync(path.join(dir, 'templates', 'sheet', 'labels.hbs'), 'prepared: Prepared\nfooter: Firm footer line.\n');
    const p = fixtureProject();
    p.dir = dir;
    p.templatesDir = path.join(dir, 'templates');
    const d = sheetOf('MSB-Q4', p);
    const t = docText(d, { header: true });
    expect(t).toContain('1 Summary of checks (firm wording)');
    expect(t).not.toContain('1 Verdict');
    expect(t).toContain('Firm footer line.');
    expect(t).toContain('2 Inputs as used'); // other files keep the defaults
    expect(t).toContain('Checked'); // labels the project did not set keep theirs
  });
});
