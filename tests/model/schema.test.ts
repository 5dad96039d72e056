// Field rules of the schema and the normaliser, on small projects held in memory (buildProject is
// the pure part of the loader: the same path a folder on disk takes after it is read).

import { describe, expect, it } from 'vitest';
import type { Issue } from '../../src/model/issues.js';
import { buildProject } from '../../src/model/load.js';
import type { Project } from '../../src/model/types.js';

const PROJECT = `project: { name: Invented Test Site, number: T-1, revision: A, date: 2026-01-15 }
settings: { system_voltage: 400 V }
supplies:
  - id: TX1
    feeds: MSB
    transformer: { rating: 800 kVA, primary_voltage: 11 kV, secondary_voltage: 400 V, impedance: 5 %, load_losses: 8.5 kW }
`;
const DEVICES = `devices:
  - id: D1
    kind: mccb
    rating: 100 A
    clearing_time: 0.1 s
  - id: B16
    kind: mcb
    rating: 16 A
    clearing_time: 0.01 s
`;
const CIRCUIT = `id: C1
from: MSB
device: D1
cable: { conductor: copper, insulation: XLPE, size: 25 mm2, length: 20 m }
`;

function build(files: Record<string, string>) {
  const all: Record<string, string> = { 'project.yaml': PROJECT, 'devices/d.yaml': DEVICES, 'circuits/c1.yaml': CIRCUIT, ...files };
  return buildProject({
    dir: '/virtual/project',
    files: Object.entries(all).map(([path, text]) => ({ path, bytes: new TextEncoder().encode(text) })),
    problems: [],
  });
}

function issues(files: Record<string, string>): Issue[] {
  const outcome = build(files);
  if (outcome.ok) throw new Error('expected issues');
  return outcome.issues;
}

function project(files: Record<string, string>): Project {
  const outcome = build(files);
  if (!outcome.ok) throw new Error(outcome.issues.map((i) => `${i.file}:${i.line}:${i.col} ${i.path}: ${i.message}`).join('\n'));
  return outcome.project;
}

const summary = (list: Issue[]) => list.map((i) => `${i.file}:${i.line}:${i.col} ${i.path} ${i.code}`);

