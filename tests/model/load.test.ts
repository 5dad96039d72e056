// The loader as a checker would test it: a good project comes out in SI with every default
// recorded; every kind of bad input is reported at the right file, line, column and field, and
// all problems of a project are reported together.

import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Issue } from '../../src/model/issues.js';
import { loadProject, type LoadOutcome } from '../../src/model/load.js';
import type { Circuit, Device, Project } from '../../src/model/types.js';

const FIXTURES = path.resolve('tests/fixtures/model');

async function load(scenario: string): Promise<LoadOutcome> {
  return loadProject(path.join(FIXTURES, scenario));
}

async function issuesOf(scenario: string): Promise<Issue[]> {
  const outcome = await load(scenario);
  if (outcome.ok) throw new Error(`${scenario} loaded without errors`);
  return outcome.issues;
}

async function projectOf(scenario: string): Promise<{ project: Project; warnings: Issue[] }> {
  const outcome = await load(scenario);
  if (!outcome.ok) throw new Error(`${scenario} failed:\n${outcome.issues.map((i) => `${i.file}:${i.line}:${i.col} ${i.path}: ${i.message}`).join('\n')}`);
  return { project: outcome.project, warnings: outcome.warnings };
}

/** The one issue of `code` in `file` (fails if there is not exactly one). */
function only(issues: Issue[], code: string, file: string): Issue {
  const found = issues.filter((i) => i.code === code && i.file === file);
  expect(found, `${code} in ${file} among ${JSON.stringify(issues, null, 1)}`).toHaveLength(1);
  return found[0]!;
}

function at(issue: Issue): string {
  return `${issue.file}:${issue.line}:${issue.col} ${issue.path}`;
}

const circuit = (p: Project, id: string): Circuit => p.circuits.find((c) => c.id === id)!;
const device = (p: Project, id: string): Device => p.devices.find((d) => d.id === id)!;
const defaultOf = (defaults: ReadonlyArray<{ field: string; value: string; source: string }>, field: string) =>
  defaults.find((d) => d.field === field);

