// The results contract of FORMAT.md section 3: SI numbers under the contract's field names.

import type { Project } from '../model/types.js';
import type { ProjectResult } from './types.js';

/** 12 significant figures: enough for any check, and 35 kA prints as 35000, not 34999.99999999999. */
function tidy<T>(value: T): T {
  if (typeof value === 'number') return (Number.isFinite(value) ? Number(value.toPrecision(12)) : value) as T;
  if (Array.isArray(value)) return value.map(tidy) as T;
  if (value !== null && typeof value === 'object') {
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, tidy(v)])) as T;
  }
  return value;
}

export function resultsDocument(project: Project, result: ProjectResult) {
  return tidy({
    project: {
      name: project.meta.name,
      number: project.meta.number,
      revision: project.meta.revision,
      date: project.meta.date,
      input_sha256: project.inputSha256,
    },
    settings: {
      system_voltage_v: project.settings.systemVoltage,
      frequency_hz: project.settings.frequency,
      earthing: project.settings.earthing,
      voltage_factor_max: project.settings.voltageFactorMax,
      voltage_factor_min: project.settings.voltageFactorMin,
      withstand_criterion: project.settings.withstandCriterion,
    },
    boards: result.boards.map((b) => ({
      id: b.id,
      ik3max_a: b.ik3max,
      ip_a: b.ip,
      ik1min_a: b.ik1min,
      z_max: { r_ohm: b.zMax.r, x_ohm: b.zMax.x },
      z_loop_min: { r_ohm: b.zLoopMin.r, x_ohm: b.zLoopMin.x },
      voltage_drop_pct: b.voltageDrop,
      fed_by: b.fedBy,
      supply: b.supply,
    })),
    circuits: result.circuits.map((c) => ({
      id: c.id,
      description: c.description,
      from: c.from,
      to: c.to ?? null,
      device: c.device,
      origin: { ik3max_a: c.origin.ik3max, ip_a: c.origin.ip, ik1min_a: c.origin.ik1min },
      end: { ik3max_a: c.end.ik3max, ip_a: c.end.ip, ik1min_a: c.end.ik1min },
      k: c.k,
      withstand_a2s: c.withstand,
      let_through_a2s: c.letThrough,
      governing_current_a: c.energy.governingCurrent,
      threshold_length_m: c.thresholdLength,
      max_length_m: c.maxLength,
      voltage_drop_pct: c.voltageDrop,
      verdict: c.verdict,
      checks: c.checks.map((k) => ({ name: k.name, status: k.status, value: k.value, limit: k.limit })),
      protective_conductor: c.protectiveConductor
        ? { k: c.protectiveConductor.k, withstand_a2s: c.protectiveConductor.withstand, status: c.protectiveConductor.status }
        : null,
      smallest_compliant_size: c.smallestCompliantSize,
      alternatives: c.alternatives.map((a) => ({
        size: a.size,
        withstand_a2s: a.withstand,
        let_through_a2s: a.letThrough,
        end_ik3max_a: a.endIk3max,
        end_ik1min_a: a.endIk1min,
        verdict: a.verdict,
        chosen: a.chosen,
      })),
    })),
  });
}

export type ResultsDocument = ReturnType<typeof resultsDocument>;
