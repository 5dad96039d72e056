// Source and cable impedances for short-circuit calculation, IEC 60909-0:2016 clause 6.

import type { Cable, NetworkFeeder, ServiceSupply, Transformer } from '../model/types.js';
import type { Impedance, ImpedanceStep } from './types.js';
import { fmt, sig } from './quantity-text.js';

export const ZERO: Impedance = { r: 0, x: 0 };

export function add(a: Impedance, b: Impedance): Impedance {
  return { r: a.r + b.r, x: a.x + b.x };
}

/** The build-up with one more element, its running total carried on (a new array: steps are shared). */
export function appendStep(steps: readonly ImpedanceStep[], element: string, detail: string, z: Impedance): ImpedanceStep[] {
  const prev = steps.length > 0 ? steps[steps.length - 1]!.total : ZERO;
  return [...steps, { element, detail, z, total: add(prev, z) }];
}

/**
 * A build-up as a chain from the source: each board and circuit adds one link to its feeder's, so a
 * deep board tree costs one link per level, not a copy of the whole list at every level. The list is
 * written out (`stepsOf`) only where a sheet reads it.
 */
export interface StepChain {
  readonly parent: StepChain | undefined;
  readonly step: ImpedanceStep;
}

export function chainStep(parent: StepChain | undefined, element: string, detail: string, z: Impedance): StepChain {
  return { parent, step: { element, detail, z, total: add(parent?.step.total ?? ZERO, z) } };
}

export function chainOf(steps: readonly ImpedanceStep[]): StepChain | undefined {
  let chain: StepChain | undefined;
  for (const s of steps) chain = chainStep(chain, s.element, s.detail, s.z);
  return chain;
}

/** The chain as the list from the source, without recursion. */
export function stepsOf(chain: StepChain | undefined): ImpedanceStep[] {
  const out: ImpedanceStep[] = [];
  for (let link = chain; link !== undefined; link = link.parent) out.push(link.step);
  return out.reverse();
}

/** Defines `key` on `target` as the chain's list, written out when first read (enumerable, so spreads copy it). */
export function defineSteps<T extends object>(target: T, key: string, chain: StepChain | undefined): T {
  let steps: ImpedanceStep[] | undefined;
  return Object.defineProperty(target, key, { enumerable: true, configurable: true, get: () => (steps ??= stepsOf(chain)) });
}

export function scale(z: Impedance, factor: number): Impedance {
  return { r: z.r * factor, x: z.x * factor };
}

export function magnitude(z: Impedance): number {
  return Math.hypot(z.r, z.x);
}

/** Split a magnitude into R and X from a given X/R ratio. */
export function fromMagnitude(z: number, xOverR: number): Impedance {
  const r = z / Math.sqrt(1 + xOverR * xOverR);
  return { r, x: r * xOverR };
}

export interface Derived {
  z: Impedance;
  detail: string;
}

/**
 * Network feeder referred to the LV side, IEC 60909-0 eq. (1) and (2):
 * Z_Q = c_Q U_nQ^2 / S''_kQ, X_Q from X/R (0.995 Z_Q at X/R = 10), divided by t_r^2.
 */
export function networkFeederImpedance(net: NetworkFeeder, faultLevel: number, ratio: number): Derived {
  const zq = (net.voltageFactor * net.voltage ** 2) / faultLevel;
  const zqt = zq / (ratio * ratio);
  const z = fromMagnitude(zqt, net.xOverR);
  return {
    z,
    detail:
      `Z_Qt = c_Q·U_nQ²/(S″kQ·t_r²) = ${sig(net.voltageFactor, 3)}×(${fmt.voltage(net.voltage)})²/` +
      `(${fmt.power(faultLevel, 'VA')}×${sig(ratio, 5)}²) = ${fmt.ohm(zqt)}; X/R = ${sig(net.xOverR, 3)}`,
  };
}

export interface TransformerImpedance {
  zT: Impedance; // uncorrected
  kT: number;
  xT: number; // relative reactance x_T
  zTK: Impedance; // corrected K_T Z_T
  detail: string;
}

