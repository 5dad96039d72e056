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

export function faultAt(settings: Settings, source: SourceAtBoard, cable: Cable, length: number): FaultPoint {
  // Inlined phase and loop impedances: this runs thousands of times per circuit in the length searches.
  const hot = resistanceAt(1, minFaultTemperature(settings, cable));
  const pe = cable.protectiveConductor;
  const xPhase = (cable.reactance * length) / cable.parallel;
  const zMax = { r: source.zMax.r + (cable.resistance20 * length) / cable.parallel, x: source.zMax.x + xPhase };
  const zLoop = {
    r: source.zLoopMin.r + hot * length * (cable.resistance20 / cable.parallel + pe.resistance20 / pe.parallel),
    x: source.zLoopMin.x + xPhase + (cable.reactance * length) / pe.parallel,
  };
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
  const rs = source.zMax.r;
  const xs = source.zMax.x;
  const r1 = cable.resistance20 / cable.parallel;
  const x1 = cable.reactance / cable.parallel;
  const a = r1 * r1 + x1 * x1;
  const b = 2 * (rs * r1 + xs * x1);
  const cu = (settings.voltageFactorMax * settings.systemVoltage) / Math.sqrt(3);
  return (current: number) => {
    const z = cu / current; // |Z_k| that gives this current
    let l = 0;
    if (a > 0) {
      const c = rs * rs + xs * xs - z * z;
      const disc = b * b - 4 * a * c;
      l = disc > 0 ? (-b + Math.sqrt(disc)) / (2 * a) : 0;
    }
    l = Math.min(Math.max(l, 0), length);
    return peakFactor({ r: rs + l * r1, x: xs + l * x1 });
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
  const pe = cable.protectiveConductor;
  let z0: Impedance;
  let r1: number;
  let x1: number;
  let c: number;
  if (kind === 'max') {
    z0 = source.zMax;
    r1 = cable.resistance20 / cable.parallel;
    x1 = cable.reactance / cable.parallel;
    c = settings.voltageFactorMax;
  } else {
    const hot = resistanceAt(1, minFaultTemperature(settings, cable));
    z0 = source.zLoopMin;
    r1 = hot * (cable.resistance20 / cable.parallel + pe.resistance20 / pe.parallel);
    x1 = cable.reactance / cable.parallel + cable.reactance / pe.parallel;
    c = settings.voltageFactorMin;
  }
  const z = (c * settings.systemVoltage) / (Math.sqrt(3) * current);
  const a = r1 * r1 + x1 * x1;
  const b = 2 * (z0.r * r1 + z0.x * x1);
  const k = z0.r * z0.r + z0.x * z0.x - z * z;
  if (a <= 0 || k > 0) return null; // the current exceeds the origin's
  const l = (-b + Math.sqrt(b * b - 4 * a * k)) / (2 * a);
  return l >= 0 && l <= limit ? l : null;
}
