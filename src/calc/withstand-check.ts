// The adiabatic energy check over a range of prospective currents, IEC 60364-4-43:2008 434.5.2:
// the device's let-through energy must not exceed k^2 S^2 at any current in the range.

import type { EnergyEvaluation } from './types.js';
import { type DeviceInCircuit, type DeviceRule, operatingPoint, responseBreakpoints } from './device.js';

/** Peak factor kappa of the fault that gives a prospective current (for the DC-component factor m). */
export type KappaOf = (current: number) => number;

export interface EnergyCheck extends EnergyEvaluation {
  withstand: number;
  /** The largest energy found where a rule applies (the governing case of a failure even where part of
   * the range is undetermined); `letThrough` is null wherever any current of the range is undetermined. */
  largestFound: { current: number; energy: number } | null;
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
  kappaOf: KappaOf,
  withstand: number,
  breakpoints: readonly number[] = responseBreakpoints(device.device),
): EnergyCheck {
  let best: { current: number; energy: number; rule: DeviceRule } | null = null;
  let undetermined = false;
  const visit = (current: number) => {
    const op = operatingPoint(device, current, kappaOf(current));
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
    governingCurrent: undetermined || !found ? null : found.current,
    letThrough: undetermined || !found ? null : found.energy,
    largestFound: found ? { current: found.current, energy: found.energy } : null,
    rule: found ? found.rule : null,
    currentMin,
    currentMax,
    withstand,
  };
}
