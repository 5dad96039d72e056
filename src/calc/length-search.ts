// Length limits of a circuit (FORMAT.md section 2): the threshold (minimum) length at which the energy
// check on far-end faults passes, and the maximum length at which the smallest far-end fault still
// disconnects in time. Searched on a log grid up to 10 km, then refined by bisection.

import { isDefiniteTimeOnly } from './device.js';
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
  for (let i = 1; i < GRID.length; i++) {
    if (passes(GRID[i]!)) return bisect(GRID[i - 1]!, GRID[i]!, passes, false);
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
  let last = -1;
  for (let i = GRID.length - 1; i >= 0; i--) {
    if (ok(GRID[i]!)) {
      last = i;
      break;
    }
  }
  if (last < 0) return at(0) === 'fail' || GRID.some((l) => at(l) === 'fail') ? 0 : null;
  if (last === GRID.length - 1) return LENGTH_SEARCH_LIMIT;
  return bisect(GRID[last]!, GRID[last + 1]!, ok, true);
}
