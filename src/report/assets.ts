// The report's read side: the package's fonts and template folders, and a project's templates/.
// (The only report module besides render.ts that reads the disk.)

import { existsSync, lstatSync, readFileSync, readdirSync, realpathSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import path from 'node:path';
import { TemplateError, type TemplateFiles } from './templates.js';

/** The package root: the nearest folder above this file holding assets/fonts (src/ and dist/ alike). */
export const packageRoot = findRoot(path.dirname(fileURLToPath(import.meta.url)));

function findRoot(from: string): string {
  for (let dir = from; ; dir = path.dirname(dir)) {
    if (existsSync(path.join(dir, 'assets', 'fonts', 'DejaVuSans.ttf')) && existsSync(path.join(dir, 'templates'))) return dir;
    if (path.dirname(dir) === dir) throw new Error(`internal error: no assets/fonts and templates/ above ${from}`);
  }
}

export const defaultTemplatesDir = path.join(packageRoot, 'templates');

export const fontFiles = {
  normal: path.join(packageRoot, 'assets/fonts/DejaVuSans.ttf'),
  bold: path.join(packageRoot, 'assets/fonts/DejaVuSans-Bold.ttf'),
  italics: path.join(packageRoot, 'assets/fonts/DejaVuSans-Oblique.ttf'),
  bolditalics: path.join(packageRoot, 'assets/fonts/DejaVuSans-BoldOblique.ttf'),
} as const;

export type FontFace = keyof typeof fontFiles;

export function readFonts(): Record<FontFace, Buffer> {
  return {
    normal: readFileSync(fontFiles.normal),
    bold: readFileSync(fontFiles.bold),
    italics: readFileSync(fontFiles.italics),
    bolditalics: readFileSync(fontFiles.bolditalics),
  };
}

/** The largest template file read (a template is a page of wording, not data). */
const MAX_TEMPLATE_BYTES = 1 << 20;

/**
 * Every *.hbs under `dir`, keyed by posix path relative to `dir`, in sorted order. `dir` is a
 * project's templates/ folder (or the package's): a symbolic link, the folder itself included, must
 * stay inside the folder that holds `dir` (the project), every file must be a regular file of UTF-8
 * text up to 1 MiB; anything else is a TemplateError naming the file.
 */
export function readTemplateFiles(dir: string): TemplateFiles {
  const out = new Map<string, string>();
  const shown = (rel: string): string => (rel ? `${dir}/${rel}` : dir);
  const fail = (rel: string, detail: string): never => {
    throw new TemplateError(shown(rel), detail);
  };
  const code = (err: unknown): string => String((err as NodeJS.ErrnoException).code ?? (err as Error).message);
  let root: string;
  try {
    root = realpathSync(path.dirname(dir));
  } catch (err) {
    return fail('', `cannot be read (${code(err)})`);
  }
  const inside = (real: string): boolean => real === root || real.startsWith(root.endsWith(path.sep) ? root : root + path.sep);
  const seen = new Set<string>();
  const walk = (rel: string): void => {
    const abs = rel ? path.join(dir, rel) : dir;
    const template = rel.endsWith('.hbs');
    let real: string;
    try {
      real = realpathSync(abs);
    } catch (err) {
      if (rel && !template) return; // not a template (a broken link among notes): not read
      return fail(rel, `cannot be read (${code(err)}${lstatSync(abs, { throwIfNoEntry: false })?.isSymbolicLink() ? ': a link to nothing' : ''})`);
    }
    const st = statSync(real);
    if (rel && !template && !st.isDirectory()) return; // not a template: not read
    if (!inside(real)) return fail(rel, `is a link to ${real}, outside the project folder ${root}; templates must be inside the project`);
    if (st.isDirectory()) {
      if (seen.has(real)) return; // a link back to a folder already read
      seen.add(real);
      let names: string[];
      try {
        names = readdirSync(abs).sort();
      } catch (err) {
        return fail(rel, `cannot be read (${code(err)})`);
      }
      for (const name of names) walk(rel ? `${rel}/${name}` : name);
      return;
    }
    if (!st.isFile()) return fail(rel, 'is not a regular file');
    if (st.size > MAX_TEMPLATE_BYTES) return fail(rel, `is ${st.size} bytes; a template may hold at most ${MAX_TEMPLATE_BYTES} bytes`);
    let bytes: Buffer;
    try {
      bytes = readFileSync(real);
    } catch (err) {
      return fail(rel, `cannot be read (${code(err)})`);
    }
    let text: string;
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    } catch {
      return fail(rel, 'is not UTF-8 text');
    }
    if (text.includes('\u0000')) return fail(rel, 'holds a NUL character; a template is text');
    out.set(rel, text.replace(/^\uFEFF/, ''));
  };
  walk('');
  return out;
}
