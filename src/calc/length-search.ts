// Length limits of a circuit (FORMAT.md section 2): the threshold (minimum) length at which the energy
// check on far-end faults passes, and the maximum length at which the smallest far-end fault still
// disconnects in time. Searched on a log grid up to 10 km, then refined by bisection.

import { isDefiniteTimeOnly, responseBreakpoints } from './device.js';
import { lengthAtCurrent } from './fault-point.js';
import { type CircuitCase, earthFaultLoopModelled, farEndDisconnection, farEndEnergy } from './circuit.js';

export const LENGTH_SEARCH_LIMIT = 10_000; // m

const GRID: readonly number[] = (() => {
  const points = [0];
  const steps = 48; // about 21 % apart: the refinement below takes each crossing to 1 mm
  const lo = Math.log(0.1);
  const hi = Math.log(LENGTH_SEARCH_LIMIT);
  for (let i = 0; i <= steps; i++) points.push(Math.exp(lo + ((hi - lo) * i) / steps));
  points[points.length - 1] = LENGTH_SEARCH_LIMIT;
  return points;
})();

/**
 * The lengths to try: the log grid, plus the lengths at which a far-end current crosses a step of the
 * device's response (a curve's end, the pickup), with a millimetre either side. Between those lengths
 * the status changes only where the operating time crosses a limit, which the bisection finds; a
 * narrow window that passes beyond a region with no rule is not stepped over.
 */
function candidateLengths(c: CircuitCase, kinds: ReadonlyArray<'max' | 'loop'>): number[] {
  const extra: number[] = [];
  for (const current of responseBreakpoints(c.device.device)) {
    for (const kind of kinds) {
      const l = lengthAtCurrent(c.settings, c.source, c.cable, current, kind, LENGTH_SEARCH_LIMIT);
      if (l === null) continue;
      for (const x of [l - 1e-3, l, l + 1e-3]) if (x > 0 && x < LENGTH_SEARCH_LIMIT) extra.push(x);
    }
  }
  if (extra.length === 0) return GRID as number[];
  extra.sort((a, b) => a - b);
  // merge two sorted lists (this runs for every circuit: no set, no full sort)
  const out: number[] = [];
  let i = 0;
  let j = 0;
  while (i < GRID.length || j < extra.length) {
    const next = j >= extra.length || (i < GRID.length && GRID[i]! <= extra[j]!) ? GRID[i++]! : extra[j++]!;
    if (out.length === 0 || next > out[out.length - 1]!) out.push(next);
  }
  return out;
}

/** Boundary between a length where `ok` is `okAtLo` and one where it is not, to 1 mm. */
function bisect(lo: number, hi: number, ok: (length: number) => boolean, okAtLo: boolean): number {
  while (hi - lo > 1e-3) {
    const mid = (lo + hi) / 2;
    if (ok(mid) === okAtLo) lo = mid;
    else hi = mid;
  }
  return okAtLo ? lo : hi;
}

/** Smallest length at which the energy check over the far-end currents passes; null if none up to 10 km. */
export function thresholdLength(c: CircuitCase, withstand: number): number | null {
  const passes = (length: number) => farEndEnergy(c, length, withstand).status === 'pass';
  if (passes(0)) return 0;
  const lengths = candidateLengths(c, ['max', 'loop']);
  for (let i = 1; i < lengths.length; i++) {
    if (passes(lengths[i]!)) return bisect(lengths[i - 1]!, lengths[i]!, passes, false);
  }
  return null;
}

/**
 * Largest length at which I''k1min at the far end operates the device within the disconnection time.
 * 0 if even zero length fails and no length passes; null where the time does not depend on current
 * (definite clearing time alone), where the earth-fault loop is not modelled, or where no length is
 * either passed or failed (the device data never cover the far-end current).
 */
export function maxProtectedLength(c: CircuitCase): number | null {
  if (isDefiniteTimeOnly(c.device.device) || !earthFaultLoopModelled(c.settings)) return null;
  const at = (length: number) => farEndDisconnection(c, length).status;
  const ok = (length: number) => at(length) === 'pass';
  // The largest grid length that passes, searched from the top down. At zero length the device may be
  // undetermined (a curve that stops below the largest fault) and still operate in time further out.
  const lengths = candidateLengths(c, ['loop']);
  let last = -1;
  for (let i = lengths.length - 1; i >= 0; i--) {
    if (ok(lengths[i]!)) {
      last = i;
      break;
    }
  }
  if (last < 0) return lengths.some((l) => at(l) === 'fail') ? 0 : null;
  if (last === lengths.length - 1) return LENGTH_SEARCH_LIMIT;
  return bisect(lengths[last]!, lengths[last + 1]!, ok, true);
}
