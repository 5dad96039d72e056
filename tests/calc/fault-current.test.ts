import { describe, expect, it } from 'vitest';
import { dcHeatFactor, lineToEarthCurrent, peakFactor, threePhaseCurrent } from '../../src/calc/fault-current.js';

describe('peak factor kappa, IEC 60909-0:2016 eq. (55)', () => {
  it('is 2.0 for a purely reactive circuit and 1.02 for a purely resistive one (Figure 16 limits)', () => {
    expect(peakFactor({ r: 0, x: 1 })).toBeCloseTo(2.0, 12);
    expect(peakFactor({ r: 1, x: 0 })).toBe(1.02);
  });
  it('is about 1.75 at R/X = 0.1 and 1.22 at R/X = 0.5 (IEC 60909-0:2016 Figure 16, read off the curve)', () => {
    expect(peakFactor({ r: 0.1, x: 1 })).toBeCloseTo(1.746, 2);
    expect(peakFactor({ r: 0.5, x: 1 })).toBeCloseTo(1.239, 2);
  });
});

describe('initial symmetrical currents', () => {
  it('I"k3 = c U_n / (sqrt(3) |Z_k|), IEC 60909-0:2016 eq. (29)', () => {
    // 400 V, c = 1.05, |Z_k| = 10 mOhm: 1.05 x 400 / (1.732 x 0.01) = 24.25 kA (hand calculation).
    expect(threePhaseCurrent(1.05, 400, { r: 0.006, x: 0.008 })).toBeCloseTo(24_248.7, 0);
  });
  it('line-to-earth from the loop impedance equals sqrt(3) c U_n / |2 Z1 + Z0| (IEC 60909-0:2016 eq. (52))', () => {
    const z1 = { r: 0.004, x: 0.012 };
    const z0 = { r: 0.01, x: 0.03 };
    const loop = { r: (2 * z1.r + z0.r) / 3, x: (2 * z1.x + z0.x) / 3 };
    const direct = (Math.sqrt(3) * 0.95 * 400) / Math.hypot(2 * z1.r + z0.r, 2 * z1.x + z0.x);
    expect(lineToEarthCurrent(0.95, 400, loop)).toBeCloseTo(direct, 6);
  });
});

describe('DC-component heat factor m (IEC 60909-0:2016 clause 14)', () => {
  it('tends to 2 for very short durations: the fully offset DC starts at sqrt(2) I"k (fact of the trade)', () => {
    expect(dcHeatFactor(1.8, 50, 1e-6)).toBeCloseTo(2, 3);
  });
  it('equals the integral of the decaying DC component, tau from kappa - 1 = exp(-1/(2 f tau)) (derivation)', () => {
    const kappa = 1.8;
    const f = 50;
    const T = 0.01;
    const tau = -1 / (2 * f * Math.log(kappa - 1));
    // integral of (sqrt(2) I e^(-t/tau))^2 over T, divided by I^2 T
    const m = (tau / T) * (1 - Math.exp((-2 * T) / tau));
    expect(dcHeatFactor(kappa, f, T)).toBeCloseTo(m, 10);
    expect(m).toBeCloseTo(1.61, 2);
  });
  it('is small for long durations and for low kappa (Figure 21 trend, from memory)', () => {
    expect(dcHeatFactor(1.8, 50, 1)).toBeLessThan(0.05);
    expect(dcHeatFactor(1.1, 50, 0.1)).toBeLessThan(0.05);
  });
});
