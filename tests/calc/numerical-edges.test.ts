// Numerical edges through the whole pipeline (load, solve, results document): purely resistive paths,
// curves of one point or out of order, lengths of kilometres and centimetres, many conductors in
// parallel, and fault currents beyond every curve. Behaviour is checked (finite numbers, a located
// error, undetermined rather than passed); where a number is compared it is with the same circuit
// written another way, or with the rule of docs/FORMAT.md that defines it.

import { describe, expect, it } from 'vitest';
import { outcomeProblems, runPipeline, type Outcome, type TextFile } from '../hostile/harness.js';
import type { Issue } from '../../src/model/issues.js';
import { formatIssue } from '../../src/model/issues.js';

const PROJECT = `project: { name: Edge cases (invented), number: EDGE-1, revision: A, date: 2026-11-20 }
settings: { system_voltage: 400 V, earthing: TN-S, withstand_criterion: any-point }
supplies:
  - id: SVC
    feeds: MDB
    service: { fault_current: 16 kA, x_over_r: 2, earth_loop_impedance: 0.35 ohm }
`;

const DEVICES = `devices:
  - id: MCCB-160
    kind: mccb
    rating: 160 A
    breaking_capacity: 36 kA
    instantaneous: { pickup: 10 x In, clearing_time: 10 ms }
    trip_curve: { current_unit: x In, time_unit: s, points: [[1.3, 3600], [3, 60], [9.9, 5]] }
  - id: CURVE-ONLY
    kind: mccb
    rating: 100 A
    breaking_capacity: 50 kA
    trip_curve: { current_unit: A, time_unit: s, points: [[130, 3600], [300, 60], [1000, 5]] }
`;

function circuit(cable: string, device = 'MCCB-160', extra = ''): string {
  return `id: C1
from: MDB
device: ${device}
load: { current: 40 A, power_factor: 0.9 }
cable: { conductor: copper, insulation: XLPE, size: 16 mm2, ${cable} }
${extra}`;
}

function files(over: { project?: string; devices?: string; circuit?: string } = {}): TextFile[] {
  return [
    { path: 'circuits/c1.yaml', text: over.circuit ?? circuit('length: 30 m') },
    { path: 'devices/devices.yaml', text: over.devices ?? DEVICES },
    { path: 'project.yaml', text: over.project ?? PROJECT },
  ];
}

interface CircuitJson {
  origin: { ik3max_a: number; ip_a: number; ik1min_a: number };
  end: { ik3max_a: number; ip_a: number; ik1min_a: number };
  withstand_a2s: number;
  let_through_a2s: number | null;
  verdict: string;
  checks: Array<{ name: string; status: string; value: number | null }>;
}

/** The one circuit's results, after checking the whole outcome is clean (finite numbers, sound text). */
function solved(input: TextFile[]): CircuitJson {
  const outcome = runPipeline(input, { lazy: true });
  if (outcome.kind !== 'result') throw new Error(outcome.issues.map(formatIssue).join('\n'));
  expect(outcomeProblems(outcome, input)).toEqual([]);
  return (outcome.document as { circuits: CircuitJson[] }).circuits[0]!;
}

function issues(input: TextFile[]): Issue[] {
  const outcome: Outcome = runPipeline(input);
  if (outcome.kind !== 'issues') throw new Error('loaded without errors');
  expect(outcomeProblems(outcome, input)).toEqual([]);
  return outcome.issues.filter((i) => i.severity === 'error');
}

const located = (i: Issue) => `${i.file}:${i.line}:${i.col} ${i.path}`;
const check = (c: CircuitJson, name: string) => c.checks.find((k) => k.name === name)!;