/**
 * Two-winding transformer, IEC 60909-0 eq. (7) to (9) and correction factor K_T eq. (12a):
 * Z_T = u_kr U_rTLV^2 / S_rT, R_T = P_krT U_rTLV^2 / S_rT^2, K_T = 0.95 c_max / (1 + 0.6 x_T).
 */
export function transformerImpedance(t: Transformer, cMax: number): TransformerImpedance {
  const zBase = t.secondaryVoltage ** 2 / t.rating;
  const zMag = t.impedance * zBase;
  let r: number;
  if (t.loadLosses !== undefined) r = (t.loadLosses * t.secondaryVoltage ** 2) / t.rating ** 2;
  else r = zMag / Math.sqrt(1 + (t.xOverR ?? 0) ** 2);
  const x = Math.sqrt(Math.max(zMag * zMag - r * r, 0));
  const xT = x / zBase;
  const kT = (0.95 * cMax) / (1 + 0.6 * xT);
  const rSource =
    t.loadLosses !== undefined
      ? `R_T = P_krT·U_rTLV²/S_rT² = ${fmt.power(t.loadLosses, 'W')}×(${fmt.voltage(t.secondaryVoltage)})²/(${fmt.power(t.rating, 'VA')})² = ${fmt.ohm(r)}`
      : `R_T = Z_T/√(1+(X/R)²) with X/R = ${sig(t.xOverR ?? 0, 3)}: ${fmt.ohm(r)}`;
  return {
    zT: { r, x },
    kT,
    xT,
    zTK: { r: r * kT, x: x * kT },
    detail:
      `Z_T = u_kr·U_rTLV²/S_rT = ${sig(t.impedance * 100, 4)} %×(${fmt.voltage(t.secondaryVoltage)})²/${fmt.power(t.rating, 'VA')} = ${fmt.ohm(zMag)}; ` +
      `${rSource}; X_T = ${fmt.ohm(x)}; x_T = ${sig(xT, 4)}; ` +
      `K_T = 0.95·c_max/(1+0.6·x_T) = 0.95×${sig(cMax, 3)}/(1+0.6×${sig(xT, 4)}) = ${sig(kT, 4)}`,
  };
}

/**
 * LV service with a declared prospective current: Z_1 = c_max U_n / (sqrt(3) I_k) at the angle of X/R,
 * so that the origin shows the declared current (FORMAT.md section 2).
 */
export function serviceImpedance(s: ServiceSupply, cMax: number, un: number): Derived {
  const z = (cMax * un) / (Math.sqrt(3) * s.faultCurrent);
  return {
    z: fromMagnitude(z, s.xOverR),
    detail: `Z_S = c_max·U_n/(√3·I_k) = ${sig(cMax, 3)}×${fmt.voltage(un)}/(√3×${fmt.current(s.faultCurrent)}) = ${fmt.ohm(z)}; X/R = ${sig(s.xOverR, 3)}`,
  };
}

/** Resistance at a conductor temperature, R = R_20 [1 + 0.004 (theta - 20)] (FORMAT.md section 2). */
export function resistanceAt(r20: number, celsius: number): number {
  return r20 * (1 + 0.004 * (celsius - 20));
}

/** Phase conductor impedance of a cable run (all parallel conductors together), resistance at `celsius`. */
export function cablePhaseImpedance(cable: Cable, length: number, celsius = 20): Impedance {
  return {
    r: (resistanceAt(cable.resistance20, celsius) * length) / cable.parallel,
    x: (cable.reactance * length) / cable.parallel,
  };
}

/** Protective conductor impedance of the run; its reactance per length taken equal to the phase conductor's. */
export function cableProtectiveImpedance(cable: Cable, length: number, celsius: number): Impedance {
  const pe = cable.protectiveConductor;
  return {
    r: (resistanceAt(pe.resistance20, celsius) * length) / pe.parallel,
    x: (cable.reactance * length) / pe.parallel,
  };
}

/** Line-to-protective-conductor loop of the run: phase + PE, both at `celsius`. */
export function cableLoopImpedance(cable: Cable, length: number, celsius: number): Impedance {
  return add(cablePhaseImpedance(cable, length, celsius), cableProtectiveImpedance(cable, length, celsius));
}
