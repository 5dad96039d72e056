// Parallel sheet rendering: a pool of worker threads (piscina), one per core. The solve stays in the
// main thread; each task carries one circuit's result, and the project and templates are given to
// each worker once. The bytes of a sheet do not depend on which thread renders it or in which
// order, so the output stays byte-identical to a serial build.

import { setMaxListeners } from 'node:events';
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { Project } from '../model/types.js';
import type { ProjectResult } from '../calc/types.js';
import { TemplateError, type TemplateSet } from './templates.js';
import type { PoolData, SheetDone, SheetTask } from './sheet-worker.js';

/** Fewer sheets than this render in the main thread (a worker's start-up costs about half a second). */
export const POOL_FROM = 6;

const workerScript = fileURLToPath(new URL('./sheet-worker.js', import.meta.url));

/**
 * How many worker threads a build rendering `sheets` sheets should use (0: render in the main
 * thread). `jobs` as asked for (--jobs) is followed; by default a few sheets render in the main thread.
 */
export function workerCount(sheets: number, jobs?: number): number {
  // Running from TypeScript sources (tests) there is no compiled worker script to start.
  if (!import.meta.url.endsWith('.js') || !existsSync(workerScript)) return 0;
  if (jobs !== undefined) return jobs < 2 || sheets === 0 ? 0 : Math.min(jobs, sheets);
  const cores = availableParallelism();
  if (cores < 2 || sheets < POOL_FROM) return 0;
  return Math.min(cores, Math.ceil(sheets / 3));
}

/**
 * Render the sheets `indices` (positions in result.circuits) in `threads` worker threads; `onSheet`
 * is called once per sheet, one call at a time, in completion order. Rejects on the first failure
 * (or when `signal` aborts), after every worker has stopped.
 */
export async function renderSheetsInPool(
  project: Project,
  result: ProjectResult,
  indices: number[],
  templates: TemplateSet,
  threads: number,
  onSheet: (done: SheetDone) => Promise<void>,
  signal?: AbortSignal,
): Promise<void> {
  // The canvas addon must stay loaded for the life of the process: when a worker that loaded it
  // first exits, its teardown unloads the library under the other threads (a segmentation fault).
  // Loading it here, in the main thread, keeps it in memory until the process ends.
  await import('canvas');
  const { Piscina } = await import('piscina');
  const files = templates.files();
  const workerData: PoolData = {
    project,
    templates: { defaults: new Map(files.defaults), overrides: new Map(files.overrides), overrideRoot: files.overrideRoot },
  };
  const pool = new Piscina<SheetTask, SheetDone | { templateError: { file: string; detail: string } }>({
    filename: pathToFileURL(workerScript).href,
    workerData,
    minThreads: threads,
    maxThreads: threads,
    idleTimeout: 60_000,
    // a larger young generation: a sheet allocates a lot of short-lived objects (fewer scavenges)
    resourceLimits: { maxYoungGenerationSizeMb: 96 },
  });
  const local = new AbortController();
  setMaxListeners(indices.length + 10, local.signal); // piscina listens once per queued task
  const stop = (): void => local.abort();
  signal?.addEventListener('abort', stop, { once: true });
  let chain = Promise.resolve();
  try {
    const count = result.circuits.length;
    // Promise.all rejects with the first failure in time; the tasks cancelled after it reject later.
    await Promise.all(
      indices.map(async (index) => {
        try {
          const cr = result.circuits[index];
          // The solver samples chart series on first use (a non-enumerable getter, which a structured
          // clone would drop): take them now so the worker gets plain data.
          const task: SheetTask = { index, count, circuit: { ...cr, charts: cr.charts } };
          const done = await pool.run(task, { signal: local.signal });
          if ('templateError' in done) throw new TemplateError(done.templateError.file, done.templateError.detail);
          chain = chain.then(() => onSheet(done));
          await chain;
        } catch (err) {
          local.abort(); // the first failure stops the rest
          throw err;
        }
      }),
    );
  } catch (err) {
    await chain.catch(() => undefined);
    if (signal?.aborted) throw signal.reason ?? err;
    throw err;
  } finally {
    signal?.removeEventListener('abort', stop);
    await pool.destroy();
  }
}
