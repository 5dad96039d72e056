// The report's read side: the package's fonts and template folders, and a project's templates/.
// (The only report module besides render.ts that reads the disk.)

import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import path from 'node:path';
import type { TemplateFiles } from './templates.js';

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

/** Every *.hbs under `dir`, keyed by posix path relative to `dir`, in sorted order. */
export function readTemplateFiles(dir: string): TemplateFiles {
  const out = new Map<string, string>();
  const walk = (rel: string): void => {
    const abs = path.join(dir, rel);
    for (const name of readdirSync(abs).sort()) {
      const relChild = rel ? `${rel}/${name}` : name;
      const st = statSync(path.join(abs, name));
      if (st.isDirectory()) walk(relChild);
      else if (name.endsWith('.hbs')) out.set(relChild, readFileSync(path.join(abs, name), 'utf8'));
    }
  };
  walk('');
  return out;
}
