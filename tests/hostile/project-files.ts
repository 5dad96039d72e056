// Project folders for the hostile-input tests: a small valid project as a map of files, written
// to disk, and a snapshot of a folder tree to see what a command created or changed. The project
// (site, ratings, lengths) is invented; the device data are illustrative, no maker's.

import { createHash } from 'node:crypto';
import { lstatSync, mkdirSync, readFileSync, readdirSync, readlinkSync, writeFileSync } from 'node:fs';
import path from 'node:path';

/** Relative path -> content; a `null` content makes an empty folder. */
export type Tree = Record<string, string | Uint8Array | null>;

export function projectYaml(opts: { settings?: string; supplies?: string; name?: string } = {}): string {
  return `project:
  name: ${opts.name ?? '"Brackenholt Depot, LV distribution"'}
  number: BHD-0042
  revision: A
  date: 2026-05-04
settings:
${
  opts.settings ??
  `  system_voltage: 400 V
  frequency: 50 Hz
  earthing: TN-S
  voltage_factor_max: 1.05
  voltage_factor_min: 0.95
  min_fault_conductor_temperature: final
  withstand_criterion: any-point`
}
supplies:
${
  opts.supplies ??
  `  - id: TX1
    feeds: MSB
    network:
      voltage: 11 kV
      fault_level: 200 MVA
      fault_level_min: 120 MVA
      x_over_r: 10
      voltage_factor: 1.10
    transformer:
      rating: 630 kVA
      primary_voltage: 11 kV
      secondary_voltage: 400 V
      impedance: 5 %
      load_losses: 7.5 kW
      vector_group: Dyn11
      zero_sequence_ratio: 1.0`
}
assumptions:
  - Motor contribution is neglected (invented test project).
signoff:
  prepared_by: { name: P. Quennell, role: Design engineer }
  checked_by: { name: R. Ashdown, role: Checking engineer }
  approved_by: { name: T. Wyvern, role: Engineer responsible }
`;
}

export function deviceYaml(opts: { rating?: string; breaking?: string; tripPoints?: string; letThrough?: string | null; id?: string } = {}): string {
  const lt =
    opts.letThrough === null
      ? ''
      : `
    let_through:
      current_unit: kA
      energy_unit: A^2 s
      points: ${opts.letThrough ?? '[[2, 2.0e4], [5, 5.5e4], [10, 9.0e4], [20, 1.5e5], [36, 2.0e5]]'}`;
  return `  - id: ${opts.id ?? 'MCCB-100'}
    kind: mccb
    description: Moulded-case breaker 100 A (illustrative data, not any maker's)
    illustrative: true
    rating: ${opts.rating ?? '100 A'}
    breaking_capacity: ${opts.breaking ?? '36 kA'}
    instantaneous:
      pickup: 10 x In
      clearing_time: 10 ms
    trip_curve:
      current_unit: x In
      time_unit: s
      points: ${opts.tripPoints ?? '[[1.3, 3600], [2, 300], [3, 80], [5, 25], [8, 10], [10, 7]]'}${lt}
`;
}

export function circuitYaml(opts: { id?: string; device?: string; length?: string; size?: string; load?: string | null; extra?: string } = {}): string {
  const load = opts.load === null ? '' : `load: ${opts.load ?? '{ current: 63 A, power_factor: 0.9 }'}\n`;
  return `id: ${opts.id ?? 'MSB-Q1'}
description: Final circuit to the workshop
from: MSB
device: ${opts.device ?? 'MCCB-100'}
${load}cable:
  conductor: copper
  insulation: XLPE
  size: ${opts.size ?? '25 mm2'}
  parallel: 1
  length: ${opts.length ?? '30 m'}
${opts.extra ?? ''}`;
}

/** The valid project every hostile folder starts from: one supply, one device, one circuit. */
export function baseProject(): Tree {
  return {
    'project.yaml': projectYaml(),
    'devices/devices.yaml': `devices:\n${deviceYaml()}`,
    'circuits/MSB-Q1.yaml': circuitYaml(),
  };
}

export function writeTree(dir: string, tree: Tree): void {
  for (const [rel, content] of Object.entries(tree)) {
    const target = path.join(dir, rel);
    if (content === null) {
      mkdirSync(target, { recursive: true });
      continue;
    }
    mkdirSync(path.dirname(target), { recursive: true });
    writeFileSync(target, content);
  }
}

/** Every entry below `dir` (links not followed): relative path -> kind and content hash. */
export function snapshot(dir: string): Map<string, string> {
  const out = new Map<string, string>();
  const walk = (rel: string): void => {
    const abs = rel ? path.join(dir, rel) : dir;
    const st = lstatSync(abs);
    if (st.isSymbolicLink()) out.set(rel, `link ${readlinkSync(abs)}`);
    else if (st.isDirectory()) {
      if (rel) out.set(rel, 'dir');
      for (const name of readdirSync(abs).sort()) walk(rel ? `${rel}/${name}` : name);
    } else if (st.isFile()) out.set(rel, `file ${createHash('sha256').update(readFileSync(abs)).digest('hex')}`);
    else out.set(rel, 'other');
  };
  walk('');
  return out;
}

/** The entries added, removed or changed between two snapshots. */
export function changes(before: Map<string, string>, after: Map<string, string>): string[] {
  const out: string[] = [];
  for (const [k, v] of after) if (before.get(k) !== v) out.push(before.has(k) ? `changed ${k}` : `added ${k}`);
  for (const k of before.keys()) if (!after.has(k)) out.push(`removed ${k}`);
  return out.sort();
}