describe('purely resistive paths (X = 0)', () => {
  const resistive = PROJECT.replace('x_over_r: 2', 'x_over_r: 0');
  it('a service with X/R = 0 and a cable with reactance 0 solve to finite numbers', () => {
    const c = solved(files({ project: resistive, circuit: circuit('length: 30 m, reactance: 0 ohm/km') }));
    expect(c.origin.ik3max_a).toBeGreaterThan(0);
    // kappa = 1.02 + 0.98 e^(-3R/X) tends to 1.02 as X -> 0: IEC 60909-0:2016 eq. (55)
    expect(c.origin.ip_a / (Math.SQRT2 * c.origin.ik3max_a)).toBeCloseTo(1.02, 9);
    expect(c.end.ip_a / (Math.SQRT2 * c.end.ik3max_a)).toBeCloseTo(1.02, 9);
  });
  it('at the origin a resistive service still shows its declared current', () => {
    // FORMAT.md section 2: Z_1 = c_max U_n / (sqrt(3) fault_current), "so the origin shows the declared current"
    const c = solved(files({ project: resistive, circuit: circuit('length: 30 m, reactance: 0 ohm/km') }));
    expect(c.origin.ik3max_a).toBeCloseTo(16_000, 6);
  });
  it('a negative X/R is refused at its line', () => {
    const found = issues(files({ project: PROJECT.replace('x_over_r: 2', 'x_over_r: -1') }));
    expect(found.map(located)).toEqual(['project.yaml:6:48 supplies[0].service.x_over_r']);
  });
});

describe('curves', () => {
  const withTrip = (points: string) => DEVICES.replace('[[130, 3600], [300, 60], [1000, 5]]', points);
  it('a curve of a single point is an error at the point list', () => {
    const found = issues(files({ devices: withTrip('[[300, 60]]') }));
    expect(found.map(located)).toEqual(['devices/devices.yaml:12:58 devices[1].trip_curve.points']);
    expect(found[0]!.expected).toContain('at least 2');
  });
  it('points out of order are an error at the first point whose current does not rise', () => {
    const found = issues(files({ devices: withTrip('[[1000, 5], [300, 60], [130, 3600]]') }));
    expect(found.map(located)).toEqual([
      'devices/devices.yaml:12:71 devices[1].trip_curve.points[1][0]',
      'devices/devices.yaml:12:82 devices[1].trip_curve.points[2][0]',
    ]);
    expect(found[0]!.message).toContain('point 2');
  });
  it('two points at one current (a vertical step) are refused: currents must strictly increase', () => {
    const found = issues(files({ devices: withTrip('[[130, 3600], [300, 60], [300, 5]]') }));
    expect(found.map((i) => i.code)).toEqual(['curve-current-not-increasing']);
  });
  it('a trip time that rises with current is refused; a flat stretch is accepted', () => {
    expect(issues(files({ devices: withTrip('[[130, 3600], [300, 60], [1000, 61]]') })).map(located)).toEqual([
      'devices/devices.yaml:12:90 devices[1].trip_curve.points[2][1]',
    ]);
    solved(files({ devices: withTrip('[[130, 3600], [300, 60], [1000, 60]]'), circuit: circuit('length: 30 m', 'CURVE-ONLY') }));
  });
  it('a let-through energy that falls with current is refused; an equal one is accepted', () => {
    const lt = (points: string) => `${DEVICES}    let_through: { current_unit: kA, energy_unit: A^2 s, points: ${points} }\n`;
    expect(issues(files({ devices: lt('[[1, 2.0e4], [5, 1.0e4]]') })).map((i) => `${i.code} ${i.path}`)).toEqual([
      'curve-energy-decreasing devices[1].let_through.points[1][1]',
    ]);
    solved(files({ devices: lt('[[1, 2.0e4], [5, 2.0e4], [50, 3.0e4]]'), circuit: circuit('length: 30 m', 'CURVE-ONLY') }));
  });
});

