// Fault currents at a point along a circuit: the origin board's source impedances plus this cable.

import type { Cable, Settings } from '../model/types.js';
import { insulationTemperatures } from '../data/insulation.js';
import type { Impedance } from './types.js';
import { resistanceAt } from './impedance.js';
import { lineToEarthCurrent, peakFactor, threePhaseCurrent } from './fault-current.js';

/** Source impedances seen at a board. */
export interface SourceAtBoard {
  zMax: Impedance; // positive-sequence, cables at 20 degC (maximum currents)
  zLoopMin: Impedance; // line-PE loop, minimum condition (cables at the minimum-fault temperature)
}

export interface FaultPoint {
  zMax: Impedance;
  zLoop: Impedance;
  ik3max: number;
  ip: number;
  kappa3: number;
  ik1min: number;
  kappa1: number; // peak factor of the loop, used for the DC component of line-PE faults
}

export function areaMm2(cable: Cable): number {
  return cable.size.area * 1e6;
}

/** Conductor temperature for minimum currents (FORMAT.md settings.min_fault_conductor_temperature). */
export function minFaultTemperature(settings: Settings, cable: Cable): number {
  const mode = settings.minFaultTemperature;
  if (mode.mode === 'fixed') return mode.celsius;
  let t = temperatureCache.get(cable);
  if (!t) {
    t = insulationTemperatures(cable.insulation, areaMm2(cable));
    temperatureCache.set(cable, t);
  }
  switch (mode.mode) {
    case 'final':
      return t.finalC;
    case 'operating':
      return t.initialC;
  }
}

const temperatureCache = new WeakMap<Cable, { initialC: number; finalC: number }>();

/** This cable's impedance per metre of route: the phase at 20 degC, and the line-PE loop at the minimum-fault temperature. */
export function impedancePerMetre(settings: Settings, cable: Cable): { phase: Impedance; loop: Impedance } {
  const hot = resistanceAt(1, minFaultTemperature(settings, cable));
  const pe = cable.protectiveConductor;
  const x = cable.reactance / cable.parallel;
  return {
    phase: { r: cable.resistance20 / cable.parallel, x },
    loop: { r: hot * (cable.resistance20 / cable.parallel + pe.resistance20 / pe.parallel), x: x + cable.reactance / pe.parallel },
  };
}

/** The length l >= 0 at which |z0 + l z1| = z; null where even zero length gives more than z. */
function lengthForImpedance(z0: Impedance, z1: Impedance, z: number): number | null {
  const a = z1.r * z1.r + z1.x * z1.x;
  const b = 2 * (z0.r * z1.r + z0.x * z1.x);
  const k = z0.r * z0.r + z0.x * z0.x - z * z;
  if (a <= 0 || k > 0) return null;
  return Math.max(0, (-b + Math.sqrt(b * b - 4 * a * k)) / (2 * a));
}

export function faultAt(settings: Settings, source: SourceAtBoard, cable: Cable, length: number): FaultPoint {
  const { phase, loop } = impedancePerMetre(settings, cable);
  const zMax = { r: source.zMax.r + phase.r * length, x: source.zMax.x + phase.x * length };
  const zLoop = { r: source.zLoopMin.r + loop.r * length, x: source.zLoopMin.x + loop.x * length };
  const ik3max = threePhaseCurrent(settings.voltageFactorMax, settings.systemVoltage, zMax);
  const kappa3 = peakFactor(zMax);
  return {
    zMax,
    zLoop,
    ik3max,
    kappa3,
    ip: kappa3 * Math.SQRT2 * ik3max,
    ik1min: lineToEarthCurrent(settings.voltageFactorMin, settings.systemVoltage, zLoop),
    kappa1: peakFactor(zLoop),
  };
}

/**
 * kappa of the fault that gives a prospective current on this cable, for the DC-component factor m: the
 * peak factor of the three-phase impedance at the fault location (IEC 60909-0:2016 8.1: the peak current of
 * an unbalanced fault may use kappa of the three-phase fault at the same place). A current between
 * I''k3max at the origin and at the far end locates its fault along the cable; a larger one is the
 * origin's, a smaller one (reached by earth faults only) the far end's.
 */
export function kappaAlongCable(settings: Settings, source: SourceAtBoard, cable: Cable, length: number): (current: number) => number {
  const z0 = source.zMax;
  const { phase } = impedancePerMetre(settings, cable);
  const cu = (settings.voltageFactorMax * settings.systemVoltage) / Math.sqrt(3);
  return (current: number) => {
    const l = Math.min(lengthForImpedance(z0, phase, cu / current) ?? 0, length);
    return peakFactor({ r: z0.r + l * phase.r, x: z0.x + l * phase.x });
  };
}

/**
 * The length of this cable at whose far end the maximum three-phase current ('max') or the minimum
 * line-PE current ('loop') equals `current`; null where no length from 0 to `limit` gives it.
 */
export function lengthAtCurrent(
  settings: Settings,
  source: SourceAtBoard,
  cable: Cable,
  current: number,
  kind: 'max' | 'loop',
  limit: number,
): number | null {
  const perMetre = impedancePerMetre(settings, cable);
  const max = kind === 'max';
  const c = max ? settings.voltageFactorMax : settings.voltageFactorMin;
  const l = lengthForImpedance(max ? source.zMax : source.zLoopMin, max ? perMetre.phase : perMetre.loop, (c * settings.systemVoltage) / (Math.sqrt(3) * current));
  return l !== null && l <= limit ? l : null;
}
