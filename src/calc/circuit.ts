// The four checks of one circuit for one cable choice (used for the chosen cable, its alternatives and the
// length searches): thermal withstand, breaking capacity, disconnection, voltage drop.

import type { Cable, Load, Settings } from '../model/types.js';
import { insulationTemperatures } from '../data/insulation.js';
import type { CheckName, Status } from './types.js';
import { type KDerivation, conductorK, protectiveConductorK, withstandEnergy } from './adiabatic.js';
import { type DeviceInCircuit, type OperatingPoint, operatingPoint } from './device.js';
import { type FaultPoint, type SourceAtBoard, areaMm2, faultAt, kappaAlongCable } from './fault-point.js';
import { resistanceAt } from './impedance.js';
import { type EnergyCheck, energyOverRange } from './withstand-check.js';

export interface CircuitCase {
  settings: Settings;
  device: DeviceInCircuit;
  source: SourceAtBoard;
  upstreamDrop: number; // percent at the origin board
  cable: Cable;
  load?: Load;
  disconnectionTime: number; // s
  voltageDropLimit: number; // percent
}

export interface DisconnectionOutcome {
  status: Status;
  current: number; // I''k1min at the far end
  point: OperatingPoint | null; // null where the earthing system's loop is not modelled
  limit: number;
}

export interface VoltageDropOutcome {
  status: Status;
  own: number; // percent, this cable
  total: number; // percent, upstream + this cable
  limit: number;
}

/** The protective conductor's own adiabatic check, IEC 60364-5-54:2011 543.1.2, beside the four checks. */
export interface ProtectiveConductorOutcome {
  k: KDerivation;
  withstand: number; // k^2 S^2 of the PE conductors together, A^2 s
  status: Status;
}

export interface CircuitEvaluation {
  protectiveConductor: ProtectiveConductorOutcome;
  origin: FaultPoint;
  end: FaultPoint;
  k: KDerivation;
  totalAreaMm2: number;
  withstand: number;
  energy: EnergyCheck;
  breaking: { status: Status; value: number; limit: number | null };
  disconnection: DisconnectionOutcome;
  voltageDrop: VoltageDropOutcome | null;
  verdict: Status;
  failing: CheckName[];
  undetermined: CheckName[];
}

export function cableK(cable: Cable): KDerivation {
  return conductorK(cable.conductor, cable.insulation, areaMm2(cable));
}

/** True where earth-fault disconnection can be judged from the line-PE loop (TN systems). */
export function earthFaultLoopModelled(settings: Settings): boolean {
  return settings.earthing === 'TN-S' || settings.earthing === 'TN-C-S' || settings.earthing === 'TN-C';
}

/** Energy check on faults at one point only (the far end of a cable of `length`). */
export function farEndEnergy(c: CircuitCase, length: number, withstand: number): EnergyCheck {
  return energyAtPoint(c, faultAt(c.settings, c.source, c.cable, length), withstand);
}

/** Energy check on the faults at one fault point already computed. */
export function energyAtPoint(c: CircuitCase, end: FaultPoint, withstand: number): EnergyCheck {
  const lo = Math.min(end.ik1min, end.ik3max);
  const hi = Math.max(end.ik1min, end.ik3max);
  return energyOverRange(c.device, lo, hi, () => end.kappa3, withstand); // every fault at the far end
}

/** Device response to the smallest fault (line-PE) at the far end of a cable of `length`. */
export function farEndDisconnection(c: CircuitCase, length: number): DisconnectionOutcome {
  const end = faultAt(c.settings, c.source, c.cable, length);
  return disconnectionFor(c, end);
}

function disconnectionFor(c: CircuitCase, end: FaultPoint): DisconnectionOutcome {
  const limit = c.disconnectionTime;
  if (!earthFaultLoopModelled(c.settings)) return { status: 'undetermined', current: end.ik1min, point: null, limit };
  const point = operatingPoint(c.device, end.ik1min, end.kappa1);
  const status: Status = point.time === null ? 'undetermined' : point.time <= limit ? 'pass' : 'fail';
  return { status, current: end.ik1min, point, limit };
}

