// Parallel sheet rendering: a pool of worker threads (piscina), one per core at most. The solve
// stays in the main thread; each task carries one circuit's result. The project and the template
// files travel once per build, serialised into a SharedArrayBuffer that every task refers to (a
// worker reads it on its first task of the build). The bytes of a sheet do not depend on which
// thread renders it or in which order, so the output stays byte-identical to a serial build.
//
// The command line starts the pool before it reads the project (startSheetPool): a worker loads
// pdfmake, Chart.js, canvas and the fonts on another core while the main thread loads and solves;
// a one-edit rebuild then renders its sheet there, and the summary parts that changed after it.

import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { serialize } from 'node:v8';
import type { Project } from '../model/types.js';
import type { ProjectResult } from '../calc/types.js';
import { TemplateError, type TemplateSet } from './templates.js';
import type { PartDone, PoolData, PoolWorkerData, SheetDone, SheetTask, SummaryPartTask, TemplateFailure } from './sheet-worker.js';
import type { ShapedWords } from './shaped-words.js';

/** Without a pool started early, fewer sheets than this render in the main thread (a worker's start-up costs about half a second). */
export const POOL_FROM = 6;

const workerScript = fileURLToPath(new URL('./sheet-worker.js', import.meta.url));

/** False when running from TypeScript sources (tests): there is no compiled worker script to start. */
export function poolAvailable(): boolean {
  return import.meta.url.endsWith('.js') && existsSync(workerScript);
}

/**
 * How many worker threads a build rendering `sheets` sheets should use (0: render in the main
 * thread). `jobs` as asked for (--jobs) is followed; by default a few sheets render in the main thread.
 */
export function workerCount(sheets: number, jobs?: number): number {
  if (!poolAvailable()) return 0;
  if (jobs !== undefined) return jobs < 2 || sheets === 0 ? 0 : Math.min(jobs, sheets);
  const cores = availableParallelism();
  if (cores < 2 || sheets < POOL_FROM) return 0;
  return Math.min(cores, Math.ceil(sheets / 3));
}

/** Worker threads a pool started before the project is known may grow to: --jobs, or one per core. */
export function earlyThreads(jobs?: number): number {
  if (!poolAvailable()) return 0;
  if (jobs !== undefined) return jobs < 2 ? 0 : jobs;
  const cores = availableParallelism();
  return cores < 2 ? 0 : cores;
}

type Answer = SheetDone | PartDone | TemplateFailure;

/** A worker's answer, or the template error it reported, thrown again in this thread. */
function answer<T extends SheetDone | PartDone>(done: Answer, kind: 'part' | 'sheet'): T {
  if ('templateError' in done) throw new TemplateError(done.templateError.file, done.templateError.detail);
  if ('part' in done !== (kind === 'part')) throw new Error(`internal error: a ${kind} task came back as something else`);
  return done as T;
}

export interface SheetPool {
  readonly maxThreads: number;
  /**
   * Render the sheets `indices` (positions in result.circuits), then those `more` gives, when it
   * comes (the caller is still finding them); `onSheet` is called once per sheet, one call at a
   * time, in completion order. Rejects on the first failure (or when `signal` aborts), after the
   * tasks still running have stopped.
   */
  render(
    project: Project,
    result: ProjectResult,
    indices: number[],
    templates: TemplateSet,
    onSheet: (done: SheetDone) => Promise<void>,
    signal?: AbortSignal,
    more?: Promise<number[]>,
  ): Promise<void>;
  /**
   * Lay out one part of the summary (summary.ts summaryPartDocument) on a worker, after the sheets
   * `render` has handed out so far and on one of its lanes (no worker is started for it). Only
   * while a `render` of the same build has not returned; its project and templates are used.
   */
  layOut(part: SummaryPartTask['part'], signal?: AbortSignal): Promise<Buffer>;
  /** The words the workers shaped for the first time, task by task (shaped-words.ts), so far. */
  shapedWords(): ShapedWords[];
  destroy(): Promise<void>;
}

/**
 * At most `width` tasks at a time, handed out in the order asked for: the sheets' lanes and the
 * summary parts share it, so a part waits for a lane instead of making the pool start a worker.
 */
class Gate {
  width = 1;
  private busy = 0;
  private readonly waiting: Array<() => void> = [];

  async run<T>(task: () => Promise<T>): Promise<T> {
    if (this.busy >= this.width) await new Promise<void>((go) => this.waiting.push(go));
    else this.busy++;
    try {
      return await task();
    } finally {
      const next = this.waiting.shift();
      if (next) next(); // the slot passes on
      else this.busy--;
    }
  }
}

let generation = 0;

/**
 * Start a pool of up to `maxThreads` workers. One worker starts at once (it loads the report
 * modules); more start as tasks queue up. `shapedWords` names the last build's shaped words
 * (OUT/.faultsheet-cache/shaped.bin), which each worker starts with.
 */