describe('lengths', () => {
  it('kilometres and centimetres give the results of the same length in metres', () => {
    expect(solved(files({ circuit: circuit('length: 1.2 km') }))).toEqual(solved(files({ circuit: circuit('length: 1200 m') })));
    expect(solved(files({ circuit: circuit('length: 35 cm') }))).toEqual(solved(files({ circuit: circuit('length: 0.35 m') })));
  });
  it('a longer cable gives smaller far-end currents, down to a few metres of difference', () => {
    const short = solved(files({ circuit: circuit('length: 1 cm') }));
    const long = solved(files({ circuit: circuit('length: 2 km') }));
    expect(long.end.ik3max_a).toBeLessThan(short.end.ik3max_a);
    expect(long.end.ik1min_a).toBeLessThan(short.end.ik1min_a);
    expect(short.end.ik3max_a).toBeLessThanOrEqual(short.origin.ik3max_a);
  });
  it('a length beyond 1000 km or below 1 µm is refused at its line', () => {
    for (const length of ['1001 km', '1e308 m', '0.0001 mm']) {
      const found = issues(files({ circuit: circuit(`length: ${length}`) }));
      expect(found.map((i) => `${i.code} ${located(i)}`)).toEqual(['out-of-range circuits/c1.yaml:5:69 cable.length']);
    }
  });
});

describe('conductors in parallel', () => {
  it('n conductors of resistance R and reactance X carry the far-end currents of one of R/n and X/n', () => {
    // FORMAT.md section 2: cable impedances "divided by parallel"; withstand k^2 S^2 with S times parallel
    for (const n of [2, 7, 12, 13, 100]) {
      const many = solved(files({ circuit: circuit(`length: 80 m, parallel: ${n}, resistance: 1.15 ohm/km, reactance: 0.08 ohm/km`) }));
      const one = solved(files({ circuit: circuit(`length: 80 m, resistance: ${1.15 / n} ohm/km, reactance: ${0.08 / n} ohm/km`) }));
      expect(many.end.ik3max_a).toBeCloseTo(one.end.ik3max_a, 6);
      expect(many.end.ik1min_a).toBeCloseTo(one.end.ik1min_a, 6);
      expect(many.withstand_a2s / one.withstand_a2s).toBeCloseTo(n * n, 9);
    }
  });
  it('more than 100 in parallel, zero, or a fraction is refused at the field', () => {
    for (const n of ['101', '0', '2.5', '1e308']) {
      const found = issues(files({ circuit: circuit(`length: 30 m, parallel: ${n}`) }));
      expect([...new Set(found.map((i) => `${i.file}:${i.line} ${i.path}`))]).toEqual(['circuits/c1.yaml:5 cable.parallel']);
    }
  });
});

describe('currents beyond every curve', () => {
  it('fault currents above the only curve are undetermined, never passed', () => {
    // 16 kA at the origin and some 9 kA to earth at the far end, far above the curve's last point (1 kA)
    const stiff = PROJECT.replace('earth_loop_impedance: 0.35 ohm', 'earth_loop_impedance: 0.02 ohm');
    const c = solved(files({ project: stiff, circuit: circuit('length: 5 m', 'CURVE-ONLY') }));
    expect(c.end.ik1min_a).toBeGreaterThan(1000);
    // undetermined where no rule applies; a fail only where a determined current already exceeds k^2 S^2
    expect(check(c, 'thermal_withstand').status).not.toBe('pass');
    expect(c.let_through_a2s).toBeNull();
    expect(check(c, 'disconnection').status).toBe('undetermined');
    expect(c.verdict).not.toBe('pass');
  });
  it('fault currents below the only curve are undetermined too', () => {
    const devices = DEVICES.replace('[[130, 3600], [300, 60], [1000, 5]]', '[[100000, 60], [200000, 0.01]]');
    const c = solved(files({ devices, circuit: circuit('length: 200 m', 'CURVE-ONLY') }));
    expect(check(c, 'thermal_withstand').status).toBe('undetermined');
    expect(check(c, 'disconnection').status).toBe('undetermined');
    expect(c.verdict).not.toBe('pass');
  });
});
