// The words of every input problem, decided here and only here: the rest of the loader says
// which problem it found and where (a code and its data), this module says it to the author.

import type { Issue, Severity } from './issues.js';

export interface ProblemLocation {
  file: string;
  line: number;
  col: number;
  path: string;
}

/** What a problem is about; which keys a code uses is listed beside it in MESSAGES. */
export interface ProblemData {
  actual?: string; // the value as written
  expected?: string; // what the field wants, in words
  detail?: string; // a parser's own words, a unit, a sub-reason
  key?: string; // a field name
  suggestion?: string; // a near spelling of `key` / `actual`
  allowed?: readonly string[];
  fields?: readonly string[];
  id?: string;
  kind?: string; // "device", "circuit", "supply"
  other?: string; // "file:line:col" of the other occurrence
  list?: readonly string[];
  limit?: number;
  index?: number;
}

const entries = (count: string | undefined): string => `${count} ${count === '1' ? 'entry' : 'entries'}`;

type Wording = (d: ProblemData) => { message: string; expected?: string };

const quote = (text: string | undefined): string => JSON.stringify(text ?? '');
const didYouMean = (s: string | undefined): string => (s === undefined ? '' : ` (did you mean ${quote(s)}?)`);
const oneOf = (values: readonly string[] | undefined): string =>
  values === undefined || values.length === 0 ? '' : values.length === 1 ? quote(values[0]) : `one of ${values.map(quote).join(', ')}`;

const MESSAGES = {
  // files
  'missing-file': (d) => ({ message: `file not found${d.detail ? `: ${d.detail}` : ''}`, expected: d.expected }),
  'read-error': (d) => ({ message: `cannot be read: ${d.detail ?? 'unknown error'}` }),
  'invalid-encoding': () => ({ message: 'is not valid UTF-8 text', expected: 'a UTF-8 encoded YAML file' }),
  'ignored-file': (d) => ({ message: `is not read (only *.yaml files are)${d.detail ? `: ${d.detail}` : ''}` }),
  'yaml-syntax': (d) => ({
    message: `YAML syntax error: ${d.detail ?? ''}`,
    expected: 'valid YAML: "key: value" pairs, the keys of one mapping indented alike, quotes around text that holds ": "',
  }),
  'yaml-warning': (d) => ({ message: `YAML: ${d.detail ?? ''}` }),
  'yaml-alias-limit': (d) => ({
    message: `YAML ${d.detail ?? 'aliases expand too far'} (refused, to protect against runaway expansion)`,
    expected: d.detail?.startsWith('collections') ? 'fewer levels of lists and mappings' : 'the values written out, or fewer aliases',
  }),
  'empty-file': (d) => ({ message: 'the file is empty', expected: d.expected }),
  'not-a-mapping': (d) => ({ message: `holds ${d.detail}, not a mapping`, expected: d.expected }),

  // fields
  'unknown-field': (d) => ({ message: `unknown field ${quote(d.key)}${didYouMean(d.suggestion)}`, expected: d.allowed ? `a field among ${d.allowed.join(', ')}` : undefined }),
  'missing-field': (d) => ({ message: `required field ${quote(d.key)} is missing`, expected: d.expected }),
  'wrong-type': (d) => ({ message: `${d.detail ?? quote(d.actual)} is not accepted here`, expected: d.expected }),
  'empty-value': (d) => ({ message: 'has no value', expected: d.expected }),
  'invalid-value': (d) => ({ message: `${quote(d.actual)} is not an accepted value${didYouMean(d.suggestion)}`, expected: oneOf(d.allowed) }),
  'empty-text': () => ({ message: 'is empty', expected: 'some text' }),
  'invalid-date': (d) => ({ message: `${quote(d.actual)} is not a calendar date`, expected: 'a date written YYYY-MM-DD, such as 2026-11-20' }),
  'not-a-number': (d) => ({ message: `${quote(d.actual)} does not start with a number`, expected: d.expected }),
  'missing-unit': (d) => ({ message: `${quote(d.actual)} has no unit`, expected: d.expected }),
  'unknown-unit': (d) => ({ message: `${quote(d.actual)}: the unit ${quote(d.detail)} is not known`, expected: d.expected }),
  'wrong-dimension': (d) => ({ message: `${quote(d.actual)} has a unit of the wrong kind (${quote(d.detail)})`, expected: d.expected }),
  'unknown-size': (d) => ({ message: `${quote(d.actual)} is not a known AWG or kcmil size`, expected: 'a size such as "14 AWG", "2/0 AWG" or "250 kcmil"' }),
  'not-positive': (d) => ({ message: `${quote(d.actual)} must be greater than zero`, expected: d.expected }),
  'negative': (d) => ({ message: `${quote(d.actual)} must not be negative`, expected: d.expected }),
  'out-of-range': (d) => ({ message: `${quote(d.actual)} is out of range`, expected: d.expected }),
  'not-integer': (d) => ({ message: `${quote(d.actual)} is not a whole number`, expected: d.expected ?? 'a whole number' }),
  'too-few': (d) => ({ message: `has ${entries(d.actual)}`, expected: `at least ${d.limit}` }),
  'too-many': (d) => ({ message: `has ${entries(d.actual)}`, expected: `at most ${d.limit}` }),
  'conflicting-fields': (d) => ({ message: `${(d.fields ?? []).map(quote).join(' and ')} are both given`, expected: `only one of them` }),
  'missing-alternative': (d) => ({ message: `none of ${(d.fields ?? []).map(quote).join(', ')} is given`, expected: `one of them` }),
  'inconsistent-values': (d) => ({ message: d.detail ?? 'values do not agree', expected: d.expected }),

  // curves
  'curve-current-not-increasing': (d) => ({
    message: `point ${(d.index ?? 0) + 1}: current ${d.actual} is not greater than the previous point's ${d.detail}`,
    expected: 'currents strictly increasing from point to point',
  }),
  'curve-time-increasing': (d) => ({
    message: `point ${(d.index ?? 0) + 1}: time ${d.actual} is longer than the previous point's ${d.detail}`,
    expected: 'clearing times that do not increase as the current increases',
  }),
  'curve-energy-decreasing': (d) => ({
    message: `point ${(d.index ?? 0) + 1}: energy ${d.actual} is less than the previous point's ${d.detail}`,
    expected: 'let-through energies that do not decrease as the current increases',
  }),

  // devices and cables
  'no-timing-data': (d) => ({
    message: `device ${quote(d.id)} has no timing data`,
    expected: 'at least one of "clearing_time", "trip_curve", "let_through"',
  }),
  'no-resistance': (d) => ({
    message: `${d.detail} has no tabulated resistance in ${d.other} and no "resistance" is given`,
    expected: `a "resistance" field (at 20 degC, such as "0.193 ohm/km") or a tabulated size`,
  }),

  // the project as a whole
  'no-supplies': () => ({ message: 'no supply is given', expected: 'at least one supply (a transformer or an LV service)' }),
  'duplicate-id': (d) => ({
    message: `${d.kind} id ${quote(d.id)} is already used by a ${d.detail ?? d.kind} at ${d.other}`,
    expected: 'ids unique across the project',
  }),
  'unknown-device': (d) => ({
    message: `device ${quote(d.id)} is not defined in devices/${didYouMean(d.suggestion)}`,
    expected: 'the id of a device in devices/*.yaml',
  }),
  'unknown-board': (d) => ({
    message: `board ${quote(d.id)} is not fed by any supply or circuit${didYouMean(d.suggestion)}`,
    expected: 'a board that a supply "feeds" or that a circuit has as "to"',
  }),
  'board-fed-twice': (d) => ({
    message: `board ${quote(d.id)} is fed twice: here and by ${d.detail} at ${d.other}`,
    expected: 'each board fed by one supply or one circuit',
  }),
  'unreachable-board': (d) => ({
    message: `board ${quote(d.id)} is not reached from any supply (${(d.list ?? []).join(' <- ')})`,
    expected: 'a chain of circuits from a supply to every board',
  }),
  'loop': (d) => ({
    message: `circuits form a loop: ${(d.list ?? []).join(', ')}`,
    expected: 'boards fed in a tree from the supplies',
  }),
  'self-loop': (d) => ({
    message: `circuit ${quote(d.id)} feeds the board it comes from (${quote(d.detail)})`,
    expected: 'a "to" board different from "from"',
  }),
} satisfies Record<string, Wording>;

