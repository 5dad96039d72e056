// The standard conductor sizes around the chosen one, each checked like the chosen cable, and the smallest
// size that passes every check.

import type { Cable, ConductorSize } from '../model/types.js';
import { METRIC_SIZES_MM2, tabulatedResistance20 } from '../data/iec60228.js';
import { AWG_STANDARD_SIZES, nfpaResistance20, parseAwgLabel } from '../data/awg.js';
import type { Alternative } from './types.js';
import { type CircuitCase, type CircuitEvaluation, evaluateCircuit } from './circuit.js';
import { maxProtectedLength, thresholdLength } from './length-search.js';

export interface SizeStep {
  size: ConductorSize;
  resistance20: number; // ohm/m
  source: string;
}

const IEC60228_SOURCE = 'IEC 60228:2004 Table 2 (class 2)';
const NFPA_SOURCE = 'NFPA 70 Ch. 9 Table 8, referred to 20 °C';

/** The standard sizes of the chosen cable's size system that have a tabulated resistance, ascending. */
export function sizeLadder(cable: Cable): readonly SizeStep[] {
  const key = `${cable.conductor}/${cable.size.system === 'metric' ? 'metric' : 'awg'}`;
  let ladder = ladders.get(key);
  if (!ladder) {
    ladder = buildLadder(cable);
    ladders.set(key, ladder);
  }
  return ladder;
}

const ladders = new Map<string, SizeStep[]>();

function buildLadder(cable: Cable): SizeStep[] {
  if (cable.size.system === 'metric') {
    const steps: SizeStep[] = [];
    for (const mm2 of METRIC_SIZES_MM2) {
      const r = tabulatedResistance20(cable.conductor, mm2);
      if (r === undefined) continue;
      steps.push({ size: { label: `${mm2} mm2`, system: 'metric', area: mm2 * 1e-6 }, resistance20: r / 1000, source: IEC60228_SOURCE });
    }
    return steps;
  }
  const steps: SizeStep[] = [];
  for (const label of AWG_STANDARD_SIZES) {
    const parsed = parseAwgLabel(label);
    const r = nfpaResistance20(cable.conductor, label);
    if (!parsed || r === undefined) continue;
    steps.push({ size: { label: parsed.label, system: parsed.system, area: parsed.areaMm2 * 1e-6 }, resistance20: r / 1000, source: NFPA_SOURCE });
  }
  return steps;
}

/** The cable with another phase size; a default protective conductor follows the phase size. */
export function withSize(cable: Cable, step: SizeStep): Cable {
  const pe = cable.protectiveConductorDefaulted
    ? { ...cable.protectiveConductor, size: step.size, resistance20: step.resistance20, resistanceSource: step.source }
    : cable.protectiveConductor;
  return {
    ...cable,
    size: step.size,
    resistance20: step.resistance20,
    resistanceSource: step.source,
    resistanceGiven: false,
    protectiveConductor: pe,
  };
}

function sameArea(a: number, b: number): boolean {
  return Math.abs(a - b) <= 1e-3 * Math.max(a, b);
}

export interface AlternativesOutcome {
  alternatives: Alternative[];
  smallestCompliantSize: string | null; // passes every check
  smallestWithstandingSize: string | null; // passes the thermal withstand check (the fix for that check alone)
}

export interface ChosenOutcome {
  evaluation: CircuitEvaluation;
  thresholdLength: number | null;
  maxLength: number | null;
}

function describe(c: CircuitCase, chosen: ChosenOutcome | null): Alternative {
  const ev = chosen?.evaluation ?? evaluateCircuit(c);
  const row: Omit<Alternative, 'thresholdLength' | 'maxLength'> = {
    size: c.cable.size.label,
    area: c.cable.size.area,
    k: ev.k.k,
    withstand: ev.withstand,
    endIk3max: ev.end.ik3max,
    endIk1min: ev.end.ik1min,
    letThrough: ev.energy.letThrough,
    verdict: ev.verdict,
    failing: ev.failing,
    chosen: chosen !== null,
  };
  if (chosen) return { ...row, thresholdLength: chosen.thresholdLength, maxLength: chosen.maxLength };
  // The length searches of the other sizes are for the sheet only: run them when first read.
  let threshold: number | null | undefined;
  let max: number | null | undefined;
  return Object.defineProperties(row, {
    thresholdLength: { enumerable: true, get: () => (threshold === undefined ? (threshold = thresholdLength(c, ev.withstand)) : threshold) },
    maxLength: { enumerable: true, get: () => (max === undefined ? (max = maxProtectedLength(c)) : max) },
  }) as Alternative;
}

/** Two sizes below and two above the chosen one (five in all where the ladder allows). */
export function alternativesFor(c: CircuitCase, chosen: ChosenOutcome, window = 2): AlternativesOutcome {
  const ladder = sizeLadder(c.cable);
  const chosenIndex = ladder.findIndex((s) => sameArea(s.size.area, c.cable.size.area));
  type Row = { step: SizeStep | null };
  const rows: Row[] = ladder.map((step) => ({ step }));
  let at = chosenIndex;
  if (at < 0) {
    at = ladder.filter((s) => s.size.area < c.cable.size.area).length;
    rows.splice(at, 0, { step: null });
  } else {
    rows[at] = { step: null };
  }
  let lo = Math.max(0, at - window);
  let hi = Math.min(rows.length - 1, at + window);
  while (hi - lo < 2 * window && (lo > 0 || hi < rows.length - 1)) {
    if (lo > 0) lo--;
    else hi++;
  }
  const alternatives = rows.slice(lo, hi + 1).map((row) =>
    row.step === null ? describe(c, chosen) : describe({ ...c, cable: withSize(c.cable, row.step) }, null),
  );

  let smallestCompliantSize: string | null = null;
  let smallestWithstandingSize: string | null = null;
  // The breaking check does not depend on the size: where it fails, no size complies.
  const compliantPossible = chosen.evaluation.breaking.status !== 'fail';
  for (const row of rows) {
    const ev = row.step === null ? chosen.evaluation : evaluateCircuit({ ...c, cable: withSize(c.cable, row.step) });
    const label = row.step === null ? c.cable.size.label : row.step.size.label;
    if (smallestWithstandingSize === null && ev.energy.status === 'pass') smallestWithstandingSize = label;
    if (ev.verdict === 'pass') {
      smallestCompliantSize = label;
      break;
    }
    if (!compliantPossible && smallestWithstandingSize !== null) break;
  }
  return { alternatives, smallestCompliantSize, smallestWithstandingSize };
}
