// The pipeline the CLI runs, on project files held in memory: load (buildProject), solve, the results
// document. Used by the hostile-input tests to check behaviour (never engineering numbers): any input
// gives either user errors in the `file:line:col field: ...` form or a result of finite numbers.

import path from 'node:path';
import { readProjectFolder, type InputFile, type ProjectFolder } from '../../src/io/read.js';
import { formatIssue, type Issue } from '../../src/model/issues.js';
import { buildProject } from '../../src/model/load.js';
import { loadUnitLibrary } from '../../src/model/units.js';
import { solveProject } from '../../src/calc/solve.js';
import { resultsDocument } from '../../src/calc/results-json.js';

export interface TextFile {
  path: string;
  text: string;
}

// loadProject loads mathjs's units the first time a project writes a unit our own reader does not
// know, and reads the project again; buildProject is synchronous, so the pipeline here has them loaded.
await loadUnitLibrary();

const decoder = new TextDecoder();
const encoder = new TextEncoder();

/** A project folder's input files as text (read once, mutated in memory afterwards). */
export async function readTextFiles(dir: string): Promise<TextFile[]> {
  const folder = await readProjectFolder(path.resolve(dir));
  if (folder.problems.length > 0) throw new Error(`${dir}: ${JSON.stringify(folder.problems)}`);
  return folder.files.map((f) => ({ path: f.path, text: decoder.decode(f.bytes) }));
}

export function folderOf(files: readonly TextFile[]): ProjectFolder {
  const inputs: InputFile[] = files.map((f) => ({ path: f.path, bytes: encoder.encode(f.text) }));
  return { dir: '/in-memory/project', files: inputs, problems: [] };
}

export type Outcome =
  | { kind: 'issues'; issues: Issue[] }
  | { kind: 'result'; document: unknown; warnings: Issue[]; lazy: unknown[] };

/**
 * Load, solve and build the results document, as `faultsheet solve --json` does. With `lazy`, also the
 * values the report reads on demand (chart series, impedance build-ups, the alternatives' lengths).
 */
export function runPipeline(files: readonly TextFile[], options: { lazy?: boolean } = {}): Outcome {
  const outcome = buildProject(folderOf(files));
  if (!outcome.ok) return { kind: 'issues', issues: outcome.issues };
  const result = solveProject(outcome.project);
  const document = resultsDocument(outcome.project, result);
  const lazy: unknown[] = [];
  if (options.lazy) {
    for (const c of result.circuits) {
      lazy.push(c.charts, c.buildUpMax, c.buildUpMin, c.quantities);
      for (const a of c.alternatives) lazy.push({ threshold: a.thresholdLength, max: a.maxLength });
    }
    for (const b of result.boards) lazy.push(b.buildUpMax, b.buildUpMin);
  }
  return { kind: 'result', document: JSON.parse(JSON.stringify(document, guard)), warnings: outcome.warnings, lazy };
}

/** JSON.stringify would print NaN and Infinity as null: refuse them before that happens. */
function guard(key: string, value: unknown): unknown {
  if (typeof value === 'number' && !Number.isFinite(value)) throw new Error(`non-finite number ${value} at "${key}"`);
  return value;
}

/** Every place in a value that is not plain JSON data of finite numbers: NaN, Infinity, undefined, functions. */
export function nonFinite(value: unknown, at = '$', out: string[] = [], seen = new Set<unknown>()): string[] {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) out.push(`${at} = ${value}`);
  } else if (value === undefined) {
    out.push(`${at} is undefined`);
  } else if (typeof value === 'function' || typeof value === 'symbol' || typeof value === 'bigint') {
    out.push(`${at} is a ${typeof value}`);
  } else if (value !== null && typeof value === 'object') {
    if (seen.has(value)) return out;
    seen.add(value);
    if (Array.isArray(value)) value.forEach((v, i) => nonFinite(v, `${at}[${i}]`, out, seen));
    else for (const [k, v] of Object.entries(value)) nonFinite(v, `${at}.${k}`, out, seen);
  }
  return out;
}

/**
 * What is wrong with an issue as the user would see it: a position inside one of the input files, and
 * the `file:line:col field: message` form (`(top level)` for a whole-file error; a warning about the
 * whole file prints `file:line:col warning: message`). No `undefined`, `NaN` or `[object` in the words.
 */
export function issueProblems(issue: Issue, files: readonly TextFile[]): string[] {
  const problems: string[] = [];
  const text = formatIssue(issue);
  const file = files.find((f) => f.path === issue.file);
  if (file === undefined) problems.push(`names a file that is not an input: ${issue.file}`);
  const lines = file ? file.text.split('\n').length : 0;
  if (!(issue.line >= 1 && issue.line <= lines + 1)) problems.push(`line ${issue.line} outside 1..${lines + 1}`);
  if (!(issue.col >= 1)) problems.push(`column ${issue.col}`);
  const location = `${issue.file}:${issue.line}:${issue.col}`;
  const field = issue.path !== '' ? `${issue.path}:` : issue.severity === 'warning' ? '' : '(top level):';
  const head = `${location}${issue.severity === 'warning' ? ' warning:' : ''}${field === '' ? '' : ` ${field}`} `;
  if (!text.startsWith(head)) problems.push(`not of the form "${head}..."`);
  if (issue.message.trim() === '') problems.push('empty message');
  for (const bad of ['undefined', 'NaN', '[object', 'Infinity']) {
    if (text.includes(bad) && !files.some((f) => f.text.includes(bad))) problems.push(`says "${bad}"`);
  }
  return problems.map((p) => `${text}\n    -> ${p}`);
}

/** Working text of the sheets that shows a broken number (NaN, Infinity, undefined) not written in the input. */
export function badWords(value: unknown, files: readonly TextFile[]): string[] {
  const words = ['NaN', 'Infinity', 'undefined', '[object'].filter((w) => !files.some((f) => f.text.includes(w)));
  const out: string[] = [];
  const walk = (v: unknown, seen: Set<unknown>): void => {
    if (typeof v === 'string') {
      for (const w of words) if (v.includes(w)) out.push(`report text says "${w}": ${v.slice(0, 200)}`);
    } else if (v !== null && typeof v === 'object' && !seen.has(v)) {
      seen.add(v);
      for (const child of Array.isArray(v) ? v : Object.values(v)) walk(child, seen);
    }
  };
  walk(value, new Set());
  return out;
}

/** Everything wrong with an outcome; empty where it is a clean result or clean user errors. */
export function outcomeProblems(outcome: Outcome, files: readonly TextFile[]): string[] {
  if (outcome.kind === 'issues') {
    const problems = outcome.issues.flatMap((i) => issueProblems(i, files));
    if (!outcome.issues.some((i) => i.severity === 'error')) problems.push('load failed without any error');
    return problems;
  }
  return [
    ...nonFinite(outcome.document, 'results'),
    ...nonFinite(outcome.lazy, 'report values'),
    ...badWords(outcome.lazy, files),
    ...outcome.warnings.flatMap((i) => issueProblems(i, files)),
  ];
}
