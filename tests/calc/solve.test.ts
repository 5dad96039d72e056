import { describe, expect, it } from 'vitest';
import { solveProject } from '../../src/calc/solve.js';
import { resultsDocument } from '../../src/calc/results-json.js';
import { transformerImpedance } from '../../src/calc/impedance.js';
import { cable, circuit, device, project, POS, settings } from './builders.js';
import type { Supply } from '../../src/model/types.js';

const transformer: Supply = {
  kind: 'transformer',
  id: 'TX1',
  feeds: 'MSB',
  network: { voltage: 11e3, faultLevel: 250e6, faultLevelMin: 150e6, xOverR: 10, voltageFactor: 1.1 },
  transformer: { rating: 1000e3, primaryVoltage: 11e3, secondaryVoltage: 400, impedance: 0.0575, loadLosses: 10.5e3, vectorGroup: 'Dyn11', zeroSequenceRatio: 1 },
  pos: POS,
};

describe('one pass from the supply down the board tree', () => {
  const p = project({
    supplies: [transformer],
    devices: [device({ id: 'ACB', kind: 'acb', rating: 630, clearingTime: 0.3 }), device({ id: 'MCB', kind: 'mcb', rating: 32, breakingCapacity: 10e3, instantaneous: { pickup: 320, clearingTime: 0.01 }, tripCurve: [{ current: 41.6, value: 3600 }, { current: 319, value: 2 }] })],
    circuits: [
      circuit({ id: 'MSB-1', from: 'MSB', to: 'DB1', device: 'ACB', cable: cable({ mm2: 185, length: 60, parallel: 2 }), load: { current: 400, powerFactor: 0.85, phases: 3 } }),
      circuit({ id: 'DB1-1', from: 'DB1', device: 'MCB', cable: { ...cable({ mm2: 6, length: 25 }), insulation: 'PVC' }, load: { current: 25, powerFactor: 0.9, phases: 3 }, checks: { disconnectionTime: 0.4, voltageDropLimit: 5 } }),
    ],
  });
  const r = solveProject(p);
  const msb = r.boards.find((b) => b.id === 'MSB')!;
  const db1 = r.boards.find((b) => b.id === 'DB1')!;

  it('the main board sees the network plus K_T Z_T (IEC 60909-0:2016 eq. (29))', () => {
    const ratio = 11e3 / 400;
    const zq = (1.1 * 11e3 ** 2) / 250e6 / ratio ** 2;
    const rq = zq / Math.sqrt(101);
    const tx = transformerImpedance(transformer.kind === 'transformer' ? transformer.transformer : (undefined as never), 1.05);
    const z = Math.hypot(rq + tx.zTK.r, 10 * rq + tx.zTK.x);
    expect(msb.ik3max).toBeCloseTo((1.05 * 400) / (Math.sqrt(3) * z), 6);
    // about 26 kA: a 1000 kVA, 5.75 % transformer on a 250 MVA network (rule of thumb 25.1 kA, common practice)
    expect(msb.ik3max).toBeGreaterThan(24_000);
    expect(msb.ik3max).toBeLessThan(28_000);
  });
  it('the minimum line-PE current at the main board uses (2 Z1 + Z0)/3 with the MV network out of Z0', () => {
    const ratio = 11e3 / 400;
    const zqMin = (1.1 * 11e3 ** 2) / 150e6 / ratio ** 2;
    const rq = zqMin / Math.sqrt(101);
    const tx = transformerImpedance(transformer.kind === 'transformer' ? transformer.transformer : (undefined as never), 1.05);
    const loop = { r: (2 * (rq + tx.zTK.r) + tx.zTK.r) / 3, x: (2 * (10 * rq + tx.zTK.x) + tx.zTK.x) / 3 };
    expect(msb.ik1min).toBeCloseTo((0.95 * 400) / (Math.sqrt(3) * Math.hypot(loop.r, loop.x)), 6);
  });
  it('the sub-board adds the sub-main cable: 2 x 185 mm2 at 20 degC for maximum currents', () => {
    const cableR = (0.0991e-3 * 60) / 2; // IEC 60228 Table 2: 185 mm2 Cu 0.0991 ohm/km
    expect(db1.zMax.r - msb.zMax.r).toBeCloseTo(cableR, 9);
    expect(db1.zMax.x - msb.zMax.x).toBeCloseTo((0.08e-3 * 60) / 2, 9);
    expect(db1.ik3max).toBeLessThan(msb.ik3max);
  });
  it('circuit origin equals its board and voltage drop accumulates from the supply', () => {
    const c = r.circuits.find((x) => x.id === 'DB1-1')!;
    expect(c.origin.ik3max).toBeCloseTo(db1.ik3max, 9);
    // hand calculation: sub-main 400 A, 60 m, 2 x 185 mm2 XLPE at 90 degC, cos phi 0.85
    const rSub = (0.0991e-3 * (1 + 0.004 * 70) * 60) / 2;
    const xSub = (0.08e-3 * 60) / 2;
    const dSub = (Math.sqrt(3) * 400 * (rSub * 0.85 + xSub * Math.sqrt(1 - 0.85 ** 2))) / 400 * 100;
    const rFin = 3.08e-3 * (1 + 0.004 * 50) * 25; // 6 mm2 Cu 3.08 ohm/km, PVC at 70 degC
    const xFin = 0.08e-3 * 25;
    const dFin = (Math.sqrt(3) * 25 * (rFin * 0.9 + xFin * Math.sqrt(1 - 0.81))) / 400 * 100;
    expect(db1.voltageDrop).toBeCloseTo(dSub, 9);
    expect(c.voltageDrop).toBeCloseTo(dSub + dFin, 9);
    expect(c.checks.map((k) => k.name)).toEqual(['thermal_withstand', 'breaking_capacity', 'disconnection', 'voltage_drop']);
  });
  it('single-phase drop: b = 2 over U_0 (IEC 60364-5-52:2009 Annex G, G.1), twice the three-phase figure', () => {
    // hand calculation: 16 A, 30 m of 2.5 mm2 Cu PVC (7.41 ohm/km at 20 degC, IEC 60228 Table 2) at 70 degC,
    // cos phi = 1: u = 2 x 16 A x 0.2668 ohm = 8.54 V, over U_0 = 230.9 V: 3.70 %
    const single = solveProject(project({ circuits: [circuit({ cable: { ...cable({ mm2: 2.5, length: 30 }), insulation: 'PVC' }, load: { current: 16, powerFactor: 1, phases: 1 } })] })).circuits[0]!;
    const r = 7.41e-3 * (1 + 0.004 * 50) * 30;
    expect(single.voltageDrop).toBeCloseTo(((2 * 16 * r) / (400 / Math.sqrt(3))) * 100, 9);
    expect(single.voltageDrop).toBeCloseTo(3.7, 2);
    const three = solveProject(project({ circuits: [circuit({ cable: { ...cable({ mm2: 2.5, length: 30 }), insulation: 'PVC' }, load: { current: 16, powerFactor: 1, phases: 3 } })] })).circuits[0]!;
    expect(single.voltageDrop! / three.voltageDrop!).toBeCloseTo(2, 9);
  });
  it('a circuit without a load has no voltage-drop check', () => {
    const q = solveProject(project({ circuits: [circuit({ load: undefined })] }));
    expect(q.circuits[0]!.checks.map((k) => k.name)).not.toContain('voltage_drop');
  });
  it('breaking capacity compares I"k3max at the origin with the device rating', () => {
    const c = r.circuits.find((x) => x.id === 'DB1-1')!;
    const check = c.checks.find((k) => k.name === 'breaking_capacity')!;
    expect(check.value).toBeCloseTo(db1.ik3max, 6);
    expect(check.status).toBe(db1.ik3max <= 10e3 ? 'pass' : 'fail');
  });
  it('the results document carries the contract fields in SI', () => {
    const doc = resultsDocument(p, r);
    const c = doc.circuits.find((x) => x.id === 'MSB-1')!;
    expect(Object.keys(c)).toEqual(expect.arrayContaining(['id', 'from', 'to', 'origin', 'end', 'k', 'withstand_a2s', 'let_through_a2s', 'threshold_length_m', 'max_length_m', 'verdict', 'checks']));
    expect(Object.keys(doc.boards[0]!)).toEqual(expect.arrayContaining(['id', 'ik3max_a', 'ip_a', 'ik1min_a', 'z_max', 'fed_by']));
    expect(doc.boards.map((b) => b.id)).toEqual(['MSB', 'DB1']);
    expect(doc.boards[1]!.fed_by).toBe('MSB-1');
    expect(c.withstand_a2s / (c.k * 2 * 185) ** 2).toBeCloseTo(1, 9); // the document carries 12 significant figures
  });
});

