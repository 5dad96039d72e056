// Checks src/data/iec60949.ts: IEC 60949:1988 Table I constants.
import { describe, expect, it } from 'vitest';
import { IEC60949_CONSTANTS, IEC60949_TABLE_I } from '../../src/data/iec60949.js';

describe('IEC 60949:1988 Table I', () => {
  it('copper K = 226 A s^0.5/mm2, beta = 234.5 K; aluminium K = 148, beta = 228', () => {
    // IEC 60949:1988 Table I (also IEC 60364-5-54:2011 Table A.54.1), from memory
    expect(IEC60949_CONSTANTS.copper).toEqual({ K: 226, beta: 234.5 });
    expect(IEC60949_CONSTANTS.aluminium).toEqual({ K: 148, beta: 228 });
    expect(IEC60949_TABLE_I.lead).toMatchObject({ K: 41, beta: 230 });
    expect(IEC60949_TABLE_I.steel).toMatchObject({ K: 78, beta: 202 });
  });

  // IEC 60949:1988 clause 3: K = sqrt(sigma_c (beta + 20) / rho_20). Recomputing K from the other
  // three columns of the same table checks the transcription of all four (to the table's rounding).
  it.each(['copper', 'aluminium', 'lead', 'steel'] as const)('%s: K agrees with sqrt(sigma_c (beta + 20) / rho_20)', (m) => {
    const c = IEC60949_TABLE_I[m];
    const kSi = Math.sqrt((c.volumetricSpecificHeat * (c.beta + 20)) / c.resistivity20); // A s^0.5 / m2
    const kMm2 = kSi * 1e-6;
    expect(Math.abs(kMm2 / c.K - 1)).toBeLessThan(0.005);
  });

  // beta is the inferred zero-resistance temperature: 1/(beta + 20) is the temperature coefficient at
  // 20 degC; for annealed copper 0.00393 per K (IEC 60028) — common practice.
  it('copper beta gives the 20 degC temperature coefficient of IEC 60028 (0.00393 /K)', () => {
    expect(1 / (IEC60949_CONSTANTS.copper.beta + 20)).toBeCloseTo(0.00393, 5);
  });
  // aluminium: 0.00403 per K at 20 degC (IEC 60889 hard-drawn aluminium, from memory)
  it('aluminium beta gives about 0.00403 /K at 20 degC', () => {
    expect(1 / (IEC60949_CONSTANTS.aluminium.beta + 20)).toBeCloseTo(0.00403, 5);
  });
});
