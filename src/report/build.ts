// `faultsheet build`: plan every output name, render the sheets that changed since the last build
// (the others are taken over from OUT, see cache.ts), then the summary and the dossier, into a
// staging folder beside OUT; write results.json and the cache manifest, then swap the folder into
// place (src/io/write.ts). Any failure or interruption before the swap leaves OUT exactly as it was.

import { existsSync } from 'node:fs';
import path from 'node:path';
import type { Content } from 'pdfmake/interfaces.js';
import type { Project } from '../model/types.js';
import type { ProjectResult } from '../calc/types.js';
import { openStaging, type Staging } from '../io/write.js';
import { CACHE_DIR, MANIFEST_FILE, cachedSummaryPart, emptyManifest, previousJoined, projectFingerprint, readManifest, reusable, sheetKey, type Manifest } from './cache.js';
import { DossierWriter, writeDossier, type DossierMeta, type DossierPart } from './dossier.js';
import { pdfPageCount } from './pdf-file.js';
import { DOSSIER_FILE, RESULTS_FILE, SUMMARY_FILE, planOutputs } from './plan.js';
import { POOL_FROM, startSheetPool, workerCount, type SheetPool } from './pool.js';
import type { Renderer } from './render.js';
import { projectDate } from './sheet.js';
import { projectTemplates, renderSheet } from './sheets.js';
import { summaryPartDocument, summaryParts } from './summary.js';
import type { TemplateSet } from './templates.js';
import { stableJson } from './fingerprint.js';
import { createHash } from 'node:crypto';
import { unmark } from './typeset.js';
import { SHAPED_FILE, mergeShapedWords, readShapedFile, shapedWordsBytes } from './shaped-words.js';

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
  /**
   * Worker threads started before the project was read (the command line does, pool.ts): used for
   * any sheet to render, however few, and stopped by the build once its sheets are rendered (their
   * memory is then free for the summary and the dossier).
   */
  pool?: SheetPool;
  /**
   * The input files (paths in the project folder) that changed since the last build into OUT, where
   * known (the command line's parse cache): with `pool`, their sheets are looked at and started first.
   */
  changedInputs?: ReadonlySet<string>;
  /** Further files for OUT's cache folder, written with the manifest (the command line's parse cache). */
  cacheFiles?: ReadonlyArray<{ name: string; bytes: () => Uint8Array }>;
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
  /** Parts of the summary laid out by this build (the others were taken over), and all its parts. */
  summaryParts: { laidOut: number; total: number };
  /** Sheets whose bytes the dossier copied from the previous dossier. */
  dossierReused: number;
}

/**
 * Write the dossier of `project` into `outDir`, with results.json holding `resultsJson`: the
 * document, or a function that makes it (called once the sheets are under way, off the path to
 * the first sheet).
 */
