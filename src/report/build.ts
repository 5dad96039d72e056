// `faultsheet build`: plan every output name, render the sheets, the summary and the dossier into a
// staging folder beside OUT, write results.json, then swap the folder into place (src/io/write.ts).
// Any failure before the swap leaves OUT exactly as it was.

import path from 'node:path';
import type { Project } from '../model/types.js';
import type { ProjectResult } from '../calc/types.js';
import { openStaging } from '../io/write.js';
import { mergeDossier, pageCount } from './dossier.js';
import { childCount, renderSheetsInChildren } from './parallel.js';
import { DOSSIER_FILE, RESULTS_FILE, SUMMARY_FILE, planOutputs } from './plan.js';
import { defaultRenderer, type Renderer } from './render.js';
import { projectDate } from './sheet.js';
import { projectTemplates, renderSheet } from './sheets.js';
import { summaryDocument } from './summary.js';
import { unmark } from './typeset.js';

export { OutputPlanError, sheetFileName, planOutputs } from './plan.js';
export { OutputDirError } from '../io/write.js';
export { TemplateError } from './templates.js';
export { projectTemplates, renderSheet } from './sheets.js';

export interface BuildOptions {
  onProgress?: (done: number, total: number, circuitId: string) => void;
  /** Sheet processes to render with; default: as many as the machine has cores (up to 4), 0 or 1: none. */
  jobs?: number;
  /** For tests: a renderer to use instead of the shared one (always renders in process). */
  renderer?: Renderer;
}

interface Sheet {
  bytes: Buffer;
  title: string;
  pages: number;
  file: string;
}

/** Write the dossier of `project` into `outDir`; returns the paths written (OUT joined with each name). */
export async function buildDossier(
  project: Project,
  result: ProjectResult,
  resultsJson: unknown,
  outDir: string,
  opts: BuildOptions = {},
): Promise<{ files: string[] }> {
  const plan = planOutputs(project, result); // collisions fail here, before anything is written
  const templates = projectTemplates(project);
  templates.check(); // a project template that does not compile fails here, before anything is written
  const renderer = opts.renderer ?? defaultRenderer();
  const staging = await openStaging(outDir);
  try {
    const total = result.circuits.length;
    // Only the bytes are kept: a hundred parsed documents held in memory slow every later sheet.
    const sheets: Sheet[] = new Array(total);
    let done = 0;
    const accept = async (i: number, bytes: Buffer): Promise<void> => {
      const cr = result.circuits[i];
      await staging.write(plan.sheets[i].file, bytes);
      sheets[i] = { bytes, title: cr.description ? `${unmark(cr.id)} — ${unmark(cr.description)}` : unmark(cr.id), pages: await pageCount(bytes), file: plan.sheets[i].file };
      opts.onProgress?.(++done, total, cr.id);
    };
    const children = opts.renderer ? 0 : childCount(total, opts.jobs);
    if (children > 0) await renderSheetsInChildren(project, result, templates, children, accept);
    else for (let i = 0; i < total; i++) await accept(i, await renderSheet(project, result, i, templates, renderer));

    // The summary's index gives each sheet's first page in the dossier, which depends on the
    // summary's own length: lay it out until the page count it assumed is the one it has.
    const labels = templates.labels('summary/labels.hbs');
    let summaryPages = 1;
    let summary: Buffer | null = null;
    for (let attempt = 0; attempt < 4 && !summary; attempt++) {
      const firstPage = new Map<string, number>();
      let next = summaryPages + 1;
      result.circuits.forEach((c, i) => {
        firstPage.set(c.id, next);
        next += sheets[i].pages;
      });
      const bytes = await renderer.pdf(summaryDocument(project, result, { templates, dossierPages: firstPage }));
      const pages = await pageCount(bytes);
      if (pages === summaryPages) summary = bytes;
      else summaryPages = pages;
    }
    if (!summary) throw new Error('internal error: the summary page count does not settle');
    await staging.write(SUMMARY_FILE, summary);

    const dossier = await mergeDossier({ bytes: summary, title: labels['dossier.summary'] }, sheets, {
      title: `${unmark(project.meta.name)} — ${labels['cover.kicker']}`,
      subject: labels['info.subject'],
      date: projectDate(project.meta.date),
      summaryTitle: labels['dossier.summary'],
      sheetsTitle: labels['dossier.sheets'],
      pageLabel: labels['dossier.page'],
    });
    await staging.write(DOSSIER_FILE, dossier);
    await staging.write(RESULTS_FILE, JSON.stringify(resultsJson, null, 2) + '\n');
    await staging.commit();
  } catch (err) {
    await staging.discard();
    throw err;
  }
  return { files: plan.files.map((f) => path.join(outDir, f)) };
}
