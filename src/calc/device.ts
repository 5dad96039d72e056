// Protective device response at a prospective current: operating time and let-through energy
// (FORMAT.md section 2; DC component per IEC 60909-0:2016 clause 14 under 0.1 s).

import type { CurvePoint, Device } from '../model/types.js';
import { dcHeatFactor } from './fault-current.js';

export type DeviceRule = 'let-through curve' | 'instantaneous' | 'trip curve' | 'clearing time';

export interface OperatingPoint {
  current: number; // prospective current, A
  rule: DeviceRule | null; // null: no rule applies (undetermined)
  time: number | null; // operating (total clearing) time, s; virtual time E / I^2 on the let-through curve
  energy: number | null; // let-through Joule integral, A^2 s
  dcFactor: number; // m applied (0 where none)
}

/** The device as used in one circuit: a circuit may override the definite clearing time. */
export interface DeviceInCircuit {
  device: Device;
  clearingTime?: number; // the definite time in force (circuit override, else the device's)
  frequency: number;
}

/** Below this operating time the DC component adds to the Joule integral (FORMAT.md section 2). */
export const DC_COMPONENT_TIME_LIMIT = 0.1;

/** Log-log interpolation inside the points' current range; undefined outside it (never extrapolated). */
export function logLogInterpolate(points: readonly CurvePoint[], current: number): number | undefined {
  const n = points.length;
  if (n === 0) return undefined;
  const first = points[0]!;
  const last = points[n - 1]!;
  if (current < first.current || current > last.current) return undefined;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (points[mid]!.current <= current) lo = mid;
    else hi = mid;
  }
  const a = points[lo]!;
  const b = points[hi]!;
  if (a.current === current) return a.value;
  if (b.current === current) return b.value;
  const f = Math.log(current / a.current) / Math.log(b.current / a.current);
  return Math.exp(Math.log(a.value) + f * Math.log(b.value / a.value));
}

/**
 * Response at prospective current I, rules in order: let-through curve (energy read directly, inside its
 * range), instantaneous band (I >= pickup), trip curve (inside its range), definite clearing time.
 * A time-based operation lets through I^2 t, times (1 + m) where t < 0.1 s; kappa is the peak factor at the
 * fault location of this current.
 */
export function operatingPoint(d: DeviceInCircuit, current: number, kappa: number): OperatingPoint {
  const dev = d.device;
  if (dev.letThrough) {
    const energy = logLogInterpolate(dev.letThrough, current);
    if (energy !== undefined) {
      return { current, rule: 'let-through curve', time: energy / (current * current), energy, dcFactor: 0 };
    }
  }
  let time: number | undefined;
  let rule: DeviceRule | null = null;
  if (dev.instantaneous && current >= dev.instantaneous.pickup) {
    time = dev.instantaneous.clearingTime;
    rule = 'instantaneous';
  }
  if (time === undefined && dev.tripCurve) {
    const t = logLogInterpolate(dev.tripCurve, current);
    if (t !== undefined) {
      time = t;
      rule = 'trip curve';
    }
  }
  if (time === undefined && d.clearingTime !== undefined) {
    time = d.clearingTime;
    rule = 'clearing time';
  }
  if (time === undefined) return { current, rule: null, time: null, energy: null, dcFactor: 0 };
  const m = time < DC_COMPONENT_TIME_LIMIT ? dcHeatFactor(kappa, d.frequency, time) : 0;
  return { current, rule, time, energy: current * current * time * (1 + m), dcFactor: m };
}

/**
 * Currents at which the device's response changes rule or slope: curve points, range ends and the
 * instantaneous pickup, each with a neighbour just outside so both sides of a step are seen.
 */
export function responseBreakpoints(dev: Device): readonly number[] {
  const cached = breakpointCache.get(dev);
  if (cached) return cached;
  const out: number[] = [];
  const edge = (i: number) => out.push(i * (1 - 1e-9), i, i * (1 + 1e-9));
  for (const curve of [dev.letThrough, dev.tripCurve]) {
    if (!curve) continue;
    for (const p of curve) out.push(p.current);
    edge(curve[0]!.current);
    edge(curve[curve.length - 1]!.current);
  }
  if (dev.instantaneous) edge(dev.instantaneous.pickup);
  out.sort((a, b) => a - b);
  breakpointCache.set(dev, out);
  return out;
}

const breakpointCache = new WeakMap<Device, number[]>();

/** True where the device's time never depends on current: it is given by a definite clearing time alone. */
export function isDefiniteTimeOnly(dev: Device): boolean {
  return !dev.letThrough && !dev.instantaneous && !dev.tripCurve;
}
