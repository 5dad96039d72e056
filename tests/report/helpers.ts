// Helpers for reading pdfmake document definitions and PDFs in the report tests.
import { execFileSync } from 'node:child_process';
import type { Content, TDocumentDefinitions } from 'pdfmake/interfaces.js';

/** Every text of a document definition's content (and its first page's header and footer), joined. */
export function docText(doc: TDocumentDefinitions, opts: { header?: boolean } = {}): string {
  const out: string[] = [];
  const walk = (node: unknown): void => {
    if (node == null) return;
    if (typeof node === 'string') {
      out.push(node);
      return;
    }
    if (Array.isArray(node)) {
      node.forEach(walk);
      return;
    }
    if (typeof node === 'object') {
      const o = node as Record<string, unknown>;
      for (const key of ['text', 'stack', 'columns', 'ul', 'ol']) if (key in o) walk(o[key]);
      if (o.table && typeof o.table === 'object') walk((o.table as { body: unknown }).body);
      if (endsBlock(o)) out.push('\n');
    }
  };
  walk(doc.content as Content);
  if (opts.header) {
    const h = doc.header as ((p: number, n: number) => Content) | undefined;
    const f = doc.footer as ((p: number, n: number) => Content) | undefined;
    if (h) walk(h(1, 3));
    if (f) walk(f(1, 3));
  }
  return out.join('');
}

function endsBlock(o: Record<string, unknown>): boolean {
  return 'style' in o || 'stack' in o;
}

/** The nodes of a definition's content matching `pred`, depth first. */
export function findNodes(doc: TDocumentDefinitions, pred: (n: Record<string, unknown>) => boolean): Array<Record<string, unknown>> {
  const found: Array<Record<string, unknown>> = [];
  const walk = (node: unknown): void => {
    if (Array.isArray(node)) node.forEach(walk);
    else if (node && typeof node === 'object') {
      const o = node as Record<string, unknown>;
      if (pred(o)) found.push(o);
      for (const v of Object.values(o)) if (v && typeof v === 'object') walk(v);
    }
  };
  walk(doc.content);
  return found;
}

/** Text of a PDF via poppler's pdftotext (installed here and in CI). */
export function pdfText(file: string, opts: { first?: number; last?: number } = {}): string {
  const args = ['-layout', '-enc', 'UTF-8'];
  if (opts.first) args.push('-f', String(opts.first));
  if (opts.last) args.push('-l', String(opts.last));
  return execFileSync('pdftotext', [...args, file, '-'], { encoding: 'utf8' });
}

export function pdfPages(file: string): number {
  const info = execFileSync('pdfinfo', [file], { encoding: 'utf8' });
  return Number(/^Pages:\s+(\d+)/m.exec(info)?.[1] ?? NaN);
}

/** The images of a PDF as poppler's `pdfimages -list` lists them, a row of its columns each (page, num, type, width, height, color, ...). */
export function pdfImageList(file: string): string[][] {
  const list = execFileSync('pdfimages', ['-list', file], { encoding: 'utf8' });
  return list
    .trim()
    .split('\n')
    .slice(2) // two header lines
    .map((line) => line.trim().split(/\s+/));
}

/** Image count of a PDF via poppler's pdfimages. */
export function pdfImages(file: string): number {
  return pdfImageList(file).length;
}
