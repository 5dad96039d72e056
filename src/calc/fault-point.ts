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
