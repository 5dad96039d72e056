// A child process of a parallel build (parallel.ts): receives the project, the result and the
// template files once, then renders the sheets it is asked for and sends back their bytes.

import type { Project } from '../model/types.js';
import type { ProjectResult } from '../calc/types.js';
import { defaultRenderer } from './render.js';
import { renderSheet } from './sheets.js';
import { TemplateError, TemplateSet } from './templates.js';

export type ToChild =
  | { type: 'init'; project: Project; result: ProjectResult; templates: { defaults: Map<string, string>; overrides: Map<string, string>; overrideRoot: string } }
  | { type: 'sheet'; index: number }
  | { type: 'stop' };

export type FromChild =
  | { type: 'ready' }
  | { type: 'sheet'; index: number; bytes: Uint8Array }
  | { type: 'error'; index: number; name: string; message: string; stack?: string; file?: string; detail?: string };

let state: { project: Project; result: ProjectResult; templates: TemplateSet } | null = null;

const send = (m: FromChild): void => {
  process.send!(m);
};

process.on('message', (m: ToChild) => {
  if (m.type === 'init') {
    state = { project: m.project, result: m.result, templates: new TemplateSet(m.templates.defaults, m.templates.overrides, m.templates.overrideRoot) };
    send({ type: 'ready' });
  } else if (m.type === 'sheet') {
    const s = state;
    if (!s) {
      send({ type: 'error', index: m.index, name: 'Error', message: 'internal error: sheet requested before init' });
      return;
    }
    renderSheet(s.project, s.result, m.index, s.templates, defaultRenderer()).then(
      (bytes) => send({ type: 'sheet', index: m.index, bytes }),
      (err: Error) =>
        send({
          type: 'error',
          index: m.index,
          name: err?.name ?? 'Error',
          message: err?.message ?? String(err),
          stack: err?.stack,
          ...(err instanceof TemplateError ? { file: err.file, detail: err.detail } : {}),
        }),
    );
  } else if (m.type === 'stop') {
    process.disconnect();
  }
});
