// Unit parsing at the edge: dimensional text to SI numbers, and clear refusals.

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  DIMENSIONS,
  isMultipleOfRatingUnit,
  libraryReading,
  loadUnitLibrary,
  ownReading,
  ownUnitNames,
  normaliseUnitText,
  parseMultipleOfRating,
  parsePercent,
  parseQuantity,
  parseUnitFactor,
  type Dimension,
} from '../../src/model/units.js';

// Units beyond our own reader's go to mathjs, as they do once the loader has loaded it (load.ts).
await loadUnitLibrary();

const ALL_DIMENSIONS = Object.keys(DIMENSIONS) as Dimension[];

function si(text: string, dimension: Dimension): number {
  const parsed = parseQuantity(text, dimension);
  if (!parsed.ok) throw new Error(`${text}: ${parsed.problem}`);
  return parsed.value;
}

describe('parseQuantity', () => {
  // SI prefixes and unit definitions (SI Brochure, 9th edition): exact conversions.
  it.each([
    ['45 m', 'length', 45],
    ['0.03 km', 'length', 30],
    ['95 mm2', 'area', 95e-6],
    ['95 mm²', 'area', 95e-6],
    ['95 mm^2', 'area', 95e-6],
    ['250 MVA', 'apparent-power', 250e6],
    ['1000 kVA', 'apparent-power', 1e6],
    ['10.5 kW', 'power', 10500],
    ['0.2 s', 'time', 0.2],
    ['20 ms', 'time', 0.02],
    ['13 kA', 'current', 13000],
    ['11 kV', 'voltage', 11000],
    ['50 Hz', 'frequency', 50],
    ['0.35 ohm', 'impedance', 0.35],
    ['0.35 Ω', 'impedance', 0.35],
    ['20 mohm', 'impedance', 0.02],
    ['0.08 ohm/km', 'impedance-per-length', 0.08e-3],
    ['0.193 Ω/km', 'impedance-per-length', 0.193e-3],
    ['1.5e5 A^2 s', 'joule-integral', 1.5e5],
    ['1.5e5 A2s', 'joule-integral', 1.5e5],
    ['1.5e5 A²s', 'joule-integral', 1.5e5],
    ['2 kA^2 s', 'joule-integral', 2e6],
    ['160 degC', 'temperature', 160],
    ['160 °C', 'temperature', 160], // the degree sign as engineers write it
    ['45m', 'length', 45],
  ] as const)('%s is %s %d (SI)', (text, dimension, expected) => {
    expect(si(text, dimension)).toBeCloseTo(expected, 12);
  });

  it('converts temperatures with their offset: 320 degF = 160 degC (t_C = (t_F - 32) x 5/9)', () => {
    expect(si('320 degF', 'temperature')).toBeCloseTo(160, 9);
  });

  it('a bare number has no unit', () => {
    expect(parseQuantity('45', 'length')).toEqual({ ok: false, problem: 'missing-unit' });
  });

  it('a unit of the wrong dimension is refused', () => {
    expect(parseQuantity('45 A', 'length')).toMatchObject({ ok: false, problem: 'wrong-dimension', detail: 'A' });
    expect(parseQuantity('250 kA', 'apparent-power')).toMatchObject({ ok: false, problem: 'wrong-dimension' });
    expect(parseQuantity('0.08 ohm', 'impedance-per-length')).toMatchObject({ ok: false, problem: 'wrong-dimension' });
  });

  it('an unknown unit and text without a number are refused', () => {
    expect(parseQuantity('20 fish', 'length')).toMatchObject({ ok: false, problem: 'unknown-unit', detail: 'fish' });
    expect(parseQuantity('250 mva', 'apparent-power')).toMatchObject({ ok: false, problem: 'unknown-unit' }); // units are case-sensitive
    expect(parseQuantity('m', 'length')).toMatchObject({ ok: false, problem: 'not-a-number' });
    expect(parseQuantity('', 'length')).toMatchObject({ ok: false, problem: 'not-a-number' });
  });

  it('keeps the sign, so that the schema can refuse negative values', () => {
    expect(si('-5 m', 'length')).toBe(-5);
  });
});

describe('unit spellings of the trade', () => {
  it('reads mm2 as mm^2 and A2s as A^2 s, without touching the number', () => {
    expect(normaliseUnitText('mm2')).toBe('mm^2');
    expect(normaliseUnitText('kA2s')).toBe('kA^2 s');
    expect(si('1e2 mm2', 'area')).toBeCloseTo(100e-6, 15);
  });
});

describe('parsePercent', () => {
  it('"5.75 %" is 5.75 percent', () => {
    expect(parsePercent('5.75 %')).toEqual({ ok: true, value: 5.75 });
    expect(parsePercent('5%')).toEqual({ ok: true, value: 5 });
  });
  it('needs the % sign', () => {
    expect(parsePercent('5.75')).toMatchObject({ ok: false, problem: 'missing-unit' });
    expect(parsePercent('5.75 V')).toMatchObject({ ok: false, problem: 'wrong-dimension' });
  });
});

