import { describe, expect, it } from 'vitest';
import { conductorK, kFactor, withstandEnergy, withstandTime } from '../../src/calc/adiabatic.js';

describe('k of IEC 60949:1988 against IEC 60364-5-54:2011 Table A.54 / IEC 60364-4-43:2008 Table 43A', () => {
  const cases: Array<[string, 'copper' | 'aluminium', 'PVC' | 'XLPE' | 'EPR' | 'rubber-60' | 'mineral-bare', number, number]> = [
    // [what, conductor, insulation, area mm2, published k]  (Table 43A / Table A.54.3, 2008 / 2011 editions)
    ['Cu PVC up to 300 mm2', 'copper', 'PVC', 95, 115],
    ['Cu PVC above 300 mm2', 'copper', 'PVC', 400, 103],
    ['Cu XLPE', 'copper', 'XLPE', 95, 143],
    ['Cu EPR', 'copper', 'EPR', 95, 143],
    ['Al PVC up to 300 mm2', 'aluminium', 'PVC', 95, 76],
    ['Al PVC above 300 mm2', 'aluminium', 'PVC', 400, 68],
    ['Al XLPE', 'aluminium', 'XLPE', 95, 94],
    ['Cu rubber 60 degC', 'copper', 'rubber-60', 95, 141],
    ['Cu mineral, bare', 'copper', 'mineral-bare', 95, 135],
  ];
  for (const [what, conductor, insulation, area, published] of cases) {
    it(`${what}: ${published}`, () => {
      // The tables print k rounded to a whole number: allow that rounding (half a unit) or 0.5 %.
      const k = conductorK(conductor, insulation, area).k;
      expect(Math.abs(k - published)).toBeLessThanOrEqual(Math.max(0.5, 0.005 * published));
    });
  }
  it('protective conductor not in a cable, Cu, 30 -> 160 degC: 143; 30 -> 250 degC: 176 (Table A.54.2)', () => {
    expect(kFactor(226, 234.5, 30, 160)).toBeCloseTo(143, 0);
    expect(kFactor(226, 234.5, 30, 250)).toBeCloseTo(176, 0);
  });
});

describe('adiabatic withstand of a 4 mm2 XLPE copper conductor (common practice, no source)', () => {
  const k = conductorK('copper', 'XLPE', 4).k;
  const current = (t: number) => Math.sqrt(withstandEnergy(k, 4) / t);
  it('about 572 A for 1 s', () => expect(current(1)).toBeCloseTo(572, -1));
  it('about 809 A for 0.5 s', () => expect(current(0.5)).toBeCloseTo(809, -1));
  it('about 1144 A for 0.25 s', () => expect(current(0.25)).toBeCloseTo(1144, -1));
  it('t = (k S / I)^2 inverts the same relation', () => {
    expect(withstandTime(k, 4, current(0.5))).toBeCloseTo(0.5, 10);
  });
});
