// `faultsheet build`: plan every output name, render the sheets that changed since the last build
// (the others are taken over from OUT, see cache.ts), then the summary and the dossier, into a
// staging folder beside OUT; write results.json and the cache manifest, then swap the folder into
// place (src/io/write.ts). Any failure or interruption before the swap leaves OUT exactly as it was.

import path from 'node:path';
import type { Project } from '../model/types.js';
import type { ProjectResult } from '../calc/types.js';
import { openStaging } from '../io/write.js';
import { CACHE_DIR, MANIFEST_FILE, emptyManifest, projectFingerprint, readManifest, reusable, sheetKey, type Manifest } from './cache.js';
import { writeDossier } from './dossier.js';
import { pdfPageCount } from './pdf-file.js';
import { DOSSIER_FILE, RESULTS_FILE, SUMMARY_FILE, planOutputs } from './plan.js';
import { renderSheetsInPool, workerCount } from './pool.js';
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
  /** Called after each sheet rendered (not for sheets taken over from the previous build). */
  onProgress?: (done: number, total: number, circuitId: string) => void;
  /** Called once the build knows how many sheets it renders and how many it takes over. */
  onPlan?: (render: number, kept: number) => void;
  /** Worker threads to render with; default: one per core. 0 or 1: render in the main thread. */
  jobs?: number;
  /** Render every sheet, ignoring what the previous build left in OUT. */
  force?: boolean;
  /** Aborting stops the build; OUT is left as it was. */
  signal?: AbortSignal;
  /** For tests: a renderer to use instead of the shared one (always renders in the main thread). */
  renderer?: Renderer;
}

/** FAULTSHEET_TIMINGS=1: the time of each phase of a build on stderr (for profiling; see DEVELOPERS.md). */
function phaseClock(): (phase: string) => void {
  if (!process.env.FAULTSHEET_TIMINGS) return () => undefined;
  let last = performance.now();
  return (phase) => {
    const now = performance.now();
    process.stderr.write(`faultsheet: ${phase} ${((now - last) / 1000).toFixed(3)} s\n`);
    last = now;
  };
}

export interface BuildReport {
  files: string[]; // OUT joined with each name
  rendered: number;
  kept: number;
}

/** Write the dossier of `project` into `outDir`. */
export async function buildDossier(project: Project, result: ProjectResult, resultsJson: unknown, outDir: string, opts: BuildOptions = {}): Promise<BuildReport> {
  const clock = phaseClock();
  const plan = planOutputs(project, result); // collisions fail here, before anything is written
  const templates = projectTemplates(project);
  templates.check(); // a project template that does not compile fails here, before anything is written
  const signal = opts.signal;
  signal?.throwIfAborted();
  const staging = await openStaging(outDir);
  try {
    const total = result.circuits.length;
    const projectPrint = projectFingerprint(project, templates);
    const previous = opts.force ? null : readManifest(staging.outDir);
    const manifest: Manifest = emptyManifest();
    const pages: number[] = new Array(total);
    const toRender: number[] = [];
    const keys = result.circuits.map((cr, i) => sheetKey(projectPrint, project, cr, i, total));
    for (let i = 0; i < total; i++) {
      const file = plan.sheets[i].file;
      const kept = reusable(staging.outDir, previous, file, keys[i]);
      if (!kept) {
        toRender.push(i);
        continue;
      }
      await staging.adopt(file, path.join(staging.outDir, file));
      pages[i] = kept.pages;
      manifest.sheets[file] = kept;
    }
    clock(`plan and cache (${toRender.length} to render, ${total - toRender.length} kept)`);
    opts.onPlan?.(toRender.length, total - toRender.length);
    signal?.throwIfAborted();

    let done = 0;
    const accept = async (i: number, bytes: Uint8Array, pageCount: number): Promise<void> => {
      signal?.throwIfAborted();
      const file = plan.sheets[i].file;
      await staging.write(file, bytes);
      const st = await staging.stat(file);
      pages[i] = pageCount;
      manifest.sheets[file] = { key: keys[i], pages: pageCount, size: st.size, mtimeMs: st.mtimeMs };
      opts.onProgress?.(++done, toRender.length, result.circuits[i].id);
    };
    const threads = opts.renderer ? 0 : workerCount(toRender.length, opts.jobs);
    if (threads > 0) await renderSheetsInPool(project, result, toRender, templates, threads, (s) => accept(s.index, s.bytes, s.pages), signal);
    else {
      const renderer = opts.renderer ?? defaultRenderer();
      for (const i of toRender) {
        const bytes = await renderSheet(project, result, i, templates, renderer);
        await accept(i, bytes, pdfPageCount(bytes));
      }
    }

    clock(`sheets (${threads > 0 ? `${threads} worker threads` : 'main thread'})`);
    // The summary's index gives each sheet's first page in the dossier, which depends on the
    // summary's own length: lay it out until the page count it assumed is the one it has (the last
    // build's count is the first guess, so an unchanged length is laid out once).
    const renderer = opts.renderer ?? defaultRenderer();
    const labels = templates.labels('summary/labels.hbs');
    let summaryPages = previous?.summaryPages && previous.summaryPages >= 1 ? previous.summaryPages : 1;
    let summary: { bytes: Buffer; pages: number } | null = null;
    let summaryLayouts = 0;
    for (let attempt = 0; attempt < 4 && !summary; attempt++) {
      signal?.throwIfAborted();
      const firstPage = new Map<string, number>();
      let next = summaryPages + 1;
      result.circuits.forEach((c, i) => {
        firstPage.set(c.id, next);
        next += pages[i];
      });
      const bytes = await renderer.pdf(summaryDocument(project, result, { templates, dossierPages: firstPage }));
      summaryLayouts++;
      const got = pdfPageCount(bytes);
      if (got === summaryPages) summary = { bytes, pages: got };
      else summaryPages = got;
    }
    if (!summary) throw new Error('internal error: the summary page count does not settle');
    clock(`summary (${summaryLayouts} layout${summaryLayouts === 1 ? '' : 's'}, ${summary.pages} pages)`);
    await staging.write(SUMMARY_FILE, summary.bytes);
    manifest.summaryPages = summary.pages;
    signal?.throwIfAborted();

    writeDossier(
      staging.pathOf(DOSSIER_FILE),
      { path: staging.pathOf(SUMMARY_FILE), pages: summary.pages, title: labels['dossier.summary'] },
      result.circuits.map((cr, i) => ({
        path: staging.pathOf(plan.sheets[i].file),
        pages: pages[i],
        title: cr.description ? `${unmark(cr.id)} — ${unmark(cr.description)}` : unmark(cr.id),
        file: plan.sheets[i].file,
      })),
      {
        title: `${unmark(project.meta.name)} — ${labels['cover.kicker']}`,
        subject: labels['info.subject'],
        date: projectDate(project.meta.date),
        summaryTitle: labels['dossier.summary'],
        sheetsTitle: labels['dossier.sheets'],
        pageLabel: labels['dossier.page'],
      },
    );
    clock('dossier');
    await staging.write(RESULTS_FILE, JSON.stringify(resultsJson, null, 2) + '\n');
    await staging.write(`${CACHE_DIR}/${MANIFEST_FILE}`, JSON.stringify(manifest) + '\n');
    signal?.throwIfAborted(); // the last point at which an interruption is honoured: the swap is not split
    await staging.commit();
    clock('results, cache and swap');
    return { files: plan.files.map((f) => path.join(outDir, f)), rendered: toRender.length, kept: total - toRender.length };
  } catch (err) {
    await staging.discard();
    throw err;
  }
}