describe('multiples of the rating and curve units', () => {
  it('"10 x In" is a multiple of 10', () => {
    expect(parseMultipleOfRating('10 x In')).toBe(10);
    expect(parseMultipleOfRating('7.5xIn')).toBe(7.5);
    expect(parseMultipleOfRating('2.5 kA')).toBeUndefined();
  });
  it('"x In" is a current unit of multiples', () => {
    expect(isMultipleOfRatingUnit('x In')).toBe(true);
    expect(isMultipleOfRatingUnit('kA')).toBe(false);
  });
  it('unit factors to SI', () => {
    expect(parseUnitFactor('kA', 'current')).toEqual({ ok: true, value: 1000 });
    expect(parseUnitFactor('ms', 'time')).toEqual({ ok: true, value: 0.001 });
    expect(parseUnitFactor('kA^2 s', 'joule-integral')).toEqual({ ok: true, value: 1e6 });
    expect(parseUnitFactor('A2s', 'joule-integral')).toEqual({ ok: true, value: 1 });
    expect(parseUnitFactor('V', 'current')).toMatchObject({ ok: false, problem: 'wrong-dimension' });
  });
});

// FORMAT.md: dimensional values are read with mathjs's units. Our own reader stands in for mathjs on the
// units projects nearly always write, and must give mathjs's numbers exactly, not only to 12 figures.
describe('our own unit reader against mathjs', () => {
  const magnitudes = [1, 45, 0.07, 1.5e5, 123.456789, 3e-7, 0.1 + 0.2]; // common practice, no source

  it('reads every unit name it knows as mathjs does, in every dimension, bit for bit', () => {
    const names = ownUnitNames();
    expect(names.length).toBeGreaterThan(150); // 8 prefixed units x 21 spellings and 5 plain ones
    for (const name of names) {
      for (const dimension of ALL_DIMENSIONS) {
        for (const magnitude of magnitudes) {
          expect(ownReading(name, dimension, magnitude), `${magnitude} ${name} as ${dimension}`).toBe(libraryReading(name, dimension, magnitude));
        }
      }
    }
  });

  it.each([
    ['A^2 s', 'joule-integral'],
    ['kA^2 s', 'joule-integral'],
    ['A2s', 'joule-integral'],
    ['kA²·s', 'joule-integral'],
    ['A^2*s', 'joule-integral'],
    ['ohm/km', 'impedance-per-length'],
    ['mohm/m', 'impedance-per-length'],
    ['Ω/km', 'impedance-per-length'],
    ['ohm / km', 'impedance-per-length'],
    ['uohm/m', 'impedance-per-length'],
    ['mm2', 'area'],
    ['cm^2', 'area'],
    ['ft^2', 'area'],
    ['V A', 'apparent-power'],
    ['V/m s', 'voltage'], // "/" takes only the next unit: V m^-1 s, not a voltage
    ['kV/kA', 'impedance'],
    ['s/h', 'time'],
  ] as const)('reads %s as mathjs does (%s)', (text, dimension) => {
    expect(ownReading(text, 'length', 1)).toBe(libraryReading(text, 'length', 1));
    for (const magnitude of magnitudes) expect(ownReading(text, dimension, magnitude)).toBe(libraryReading(text, dimension, magnitude));
  });

  it('reads the spellings that name a quantity (not "V/m s") in their dimension', () => {
    expect(ownReading('kA^2 s', 'joule-integral', 2)).toBe(2e6);
    expect(ownReading('ohm/km', 'impedance-per-length', 0.08)).toBeCloseTo(0.08e-3, 18);
    expect(ownReading('V/m s', 'voltage', 1)).toBeUndefined();
  });

  it('leaves to mathjs what it does not read: other units, offsets in products, powers beyond 9, parentheses', () => {
    for (const text of ['degF', 'K', 'yd', 'mi', 'kiloohm', 'degC^2', 'degC m', 'm^10', 'm^0.5', 'm^-1', '(m)', 'kg', 'mm2/'])
      expect(ownReading(text, 'length', 1), text).toBeUndefined();
  });

  it('agrees with mathjs on random products and quotients of the units it knows', () => {
    const names = ownUnitNames();
    const term = fc.tuple(fc.constantFrom(...names), fc.constantFrom('', '^2', '^3', '2', ' ^ 2'));
    const text = fc
      .tuple(term, fc.array(fc.tuple(fc.constantFrom(' ', '*', '/', ' / ', '·'), term), { maxLength: 3 }))
      .map(([first, rest]) => first.join('') + rest.map(([op, t]) => op + t.join('')).join(''));
    fc.assert(
      fc.property(text, fc.constantFrom(...ALL_DIMENSIONS), fc.double({ min: -1e6, max: 1e6, noNaN: true }), (unit, dimension, magnitude) => {
        const ours = ownReading(unit, dimension, magnitude);
        if (ours !== undefined) expect(ours).toBe(libraryReading(unit, dimension, magnitude));
      }),
      { seed: 20261202, numRuns: 3000 },
    );
  });
});
