// The fingerprint of what one sheet is computed from: its circuit's input and result (the result
// carries every upstream fault level, so an upstream edit changes it), its device and supply, and
// the project's header, settings, defaults, assumptions and sign-off. The sheet prints it in its
// title block ("Sheet inputs") and its sign-off, and the build cache keys the sheet on it, so a sheet
// kept from an earlier build never shows a fingerprint other than its own. The whole project's
// input hash (every file) is on the summary's cover and in results.json.

import { createHash } from 'node:crypto';
import type { Project } from '../model/types.js';
import type { CircuitResult } from '../calc/types.js';

/** The project's part of every sheet's fingerprint, hashed once per project object. */
const projectParts = new WeakMap<Project, string>();

function projectPart(project: Project): string {
  let h = projectParts.get(project);
  if (h === undefined) {
    h = createHash('sha256')
      .update(stableJson({ meta: project.meta, settings: project.settings, signoff: project.signoff, assumptions: project.assumptions, defaults: project.defaults }))
      .digest('hex');
    projectParts.set(project, h);
  }
  return h;
}

export function sheetInputHash(project: Project, cr: CircuitResult): string {
  // the chart series are sampled from the rest of the result (a lazy getter in the solver's result,
  // plain data in a worker's copy): leave them out, so the hash is the same in every thread
  // (copied key by key: destructuring would read the getter, which samples the series). The
  // alternatives' threshold and maximum lengths are left out the same way: searched lazily from the
  // alternative's size, this circuit's input and its origin's fault levels, all of which are in.
  const result = omit(cr, ['charts']);
  if (Array.isArray(result.alternatives)) result.alternatives = result.alternatives.map((a: object) => omit(a, ['thresholdLength', 'maxLength']));
  const circuit = project.circuits.find((c) => c.id === cr.id);
  const device = project.devices.find((d) => d.id === cr.device);
  const supply = project.supplies.find((s) => s.id === cr.supply);
  return createHash('sha256')
    .update(projectPart(project))
    .update(stableJson({ circuit, device, supply, supplyIndex: supply ? project.supplies.indexOf(supply) : -1, result }))
    .digest('hex');
}

/** The own enumerable properties of `o` but `keys`, without reading those (they may be lazy getters). */
function omit(o: object, keys: string[]): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(o)) if (!keys.includes(key)) out[key] = (o as Record<string, unknown>)[key];
  return out;
}

/** JSON that also writes Maps, Sets and non-finite numbers distinctly (for hashing, not for reading back). */
export function stableJson(v: unknown): string {
  return JSON.stringify(v, (_k, x: unknown) => {
    if (x instanceof Map) return { $map: [...x.entries()] };
    if (x instanceof Set) return { $set: [...x.values()] };
    if (typeof x === 'number' && !Number.isFinite(x)) return `$num:${String(x)}`;
    if (typeof x === 'bigint') return `$big:${x.toString()}`;
    return x;
  });
}
