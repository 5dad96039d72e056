// A worker thread of the sheet pool (pool.ts). Importing this module loads the report (pdfmake,
// Chart.js, canvas, fonts) as the worker starts. Each task brings one circuit (input, device,
// result) and names the rest of the build's project and its template files, serialised once into
// shared memory; the worker reads those on its first task of that build, renders the sheets it is
// given and hands back their bytes and page counts.

import { deserialize } from 'node:v8';
import { workerData } from 'node:worker_threads';
import type { Content } from 'pdfmake/interfaces.js';
import type { Circuit, Device, Project } from '../model/types.js';
import type { CircuitResult } from '../calc/types.js';
import { pdfPageCount } from './pdf-file.js';
import { defaultRenderer, preloadShapedWords, takeShapedWords } from './render.js';
import { renderCircuitSheet } from './sheets.js';
import { summaryPartDocument } from './summary.js';
import { TemplateError, TemplateSet } from './templates.js';
import { readShapedFile, type ShapedWords } from './shaped-words.js';

export interface PoolData {
  project: Project; // without its circuits and devices (each task brings its own)
  templates: { defaults: Map<string, string>; overrides: Map<string, string>; overrideRoot: string };
}

export interface SheetTask {
  index: number; // position in the result's circuit order (the sheet says "sheet n of N")
  count: number;
  circuit: CircuitResult; // with its chart series taken (plain data)
  input: Circuit; // the circuit as read
  device?: Device; // its device, if the project has it
  data: { generation: number; buffer: SharedArrayBuffer }; // PoolData, serialised (node:v8)
}

/** What the pool's workers are started with (pool.ts startSheetPool). */
export interface PoolWorkerData {
  /** The last build's shaped words (shaped-words.ts), if any. */
  shapedWords?: string;
}

export interface SheetDone {
  index: number;
  bytes: Uint8Array;
  pages: number;
  /** Words this worker shaped for the first time on this task, for the next build's workers. */
  shaped?: ShapedWords;
}

/** One part of the summary to lay out (build.ts): its content is plain data (layout.ts TABLE_LAYOUTS). */
export interface SummaryPartTask {
  part: { content: Content[]; circuits: number; offset: number; total: number };
  data: SheetTask['data'];
}

export interface PartDone {
  part: Uint8Array;
  shaped?: ShapedWords;
}

/** A user error keeps its meaning across the thread boundary (the CLI prints it without a stack). */
export interface TemplateFailure {
  templateError: { file: string; detail: string };
}

const renderer = defaultRenderer(); // the fonts are read now, while the main thread loads the project
preload((workerData as PoolWorkerData | undefined)?.shapedWords); // and the words the last build shaped

/** Start the word cache with the words in `file`; a missing or damaged file is passed over. */
function preload(file: string | undefined): void {
  if (!file) return;
  const words = readShapedFile(file);
  const taken = words ? preloadShapedWords(words) : 0;
  if (process.env.FAULTSHEET_TIMINGS) process.stderr.write(`faultsheet: a worker started with ${taken} shaped words\n`);
}

let current: { generation: number; project: Project; templates: TemplateSet } | null = null;

function build(data: SheetTask['data']): { project: Project; templates: TemplateSet } {
  if (current?.generation !== data.generation) {
    const d = deserialize(new Uint8Array(data.buffer)) as PoolData;
    current = { generation: data.generation, project: d.project, templates: new TemplateSet(d.templates.defaults, d.templates.overrides, d.templates.overrideRoot) };
  }
  return current;
}

export default async function renderTask(task: SheetTask | SummaryPartTask): Promise<SheetDone | PartDone | TemplateFailure> {
  try {
    return 'part' in task ? await layOutPart(task) : await renderSheetTask(task);
  } catch (err) {
    if (err instanceof TemplateError) return { templateError: { file: err.file, detail: err.detail } };
    throw err;
  }
}

async function renderSheetTask(task: SheetTask): Promise<SheetDone> {
  const { project: rest, templates } = build(task.data);
  const project: Project = { ...rest, circuits: [task.input], devices: task.device ? [task.device] : [] };
  const bytes = await renderCircuitSheet(project, task.circuit, task.index, task.count, templates, renderer);
  const out = new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  return { index: task.index, bytes: out, pages: pdfPageCount(out), ...shapedNow() }; // copied across (a sheet is a few hundred kB)
}

async function layOutPart(task: SummaryPartTask): Promise<PartDone> {
  const { project, templates } = build(task.data);
  const { content, circuits, offset, total } = task.part;
  const bytes = await renderer.pdf(summaryPartDocument(project, circuits, templates, content, { offset, total }));
  return { part: new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength), ...shapedNow() };
}

function shapedNow(): { shaped?: ShapedWords } {
  const shaped = takeShapedWords();
  return shaped ? { shaped } : {};
}