describe('a good project', () => {
  it('reads project.yaml, devices/**/*.yaml and circuits/**/*.yaml only, hashing them in path order', async () => {
    const { project, warnings } = await projectOf('good');
    expect(warnings).toEqual([]);
    expect(project.dir).toBe(path.join(FIXTURES, 'good'));
    expect(project.templatesDir).toBe(path.join(FIXTURES, 'good', 'templates'));
    // The hash as FORMAT.md defines it, over exactly these files (circuits/notes.txt and
    // templates/ are not inputs).
    const files = [
      'circuits/mcc/finals.yaml',
      'circuits/mdb-q1.yaml',
      'circuits/msb-q4.yaml',
      'devices/breakers.yaml',
      'devices/fuses.yaml',
      'project.yaml',
    ];
    const hash = createHash('sha256');
    for (const f of files) {
      hash.update(`${f}\0`);
      hash.update(readFileSync(path.join(FIXTURES, 'good', f)));
      hash.update('\0');
    }
    expect(project.inputSha256).toBe(hash.digest('hex'));
  });

  it('keeps text as written and sorts devices and circuits by id', async () => {
    const { project } = await projectOf('good');
    expect(project.meta).toEqual({
      name: 'Kestrel Lane Water Treatment Works',
      number: '0417', // written 0417: a project number, not the integer 417
      revision: 'C',
      date: '2026-11-20',
      client: 'Invented Client for Tests',
    });
    expect(project.devices.map((d) => d.id)).toEqual(['FUSE-63', 'MCB-B16', 'MCCB-250']);
    expect(project.circuits.map((c) => c.id)).toEqual(['MCC-1-Q1', 'MCC-1-Q2', 'MDB-Q1', 'MSB-Q4']);
    expect(project.assumptions).toEqual(['Motor contribution to fault current is neglected.']);
    expect(project.signoff.preparedBy).toEqual({ name: 'A. Example', role: 'Electrical engineer' });
    expect(project.signoff.approvedBy).toBeUndefined();
  });

  it('applies and records the settings defaults', async () => {
    const { project } = await projectOf('good');
    expect(project.settings).toEqual({
      systemVoltage: 400,
      frequency: 50,
      earthing: 'TN-S',
      voltageFactorMax: 1.1, // written in project.yaml
      // c_max 1.10 is written; c_min keeps the format default 0.95 (IEC 60909-0:2016 Table 1, LV).
      voltageFactorMin: 0.95,
      minFaultTemperature: { mode: 'final' },
      withstandCriterion: 'any-point',
    });
    const fields = project.defaults.map((d) => d.field);
    expect(fields).not.toContain('settings.voltage_factor_max'); // written, so not a default
    expect(defaultOf(project.defaults, 'settings.voltage_factor_min')).toMatchObject({ value: '0.95' });
    expect(defaultOf(project.defaults, 'settings.voltage_factor_min')!.source).toContain('IEC 60909-0:2016 Table 1');
    expect(defaultOf(project.defaults, 'settings.voltage_factor_min')!.source).toContain('+6 %');
    expect(defaultOf(project.defaults, 'settings.frequency')).toMatchObject({ value: '50 Hz' });
    expect(defaultOf(project.defaults, 'settings.earthing')).toMatchObject({ value: 'TN-S' });
    expect(defaultOf(project.defaults, 'settings.min_fault_conductor_temperature')).toMatchObject({ value: 'final' });
    expect(defaultOf(project.defaults, 'settings.withstand_criterion')).toMatchObject({ value: 'any-point' });
  });

  it('converts the supplies to SI and records their defaults', async () => {
    const { project } = await projectOf('good');
    const [tx1, utility] = project.supplies;
    if (tx1?.kind !== 'transformer' || utility?.kind !== 'service') throw new Error('supply kinds');
    expect(tx1.pos).toEqual({ file: 'project.yaml', line: 12, col: 5 });
    // S''_kQ = sqrt(3) U_nQ I''_kQ (IEC 60909-0:2016, definition of the initial symmetrical
    // short-circuit power): sqrt(3) x 11 kV x 13 kA = 247.683 MVA.
    expect(tx1.network!.faultLevel).toBeCloseTo(Math.sqrt(3) * 11e3 * 13e3, 3);
    expect(tx1.network!.faultLevel / 1e6).toBeCloseTo(247.683, 3);
    expect(tx1.network!.faultLevelMin).toBe(tx1.network!.faultLevel); // FORMAT default: = fault_level
    expect(tx1.network!.voltage).toBe(11000);
    expect(tx1.network!.xOverR).toBe(10); // FORMAT default (IEC 60909-0: R_Q = 0.1 X_Q)
    expect(tx1.network!.voltageFactor).toBe(1.1); // IEC 60909-0:2016 Table 1, c_max above 1 kV
    expect(tx1.transformer).toEqual({
      rating: 1e6,
      primaryVoltage: 11e3,
      secondaryVoltage: 400,
      impedance: 0.0575, // 5.75 % as a fraction
      loadLosses: 10500,
      vectorGroup: 'Dyn11',
      zeroSequenceRatio: 1,
    });
    expect(utility).toMatchObject({ faultCurrent: 16000, xOverR: 2, earthLoopImpedance: 0.35, feeds: 'MDB' });
    const fields = project.defaults.map((d) => d.field);
    expect(fields).toEqual(
      expect.arrayContaining([
        'supplies[TX1].network.fault_level_min',
        'supplies[TX1].network.x_over_r',
        'supplies[TX1].network.voltage_factor',
        'supplies[TX1].transformer.vector_group',
        'supplies[TX1].transformer.zero_sequence_ratio',
        'supplies[UTILITY].service.x_over_r',
      ]),
    );
    expect(fields).not.toContain('supplies[UTILITY].service.earth_loop_impedance'); // left to the solver
  });

  it('converts devices: multiples of In, ms, kA and kA^2 s to A, s and A^2 s', async () => {
    const { project } = await projectOf('good');
    const mccb = device(project, 'MCCB-250');
    expect(mccb.pos).toEqual({ file: 'devices/breakers.yaml', line: 2, col: 5 });
    expect(mccb.rating).toBe(250);
    expect(mccb.breakingCapacity).toBe(50000);
    expect(mccb.clearingTime).toBe(0.2);
    expect(mccb.instantaneous).toEqual({ pickup: 2500, clearingTime: 0.01 }); // 10 x 250 A; 10 ms default
    expect(defaultOf(mccb.defaults, 'instantaneous.clearing_time')).toMatchObject({ value: '10 ms' });
    expect(mccb.tripCurve).toEqual([
      { current: 375, value: 400 },
      { current: 750, value: 30 },
      { current: 1250, value: 8 },
      { current: 2000, value: 2.5 },
    ]);
    expect(mccb.illustrative).toBe(true);
    const mcb = device(project, 'MCB-B16');
    expect(mcb.instantaneous).toEqual({ pickup: 80, clearingTime: 0.008 });
    expect(mcb.defaults).toEqual([]);
    // 1 kA^2 s = 1e6 A^2 s
    expect(mcb.letThrough).toEqual([
      { current: 500, value: 2e6 },
      { current: 1000, value: 5e6 },
      { current: 3000, value: 14e6 },
      { current: 6000, value: 28e6 },
    ]);
    const fuse = device(project, 'FUSE-63');
    expect(fuse.tripCurve![2]).toEqual({ current: 800, value: 0.02 }); // 20 ms
    expect(fuse.clearingTime).toBeUndefined();
  });

  it('resolves a metric cable with tabulated resistances and a smaller protective conductor', async () => {
    const { project } = await projectOf('good');
    const q4 = circuit(project, 'MSB-Q4');
    expect(q4.pos).toEqual({ file: 'circuits/msb-q4.yaml', line: 1, col: 1 });
    expect(q4).toMatchObject({ description: 'Feeder to pump MCC', from: 'MSB', to: 'MCC-1', device: 'MCCB-250' });
    expect(q4.load).toEqual({ current: 180, powerFactor: 0.85, phases: 3 }); // phases: the format default, three-phase
    const cable = q4.cable;
    expect(cable.size).toEqual({ label: '95 mm2', system: 'metric', area: 95e-6 });
    expect(cable.length).toBe(45);
    expect(cable.parallel).toBe(1);
    expect(cable.resistance20).toBeCloseTo(0.193e-3, 12); // IEC 60228:2004 Table 2, 95 mm2 plain copper: 0.193 ohm/km
    expect(cable.resistanceGiven).toBe(false);
    expect(cable.resistanceSource).toContain('IEC 60228');
    expect(cable.reactance).toBeCloseTo(0.08e-3, 12);
    // "50 mm²" written with the superscript
    expect(cable.protectiveConductor).toMatchObject({
      size: { label: '50 mm2', system: 'metric', area: 50e-6 },
      conductor: 'copper',
      arrangement: 'in-cable',
      parallel: 1,
    });
    expect(cable.protectiveConductor.resistance20).toBeCloseTo(0.387e-3, 12); // IEC 60228:2004 Table 2, 50 mm2 Cu: 0.387 ohm/km
    expect(cable.protectiveConductorDefaulted).toBe(false);
    expect(q4.checks).toEqual({
      disconnectionTime: 5, // IEC 60364-4-41:2005 411.3.2.3: TN, circuits above 32 A
      voltageDropLimit: 5, // IEC 60364-5-52:2009 Table G.52.1, type A, other uses: 5 %
    });
    expect(q4.assumptions).toEqual(['Cable route length taken from the layout drawing plus 10 %.']);
    const fields = q4.defaults.map((d) => d.field);
    expect(fields).toEqual([
      'cable.parallel',
      'cable.resistance',
      'cable.reactance',
      'cable.protective_conductor.conductor',
      'cable.protective_conductor.arrangement',
      'cable.protective_conductor.parallel',
      'cable.protective_conductor.resistance',
      'load.phases',
      'checks.disconnection_time',
      'checks.voltage_drop_limit',
    ]);
    expect(defaultOf(q4.defaults, 'cable.resistance')).toEqual({
      field: 'cable.resistance',
      value: '0.193 ohm/km',
      source: 'IEC 60228:2004 Table 2 (class 2)',
    });
    expect(defaultOf(q4.defaults, 'cable.reactance')!.value).toBe('0.08 ohm/km');
  });

  it('resolves AWG sizes with NFPA 70 resistances and the default protective conductor', async () => {
    const { project } = await projectOf('good');
    const q2 = circuit(project, 'MCC-1-Q2');
    expect(q2.pos).toEqual({ file: 'circuits/mcc/finals.yaml', line: 2, col: 5 });
    expect(q2.cable.size.label).toBe('12 AWG');
    // NFPA 70 Ch. 9 Table 8: 12 AWG area 3.309 mm2
    expect(q2.cable.size.area * 1e6).toBeCloseTo(3.309, 3);
    // NFPA 70 Ch. 9 Table 8: 12 AWG stranded uncoated copper 6.50 ohm/km at 75 degC; referred to
    // 20 degC by note 2 with alpha 0.00323: 6.50 x (1 - 0.00323 x 55) = 5.3453 ohm/km.
    expect(q2.cable.resistance20 * 1000).toBeCloseTo(5.3453, 4);
    expect(q2.cable.length).toBe(30); // 0.03 km
    expect(q2.cable.protectiveConductorDefaulted).toBe(true);
    expect(q2.cable.protectiveConductor).toEqual({
      size: q2.cable.size,
      conductor: 'copper',
      arrangement: 'in-cable',
      parallel: 1,
      resistance20: q2.cable.resistance20,
      resistanceSource: q2.cable.resistanceSource,
    });
    expect(q2.load).toEqual({ current: 12, powerFactor: 0.8, phases: 3 }); // IEC 60364-5-52:2009 Annex G: cos phi = 0.8
    expect(defaultOf(q2.defaults, 'load.power_factor')!.source).toContain('IEC 60364-5-52');
    // IEC 60364-4-41:2005 Table 41.1: TN, 120 V < U0 <= 230 V, final circuit <= 32 A: 0.4 s
    expect(q2.checks.disconnectionTime).toBe(0.4);
    expect(defaultOf(q2.defaults, 'checks.disconnection_time')!.source).toContain('Table 41.1');
    expect(defaultOf(q2.defaults, 'cable.protective_conductor')).toBeDefined();
    expect(defaultOf(q2.defaults, 'description')).toMatchObject({ value: '""' });

    const q1 = circuit(project, 'MCC-1-Q1');
    expect(q1.cable.size.label).toBe('4/0 AWG'); // written "4/0"
    expect(q1.cable.size.area * 1e6).toBeCloseTo(107.2, 1); // NFPA 70 Ch. 9 Table 8: 4/0 AWG 107.2 mm2
    expect(q1.cable).toMatchObject({ conductor: 'aluminium', parallel: 2, length: 120, resistanceGiven: true, resistanceSource: 'given' });
    expect(q1.cable.resistance20).toBeCloseTo(0.2e-3, 12);
    expect(q1.cable.reactance).toBeCloseTo(0.07e-3, 12);
    // Separate PE: one conductor unless told otherwise; 1/0 AWG copper from NFPA 70 Table 8:
    // 0.399 ohm/km at 75 degC -> 0.399 x (1 - 0.00323 x 55) = 0.3281 ohm/km at 20 degC.
    expect(q1.cable.protectiveConductor).toMatchObject({ arrangement: 'separate', parallel: 1, conductor: 'copper' });
    expect(q1.cable.protectiveConductor.resistance20 * 1000).toBeCloseTo(0.3281, 4);
    expect(q1.checks).toEqual({ disconnectionTime: 5, voltageDropLimit: 4 });
    expect(q1.defaults.map((d) => d.field)).toEqual([
      'description',
      'cable.protective_conductor.parallel',
      'cable.protective_conductor.resistance',
    ]);

    const mdb = circuit(project, 'MDB-Q1');
    expect(mdb.clearingTime).toBe(0.3);
    expect(mdb.load).toBeUndefined();
    expect(mdb.cable.resistance20).toBeCloseTo(1.15e-3, 12); // IEC 60228:2004 Table 2, 16 mm2 Cu: 1.15 ohm/km
    expect(mdb.checks.disconnectionTime).toBe(5); // 63 A fuse: above 32 A, 411.3.2.3
  });
});

