// Initial symmetrical short-circuit currents and peak current, IEC 60909-0:2016 clauses 7.1, 8.1 and 9.1.

import type { Impedance } from './types.js';
import { magnitude } from './impedance.js';

/** I''k3 = c U_n / (sqrt(3) |Z_k|), IEC 60909-0 eq. (29). */
export function threePhaseCurrent(c: number, un: number, z: Impedance): number {
  return (c * un) / (Math.sqrt(3) * magnitude(z));
}

/**
 * Line-to-earth current from the loop impedance Z_loop = (2 Z_1 + Z_0) / 3 of the source plus phase + PE
 * of every cable: I''k1 = sqrt(3) c U_n / |2 Z_1 + Z_0| = c U_n / (sqrt(3) |Z_loop|), IEC 60909-0 eq. (52).
 */
export function lineToEarthCurrent(c: number, un: number, zLoop: Impedance): number {
  return (c * un) / (Math.sqrt(3) * magnitude(zLoop));
}

/** kappa = 1.02 + 0.98 exp(-3 R/X), IEC 60909-0 eq. (55). */
export function peakFactor(z: Impedance): number {
  if (z.x <= 0) return 1.02;
  return 1.02 + 0.98 * Math.exp((-3 * z.r) / z.x);
}

/** i_p = kappa sqrt(2) I''k, IEC 60909-0 eq. (54). */
export function peakCurrent(kappa: number, ik: number): number {
  return kappa * Math.SQRT2 * ik;
}

/**
 * Factor m for the heat effect of the DC component (IEC 60909-0:2016 clause 14, Joule integral
 * I''k^2 (m + n) T_k; the closed form of m is the one IEC 60865-1 gives, from memory):
 * m = [exp(4 f T_k ln(kappa - 1)) - 1] / (2 f T_k ln(kappa - 1)). Far from generator n = 1.
 */
export function dcHeatFactor(kappa: number, frequency: number, duration: number): number {
  const lnK = Math.log(Math.max(kappa - 1, 1e-9));
  const a = 2 * frequency * duration * lnK;
  if (a === 0) return 0;
  return (Math.exp(2 * a) - 1) / a;
}
