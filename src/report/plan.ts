// Output planning: every file name of a build is decided before anything is written, and two
// outputs that would land on one file (on any filesystem, so compared without case) are an error.

import type { Project } from '../model/types.js';
import type { ProjectResult } from '../calc/types.js';

export const SUMMARY_FILE = 'summary.pdf';
export const DOSSIER_FILE = 'dossier.pdf';
export const RESULTS_FILE = 'results.json';

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

/** `<circuit id>.pdf` with characters outside [A-Za-z0-9._-] replaced by `_` (FORMAT.md section 4). */
export function sheetFileName(circuitId: string): string {
  return `${circuitId.replace(/[^A-Za-z0-9._-]/g, '_')}.pdf`;
}

export function planOutputs(project: Project, result: ProjectResult): OutputPlan {
  const where = (id: string): string => {
    const c = project.circuits.find((x) => x.id === id);
    return c ? ` (${c.pos.file}:${c.pos.line}:${c.pos.col})` : '';
  };
  const owners = new Map<string, string[]>(); // lower-case file name -> descriptions
  const claim = (file: string, who: string): void => {
    const key = file.toLowerCase();
    owners.set(key, [...(owners.get(key) ?? []), who]);
  };
  claim(SUMMARY_FILE, 'the project summary');
  claim(DOSSIER_FILE, 'the dossier');
  const sheets = result.circuits.map((c) => {
    const file = sheetFileName(c.id);
    claim(file, `circuit "${c.id}"${where(c.id)}`);
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
