// Parallel sheet rendering: a few child processes (not worker threads: the canvas addon does not
// survive a worker's teardown) each render the sheets handed to them. The bytes of a sheet do not
// depend on which process renders it or in which order, so the output stays byte-identical.

import { fork, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import type { Project } from '../model/types.js';
import type { ProjectResult } from '../calc/types.js';
import { TemplateError, type TemplateSet } from './templates.js';
import type { FromChild, ToChild } from './sheet-process.js';

/** Fewer circuits than this render in process (a child's start-up costs about a second). */
export const PARALLEL_FROM = 8;

const childScript = fileURLToPath(new URL('./sheet-process.js', import.meta.url));

/** How many child processes a build of `circuits` sheets should use (0: render in process). */
export function childCount(circuits: number, jobs?: number): number {
  // Running from TypeScript sources (tests) there is no compiled child script to start.
  if (!import.meta.url.endsWith('.js') || !existsSync(childScript)) return 0;
  const wanted = jobs ?? Math.min(availableParallelism(), 4);
  if (wanted < 2 || circuits < PARALLEL_FROM) return 0;
  return Math.min(wanted, Math.ceil(circuits / 4));
}

/**
 * Render every sheet in `count` child processes; `onSheet` is called once per sheet, one call at a
 * time, in completion order. Rejects (and stops every child) on the first failure.
 */
export function renderSheetsInChildren(
  project: Project,
  result: ProjectResult,
  templates: TemplateSet,
  count: number,
  onSheet: (index: number, bytes: Buffer) => Promise<void>,
): Promise<void> {
  const total = result.circuits.length;
  return new Promise<void>((resolve, reject) => {
    const children: ChildProcess[] = [];
    let next = 0;
    let done = 0;
    let failed = false;
    let chain = Promise.resolve();
    const stderr = new Map<ChildProcess, string>();

    const stopAll = (kill: boolean): void => {
      for (const c of children) {
        if (c.exitCode !== null || c.signalCode !== null) continue;
        if (kill) c.kill();
        else if (c.connected) c.send({ type: 'stop' } satisfies ToChild);
      }
    };
    const fail = (err: Error): void => {
      if (failed) return;
      failed = true;
      stopAll(true);
      reject(err);
    };
    const give = (c: ChildProcess): void => {
      if (failed) return;
      if (next < total) c.send({ type: 'sheet', index: next++ } satisfies ToChild);
    };

    const files = templates.files();
    // The solver samples chart series on first use (a non-enumerable getter, which a structured
    // clone would drop): take them now so the children get plain data.
    const plainResult: ProjectResult = { ...result, circuits: result.circuits.map((c) => ({ ...c, charts: c.charts })) };
    for (let k = 0; k < count; k++) {
      const child = fork(childScript, [], { serialization: 'advanced', stdio: ['ignore', 'ignore', 'pipe', 'ipc'] });
      children.push(child);
      stderr.set(child, '');
      child.stderr?.on('data', (d: Buffer) => stderr.set(child, (stderr.get(child)! + d.toString()).slice(-4000)));
      child.on('message', (m: FromChild) => {
        if (failed) return;
        if (m.type === 'ready') give(child);
        else if (m.type === 'error') {
          // a user error keeps its class across the process boundary (the CLI prints it without a stack)
          const err = m.name === 'TemplateError' && m.file !== undefined ? new TemplateError(m.file, m.detail ?? m.message) : new Error(m.message);
          if (!(err instanceof TemplateError)) err.name = m.name;
          if (m.stack) err.stack = m.stack;
          fail(err);
        } else if (m.type === 'sheet') {
          give(child);
          chain = chain
            .then(() => onSheet(m.index, Buffer.from(m.bytes.buffer, m.bytes.byteOffset, m.bytes.byteLength)))
            .then(() => {
              if (++done === total && !failed) {
                stopAll(false);
                resolve();
              }
            }, (err: Error) => fail(err));
        }
      });
      child.on('error', (err) => fail(err));
      child.on('exit', (code, signal) => {
        if (done < total && !failed)
          fail(new Error(`internal error: a sheet process stopped (${signal ?? `exit ${code}`}) before the build was done${stderr.get(child) ? `:\n${stderr.get(child)}` : ''}`));
      });
      child.send({
        type: 'init',
        project,
        result: plainResult,
        templates: { defaults: new Map(files.defaults), overrides: new Map(files.overrides), overrideRoot: files.overrideRoot },
      } satisfies ToChild);
    }
    if (total === 0) {
      stopAll(false);
      resolve();
    }
  });
}
