// Series for a sheet's three charts, sampled here so the report draws without recomputing.

import type { ChartSeries } from './types.js';
import { operatingPoint, responseBreakpoints } from './device.js';
import { type CircuitCase, type CircuitEvaluation, energyAtPoint } from './circuit.js';
import { faultAt, kappaAlongCable } from './fault-point.js';
import { withstandTime } from './adiabatic.js';
import { LENGTH_SEARCH_LIMIT } from './length-search.js';

const CURRENT_SAMPLES = 120;
const LENGTH_SAMPLES = 100;

export function chartSeries(
  c: CircuitCase,
  ev: CircuitEvaluation,
  thresholdLength: number | null,
  maxLength: number | null,
): ChartSeries {
  const dev = c.device.device;
  const breakpoints = responseBreakpoints(dev);
  let lo = ev.end.ik1min / 3;
  let hi = ev.origin.ik3max * 2;
  for (const b of breakpoints) {
    lo = Math.min(lo, b / 1.5);
    hi = Math.max(hi, b * 1.5);
  }
  lo = Math.max(lo, dev.rating);
  if (hi <= lo) hi = lo * 10;
  const currents = new Set<number>();
  for (let i = 0; i <= CURRENT_SAMPLES; i++) currents.add(lo * (hi / lo) ** (i / CURRENT_SAMPLES));
  for (const b of breakpoints) if (b >= lo && b <= hi) currents.add(b);
  const sorted = [...currents].sort((a, b) => a - b);
  const kappaOf = kappaAlongCable(c.settings, c.source, c.cable, c.cable.length);
  const energy: ChartSeries['energy'] = [];
  const time: ChartSeries['time'] = [];
  const withstand: ChartSeries['withstandTime'] = [];
  for (const current of sorted) {
    const kappa = kappaOf(current);
    const op = operatingPoint(c.device, current, kappa);
    energy.push({ current, energy: op.energy });
    time.push({ current, time: op.time });
    withstand.push({ current, time: withstandTime(ev.k.k, ev.totalAreaMm2, current) });
  }

  let maxL = Math.max(2 * c.cable.length, 20);
  if (thresholdLength !== null) maxL = Math.max(maxL, 1.3 * thresholdLength);
  if (maxLength !== null && maxLength < LENGTH_SEARCH_LIMIT) maxL = Math.max(maxL, 1.2 * maxLength);
  maxL = Math.min(maxL, LENGTH_SEARCH_LIMIT);
  const length: ChartSeries['length'] = [];
  for (let i = 0; i <= LENGTH_SAMPLES; i++) {
    const l = (maxL * i) / LENGTH_SAMPLES;
    const p = faultAt(c.settings, c.source, c.cable, l);
    const e = energyAtPoint(c, p, ev.withstand);
    const op = operatingPoint(c.device, p.ik1min, p.kappa1);
    length.push({ length: l, ik3max: p.ik3max, ik1min: p.ik1min, letThrough: e.letThrough, operatingTime: op.time });
  }
  return { energy, time, withstandTime: withstand, length };
}