export async function startSheetPool(maxThreads: number, opts: { shapedWords?: string } = {}): Promise<SheetPool> {
  // The canvas addon must stay loaded for the life of the process: when a worker that loaded it
  // first exits, its teardown unloads the library under the other threads (a segmentation fault).
  // Loading it here, in the main thread, before any worker, keeps it in memory until the process ends.
  await import('canvas');
  const { Piscina } = await import('piscina');
  const pool = new Piscina<SheetTask | SummaryPartTask, Answer>({
    filename: pathToFileURL(workerScript).href,
    minThreads: 1,
    maxThreads,
    idleTimeout: 60_000,
    // a larger young generation: a sheet allocates a lot of short-lived objects (fewer scavenges)
    resourceLimits: { maxYoungGenerationSizeMb: 96 },
    workerData: { shapedWords: opts.shapedWords } satisfies PoolWorkerData,
  });
  const shaped: ShapedWords[] = [];
  const keep = <T extends SheetDone | PartDone>(done: T): T => {
    if (done.shaped) shaped.push(done.shaped);
    return done;
  };
  let destroyed: Promise<void> | null = null;
  const gate = new Gate();
  let current: SheetTask['data'] | null = null; // the project of the render under way, for layOut
  return {
    maxThreads,
    async layOut(part, signal) {
      if (!current) throw new Error('internal error: a summary part was sent to the pool outside a render');
      const data = current;
      const done = await gate.run(() => {
        signal?.throwIfAborted(); // a build that stopped while this part waited for a lane
        return pool.run({ part, data });
      });
      const bytes = keep(answer<PartDone>(done, 'part')).part;
      return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    },
    async render(project, result, indices, templates, onSheet, signal, more) {
      const files = templates.files();
      // a sheet shows its own circuit and device only: the rest of the project travels once, and each
      // task brings those two (a worker then holds no copy of every circuit)
      const packed: PoolData = {
        project: { ...project, circuits: [], devices: [] },
        templates: { defaults: new Map(files.defaults), overrides: new Map(files.overrides), overrideRoot: files.overrideRoot },
      };
      const bytes = serialize(packed);
      const shared = new SharedArrayBuffer(bytes.length);
      new Uint8Array(shared).set(bytes);
      const data = { generation: ++generation, buffer: shared };
      current = data;
      const circuitOf = new Map(project.circuits.map((c) => [c.id, c]));
      const deviceOf = new Map(project.devices.map((d) => [d.id, d]));
      // Each of maxThreads lanes hands its worker the next sheet as soon as the last is back. A
      // failure or an interruption stops the lanes from starting more, but a sheet already running
      // is let finish: cutting a worker off inside the canvas addon aborts the whole process (a
      // fatal N-API error, seen here when a build was interrupted mid-chart).
      const count = result.circuits.length;
      const queue = [...indices];
      let next = 0;
      let waiting = more; // the sheets still to come, until a lane has taken them into the queue
      let first: { err: unknown } | null = null;
      const stopped = (): boolean => first !== null || signal?.aborted === true;
      let chain = Promise.resolve();
      const lanes: Array<Promise<void>> = [];
      const lane = async (): Promise<void> => {
        for (;;) {
          while (next < queue.length && !stopped()) {
            const index = queue[next++];
            const cr = result.circuits[index];
            const input = circuitOf.get(cr.id);
            if (!input) throw new Error(`internal error: circuit ${cr.id} is in the result but not in the project`);
            // The solver samples chart series on first use (a non-enumerable getter, which a structured
            // clone would drop): take them now so the worker gets plain data.
            const task: SheetTask = { index, count, circuit: { ...cr, charts: cr.charts }, input, device: deviceOf.get(cr.device), data };
            const done = keep(answer<SheetDone>(await gate.run(() => pool.run(task)), 'sheet'));
            if (stopped()) return;
            // the sheets are taken one at a time, in completion order, while the worker goes on
            chain = chain.then(() => (stopped() ? undefined : onSheet(done))).catch((err: unknown) => void (first ??= { err }));
          }
          if (stopped() || waiting === undefined) return;
          const coming = waiting;
          const extra = await coming;
          if (waiting !== coming) continue; // another lane took them
          waiting = undefined;
          queue.push(...extra);
          widen();
        }
      };
      // one lane per thread with sheets to give it (at least one, to wait for `more`)
      const widen = (): void => {
        gate.width = Math.max(gate.width, 1, Math.min(maxThreads, queue.length - next));
        while (lanes.length < gate.width) lanes.push(lane().catch((err: unknown) => void (first ??= { err })));
      };
      gate.width = 0;
      widen();
      for (let awaited = 0; awaited < lanes.length; ) {
        awaited = lanes.length;
        await Promise.all(lanes);
      }
      await chain;
      if (signal?.aborted) throw signal.reason ?? new Error('aborted');
      if (first) throw (first as { err: unknown }).err;
    },
    shapedWords: () => shaped,
    destroy() {
      destroyed ??= pool.destroy();
      return destroyed;
    },
  };
}