export async function buildDossier(project: Project, result: ProjectResult, resultsJson: unknown, outDir: string, opts: BuildOptions = {}): Promise<BuildReport> {
  const clock = phaseClock();
  const plan = planOutputs(project, result); // collisions fail here, before anything is written
  const templates = projectTemplates(project);
  templates.check(); // a project template that does not compile fails here, before anything is written
  const signal = opts.signal;
  signal?.throwIfAborted();
  const staging = await openStaging(outDir);
  let stopping: Promise<void> | undefined; // the workers' ending, awaited before the build returns
  let later: SheetPool | undefined; // workers to stop once the build is done
  let earlyDossier: DossierWriter | undefined; // begun while the sheets render
  try {
    const total = result.circuits.length;
    const projectPrint = projectFingerprint(project, templates);
    const previous = opts.force ? null : readManifest(staging.outDir);
    const manifest: Manifest = emptyManifest();
    const pages: number[] = new Array(total);
    const toRender: number[] = [];
    const keys: string[] = new Array(total);
    const keptSheets: number[] = [];
    const classify = (i: number): void => {
      const file = plan.sheets[i].file;
      keys[i] = sheetKey(projectPrint, project, result.circuits[i], i, total);
      const kept = reusable(staging.outDir, previous, file, keys[i]);
      if (!kept) {
        toRender.push(i);
        return;
      }
      keptSheets.push(i);
      pages[i] = kept.pages;
      manifest.sheets[file] = kept;
    };
    // With workers already started, the sheets of the input files that changed since the last build
    // are looked at first, and those to render start on a worker before the other sheets' keys are
    // computed (about a quarter of a second for a thousand); the rest follow as one more batch.
    const changed = opts.pool && !opts.renderer && previous && opts.changedInputs ? opts.changedInputs : undefined;
    const inputFile = new Map(project.circuits.map((c) => [c.id, c.pos.file]));
    const firstLook = changed ? result.circuits.flatMap((cr, i) => (changed.has(inputFile.get(cr.id) ?? '') ? [i] : [])) : [];
    const lookedAt = new Set(firstLook.length < total ? firstLook : []);
    for (const i of lookedAt) classify(i);
    const early = [...toRender];
    const classifyRest = (): number[] => {
      for (let i = 0; i < total; i++) if (!lookedAt.has(i)) classify(i);
      keptSheets.sort((a, b) => a - b);
      return toRender.slice(early.length);
    };
    if (early.length === 0) classifyRest();

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
    const local = new AbortController(); // the first failure, or an interruption, stops both
    const stop = (): void => local.abort(signal?.reason);
    signal?.addEventListener('abort', stop, { once: true });
    let first: { err: unknown } | null = null;
    const fail = (err: unknown): null => {
      first ??= { err };
      local.abort();
      return null;
    };
    // the first sheets go to the pool now, the rest once their keys are known
    let rendering: Promise<void | null> | null = null;
    if (early.length > 0) {
      let give!: (more: number[]) => void;
      let refuse!: (err: unknown) => void;
      const rest = new Promise<number[]>((resolve, reject) => ((give = resolve), (refuse = reject)));
      rendering = opts.pool!.render(project, result, early, templates, (s) => accept(s.index, s.bytes, s.pages), local.signal, rest).catch(fail);
      try {
        give(classifyRest());
      } catch (err) {
        refuse(err);
        await rendering; // the workers have stopped writing before the staging folder goes
        throw err;
      }
    }
    opts.onPlan?.(toRender.length, total - toRender.length);
    if (!rendering) signal?.throwIfAborted(); // (once sheets are rendering, below, after they stop)

    const labels = templates.labels('summary/labels.hbs');
    const dossierMeta: DossierMeta = {
      title: `${unmark(project.meta.name)} — ${labels['cover.kicker']}`,
      subject: labels['info.subject'],
      date: projectDate(project.meta.date),
      summaryTitle: labels['dossier.summary'],
      sheetsTitle: labels['dossier.sheets'],
      pageLabel: labels['dossier.page'],
    };
    /** The dossier's sheets, with these page counts. */
    const sheetParts = (sheetPages: number[]): DossierPart[] =>
      result.circuits.map((cr, i) => ({
        path: staging.pathOf(plan.sheets[i].file),
        pages: sheetPages[i],
        title: cr.description ? `${unmark(cr.id)} — ${unmark(cr.description)}` : unmark(cr.id),
        file: plan.sheets[i].file,
        key: keys[i],
      }));
    // the previous dossier and where its parts lie, if it is still the file the last build wrote
    const dossierReuse = previousJoined(staging.outDir, previous, 'dossier');
    let prewriting: Promise<void | null> | undefined;
    // results.json and the cache files depend on nothing rendered: written while the sheets render
    let extras: Promise<void> | undefined;
    const writeExtras = (): Promise<void> =>
      (extras ??= (async () => {
        const doc: unknown = typeof resultsJson === 'function' ? (resultsJson as () => unknown)() : resultsJson;
        await staging.write(RESULTS_FILE, JSON.stringify(doc, null, 2) + '\n');
        for (const extra of opts.cacheFiles ?? []) await staging.write(`${CACHE_DIR}/${extra.name}`, extra.bytes());
      })());
    let summary: LaidOutSummary | null = null;
    const made = new Map<string, SummaryPart>(); // summary parts laid out by this build
    let renderer: Renderer | undefined = opts.renderer; // pdfmake and Chart.js in this thread, loaded when first needed
    const ownRenderer = async (): Promise<Renderer> => (renderer ??= (await import('./render.js')).defaultRenderer());
    const threads = opts.renderer || toRender.length === 0 ? 0 : opts.pool ? opts.pool.maxThreads : workerCount(toRender.length, opts.jobs);
    if (threads === 0) stopping = opts.pool?.destroy(); // not needed: nothing to render, or rendering here
    const shapedFile = path.join(staging.outDir, CACHE_DIR, SHAPED_FILE);
    const pool = threads > 0 ? (opts.pool ?? (await startSheetPool(threads, { shapedWords: opts.force ? undefined : shapedFile }))) : null;
    // After a sheet or two the worker that rendered them, its code warm, lays out the summary's
    // changed parts as well (this thread then never loads the layout code); after a batch the
    // workers are stopped and the parts are laid out here.
    const partsOnPool = pool !== null && toRender.length < POOL_FROM;
    const layOutPart = async (content: Content[], pageNumbers: { offset: number; total: number }, stopOn?: AbortSignal): Promise<Buffer> =>
      partsOnPool ? pool.layOut({ content, circuits: total, ...pageNumbers }, stopOn) : (await ownRenderer()).pdf(summaryPartDocument(project, total, templates, content, pageNumbers));
    const summaryCtx = (sheetPages: number[], stopOn?: AbortSignal) => ({ templates, layOut: layOutPart, projectPrint, previous, outDir: staging.outDir, made, pages: sheetPages, signal: stopOn });
    // The sheets render on the workers; meanwhile this thread takes the kept sheets over and, when
    // the last build says how many pages each sheet to render had (an edit seldom changes that),
    // lays out the summary with those counts (again below, with the counts the sheets have, if one
    // changed).
    rendering ??= pool ? pool.render(project, result, toRender, templates, (s) => accept(s.index, s.bytes, s.pages), local.signal).catch(fail) : null;
    try {
      for (const i of keptSheets) {
        if (first) break;
        await staging.adopt(plan.sheets[i].file, path.join(staging.outDir, plan.sheets[i].file));
      }
      clock(`plan and cache (${toRender.length} to render, ${total - toRender.length} kept)`);
      if (rendering) {
        const guess = previous && toRender.every((i) => (previous.sheets[plan.sheets[i].file]?.pages ?? 0) >= 1) ? Array.from(pages, (p, i) => p ?? previous.sheets[plan.sheets[i].file].pages) : null;
        const laying = guess && !first ? layOutSummary(project, result, summaryCtx(guess, local.signal)).catch(fail) : null;
        // While the summary's changed parts wait for the worker, the dossier's kept sheets up to the
        // first one rendering go into it (from the last build's page counts, checked at the end).
        if (guess && dossierReuse && previous!.summaryPages >= 1 && !first) {
          const guessed = sheetParts(guess);
          earlyDossier = new DossierWriter(staging.pathOf(DOSSIER_FILE), guessed, previous!.summaryPages, dossierMeta, dossierReuse);
          prewriting = prewrite(earlyDossier, guessed, Math.min(...toRender), () => first !== null || local.signal.aborted).catch(fail);
        }
        const extrasWritten = first ? null : writeExtras().catch(fail);
        const early = await laying;
        await rendering;
        await prewriting;
        await extrasWritten;
        if (early && guess!.every((p, i) => p === pages[i])) summary = early;
      } else
        for (const i of toRender) {
          const bytes = await renderSheet(project, result, i, templates, await ownRenderer());
          await accept(i, bytes, pdfPageCount(bytes));
        }
      if (first) throw (first as { err: unknown }).err;
    } catch (err) {
      local.abort();
      await rendering; // the workers have stopped writing before the staging folder goes
      throw first ? (first as { err: unknown }).err : err;
    } finally {
      signal?.removeEventListener('abort', stop);
      // After a batch the workers are stopped now, so their memory is free for the summary and
      // the dossier; after a sheet or two they are stopped at the end, their teardown out of the
      // dossier's way (on two cores it slowed the dossier's copying by half).
      if (pool && toRender.length >= POOL_FROM) stopping = pool.destroy();
      else if (pool) later = pool;
    }
    signal?.throwIfAborted();

    clock(`sheets (${threads > 0 ? `up to ${threads} worker threads` : 'main thread'})`);
    // The summary, laid out part by part (summary.ts summaryParts), each part cached like a sheet,
    // then joined into summary.pdf.
    summary ??= await layOutSummary(project, result, summaryCtx(pages, signal));
    for (const part of summary.parts)
      if (part.bytes) await staging.write(`${CACHE_DIR}/${part.file}`, part.bytes);
      else await staging.adopt(`${CACHE_DIR}/${part.file}`, path.join(staging.outDir, CACHE_DIR, part.file));
    manifest.summaryPages = summary.pages;
    manifest.summaryParts = summary.parts.map(({ key, pages, file }) => ({ key, pages, file }));
    // Each part is given its file and key, so the next build can copy its bytes from this one's
    // summary.pdf and dossier.pdf where nothing about it moved (dossier.ts PartRecord).
    const summaryFiles = summary.parts.map((p) => ({ path: staging.pathOf(`${CACHE_DIR}/${p.file}`), pages: p.pages, title: '', file: p.file, key: p.key }));
    const joined = writeDossier(
      staging.pathOf(SUMMARY_FILE),
      [],
      summaryFiles,
      {
        title: `${unmark(project.meta.name)} — ${labels['document']}`,
        subject: labels['info.subject'],
        date: projectDate(project.meta.date),
        summaryTitle: '',
        sheetsTitle: '',
        outline: false,
      },
      previousJoined(staging.outDir, previous, 'summary'),
    );
    const summaryStat = await staging.stat(SUMMARY_FILE);
    manifest.summary = { size: summaryStat.size, mtimeMs: summaryStat.mtimeMs, records: joined.records };
    clock(`summary (${summary.laidOut} of ${summary.parts.length} parts laid out, ${joined.reused} copied from the last summary.pdf, ${summary.pages} pages)`);
    signal?.throwIfAborted();

    // The previous dossier's sheets and summary parts are copied byte for byte where nothing about
    // them moved. The file begun while the sheets rendered is finished if the page counts it was
    // begun with held, and written again otherwise.
    const sheetsNow = sheetParts(pages);
    let written = earlyDossier?.finish(summaryFiles, sheetsNow) ?? null;
    earlyDossier?.close();
    if (!written) {
      if (earlyDossier) await staging.remove(DOSSIER_FILE);
      written = writeDossier(staging.pathOf(DOSSIER_FILE), summaryFiles, sheetsNow, dossierMeta, dossierReuse);
    }
    const dossierStat = await staging.stat(DOSSIER_FILE);
    manifest.dossier = { size: dossierStat.size, mtimeMs: dossierStat.mtimeMs, records: written.records };
    clock(`dossier (${written.reused} of ${result.circuits.length} sheets and ${written.reusedFront} of ${summary.parts.length} summary parts copied from the last one)`);
    await writeExtras();
    await keepShapedWords(staging, pool, shapedFile, opts.force === true);
    await staging.write(`${CACHE_DIR}/${MANIFEST_FILE}`, JSON.stringify(manifest) + '\n');
    signal?.throwIfAborted(); // the last point at which an interruption is honoured: the swap is not split
    await staging.commit();
    clock('results, cache and swap');
    return {
      files: plan.files.map((f) => path.join(outDir, f)),
      rendered: toRender.length,
      kept: total - toRender.length,
      summaryParts: { laidOut: summary.laidOut, total: summary.parts.length },
      dossierReused: written.reused,
    };
  } catch (err) {
    earlyDossier?.close();
    await staging.discard();
    throw err;
  } finally {
    await (later?.destroy() ?? stopping);
  }
}