describe('circuit fields', () => {
  it('power factor must be in (0, 1]; parallel a whole number of at least 1', () => {
    const found = issues({
      'circuits/c1.yaml': `id: C1
from: MSB
device: D1
load: { current: 10 A, power_factor: 1.2 }
cable: { conductor: copper, insulation: XLPE, size: 25 mm2, length: 20 m, parallel: 1.5 }
`,
    });
    expect(summary(found)).toEqual([
      'circuits/c1.yaml:4:38 load.power_factor out-of-range',
      'circuits/c1.yaml:5:85 cable.parallel not-integer',
    ]);
    expect(found[0]!.expected).toContain('at most 1');
  });

  it('percentages need "%"; a field with no value is reported as empty', () => {
    const found = issues({
      'circuits/c1.yaml': `id: C1
from: MSB
to:
device: D1
checks: { voltage_drop_limit: 4 }
cable: { conductor: copper, insulation: XLPE, size: 25 mm2, length: 20 m }
`,
    });
    expect(summary(found)).toEqual(['circuits/c1.yaml:3:1 to empty-value', 'circuits/c1.yaml:5:31 checks.voltage_drop_limit missing-unit']);
    expect(found[1]!.expected).toBe('a percentage such as "5 %"');
  });

  it('unknown fields are found at every depth', () => {
    const found = issues({
      'circuits/c1.yaml': `id: C1
from: MSB
device: D1
cable:
  conductor: copper
  insulation: XLPE
  size: 25 mm2
  length: 20 m
  protective_conductor: { size: 16 mm2, arangement: separate }
`,
    });
    expect(summary(found)).toEqual(['circuits/c1.yaml:9:41 cable.protective_conductor.arangement unknown-field']);
    expect(found[0]!.message).toContain('did you mean "arrangement"');
  });

  it('conductor and insulation are from their lists; "aluminum" is read as aluminium', () => {
    const found = issues({
      'circuits/c1.yaml': `id: C1
from: MSB
device: D1
cable: { conductor: coper, insulation: XPLE, size: 25 mm2, length: 20 m }
`,
    });
    expect(found.map((i) => i.code)).toEqual(['invalid-value', 'invalid-value']);
    expect(found[0]!.message).toContain('did you mean "copper"');
    expect(found[1]!.message).toContain('did you mean "XLPE"');
    const p = project({
      'circuits/c1.yaml': `id: C1
from: MSB
device: D1
cable: { conductor: aluminum, insulation: XLPE, size: 25 mm2, length: 20 m }
`,
    });
    expect(p.circuits[0]!.cable.conductor).toBe('aluminium');
    // IEC 60228:2004 Table 2, 25 mm2 aluminium: 1.20 ohm/km
    expect(p.circuits[0]!.cable.resistance20).toBeCloseTo(1.2e-3, 12);
  });

  it('a list file and a one-circuit file may sit side by side; ids are unique across both', () => {
    const found = issues({
      'circuits/list.yaml': `circuits:
  - id: C2
    from: MSB
    device: D1
    cable: { conductor: copper, insulation: XLPE, size: 25 mm2, length: 20 m }
  - id: C1
    from: MSB
    device: D1
    cable: { conductor: copper, insulation: XLPE, size: 25 mm2, length: 20 m }
`,
    });
    expect(summary(found)).toEqual(['circuits/list.yaml:6:9 circuits[1].id duplicate-id']);
    expect(found[0]!.message).toContain('circuits/c1.yaml:1:5');
  });

  it('a supply id equal to a board id is fine; a circuit id equal to a supply id is not', () => {
    const ok = project({
      'project.yaml': PROJECT.replace('id: TX1', 'id: MSB'),
    });
    expect(ok.supplies[0]!.id).toBe('MSB');
    const found = issues({ 'circuits/c1.yaml': CIRCUIT.replace('id: C1', 'id: TX1') });
    expect(summary(found)).toEqual(['circuits/c1.yaml:1:5 id duplicate-id']);
    expect(found[0]!.message).toContain('supply at project.yaml:4:9');
  });
});

describe('checks defaults', () => {
  it('disconnection time follows the device rating: <= 32 A 0.4 s, else 5 s (TN, 230/400 V)', () => {
    const p = project({
      'circuits/c2.yaml': CIRCUIT.replace('id: C1', 'id: C2').replace('device: D1', 'device: B16'),
    });
    // IEC 60364-4-41:2005 Table 41.1 (TN, 120 V < U0 <= 230 V): 0.4 s; 411.3.2.3: 5 s
    expect(p.circuits.map((c) => [c.id, c.checks.disconnectionTime])).toEqual([
      ['C1', 5],
      ['C2', 0.4],
    ]);
  });

  it('a TT system takes the TT column: 0.2 s and 1 s', () => {
    const tt = PROJECT.replace('system_voltage: 400 V', 'system_voltage: 400 V, earthing: TT');
    const p = project({ 'project.yaml': tt, 'circuits/c2.yaml': CIRCUIT.replace('id: C1', 'id: C2').replace('device: D1', 'device: B16') });
    // IEC 60364-4-41:2005 Table 41.1 (TT, 120 V < U0 <= 230 V): 0.2 s; 411.3.2.4: 1 s
    expect(p.circuits.map((c) => c.checks.disconnectionTime)).toEqual([1, 0.2]);
  });
});

