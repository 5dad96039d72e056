// The adiabatic energy check over a range of prospective currents, IEC 60364-4-43:2008 434.5.2:
// the device's let-through energy must not exceed k^2 S^2 at any current in the range.

import type { EnergyEvaluation } from './types.js';
import type { FaultPoint } from './fault-point.js';
import { type DeviceInCircuit, type DeviceRule, operatingPoint, responseBreakpoints } from './device.js';

/** Peak factor known at a current (the fault location giving that current). */
export interface KappaAnchor {
  current: number;
  kappa: number;
}

/** kappa at a current: linear in log I between the nearest anchors, held constant beyond them. */
export function kappaAt(anchors: readonly KappaAnchor[], current: number): number {
  const n = anchors.length;
  if (current <= anchors[0]!.current) return anchors[0]!.kappa;
  if (current >= anchors[n - 1]!.current) return anchors[n - 1]!.kappa;
  for (let i = 1; i < n; i++) {
    const b = anchors[i]!;
    if (current <= b.current) {
      const a = anchors[i - 1]!;
      if (b.current === a.current) return b.kappa;
      const f = Math.log(current / a.current) / Math.log(b.current / a.current);
      return a.kappa + f * (b.kappa - a.kappa);
    }
  }
  return anchors[n - 1]!.kappa;
}

/** Anchors from the fault points bounding the range: 3-phase and line-PE faults at each. */
export function kappaAnchors(points: readonly FaultPoint[]): KappaAnchor[] {
  const anchors: KappaAnchor[] = [];
  for (const p of points) {
    anchors.push({ current: p.ik3max, kappa: p.kappa3 }, { current: p.ik1min, kappa: p.kappa1 });
  }
  if (anchors.length === 2) {
    const [a, b] = anchors as [KappaAnchor, KappaAnchor];
    return a.current < b.current || (a.current === b.current && a.kappa <= b.kappa) ? anchors : [b, a];
  }
  return anchors.sort((a, b) => a.current - b.current || a.kappa - b.kappa);
}

export interface EnergyCheck extends EnergyEvaluation {
  withstand: number;
  exceeded: boolean;
}

/**
 * Largest let-through energy over [currentMin, currentMax]. The response is piecewise monotone between its
 * breakpoints (curve points, range ends, pickup), so the range ends and the breakpoints inside it are the
 * only candidates for the maximum and for a region where no rule applies.
 */
export function energyOverRange(
  device: DeviceInCircuit,
  currentMin: number,
  currentMax: number,
  anchors: readonly KappaAnchor[],
  withstand: number,
  breakpoints: readonly number[] = responseBreakpoints(device.device),
): EnergyCheck {
  let best: { current: number; energy: number; rule: DeviceRule } | null = null;
  let undetermined = false;
  const visit = (current: number) => {
    const op = operatingPoint(device, current, kappaAt(anchors, current));
    if (op.energy === null || op.rule === null) {
      undetermined = true;
      return;
    }
    if (best === null || op.energy > best.energy) best = { current, energy: op.energy, rule: op.rule };
  };
  visit(currentMax);
  visit(currentMin);
  for (const b of breakpoints) if (b > currentMin && b < currentMax) visit(b);
  const found = best as { current: number; energy: number; rule: DeviceRule } | null;
  const exceeded = found !== null && found.energy > withstand;
  const status = exceeded ? 'fail' : undetermined ? 'undetermined' : 'pass';
  return {
    status,
    governingCurrent: status === 'undetermined' || !found ? null : found.current,
    letThrough: status === 'undetermined' || !found ? null : found.energy,
    rule: found ? found.rule : null,
    currentMin,
    currentMax,
    withstand,
    exceeded,
  };
}