interface LaidOutSummary {
  pages: number;
  parts: SummaryPart[];
  laidOut: number;
}

interface SummaryPart {
  key: string;
  pages: number;
  file: string; // in OUT/.faultsheet-cache
  bytes?: Buffer; // laid out by this build; otherwise taken over from the previous one
}

/**
 * Lay out the summary's parts. The index prints each sheet's dossier page, which depends on the
 * summary's own length: the parts are laid out until the page count they assumed is the one they
 * have (the last build's count is the first guess, so an unchanged length is settled at once). A part
 * whose key (its content, its page numbers, the project header, the tool and templates) was laid out
 * by the last build is taken over.
 */
async function layOutSummary(
  project: Project,
  result: ProjectResult,
  ctx: {
    templates: TemplateSet;
    layOut: (content: Content[], pageNumbers: { offset: number; total: number }, signal?: AbortSignal) => Promise<Buffer>;
    projectPrint: string;
    pages: number[];
    previous: Manifest | null;
    outDir: string;
    signal?: AbortSignal;
    made: Map<string, SummaryPart>;
  },
): Promise<LaidOutSummary> {
  const made = ctx.made; // parts laid out by this build, by key (shared by the layouts of one build)
  const header = stableJson({ meta: project.meta, signoff: project.signoff, circuits: result.circuits.length });
  // first guess: the last build's count, or, for a first build, what the parts are cut for: two
  // pages of cover and board tree, then a page a part
  let total = ctx.previous?.summaryPages && ctx.previous.summaryPages >= 1 ? ctx.previous.summaryPages : summaryParts(project, result, { templates: ctx.templates }).length + 1;
  for (let attempt = 0; attempt < 5; attempt++) {
    const firstPage = new Map<string, number>();
    let next = total + 1;
    result.circuits.forEach((c, i) => {
      firstPage.set(c.id, next);
      next += ctx.pages[i];
    });
    const opts = { templates: ctx.templates, dossierPages: firstPage };
    const contents = summaryParts(project, result, opts);
    // More or fewer parts than the last build's (a list cut into one run more or less) change the
    // page count: counted as the last build's pages for the parts it had and one page for each
    // new one, before any part is laid out, so that the parts are not all laid out twice.
    if (attempt === 0 && ctx.previous && ctx.previous.summaryParts.length !== contents.length) {
      const pagesBefore = (i: number): number => {
        const p = ctx.previous!.summaryParts[i]?.pages;
        return Number.isInteger(p) && p >= 1 && p <= 1000 ? p : 1;
      };
      const expected = contents.reduce((n, _c, i) => n + pagesBefore(i), 0);
      if (expected !== total) {
        total = expected;
        continue;
      }
    }
    const parts: SummaryPart[] = [];
    let offset = 0;
    for (const content of contents) {
      ctx.signal?.throwIfAborted();
      const key = createHash('sha256').update(ctx.projectPrint).update(header).update(`${offset}/${total}\n`).update(stableJson(content)).digest('hex');
      let part: SummaryPart | undefined = made.get(key) ?? cachedSummaryPart(ctx.outDir, ctx.previous, key);
      if (!part) {
        const bytes = await ctx.layOut(content, { offset, total }, ctx.signal);
        part = { key, pages: pdfPageCount(bytes), file: `summary-${key.slice(0, 16)}.pdf`, bytes };
      }
      made.set(key, part);
      parts.push(part);
      offset += part.pages;
    }
    if (offset === total) return { pages: total, parts, laidOut: parts.filter((p) => p.bytes).length };
    total = offset;
  }
  throw new Error('internal error: the summary page count does not settle');
}