describe('project.yaml rules', () => {
  it('a supply is a transformer or a service, not both and not neither', () => {
    const both = PROJECT.replace('    feeds: MSB\n', '    feeds: MSB\n    service: { fault_current: 16 kA }\n');
    expect(summary(issues({ 'project.yaml': both }))).toEqual(['project.yaml:6:14 supplies[0].service conflicting-fields']);
    const neither = `project: { name: Invented Test Site, number: T-1, revision: A, date: 2026-01-15 }
settings: { system_voltage: 400 V }
supplies:
  - id: TX1
    feeds: MSB
`;
    expect(summary(issues({ 'project.yaml': neither }))).toEqual(['project.yaml:4:5 supplies[0] missing-alternative']);
  });

  it('fault_level or fault_current, and a minimum not above the maximum', () => {
    const both = PROJECT.replace(
      '    transformer:',
      '    network: { voltage: 11 kV, fault_level: 250 MVA, fault_current: 13 kA, fault_current_min: 20 kA }\n    transformer:',
    );
    const found = issues({ 'project.yaml': both });
    expect(found.map((i) => `${i.path} ${i.code}`)).toEqual(['supplies[0].network.fault_current conflicting-fields']);
    const inverted = PROJECT.replace(
      '    transformer:',
      '    network: { voltage: 11 kV, fault_level: 250 MVA, fault_level_min: 300 MVA }\n    transformer:',
    );
    expect(issues({ 'project.yaml': inverted }).map((i) => `${i.path} ${i.code}`)).toEqual([
      'supplies[0].network.fault_level_min inconsistent-values',
    ]);
  });

  it('fault_current_min converts like fault_current: S = sqrt(3) U_nQ I', () => {
    const withMin = PROJECT.replace(
      '    transformer:',
      '    network: { voltage: 11 kV, fault_current: 13 kA, fault_current_min: 8 kA, x_over_r: 8, voltage_factor: 1.1 }\n    transformer:',
    );
    const p = project({ 'project.yaml': withMin });
    const supply = p.supplies[0]!;
    if (supply.kind !== 'transformer') throw new Error('kind');
    // sqrt(3) x 11 kV x 8 kA = 152.42 MVA (IEC 60909-0 definition of S''_k)
    expect(supply.network!.faultLevelMin / 1e6).toBeCloseTo(152.42, 2);
    expect(p.defaults.map((d) => d.field).filter((f) => f.includes('network'))).toEqual([]);
  });

  it('a transformer needs load_losses or x_over_r (not both), and u_R below u_k', () => {
    const none = PROJECT.replace(', load_losses: 8.5 kW', '');
    expect(summary(issues({ 'project.yaml': none }))).toEqual(['project.yaml:6:18 supplies[0].transformer missing-alternative']);
    const both = PROJECT.replace('load_losses: 8.5 kW', 'load_losses: 8.5 kW, x_over_r: 6');
    expect(issues({ 'project.yaml': both }).map((i) => i.code)).toEqual(['conflicting-fields']);
    // 50 kW of 800 kVA is u_R = 6.25 %, above u_k = 5 %: impossible (Z_T >= R_T, IEC 60909-0 6.3.1)
    const impossible = PROJECT.replace('load_losses: 8.5 kW', 'load_losses: 50 kW');
    expect(issues({ 'project.yaml': impossible }).map((i) => i.code)).toEqual(['inconsistent-values']);
    const byRatio = project({ 'project.yaml': PROJECT.replace('load_losses: 8.5 kW', 'x_over_r: 6') });
    const supply = byRatio.supplies[0]!;
    expect(supply.kind === 'transformer' && supply.transformer.xOverR).toBe(6);
  });

  it('c_min above c_max is refused', () => {
    const bad = PROJECT.replace('system_voltage: 400 V', 'system_voltage: 400 V, voltage_factor_min: 1.1');
    expect(summary(issues({ 'project.yaml': bad }))).toEqual(['project.yaml:2:56 settings.voltage_factor_min inconsistent-values']);
  });

  it('min_fault_conductor_temperature: final, operating or a temperature', () => {
    const fixed = project({ 'project.yaml': PROJECT.replace('system_voltage: 400 V', 'system_voltage: 400 V, min_fault_conductor_temperature: 160 degC') });
    expect(fixed.settings.minFaultTemperature).toEqual({ mode: 'fixed', celsius: 160 });
    const wrong = issues({ 'project.yaml': PROJECT.replace('system_voltage: 400 V', 'system_voltage: 400 V, min_fault_conductor_temperature: finale') });
    expect(wrong.map((i) => i.code)).toEqual(['invalid-value']);
    expect(wrong[0]!.message).toContain('did you mean "final"');
  });

  it('required sections and fields are reported missing at their parent', () => {
    const found = issues({ 'project.yaml': 'project: { name: X, number: "1", revision: A }\nsupplies: []\n' });
    expect(summary(found)).toEqual([
      // no "unknown board" for c1.yaml: with the supplies unread, which boards are fed is not known,
      // and a follow-on error would bury the real one
      'project.yaml:1:1 project.date missing-field',
      'project.yaml:1:1 settings missing-field',
      'project.yaml:2:11 supplies no-supplies',
    ]);
  });

  it('a date from a YAML 1.1 timestamp is kept as YYYY-MM-DD', () => {
    const p = project({ 'project.yaml': `%YAML 1.1\n---\n${PROJECT}` });
    expect(p.meta.date).toBe('2026-01-15');
  });
});