describe('verdicts', () => {
  it('fail if any check fails, else undetermined if any is, else pass', () => {
    const undetermined = solveProject(project({ devices: [device({ breakingCapacity: undefined, clearingTime: 0.01 })], circuits: [circuit({ cable: cable({ mm2: 95, length: 30 }) })] })).circuits[0]!;
    expect(undetermined.checks.find((k) => k.name === 'breaking_capacity')!.status).toBe('undetermined');
    expect(undetermined.verdict).toBe('undetermined');
    const failing = solveProject(project({ devices: [device({ breakingCapacity: 10e3, clearingTime: 0.01 })], circuits: [circuit({ cable: cable({ mm2: 95, length: 30 }) })] })).circuits[0]!;
    expect(failing.verdict).toBe('fail');
  });
  it('TT earthing leaves the disconnection check undetermined (earth-electrode loop not modelled)', () => {
    const c = solveProject(project({ settings: settings({ earthing: 'TT' }), devices: [device({ clearingTime: 0.01 })] })).circuits[0]!;
    expect(c.checks.find((k) => k.name === 'disconnection')!.status).toBe('undetermined');
  });
});

describe('purity', () => {
  it('the same project solves to the same numbers twice', () => {
    const p = project();
    expect(JSON.stringify(resultsDocument(p, solveProject(p)))).toBe(JSON.stringify(resultsDocument(p, solveProject(p))));
  });
});

