// Checks src/data/awg.ts against ASTM B258 and NFPA 70 (2023) Chapter 9 Table 8.
import { describe, expect, it } from 'vitest';
import {
  AWG_KCMIL_SIZES,
  AWG_STANDARD_SIZES,
  awgDiameterMm,
  nfpaResistance20,
  parseAwgLabel,
} from '../../src/data/awg.js';

const row = (label: string) => {
  const r = AWG_KCMIL_SIZES.find((x) => x.label === label);
  if (r === undefined) throw new Error(`no row ${label}`);
  return r;
};

describe('areas, ASTM B258 formula against NFPA 70 Chapter 9 Table 8', () => {
  // [label, mm2, circular mils] as printed in NFPA 70 Chapter 9 Table 8 (from memory), with the step
  // of the last printed digit of each. The printed AWG figures come from the ASTM B258 diameters
  // rounded to 0.1 mil (8 AWG: 128.5 mil -> 16 512 cmil -> 8.367 mm2, where the formula gives
  // 128.49 mil -> 8.3656 mm2), so the formula must agree within that diameter rounding (relative
  // area 2 x 0.05 mil / d) plus half a printed step.
  const published: Array<[string, number, number, number, number]> = [
    ['18 AWG', 0.823, 0.001, 1620, 10],
    ['16 AWG', 1.31, 0.01, 2580, 10],
    ['14 AWG', 2.08, 0.01, 4110, 10],
    ['12 AWG', 3.31, 0.01, 6530, 10],
    ['10 AWG', 5.261, 0.001, 10380, 10],
    ['8 AWG', 8.367, 0.001, 16510, 10],
    ['6 AWG', 13.3, 0.01, 26240, 10],
    ['4 AWG', 21.15, 0.01, 41740, 10],
    ['2 AWG', 33.62, 0.01, 66360, 10],
    ['1 AWG', 42.41, 0.01, 83690, 10],
    ['1/0 AWG', 53.49, 0.01, 105600, 100],
    ['2/0 AWG', 67.43, 0.01, 133100, 100],
    ['3/0 AWG', 85.01, 0.01, 167800, 100],
    ['4/0 AWG', 107.2, 0.1, 211600, 100],
    ['250 kcmil', 127, 1, 250000, 1],
    ['500 kcmil', 253, 1, 500000, 1],
    ['1000 kcmil', 507, 1, 1000000, 1],
    ['2000 kcmil', 1013, 1, 2000000, 1],
  ];
  it.each(published)('%s: %s mm2 (step %s), %s cmil', (label, mm2, mm2Step, cmil, cmilStep) => {
    const r = row(label);
    const diameterRounding = r.system === 'awg' ? 0.1 / Math.sqrt(cmil) : 0; // relative, from 0.05 mil
    expect(Math.abs(r.areaMm2 - mm2)).toBeLessThanOrEqual(mm2 * diameterRounding + mm2Step / 2 + 1e-12);
    expect(Math.abs(r.circularMils - cmil)).toBeLessThanOrEqual(cmil * diameterRounding + cmilStep / 2 + 1e-9);
  });

  it('4/0 AWG is 0.46 in = 11.684 mm exactly, 36 AWG is 0.005 in (ASTM B258 definition)', () => {
    expect(awgDiameterMm(-3)).toBeCloseTo(11.684, 9);
    expect(awgDiameterMm(36)).toBeCloseTo(0.127, 12);
  });

  it('1 kcmil = 0.506707479 mm2 (1 cmil = pi/4 x 0.0254^2 mm2)', () => {
    expect(row('250 kcmil').areaMm2).toBeCloseTo(250 * 0.506707479, 6);
  });

  it('lists the Table 8 rows in ascending area, 18 AWG to 2000 kcmil', () => {
    expect(AWG_KCMIL_SIZES.map((r) => r.label)).toEqual([
      '18 AWG', '16 AWG', '14 AWG', '12 AWG', '10 AWG', '8 AWG', '6 AWG', '4 AWG', '3 AWG', '2 AWG', '1 AWG',
      '1/0 AWG', '2/0 AWG', '3/0 AWG', '4/0 AWG',
      '250 kcmil', '300 kcmil', '350 kcmil', '400 kcmil', '500 kcmil', '600 kcmil', '700 kcmil', '750 kcmil',
      '800 kcmil', '900 kcmil', '1000 kcmil', '1250 kcmil', '1500 kcmil', '1750 kcmil', '2000 kcmil',
    ]); // NFPA 70 Chapter 9 Table 8 size column (from memory)
    for (let i = 1; i < AWG_KCMIL_SIZES.length; i++) {
      expect(AWG_KCMIL_SIZES[i]!.areaMm2).toBeGreaterThan(AWG_KCMIL_SIZES[i - 1]!.areaMm2);
    }
  });
});

