// Conductor sizes as written resolved to areas, and their tabulated resistances at 20 degC.

import { describe, expect, it } from 'vitest';
import { parseConductorSize, tabulatedResistance } from '../../src/model/sizes.js';
import type { ConductorSize } from '../../src/model/types.js';

function size(text: string): ConductorSize {
  const parsed = parseConductorSize(text);
  if (!parsed.ok) throw new Error(`${text}: ${parsed.problem}`);
  return parsed.size;
}

describe('metric sizes', () => {
  it('normalise the label and give the area in m^2', () => {
    expect(size('95 mm2')).toEqual({ label: '95 mm2', system: 'metric', area: 95e-6 });
    expect(size('95 mm²')).toEqual({ label: '95 mm2', system: 'metric', area: 95e-6 });
    expect(size('1.5mm2')).toEqual({ label: '1.5 mm2', system: 'metric', area: 1.5e-6 });
    expect(size('0.95 cm2').label).toBe('95 mm2'); // 1 cm2 = 100 mm2
  });
  it('refuse a size without unit, with the wrong unit, or not positive', () => {
    expect(parseConductorSize('95')).toEqual({ ok: false, problem: 'missing-unit' });
    expect(parseConductorSize('95 mm')).toEqual({ ok: false, problem: 'wrong-dimension' });
    expect(parseConductorSize('0 mm2')).toEqual({ ok: false, problem: 'not-positive' });
  });
});

describe('AWG and kcmil sizes', () => {
  // Areas: ASTM B258 d_n = 0.127 mm x 92^((36 - n)/39); printed areas as in NFPA 70 Chapter 9
  // Table 8 (mm2 column): 14 AWG 2.08, 12 AWG 3.31, 2 AWG 33.6, 1/0 53.5, 4/0 107.2; kcmil by
  // definition, 1 kcmil = 0.506707479 mm2: 250 kcmil = 126.7 mm2.
  it.each([
    ['14 AWG', '14 AWG', 2.08, 2],
    ['12 AWG', '12 AWG', 3.31, 2],
    ['2 AWG', '2 AWG', 33.6, 1],
    ['1/0 AWG', '1/0 AWG', 53.5, 1],
    ['2/0', '2/0 AWG', 67.4, 1],
    ['4/0 AWG', '4/0 AWG', 107.2, 1],
    ['250 kcmil', '250 kcmil', 126.7, 1],
    ['500 MCM', '500 kcmil', 253.4, 1],
  ] as const)('%s -> %s, %d mm2', (text, label, mm2, digits) => {
    const s = size(text);
    expect(s.label).toBe(label);
    expect(s.area * 1e6).toBeCloseTo(mm2, digits);
  });
  it('250 kcmil is exactly 250 x 0.506707479 mm2 (definition of the circular mil)', () => {
    expect(size('250 kcmil').area * 1e6).toBeCloseTo(250 * 0.506707479, 6);
  });
  it('refuse an AWG number that does not exist', () => {
    expect(parseConductorSize('5/0 AWG')).toEqual({ ok: false, problem: 'unknown-size' });
  });
});

describe('tabulated resistance at 20 degC', () => {
  it('IEC 60228:2004 Table 2, class 2: 95 mm2 copper 0.193 ohm/km, aluminium 0.320 ohm/km', () => {
    expect(tabulatedResistance('copper', size('95 mm2'))!.resistance20).toBeCloseTo(0.193e-3, 12);
    expect(tabulatedResistance('aluminium', size('95 mm2'))!.resistance20).toBeCloseTo(0.32e-3, 12);
  });
  it('IEC 60228:2004 Table 2 has no aluminium below 10 mm2, and no 97 mm2 at all', () => {
    expect(tabulatedResistance('aluminium', size('6 mm2'))).toBeUndefined();
    expect(tabulatedResistance('copper', size('97 mm2'))).toBeUndefined();
  });
  it('NFPA 70 Ch. 9 Table 8: 4/0 AWG copper 0.1996 ohm/km at 75 degC, x (1 - 0.00323 x 55) at 20 degC', () => {
    const r = tabulatedResistance('copper', size('4/0 AWG'))!;
    expect(r.resistance20 * 1000).toBeCloseTo(0.1996 * (1 - 0.00323 * 55), 6);
    expect(r.source).toContain('NFPA 70');
  });
});
