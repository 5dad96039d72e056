// Output planning: every file name of a build is decided before anything is written, and two
// outputs that would land on one file (on any filesystem, so compared without case) are an error.
//
// A circuit id is free text (any non-empty string the YAML can hold), so its file name is made
// safe here, as a function of the id alone (the summary links a sheet by the same function):
//   1. every character outside [A-Za-z0-9._-] becomes "_" (FORMAT.md section 4): "/", "\", NUL,
//      control characters, spaces, ":" and every non-ASCII character. No separator survives, so no
//      name can leave OUT, and every name matches the file names src/io/write.ts recognises.
//   2. leading dots become "_" (no hidden file, never "." or ".."), and so do trailing dots
//      ("A." is "A_.pdf", not "A..pdf").
//   3. a Windows device name (CON, PRN, AUX, NUL, COM0-9, LPT0-9, any case) as the part before the
//      first dot gets a "_" after it: "con" is "con_.pdf", "NUL.1" is "NUL_.1.pdf".
//   4. a name longer than MAX_FILE_NAME bytes is cut, and "-" and the first 10 hex digits of the
//      SHA-256 of the id (UTF-8) are appended, so cut names stay distinct and the same id always
//      gives the same name.
// Ids that needed replacements get no hash: the rule of FORMAT.md stays as written ("DB 1" is
// DB_1.pdf), and ids that differ only in replaced characters ("Щит-1", "Пульт-1", or "DB 1" and
// "DB/1") collide. Such a collision is reported, naming both circuits, before anything is written.

import { createHash } from 'node:crypto';
import type { Project } from '../model/types.js';
import type { ProjectResult } from '../calc/types.js';

export const SUMMARY_FILE = 'summary.pdf';
export const DOSSIER_FILE = 'dossier.pdf';
export const RESULTS_FILE = 'results.json';

/** The longest file name written, in bytes (the limit of ext4, NTFS, APFS and most others). */
export const MAX_FILE_NAME = 255;
const EXTENSION = '.pdf';
const HASH_DIGITS = 10;

/** Two outputs map to one file name: a user error, reported before anything is written. */
export class OutputPlanError extends Error {
  constructor(readonly problems: string[]) {
    super(problems.join('\n'));
    this.name = 'OutputPlanError';
  }
}

export interface PlannedSheet {
  circuitId: string;
  file: string;
}

export interface OutputPlan {
  sheets: PlannedSheet[]; // in the result's circuit order
  files: string[]; // every file of the build: sheets, summary.pdf, dossier.pdf, results.json
}

/** Device names Windows reserves, with any extension and in any case. */
const RESERVED = /^(?:CON|PRN|AUX|NUL|COM[0-9]|LPT[0-9])$/i;

function safeStem(stem: string): string {
  let s = stem.replace(/^\.+/, (dots) => '_'.repeat(dots.length)).replace(/\.+$/, (dots) => '_'.repeat(dots.length));
  const firstDot = s.indexOf('.');
  const head = firstDot < 0 ? s : s.slice(0, firstDot);
  if (RESERVED.test(head)) s = `${head}_${s.slice(head.length)}`;
  return s;
}

/**
 * The sheet's file name: `<circuit id>.pdf` with characters outside [A-Za-z0-9._-] replaced by `_`
 * (FORMAT.md section 4), made safe on every filesystem (see the rules at the top of this file).
 */
export function sheetFileName(circuitId: string): string {
  // code units, not code points: an astral character is two "_" (as it always was)
  let stem = safeStem(circuitId.replace(/[^A-Za-z0-9._-]/g, '_'));
  if (stem.length + EXTENSION.length > MAX_FILE_NAME) {
    const hash = createHash('sha256').update(circuitId, 'utf8').digest('hex').slice(0, HASH_DIGITS);
    stem = `${safeStem(stem.slice(0, MAX_FILE_NAME - EXTENSION.length - HASH_DIGITS - 1))}-${hash}`;
  }
  return `${stem}${EXTENSION}`;
}

/** An id as a message shows it: quoted, with control and direction-changing characters escaped. */
export function quotedId(id: string): string {
  const escaped = id.replace(/[\\"\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g, (ch) =>
    ch === '\\' || ch === '"' ? `\\${ch}` : `\\u${ch.charCodeAt(0).toString(16).padStart(4, '0')}`,
  );
  const shown = escaped.length > 80 ? `${escaped.slice(0, 60)}…${escaped.slice(-12)} (${[...id].length} characters)` : escaped;
  return `"${shown}"`;
}

export function planOutputs(project: Project, result: ProjectResult): OutputPlan {
  const positions = new Map<string, string>();
  for (const c of project.circuits) if (!positions.has(c.id)) positions.set(c.id, ` (${c.pos.file}:${c.pos.line}:${c.pos.col})`);
  const owners = new Map<string, string[]>(); // lower-case file name -> descriptions
  const claim = (file: string, who: string): void => {
    const key = file.toLowerCase();
    owners.set(key, [...(owners.get(key) ?? []), who]);
  };
  claim(SUMMARY_FILE, 'the project summary');
  claim(DOSSIER_FILE, 'the dossier');
  const sheets = result.circuits.map((c) => {
    const file = sheetFileName(c.id);
    claim(file, `circuit ${quotedId(c.id)}${positions.get(c.id) ?? ''}`);
    return { circuitId: c.id, file };
  });
  const problems: string[] = [];
  for (const [file, who] of [...owners.entries()].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))) {
    if (who.length < 2) continue;
    const names = who.length === 2 ? `${who[0]} and ${who[1]}` : `${who.slice(0, -1).join(', ')} and ${who[who.length - 1]}`;
    problems.push(
      `output: ${names} would ${who.length === 2 ? 'both' : 'all'} be written as ${sheets.find((s) => s.file.toLowerCase() === file)?.file ?? file}; ` +
        'give the circuits ids that still differ after characters outside [A-Za-z0-9._-] become "_" (file names are compared ignoring case)',
    );
  }
  if (problems.length) throw new OutputPlanError(problems);
  return { sheets, files: [...sheets.map((s) => s.file), SUMMARY_FILE, DOSSIER_FILE, RESULTS_FILE] };
}