describe('NFPA 70 (2023) Chapter 9 Table 8, DC resistance at 75 degC', () => {
  // The same table prints every resistance twice, in ohm/km and ohm/kFT, each rounded on its own.
  // [label, uncoated copper stranded ohm/kFT, aluminium stranded ohm/kFT] — Table 8 (from memory).
  const perKft: Array<[string, number, number]> = [
    ['18 AWG', 7.95, 13.1], ['16 AWG', 4.99, 8.21], ['14 AWG', 3.14, 5.17], ['12 AWG', 1.98, 3.25],
    ['10 AWG', 1.24, 2.04], ['8 AWG', 0.778, 1.28], ['6 AWG', 0.491, 0.808], ['4 AWG', 0.308, 0.508],
    ['3 AWG', 0.245, 0.403], ['2 AWG', 0.194, 0.319], ['1 AWG', 0.154, 0.253], ['1/0 AWG', 0.122, 0.201],
    ['2/0 AWG', 0.0967, 0.159], ['3/0 AWG', 0.0766, 0.126], ['4/0 AWG', 0.0608, 0.1],
    ['250 kcmil', 0.0515, 0.0847], ['300 kcmil', 0.0429, 0.0707], ['350 kcmil', 0.0367, 0.0605],
    ['400 kcmil', 0.0321, 0.0529], ['500 kcmil', 0.0258, 0.0424], ['600 kcmil', 0.0214, 0.0353],
    ['700 kcmil', 0.0184, 0.0303], ['750 kcmil', 0.0171, 0.0282], ['800 kcmil', 0.0161, 0.0265],
    ['900 kcmil', 0.0143, 0.0235], ['1000 kcmil', 0.0129, 0.0212], ['1250 kcmil', 0.0103, 0.0169],
    ['1500 kcmil', 0.00858, 0.0141], ['1750 kcmil', 0.00735, 0.0121], ['2000 kcmil', 0.00643, 0.0106],
  ];
  it.each(perKft)('%s: the ohm/km value agrees with the ohm/kFT column (%s Cu, %s Al)', (label, cuKft, alKft) => {
    const r = row(label);
    // 1 kft = 0.3048 km; both columns are rounded to 3 figures, so agree within 1 %
    expect(Math.abs((r.copper75 * 0.3048) / cuKft - 1), 'copper').toBeLessThan(0.01);
    expect(Math.abs((r.aluminium75! * 0.3048) / alKft - 1), 'aluminium').toBeLessThan(0.01);
  });

  it('spot values: 12 AWG Cu 6.50 ohm/km (1.98 ohm/kFT), 4/0 AWG Cu 0.1996 ohm/km (0.0608 ohm/kFT)', () => {
    // NFPA 70 Chapter 9 Table 8, uncoated copper, stranded (from memory). 6.73 ohm/km (2.05 ohm/kFT)
    // is the coated-copper column of the same row, not used here.
    expect(row('12 AWG').copper75).toBe(6.5);
    expect(row('4/0 AWG').copper75).toBe(0.1996);
    expect(row('4/0 AWG').aluminium75).toBe(0.328);
    expect(row('250 kcmil').copper75).toBe(0.1687);
    expect(row('500 kcmil').aluminium75).toBe(0.1391);
  });

  // Resistance x area is a constant of the metal: rho_75 x stranding. Copper 100 % IACS, aluminium
  // 61 % IACS (Table 8 notes), so R75 x cmil ~ 42 200 (Cu) and ~ 69 400 (Al) ohm cmil / km for every
  // row, within 1.5 % (common practice, no source). Catches a mis-transcribed row.
  it('R75 x circular mils is near-constant for each metal', () => {
    for (const r of AWG_KCMIL_SIZES) {
      expect(Math.abs((r.copper75 * r.circularMils) / 42200 - 1), `Cu ${r.label}`).toBeLessThan(0.015);
      expect(Math.abs((r.aluminium75! * r.circularMils) / 69400 - 1), `Al ${r.label}`).toBeLessThan(0.015);
    }
  });

  // Annealed copper 17.241 nOhm m at 20 degC (IEC 60028); at 75 degC x (1 + 0.00393 x 55) = 20.97
  // nOhm m. Stranded 4/0 (19 wires) carries a lay allowance of about 2 % (common practice).
  it('4/0 AWG copper R75 is the resistivity of annealed copper over the area, plus about 2 % for stranding', () => {
    const rho75 = 17.241 * (1 + 0.00393 * 55); // ohm mm2 / km
    const ratio = (row('4/0 AWG').copper75 * row('4/0 AWG').areaMm2) / rho75;
    expect(ratio).toBeGreaterThan(1.0);
    expect(ratio).toBeLessThan(1.04);
  });
});

