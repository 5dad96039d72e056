// Checks src/data/icea.ts: the ICEA P-32-382 (2007) adiabatic equations against IEC 60949:1988.
import { describe, expect, it } from 'vitest';
import { iceaShortCircuitCurrent } from '../../src/data/icea.js';
import { IEC60949_CONSTANTS } from '../../src/data/iec60949.js';
import { MM2_PER_CIRCULAR_MIL } from '../../src/data/awg.js';

// IEC 60949:1988 clause 3: I = k S / sqrt(t), k = K sqrt(ln((theta_f + beta)/(theta_i + beta))).
function iecAdiabaticCurrent(conductor: 'copper' | 'aluminium', areaMm2: number, t: number, T1: number, T2: number) {
  const { K, beta } = IEC60949_CONSTANTS[conductor];
  return (K * Math.sqrt(Math.log((T2 + beta) / (T1 + beta))) * areaMm2) / Math.sqrt(t);
}

describe('ICEA P-32-382 against IEC 60949', () => {
  const CMIL_4_0 = 211600; // 4/0 AWG, ASTM B258 / NFPA 70 Ch. 9 Table 8
  const area = CMIL_4_0 * MM2_PER_CIRCULAR_MIL; // 107.2 mm2

  // The two methods are both adiabatic and differ only in their constants: ICEA's 0.0297 against the
  // IEC equivalent K^2 ln(10) (mm2 per cmil)^2 = 226^2 x 2.3026 x 2.5675e-7 = 0.0302 (copper), and
  // beta 234 against 234.5. That is 0.8 % in current for copper, 1.8 % for aluminium (0.0125 against
  // 0.01295). A 2 % tolerance accepts this known difference and still fails a wrong logarithm base
  // (ln for log10 is a factor 1.52 in current) or a wrong area unit.
  it('4/0 AWG copper, 90 -> 250 degC, 1 s: within 2 % of k S / sqrt(t)', () => {
    const icea = iceaShortCircuitCurrent('copper', CMIL_4_0, 1, 90, 250);
    const iec = iecAdiabaticCurrent('copper', area, 1, 90, 250);
    expect(Math.abs(icea / iec - 1)).toBeLessThan(0.02);
    // hand calculation of the equation: 211600 x sqrt(0.0297 x log10(484 / 324)) = 15 224 A (no published source)
    expect(icea).toBeCloseTo(15224, -1);
  });

  it('4/0 AWG aluminium, 90 -> 250 degC, 1 s: within 2 % of k S / sqrt(t)', () => {
    const icea = iceaShortCircuitCurrent('aluminium', CMIL_4_0, 1, 90, 250);
    const iec = iecAdiabaticCurrent('aluminium', area, 1, 90, 250);
    expect(Math.abs(icea / iec - 1)).toBeLessThan(0.02);
  });

  it('current falls as 1 / sqrt(t) and rises in proportion to area', () => {
    const i1 = iceaShortCircuitCurrent('copper', 250000, 1, 75, 200);
    expect(iceaShortCircuitCurrent('copper', 250000, 4, 75, 200)).toBeCloseTo(i1 / 2, 6);
    expect(iceaShortCircuitCurrent('copper', 500000, 1, 75, 200)).toBeCloseTo(i1 * 2, 6);
  });
});
