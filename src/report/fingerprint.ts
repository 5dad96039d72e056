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

/**
 * JSON that also writes Maps, Sets, non-finite numbers and bigints distinctly (for hashing, not for
 * reading back). Otherwise the text JSON.stringify writes: own enumerable keys in their order,
 * toJSON honoured, undefined and functions left out (null in arrays). Written out by hand because
 * JSON.stringify with a replacer calls it for every value: three times slower on a 1000-circuit
 * project's results (about 13 MB of text). Plain data takes JSON.stringify itself (`plain`).
 */
export function stableJson(v: unknown): string {
  // plain data, which results and layouts are, is JSON.stringify's text as it is: written natively,
  // two to three times faster than canonical (a quarter of a second a build at 1000 circuits)
  if (typeof v === 'object' && v !== null && plain(v)) return JSON.stringify(v);
  return canonical(v) ?? 'undefined';
}

/**
 * True when JSON.stringify writes `v` as canonical does: plain objects and arrays (no toJSON) of
 * strings, finite numbers, booleans and nulls, with undefined, functions and symbols, which both
 * leave out alike.
 */
function plain(v: unknown): boolean {
  switch (typeof v) {
    case 'number':
      return Number.isFinite(v);
    case 'bigint':
      return false;
    case 'object': {
      if (v === null) return true;
      if (typeof (v as { toJSON?: unknown }).toJSON === 'function') return false;
      if (Array.isArray(v)) {
        for (let i = 0; i < v.length; i++) if (!plain(v[i])) return false;
        return true;
      }
      const proto: unknown = Object.getPrototypeOf(v);
      if (proto !== Object.prototype && proto !== null) return false; // Map, Set, Date, a class
      const o = v as Record<string, unknown>;
      for (const key of Object.keys(o)) if (!plain(o[key])) return false;
      return true;
    }
    default:
      return true;
  }
}

/** The by-hand writer alone, whatever `v` holds (the tests hold stableJson's shortcut to it). */
export function byHandJson(v: unknown): string {
  return canonical(v) ?? 'undefined';
}

const skipped = (x: unknown): boolean => x === undefined || typeof x === 'function' || typeof x === 'symbol';

function canonical(v: unknown): string | undefined {
  switch (typeof v) {
    case 'string':
      return JSON.stringify(v);
    case 'number':
      return Number.isFinite(v) ? String(v) : `"$num:${String(v)}"`;
    case 'boolean':
      return v ? 'true' : 'false';
    case 'bigint':
      return `"$big:${v.toString()}"`;
    case 'object': {
      if (v === null) return 'null';
      if (Array.isArray(v)) {
        let s = '[';
        for (let i = 0; i < v.length; i++) s += `${i > 0 ? ',' : ''}${skipped(v[i]) ? 'null' : canonical(v[i])}`;
        return `${s}]`;
      }
      if (v instanceof Map) return `{"$map":${canonical([...v.entries()])}}`;
      if (v instanceof Set) return `{"$set":${canonical([...v.values()])}}`;
      const o = v as Record<string, unknown> & { toJSON?: () => unknown };
      if (typeof o.toJSON === 'function') return canonical(o.toJSON());
      let s = '{';
      let first = true;
      for (const key of Object.keys(o)) {
        const x = o[key];
        if (skipped(x)) continue;
        s += `${first ? '' : ','}${JSON.stringify(key)}:${canonical(x)}`;
        first = false;
      }
      return `${s}}`;
    }
    default:
      return undefined; // undefined, functions, symbols: left out by the caller, as JSON does
  }
}