describe('devices', () => {
  it('instantaneous pickup as a current; a pickup not above the rating is a warning', () => {
    const outcome = build({
      'devices/d.yaml': `devices:
  - id: D1
    kind: mccb
    rating: 100 A
    clearing_time: 0.1 s
    instantaneous: { pickup: 80 A, clearing_time: 20 ms }
`,
    });
    if (!outcome.ok) throw new Error('expected a project');
    expect(outcome.project.devices[0]!.instantaneous).toEqual({ pickup: 80, clearingTime: 0.02 });
    expect(summary(outcome.warnings)).toEqual(['devices/d.yaml:6:30 devices[0].instantaneous.pickup inconsistent-values']);
  });

  it('a file that does not parse brings no follow-on errors from the files that refer to it', () => {
    const found = issues({ 'devices/d.yaml': `devices:\n  - id: D1\n    kind: [mcb\n` });
    expect(found.every((i) => i.file === 'devices/d.yaml')).toBe(true); // no "device D1 is not defined" in c1.yaml
    expect(found.map((i) => i.code)).toContain('yaml-syntax');
  });

  it('a devices file needs its list under `devices:`', () => {
    const found = issues({ 'devices/d.yaml': `- id: D1\n`, 'devices/e.yaml': `device:\n  - id: D1\n` });
    expect(summary(found)).toEqual([
      // no "unknown device" for c1.yaml: d.yaml could not be read, so D1 may well be defined there
      'devices/d.yaml:1:1  not-a-mapping',
      'devices/e.yaml:1:1 device unknown-field',
      'devices/e.yaml:1:1 devices missing-field',
    ]);
  });
});

describe('text', () => {
  it('invalid UTF-8 is reported, not guessed', () => {
    const outcome = buildProject({
      dir: '/virtual',
      files: [
        { path: 'project.yaml', bytes: new TextEncoder().encode(PROJECT) },
        { path: 'circuits/c1.yaml', bytes: new Uint8Array([0x69, 0x64, 0x3a, 0x20, 0xff, 0xfe, 0x0a]) },
      ],
      problems: [],
    });
    expect(outcome.ok).toBe(false);
    if (!outcome.ok) expect(outcome.issues.map((i) => `${i.file} ${i.code}`)).toEqual(['circuits/c1.yaml invalid-encoding']);
  });

  it('duplicate keys in one mapping are a YAML error', () => {
    const found = issues({ 'circuits/c1.yaml': `${CIRCUIT}id: C2\n` });
    expect(summary(found)).toEqual(['circuits/c1.yaml:5:1 id yaml-syntax']); // the key written on that line names the field
  });
});