/**
 * Voltage drop in percent, IEC 60364-5-52:2009 Annex G: u = b (R cos phi + X sin phi) I_b with b = 1 for a
 * three-phase and b = 2 for a single-phase circuit, over U_0 = U_n / sqrt(3); for three phases this is
 * sqrt(3) I_b L (R cos phi + X sin phi) / U_n. R at the insulation's maximum operating temperature.
 */
export function cableVoltageDrop(settings: Settings, cable: Cable, load: Load, length = cable.length) {
  const temperature = insulationTemperatures(cable.insulation, areaMm2(cable)).initialC;
  const r = (resistanceAt(cable.resistance20, temperature) * length) / cable.parallel;
  const x = (cable.reactance * length) / cable.parallel;
  const cos = load.powerFactor;
  const sin = Math.sqrt(Math.max(0, 1 - cos * cos));
  const factor = load.phases === 1 ? 2 * Math.sqrt(3) : Math.sqrt(3);
  const percent = ((factor * load.current * (r * cos + x * sin)) / settings.systemVoltage) * 100;
  return { percent, r, x, temperature };
}

export function evaluateCircuit(c: CircuitCase): CircuitEvaluation {
  const { settings, cable } = c;
  const origin = faultAt(settings, c.source, cable, 0);
  const end = faultAt(settings, c.source, cable, cable.length);
  const k = cableK(cable);
  const totalAreaMm2 = areaMm2(cable) * cable.parallel;
  const withstand = withstandEnergy(k.k, totalAreaMm2);

  const anyPoint = settings.withstandCriterion === 'any-point';
  const kappaOf = anyPoint ? kappaAlongCable(settings, c.source, cable, cable.length) : () => end.kappa3;
  const lo = Math.min(end.ik1min, end.ik3max);
  const hi = anyPoint ? origin.ik3max : Math.max(end.ik1min, end.ik3max);
  const energy = energyOverRange(c.device, lo, hi, kappaOf, withstand);

  // The PE carries the earth-fault currents, which lie inside the range the phase check considers: the
  // largest let-through found there bounds the PE's energy too (on the safe side).
  const pe = cable.protectiveConductor;
  const peK = protectiveConductorK(pe.conductor, pe.arrangement, cable.insulation, pe.size.area * 1e6);
  const peWithstand = withstandEnergy(peK.k, pe.size.area * 1e6 * pe.parallel);
  const protectiveConductor: ProtectiveConductorOutcome = {
    k: peK,
    withstand: peWithstand,
    status: energy.largestFound !== null && energy.largestFound.energy > peWithstand ? 'fail' : energy.status === 'undetermined' ? 'undetermined' : 'pass',
  };

  const capacity = c.device.device.breakingCapacity;
  const breaking = {
    status: (capacity === undefined ? 'undetermined' : origin.ik3max <= capacity ? 'pass' : 'fail') as Status,
    value: origin.ik3max,
    limit: capacity ?? null,
  };

  const disconnection = disconnectionFor(c, end);

  let voltageDrop: VoltageDropOutcome | null = null;
  if (c.load) {
    const vd = cableVoltageDrop(settings, cable, c.load);
    const total = c.upstreamDrop + vd.percent;
    voltageDrop = {
      status: total <= c.voltageDropLimit ? 'pass' : 'fail',
      own: vd.percent,
      total,
      limit: c.voltageDropLimit,
    };
  }

  const statuses: Array<[CheckName, Status]> = [
    ['thermal_withstand', energy.status],
    ['breaking_capacity', breaking.status],
    ['disconnection', disconnection.status],
  ];
  if (voltageDrop) statuses.push(['voltage_drop', voltageDrop.status]);
  const failing = statuses.filter(([, s]) => s === 'fail').map(([n]) => n);
  const undetermined = statuses.filter(([, s]) => s === 'undetermined').map(([n]) => n);
  const verdict: Status = failing.length > 0 ? 'fail' : undetermined.length > 0 ? 'undetermined' : 'pass';
  return { protectiveConductor, origin, end, k, totalAreaMm2, withstand, energy, breaking, disconnection, voltageDrop, verdict, failing, undetermined };
}