export type ProblemCode = keyof typeof MESSAGES;

export function problem(code: ProblemCode, at: ProblemLocation, data: ProblemData, severity: Severity = 'error'): Issue {
  const wording = (MESSAGES[code] as Wording)(data);
  const issue: Issue = { code, severity, file: at.file, line: at.line, col: at.col, path: at.path, message: wording.message };
  if (wording.expected !== undefined && wording.expected !== '') issue.expected = wording.expected;
  if (data.actual !== undefined) issue.actual = data.actual;
  return issue;
}

/** The closest of `candidates` to `word` by edit distance, if it is close enough to be a typo. */
export function nearest(word: string, candidates: readonly string[]): string | undefined {
  const tolerance = Math.max(1, Math.floor(word.length / 3));
  const lower = word.toLowerCase();
  let best: string | undefined;
  let bestDistance = tolerance + 1;
  for (const candidate of candidates) {
    if (Math.abs(candidate.length - word.length) >= bestDistance) continue; // at least that many edits
    const distance = editDistance(lower, candidate.toLowerCase(), bestDistance - 1);
    if (distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  return best;
}

/**
 * `nearest` over one list of candidates, remembered per word, for the project-wide checks where every
 * circuit may name an unknown board: after `budget` distinct words no more are looked up (each lookup
 * is a pass over the whole list), so that thousands of unknown names stay linear.
 */
export function suggester(candidates: readonly string[], budget = 200): (word: string) => string | undefined {
  const known = new Map<string, string | undefined>();
  return (word) => {
    if (known.has(word)) return known.get(word);
    if (known.size >= budget) return undefined;
    const found = nearest(word, candidates);
    known.set(word, found);
    return found;
  };
}

/**
 * Optimal string alignment distance (insertions, deletions, substitutions, adjacent swaps); any value
 * above `limit` is returned as `limit + 1` as soon as no alignment can stay within it.
 */
function editDistance(a: string, b: string, limit: number): number {
  let before = new Array<number>(b.length + 1).fill(0); // row i - 2
  let previous = Array.from({ length: b.length + 1 }, (_, j) => j); // row i - 1
  let current = new Array<number>(b.length + 1).fill(0);
  for (let i = 1; i <= a.length; i++) {
    current[0] = i;
    let rowMin = i;
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let best = Math.min(previous[j]! + 1, current[j - 1]! + 1, previous[j - 1]! + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) best = Math.min(best, before[j - 2]! + 1);
      current[j] = best;
      if (best < rowMin) rowMin = best;
    }
    if (rowMin > limit) return limit + 1;
    [before, previous, current] = [previous, current, before];
  }
  return Math.min(previous[b.length]!, limit + 1);
}
