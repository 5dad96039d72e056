// Adiabatic short-circuit withstand of a conductor: k from IEC 60949:1988 clause 3, energy k^2 S^2
// (IEC 60364-4-43:2008 434.5.2).

import type { Conductor, Insulation } from '../model/types.js';
import { IEC60949_CONSTANTS } from '../data/iec60949.js';
import { insulationTemperatures, protectiveConductorTemperatures } from '../data/insulation.js';

export interface KDerivation {
  k: number; // A s^0.5 / mm^2
  K: number;
  beta: number;
  initialC: number;
  finalC: number;
  reference: string;
}

/** k = K sqrt(ln((theta_f + beta) / (theta_i + beta))), IEC 60949:1988 eq. (1) rearranged. */
export function kFactor(K: number, beta: number, initialC: number, finalC: number): number {
  return K * Math.sqrt(Math.log((finalC + beta) / (initialC + beta)));
}

export function conductorK(conductor: Conductor, insulation: Insulation, areaMm2: number): KDerivation {
  const { K, beta } = IEC60949_CONSTANTS[conductor];
  const t = insulationTemperatures(insulation, areaMm2);
  return {
    k: kFactor(K, beta, t.initialC, t.finalC),
    K,
    beta,
    initialC: t.initialC,
    finalC: t.finalC,
    reference: t.reference,
  };
}

/**
 * k of a protective conductor, IEC 60364-5-54:2011 543.1.2 with Annex A: a core of the cable starts at the
 * cable's operating temperature (Table A.54.3), a separate insulated conductor at 30 degC (Table A.54.2).
 */
export function protectiveConductorK(
  conductor: Conductor,
  arrangement: 'in-cable' | 'separate',
  insulation: Insulation,
  areaMm2: number,
): KDerivation {
  const { K, beta } = IEC60949_CONSTANTS[conductor];
  const t = protectiveConductorTemperatures(arrangement, insulation, areaMm2);
  return { k: kFactor(K, beta, t.initialC, t.finalC), K, beta, initialC: t.initialC, finalC: t.finalC, reference: t.reference };
}

/** Withstand energy k^2 S^2 with S the total area in mm^2 (one conductor times the parallel count). */
export function withstandEnergy(k: number, totalAreaMm2: number): number {
  return (k * totalAreaMm2) ** 2;
}

/** Time a conductor withstands a current adiabatically: t = (k S / I)^2. */
export function withstandTime(k: number, totalAreaMm2: number, current: number): number {
  return ((k * totalAreaMm2) / current) ** 2;
}
