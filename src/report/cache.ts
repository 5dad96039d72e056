// The build cache: which sheets in OUT can be kept. A sheet is rendered again only when something it
// shows has changed: its circuit (input and result, the result carrying every upstream fault level),
// its device and supply, the project header, settings, defaults, assumptions and sign-off, its
// position "sheet n of N", the templates, or the tool (its version and the code that draws a sheet).
//
// The cache is OUT/.faultsheet-cache/manifest.json: for each sheet file, the key it was rendered for,
// its page count and the size and modification time the file had. Deleting it is always safe: the
// next build renders everything. A manifest that cannot be read is treated as missing.

import { createHash } from 'node:crypto';
import { existsSync, readFileSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createRequire } from 'node:module';
import type { Project } from '../model/types.js';
import type { CircuitResult } from '../calc/types.js';
import type { TemplateSet } from './templates.js';
import { sheetInputHash } from './fingerprint.js';
import type { DossierReuse, PartRecord } from './dossier.js';
import { DOSSIER_FILE, SUMMARY_FILE } from './plan.js';

export const CACHE_DIR = '.faultsheet-cache';
export const MANIFEST_FILE = 'manifest.json';
const FORMAT = 4;

export interface CachedSheet {
  key: string;
  pages: number;
  size: number;
  mtimeMs: number;
}

export interface Manifest {
  format: typeof FORMAT;
  sheets: Record<string, CachedSheet>; // by sheet file name
  summaryPages: number;
  /** The summary's parts in order (build.ts), each a PDF in the cache folder. */
  summaryParts: Array<{ key: string; pages: number; file: string }>;
  /** The dossier as written, and where each part lies in it (dossier.ts PartRecord). */
  dossier?: JoinedFile;
  /** summary.pdf as joined from the parts, and where each part lies in it. */
  summary?: JoinedFile;
}

export interface JoinedFile {
  size: number;
  mtimeMs: number;
  records: Record<string, PartRecord>;
}

export function emptyManifest(): Manifest {
  return { format: FORMAT, sheets: {}, summaryPages: 1, summaryParts: [] };
}

/** The manifest of a previous build in `outDir`, or null (none, or not readable as one). */
export function readManifest(outDir: string): Manifest | null {
  try {
    const m = JSON.parse(readFileSync(path.join(outDir, CACHE_DIR, MANIFEST_FILE), 'utf8')) as Manifest;
    if (m?.format !== FORMAT || typeof m.sheets !== 'object' || m.sheets === null || !Array.isArray(m.summaryParts)) return null;
    return m;
  } catch {
    return null;
  }
}

/** True if `file` is still the file a build wrote with this size and modification time. */
function unchanged(file: string, seen: { size: number; mtimeMs: number }): boolean {
  try {
    const st = statSync(file);
    return st.isFile() && st.size === seen.size && st.mtimeMs === seen.mtimeMs;
  } catch {
    return false;
  }
}

/** The previous build's file for `file` if it is still the one it wrote for `key`. */
export function reusable(outDir: string, manifest: Manifest | null, file: string, key: string): CachedSheet | null {
  const entry = manifest && Object.hasOwn(manifest.sheets, file) ? manifest.sheets[file] : undefined;
  if (!entry || entry.key !== key || !(entry.pages >= 1)) return null;
  return unchanged(path.join(outDir, file), entry) ? entry : null;
}

/** The previous build's dossier or summary.pdf and where its parts lie, if the file is still the one it wrote. */
export function previousJoined(outDir: string, manifest: Manifest | null, which: 'dossier' | 'summary'): DossierReuse | undefined {
  const file = path.join(outDir, which === 'dossier' ? DOSSIER_FILE : SUMMARY_FILE);
  const seen = manifest?.[which];
  return seen && typeof seen.records === 'object' && seen.records !== null && unchanged(file, seen) ? { path: file, records: new Map(Object.entries(seen.records)) } : undefined;
}

/** The previous build's summary part laid out for `key`, if its file is still in the cache. */
export function cachedSummaryPart(outDir: string, manifest: Manifest | null, key: string): { key: string; pages: number; file: string } | undefined {
  const before = manifest?.summaryParts.find((p) => p.key === key);
  if (!before || !(before.pages >= 1) || !/^summary-[0-9a-f]{16}\.pdf$/.test(before.file) || !existsSync(path.join(outDir, CACHE_DIR, before.file))) return undefined;
  return { key, pages: before.pages, file: before.file };
}

let toolPrint: string | null = null;

/**
 * The tool's fingerprint: its version, the versions of the libraries that draw, and the compiled
 * code of the report itself (so a changed drawing routine renders again even without a new version).
 */
export function toolFingerprint(): string {
  if (toolPrint) return toolPrint;
  const h = createHash('sha256');
  const here = path.dirname(fileURLToPath(import.meta.url));
  const require = createRequire(import.meta.url);
  for (const pkg of ['../../package.json', 'pdfmake/package.json', 'chart.js/package.json', 'canvas/package.json', '@pdf-lib/standard-fonts/package.json']) {
    try {
      const file = pkg.startsWith('.') ? path.join(here, pkg) : require.resolve(pkg);
      h.update(`${pkg}:${(JSON.parse(readFileSync(file, 'utf8')) as { version?: string }).version ?? ''}\n`);
    } catch {
      h.update(`${pkg}:?\n`);
    }
  }
  for (const name of readdirSync(here).sort()) if (/\.(js|ts)$/.test(name)) h.update(name).update(readFileSync(path.join(here, name)));
  toolPrint = h.digest('hex');
  return toolPrint;
}

/** The fingerprint of a template set (every file, the package's and the project's). */
export function templatesFingerprint(templates: TemplateSet): string {
  const h = createHash('sha256');
  const files = templates.files();
  for (const [label, set] of [['default', files.defaults], ['project', files.overrides]] as const)
    for (const name of [...set.keys()].sort()) h.update(`${label}:${name}\n`).update(set.get(name)!).update('\n');
  h.update(files.overrideRoot);
  return h.digest('hex');
}

/**
 * What every sheet of the project shows besides what it is computed from (fingerprint.ts): the tool
 * and the templates. A project template that prints the whole project's input hash (project.hash)
 * makes every sheet depend on every input file, and the hash is then part of every key.
 */
export function projectFingerprint(project: Project, templates: TemplateSet): string {
  const usesProjectHash = [...templates.files().overrides.values()].some((text) => /project\.hash/.test(text));
  return createHash('sha256')
    .update(toolFingerprint())
    .update(templatesFingerprint(templates))
    .update(usesProjectHash ? project.inputSha256 : '')
    .digest('hex');
}

/** The key of one sheet: the project's fingerprint (tool, templates), its place, and what it is computed from. */
export function sheetKey(projectPrint: string, project: Project, cr: CircuitResult, index: number, count: number): string {
  return createHash('sha256').update(projectPrint).update(`${index}/${count}\n`).update(sheetInputHash(project, cr)).digest('hex');
}
