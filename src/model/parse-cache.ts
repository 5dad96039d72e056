// The parse cache: what reading each input file's YAML gave last time, so that a rebuild after one
// edit parses only the files that changed (reading the YAML of a thousand small files costs about
// half a second; JIT warm-up most of it). `faultsheet build` keeps it in OUT/.faultsheet-cache.
//
// An entry is keyed by the file's path and bytes, and the whole cache by the code that reads YAML
// (this folder's compiled files, the tool's version and the YAML library's). It holds the file's
// value and the positions the loader looked up in it (a circuit's line on its sheet, an issue's
// line): a file taken from the cache answers those without its tree, and parses its text again only
// if asked for a position it does not have. Only files that parsed cleanly, to plain data (objects,
// arrays, text, finite numbers, booleans, null), are kept. Validation still runs on every file.
// A cache that cannot be read, or was written by other code, is an empty one.

import { createHash } from 'node:crypto';
import { readFileSync, readdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { deserialize, serialize } from 'node:v8';
import { parseYamlFile, type SourceFile, type SourceTree } from './source.js';

export const PARSE_CACHE_FILE = 'parsed.bin';
const FORMAT = 1;

interface Entry {
  value: Buffer; // the file's value, v8-serialised
  located: Array<[string, number, number]>; // position key, line, col
}

interface Stored {
  format: number;
  reader: string;
  entries: Array<[string, Entry]>;
}

let readerPrint: string | null = null;

/** The code that turns a file's bytes into its value and positions. */
function readerFingerprint(): string {
  if (readerPrint !== null) return readerPrint;
  const h = createHash('sha256');
  const here = path.dirname(fileURLToPath(import.meta.url));
  const require = createRequire(import.meta.url);
  for (const pkg of ['../../package.json', 'yaml/package.json']) {
    try {
      const file = pkg.startsWith('.') ? path.join(here, pkg) : require.resolve(pkg);
      h.update(`${pkg}:${(JSON.parse(readFileSync(file, 'utf8')) as { version?: string }).version ?? ''}\n`);
    } catch {
      h.update(`${pkg}:?\n`);
    }
  }
  for (const name of readdirSync(here).sort()) if (/\.(js|ts)$/.test(name)) h.update(name).update(readFileSync(path.join(here, name)));
  readerPrint = h.digest('hex');
  return readerPrint;
}

function entryKey(file: string, bytes: Uint8Array): string {
  return createHash('sha256').update(file).update('\0').update(bytes).digest('hex');
}

/** Plain data only: what a serialised copy gives back exactly (no dates, no non-finite numbers, no odd keys). */
function plain(value: unknown, depth = 0): boolean {
  if (value === null || typeof value === 'string' || typeof value === 'boolean') return true;
  if (typeof value === 'number') return Number.isFinite(value) && !Object.is(value, -0);
  if (depth > 64 || typeof value !== 'object') return false;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) if (!(i in value) || !plain(value[i], depth + 1)) return false;
    return true;
  }
  if (Object.getPrototypeOf(value) !== Object.prototype) return false;
  for (const key of Object.keys(value)) if (key === '__proto__' || !plain((value as Record<string, unknown>)[key], depth + 1)) return false;
  return Object.getOwnPropertyNames(value).length === Object.keys(value).length;
}

export class ParseCache {
  private readonly kept = new Map<string, { value: Buffer; file: SourceFile }>(); // by key: a second reading of the project replaces the first

  private readonly parsedAgain = new Set<string>();

  private constructor(private readonly before: ReadonlyMap<string, Entry>) {}

  /** The files this reading had to parse (changed since the cache was written); undefined for an empty cache. */
  changed(): ReadonlySet<string> | undefined {
    return this.before.size > 0 ? this.parsedAgain : undefined;
  }

  static empty(): ParseCache {
    return new ParseCache(new Map());
  }

  /** The cache a build left in `file`; an empty one if there is none or it cannot be used. */
  static read(file: string): ParseCache {
    let bytes: Buffer;
    try {
      bytes = readFileSync(file);
    } catch {
      return ParseCache.empty();
    }
    return ParseCache.from(bytes);
  }

  /** The cache written as `bytes` (by bytes()); an empty one if they are not such a cache. */
  static from(bytes: Uint8Array): ParseCache {
    try {
      const stored = deserialize(bytes) as Stored;
      if (stored?.format !== FORMAT || stored.reader !== readerFingerprint() || !Array.isArray(stored.entries)) return ParseCache.empty();
      const before = new Map<string, Entry>();
      for (const [key, entry] of stored.entries) {
        if (typeof key !== 'string' || !(entry?.value instanceof Uint8Array) || !Array.isArray(entry.located)) return ParseCache.empty();
        before.set(key, { value: Buffer.from(entry.value), located: entry.located });
      }
      return new ParseCache(before);
    } catch {
      return ParseCache.empty();
    }
  }

  /** Parse one file, or take it from the cache; a clean parse is kept for the next build. */
  parse(file: string, bytes: Uint8Array, text: () => string): ReturnType<typeof parseYamlFile> {
    const key = entryKey(file, bytes);
    const entry = this.before.get(key);
    if (entry !== undefined) {
      let value: unknown;
      try {
        value = deserialize(entry.value);
      } catch {
        value = undefined;
      }
      if (value !== undefined) {
        const located = new Map<string, { line: number; col: number }>();
        for (const [where, line, col] of entry.located) if (typeof where === 'string' && Number.isInteger(line) && Number.isInteger(col)) located.set(where, { line, col });
        let tree: SourceTree | undefined;
        const source: SourceFile = {
          path: file,
          value,
          located,
          tree: () => (tree ??= treeOf(file, text())),
        };
        this.kept.set(key, { value: entry.value, file: source });
        return { ok: true, file: source, issues: [] };
      }
    }
    this.parsedAgain.add(file);
    const parsed = parseYamlFile(file, text());
    if (parsed.ok && parsed.issues.length === 0 && plain(parsed.file.value)) this.kept.set(key, { value: serialize(parsed.file.value), file: parsed.file });
    return parsed;
  }

  /** The cache for the next build: the files of this one, with every position looked up in them. */
  bytes(): Buffer {
    const entries: Array<[string, Entry]> = [...this.kept].map(([key, { value, file }]) => [key, { value, located: [...file.located].map(([where, pos]) => [where, pos.line, pos.col]) }]);
    return serialize({ format: FORMAT, reader: readerFingerprint(), entries } satisfies Stored);
  }
}

function treeOf(file: string, text: string): SourceTree {
  const parsed = parseYamlFile(file, text);
  if (!parsed.ok) throw new Error(`internal error: ${file} parsed cleanly before and not now`);
  return parsed.file.tree();
}