describe('referral to 20 degC, Table 8 note 2: R2 = R1 [1 + alpha (T2 - 75)]', () => {
  it('copper: alpha 0.00323, 4/0 AWG 0.1996 x (1 - 0.17765) = 0.16414 ohm/km', () => {
    expect(nfpaResistance20('copper', '4/0 AWG')).toBeCloseTo(0.1996 * (1 + 0.00323 * -55), 12);
    expect(nfpaResistance20('copper', '4/0 AWG')).toBeCloseTo(0.16414, 5);
  });
  it('aluminium: alpha 0.00330, 250 kcmil 0.2778 x (1 - 0.1815) = 0.22738 ohm/km', () => {
    expect(nfpaResistance20('aluminium', '250 kcmil')).toBeCloseTo(0.22738, 5);
  });
  // The referred copper value should sit close to IEC 60228 for a similar area: 4/0 AWG (107 mm2)
  // at 20 degC is 0.164 ohm/km; 120 mm2 class 2 is 0.153 (IEC 60228:2004 Table 2), scaled by
  // area 0.153 x 120 / 107.2 = 0.171. Within 5 % (different standards, different allowances).
  it('agrees with IEC 60228 class 2 scaled by area within 5 %', () => {
    const scaled = (0.153 * 120) / row('4/0 AWG').areaMm2;
    expect(Math.abs(nfpaResistance20('copper', '4/0 AWG')! / scaled - 1)).toBeLessThan(0.05);
  });
  it('accepts any spelling parseAwgLabel accepts, and gives undefined outside the table', () => {
    expect(nfpaResistance20('copper', '4/0awg')).toBe(nfpaResistance20('copper', '4/0 AWG'));
    expect(nfpaResistance20('copper', '0000 AWG')).toBe(nfpaResistance20('copper', '4/0 AWG'));
    expect(nfpaResistance20('copper', '20 AWG')).toBeUndefined();
    expect(nfpaResistance20('copper', '95 mm2')).toBeUndefined();
  });
});

describe('parseAwgLabel', () => {
  it.each([
    ['4/0 AWG', '4/0 AWG'],
    ['4/0AWG', '4/0 AWG'],
    ['4/0 awg', '4/0 AWG'],
    ['0000 AWG', '4/0 AWG'],
    ['0 AWG', '1/0 AWG'],
    ['1/0 AWG', '1/0 AWG'],
    ['2 AWG', '2 AWG'],
    ['#14 AWG', '14 AWG'],
    ['AWG 12', '12 AWG'],
    ['  10 Awg ', '10 AWG'],
    ['250 kcmil', '250 kcmil'],
    ['250kcmil', '250 kcmil'],
    ['250 KCMIL', '250 kcmil'],
    ['500 MCM', '500 kcmil'],
  ])('%j -> %s', (text, label) => {
    expect(parseAwgLabel(text)?.label).toBe(label);
  });

  it('gives the table area for tabulated sizes and the formula area outside the table', () => {
    expect(parseAwgLabel('14 AWG')!.areaMm2).toBe(row('14 AWG').areaMm2);
    // 20 AWG: 32.0 mils, 1020 cmil, 0.518 mm2; 40 AWG: 3.1 mils (ASTM B258 table, from memory)
    expect(parseAwgLabel('20 AWG')!.areaMm2).toBeCloseTo(0.518, 3);
    expect(awgDiameterMm(20) / 0.0254).toBeCloseTo(32.0, 1);
    expect(Math.abs(awgDiameterMm(40) / 0.0254 - 3.1)).toBeLessThan(0.05);
    expect(parseAwgLabel('40 AWG')!.areaMm2).toBeCloseTo((Math.PI / 4) * awgDiameterMm(40) ** 2, 12);
    expect(parseAwgLabel('40 AWG')!.system).toBe('awg');
    expect(parseAwgLabel('1250 kcmil')!.system).toBe('kcmil');
    expect(parseAwgLabel('150 kcmil')!.areaMm2).toBeCloseTo(76.006, 3); // not a Table 8 row: 150 x 0.5067
  });

  it.each(['41 AWG', '5/0 AWG', '00000 AWG', '01 AWG', '14', '95 mm2', '0 kcmil', '-250 kcmil', 'AWG', ''])(
    'rejects %j',
    (text) => {
      expect(parseAwgLabel(text)).toBeUndefined();
    },
  );
});

describe('AWG_STANDARD_SIZES', () => {
  it('runs 14 AWG to 4/0 AWG, then 250 to 1000 kcmil, ascending area, all tabulated', () => {
    expect(AWG_STANDARD_SIZES[0]).toBe('14 AWG');
    expect(AWG_STANDARD_SIZES).toContain('4/0 AWG');
    expect(AWG_STANDARD_SIZES).toContain('250 kcmil');
    expect(AWG_STANDARD_SIZES[AWG_STANDARD_SIZES.length - 1]).toBe('1000 kcmil');
    const areas = AWG_STANDARD_SIZES.map((l) => parseAwgLabel(l)!.areaMm2);
    for (let i = 1; i < areas.length; i++) expect(areas[i]).toBeGreaterThan(areas[i - 1]!);
    for (const l of AWG_STANDARD_SIZES) expect(nfpaResistance20('copper', l), l).toBeDefined();
  });
});
