// A worker thread of the sheet pool (pool.ts): receives the project and the template files once,
// as workerData, then renders the sheets it is given and hands back their bytes and page counts.

import { workerData } from 'node:worker_threads';
import type { Project } from '../model/types.js';
import type { CircuitResult } from '../calc/types.js';
import { pdfPageCount } from './pdf-file.js';
import { defaultRenderer } from './render.js';
import { renderCircuitSheet } from './sheets.js';
import { TemplateError, TemplateSet } from './templates.js';

export interface PoolData {
  project: Project;
  templates: { defaults: Map<string, string>; overrides: Map<string, string>; overrideRoot: string };
}

export interface SheetTask {
  index: number; // position in the result's circuit order (the sheet says "sheet n of N")
  count: number;
  circuit: CircuitResult; // with its chart series taken (plain data)
}

export interface SheetDone {
  index: number;
  bytes: Uint8Array;
  pages: number;
}

const data = workerData as PoolData;
const project = data.project;
const templates = new TemplateSet(data.templates.defaults, data.templates.overrides, data.templates.overrideRoot);

export default async function renderTask(task: SheetTask): Promise<SheetDone | { templateError: { file: string; detail: string } }> {
  try {
    const bytes = await renderCircuitSheet(project, task.circuit, task.index, task.count, templates, defaultRenderer());
    const out = new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    return { index: task.index, bytes: out, pages: pdfPageCount(out) }; // copied across (a sheet is a few hundred kB)
  } catch (err) {
    // a user error keeps its meaning across the thread boundary (the CLI prints it without a stack)
    if (err instanceof TemplateError) return { templateError: { file: err.file, detail: err.detail } };
    throw err;
  }
}