describe('bad input', () => {
  it('an unknown field (a typo) is named, with the near spelling, at the key', async () => {
    const issues = await issuesOf('unknown-field');
    const typo = only(issues, 'unknown-field', 'circuits/c1.yaml');
    expect(at(typo)).toBe('circuits/c1.yaml:8:3 cable.lenght');
    expect(typo.message).toContain('"lenght"');
    expect(typo.message).toContain('did you mean "length"');
    // and the field it should have been is missing: reported at the `cable:` key
    const missing = only(issues, 'missing-field', 'circuits/c1.yaml');
    expect(at(missing)).toBe('circuits/c1.yaml:4:1 cable.length');
    expect(missing.expected).toBe('a length such as "45 m"');
  });

  it('a value without a unit is an error saying what was expected', async () => {
    const issues = await issuesOf('missing-unit');
    const length = only(issues, 'missing-unit', 'circuits/c1.yaml'); // `length: 45`, a YAML number
    expect(at(length)).toBe('circuits/c1.yaml:8:11 cable.length');
    expect(length.expected).toBe('a length such as "45 m"');
    const rating = only(issues, 'missing-unit', 'devices/devices.yaml'); // `rating: "100"`, text without unit
    expect(at(rating)).toBe('devices/devices.yaml:4:13 devices[0].rating');
    expect(rating.expected).toContain('a current');
  });

  it('a unit of the wrong dimension is an error', async () => {
    const issues = await issuesOf('wrong-dimension');
    const length = only(issues, 'wrong-dimension', 'circuits/c1.yaml');
    expect(at(length)).toBe('circuits/c1.yaml:8:11 cable.length');
    expect(length.actual).toBe('45 A');
    const level = only(issues, 'wrong-dimension', 'project.yaml');
    expect(at(level)).toBe('project.yaml:6:45 supplies[0].network.fault_level');
    expect(level.expected).toBe('an apparent power such as "250 MVA"');
  });

  it('negative and zero lengths, sizes and ratings are errors', async () => {
    const issues = (await issuesOf('not-positive')).filter((i) => i.code === 'not-positive');
    expect(issues.map(at)).toEqual([
      'circuits/c1.yaml:5:73 circuits[0].cable.length',
      'circuits/c1.yaml:9:57 circuits[1].cable.size',
      'circuits/c1.yaml:9:72 circuits[1].cable.length',
      'devices/devices.yaml:4:13 devices[0].rating',
    ]);
  });

  it('an unknown device id is an error at the circuit\'s `device`', async () => {
    const issue = only(await issuesOf('unknown-device'), 'unknown-device', 'circuits/c1.yaml');
    expect(at(issue)).toBe('circuits/c1.yaml:3:9 device');
    expect(issue.message).toContain('"D2"');
    expect(issue.message).toContain('did you mean "D1"');
  });

  it('an unknown board in `from` is an error', async () => {
    const issue = only(await issuesOf('unknown-board'), 'unknown-board', 'circuits/c1.yaml');
    expect(at(issue)).toBe('circuits/c1.yaml:2:7 from');
    expect(issue.message).toContain('"MSBB"');
  });

  it('a duplicate id across two files names both files', async () => {
    const issues = await issuesOf('duplicate-id');
    const circuitDuplicate = only(issues, 'duplicate-id', 'circuits/more/b.yaml');
    expect(at(circuitDuplicate)).toBe('circuits/more/b.yaml:2:5 id');
    expect(circuitDuplicate.message).toContain('circuits/a.yaml:1:5');
    const deviceDuplicate = only(issues, 'duplicate-id', 'devices/extra.yaml');
    expect(at(deviceDuplicate)).toBe('devices/extra.yaml:2:9 devices[0].id');
    expect(deviceDuplicate.message).toContain('devices/devices.yaml:2:9');
  });

  it('a board fed twice is an error naming the other feeder', async () => {
    const issues = (await issuesOf('fed-twice')).filter((i) => i.code === 'board-fed-twice');
    expect(issues.map(at)).toEqual(['circuits/c1.yaml:9:9 circuits[1].to', 'circuits/c1.yaml:14:9 circuits[2].to']);
    expect(issues[0]!.message).toContain('"DB1"');
    expect(issues[0]!.message).toContain('circuit "C1" at circuits/c1.yaml:4:9');
    expect(issues[1]!.message).toContain('supply "TX1" at project.yaml:5:12'); // supply + circuit
  });

  it('a board no supply reaches is an error, with the chain that stops', async () => {
    const issues = await issuesOf('unreachable-board');
    const unreachable = only(issues, 'unreachable-board', 'circuits/c1.yaml');
    expect(at(unreachable)).toBe('circuits/c1.yaml:8:9 circuits[1].to');
    expect(unreachable.message).toContain('"DB2"');
    expect(unreachable.message).toContain('DB9');
    expect(at(only(issues, 'unknown-board', 'circuits/c1.yaml'))).toBe('circuits/c1.yaml:7:11 circuits[1].from');
  });

  it('loops are errors: two circuits feeding each other, and a circuit feeding its own board', async () => {
    const issues = await issuesOf('loop');
    const loop = only(issues, 'loop', 'circuits/c1.yaml');
    expect(at(loop)).toBe('circuits/c1.yaml:4:9 circuits[0].to');
    expect(loop.message).toContain('C1 (DB1 -> DB2)');
    expect(loop.message).toContain('C2 (DB2 -> DB1)');
    const self = only(issues, 'self-loop', 'circuits/c1.yaml');
    expect(at(self)).toBe('circuits/c1.yaml:19:9 circuits[3].to');
    // the boards of the loop are not reported a second time as unreachable
    expect(issues.filter((i) => i.code === 'unreachable-board')).toEqual([]);
  });

  it('a YAML syntax error is reported with its position', async () => {
    const issue = only(await issuesOf('yaml-syntax'), 'yaml-syntax', 'circuits/c1.yaml');
    expect(issue.line).toBe(5); // the unclosed flow map of line 4 is found where line 5 starts
    expect(issue.col).toBe(1);
    expect(issue.message).toContain('YAML syntax error');
  });

  it('an alias bomb is refused at its first alias', async () => {
    const issue = only(await issuesOf('alias-bomb'), 'yaml-alias-limit', 'circuits/c1.yaml');
    expect(`${issue.line}:${issue.col}`).toBe('6:10');
    expect(issue.message).toContain('100');
  });

  it('a size with no tabulated resistance and no `resistance` is an error naming the field', async () => {
    const issues = (await issuesOf('no-resistance')).filter((i) => i.code === 'no-resistance');
    expect(issues.map(at)).toEqual(['circuits/c1.yaml:5:57 circuits[0].cable.size', 'circuits/c1.yaml:9:60 circuits[1].cable.size']);
    expect(issues[0]!.message).toContain('97 mm2');
    expect(issues[0]!.message).toContain('"resistance"');
    // IEC 60228:2004 Table 2 lists aluminium from 10 mm2 only
    expect(issues[1]!.message).toContain('aluminium 6 mm2');
  });

  it('a device with no timing data is an error', async () => {
    const issue = only(await issuesOf('no-timing-data'), 'no-timing-data', 'devices/devices.yaml');
    expect(at(issue)).toBe('devices/devices.yaml:2:5 devices[0]');
    expect(issue.expected).toContain('clearing_time');
  });

  it('bad curves: currents not increasing, times rising, energies falling, too few points', async () => {
    const issues = await issuesOf('bad-curve');
    expect(at(only(issues, 'curve-current-not-increasing', 'devices/devices.yaml'))).toBe(
      'devices/devices.yaml:8:38 devices[0].trip_curve.points[2][0]',
    );
    expect(at(only(issues, 'curve-time-increasing', 'devices/devices.yaml'))).toBe(
      'devices/devices.yaml:15:34 devices[1].trip_curve.points[1][1]',
    );
    expect(at(only(issues, 'curve-energy-decreasing', 'devices/devices.yaml'))).toBe(
      'devices/devices.yaml:19:31 devices[1].let_through.points[1][1]',
    );
    expect(at(only(issues, 'too-few', 'devices/devices.yaml'))).toBe('devices/devices.yaml:26:15 devices[2].let_through.points');
  });

  it('reports the problems of every file together, sorted by file and line', async () => {
    const issues = await issuesOf('two-bad-files');
    expect(issues.map((i) => `${at(i)} ${i.code}`)).toEqual([
      'circuits/c1.yaml:4:69 cable.length unknown-unit',
      'devices/devices.yaml:3:11 devices[0].kind invalid-value',
      'project.yaml:1:70 project.date invalid-date',
      'project.yaml:2:46 settings.earthing invalid-value',
      'project.yaml:6:18 supplies[0].transformer missing-alternative',
    ]);
    expect(issues[3]!.message).toContain('did you mean "TN-S"');
  });

  it('empty files, files that are not mappings and *.yml files are reported', async () => {
    const issues = await issuesOf('file-shapes');
    expect(at(only(issues, 'empty-file', 'circuits/empty.yaml'))).toBe('circuits/empty.yaml:1:1 ');
    expect(only(issues, 'not-a-mapping', 'circuits/list.yaml').message).toContain('a list');
    expect(only(issues, 'not-a-mapping', 'devices/scalar.yaml').message).toContain('just some text');
    expect(only(issues, 'ignored-file', 'circuits/notes.yml').severity).toBe('warning');
  });

  it('a missing project.yaml is an error (with a hint when project.yml exists)', async () => {
    const issue = only(await issuesOf('no-project-file'), 'missing-file', 'project.yaml');
    expect(issue.line).toBe(0);
    expect(issue.message).toContain('project.yml');
  });

  it('a folder that does not exist is an error, not an exception', async () => {
    const issues = await issuesOf('no-such-scenario');
    expect(issues).toHaveLength(1);
    expect(issues[0]!.code).toBe('missing-file');
  });
});