describe('protective conductor withstand, IEC 60364-5-54:2011 543.1.2 (beside the four checks)', () => {
  const solveWith = (pe: Partial<import('../../src/model/types.js').ProtectiveConductor> | null) => {
    const base = cable({ mm2: 95, length: 30 });
    const c = pe ? { ...base, protectiveConductor: { ...base.protectiveConductor, ...pe }, protectiveConductorDefaulted: false } : base;
    return solveProject(project({ devices: [device({ clearingTime: 0.2 })], circuits: [circuit({ cable: c })] })).circuits[0]!;
  };
  it('a default PE (a core of the phase size) has the phase k and withstand', () => {
    const r = solveWith(null);
    expect(r.protectiveConductor!.k).toBeCloseTo(r.k, 9);
    expect(r.protectiveConductor!.withstand).toBeCloseTo(r.withstand, 3);
    expect(r.protectiveConductor!.status).toBe(r.checks[0]!.status);
  });
  it('a separate insulated PE starts at 30 degC: k = 176 for XLPE copper (Table A.54.2)', () => {
    const r = solveWith({ arrangement: 'separate' });
    expect(r.protectiveConductor!.k).toBeCloseTo(176, 0);
  });
  it('a PE too small for the let-through energy fails and says so, the verdict of the four checks unchanged', () => {
    // 16 mm2 core, k = 143: k^2 S^2 = 5.2e6 A^2 s, against about (16 kA)^2 x 0.2 s at the origin
    const r = solveWith({ size: { label: '16 mm2', system: 'metric', area: 16e-6 }, resistance20: 1.15e-3 });
    expect(r.protectiveConductor!.withstand).toBeCloseTo((143.08 * 16) ** 2, -4);
    expect(r.protectiveConductor!.status).toBe('fail');
    expect(r.checks[0]!.status).toBe('pass');
    expect(r.notes.join(' ')).toContain('protective conductor');
  });
});