/**
 * Write the dossier's sheets up to sheets[end - 1], a few at a time so that a worker's answer is
 * taken as it comes (the worker then goes on with the summary's parts), until `stop` says the
 * build failed or was interrupted.
 */
async function prewrite(writer: DossierWriter, sheets: DossierPart[], end: number, stop: () => boolean): Promise<void> {
  for (let upTo = 0; upTo < end && !stop(); ) {
    upTo = Math.min(end, upTo + 50);
    writer.advance(sheets, upTo);
    await new Promise<void>((go) => setImmediate(go));
  }
}

/**
 * Keep the words the workers shaped, after the last build's (read unless --force), for the next
 * build's workers (shaped-words.ts); with none shaped, the last build's file as it was.
 */
async function keepShapedWords(staging: Staging, pool: SheetPool | null, previousFile: string, force: boolean): Promise<void> {
  const name = `${CACHE_DIR}/${SHAPED_FILE}`;
  const fresh = pool?.shapedWords() ?? [];
  const before = force ? null : existsSync(previousFile) ? previousFile : null;
  if (fresh.length === 0) {
    if (before) await staging.adopt(name, before);
    return;
  }
  const merged = mergeShapedWords(before ? readShapedFile(before) : null, fresh); // unreadable: the workers' words alone
  if (merged) await staging.write(name, shapedWordsBytes(merged));
}
