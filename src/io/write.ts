// Atomic output: every file of a build is written into a staging folder beside OUT (same
// filesystem), then the folder is swapped into place with renames. Until the swap OUT is not
// touched; if the swap fails the old OUT is put back. A failed build leaves OUT as it was.

import { copyFileSync, linkSync } from 'node:fs';
import { chmod, mkdir, mkdtemp, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';

/** OUT cannot be used (not a folder, or holding files a build did not write). */
export class OutputDirError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'OutputDirError';
  }
}

/** Names a previous build may have left in OUT; anything else means OUT is not ours to replace. */
const OWN_FILE = /^(?:[A-Za-z0-9._-]+\.pdf|results\.json)$/;
/** The build cache's folder in OUT (src/report/cache.ts), and the names it holds. */
export const CACHE_FOLDER = '.faultsheet-cache';
const CACHE_FILE = /^(?:manifest\.json|parsed\.bin|shaped\.bin|summary-[0-9a-f]{16}\.pdf)$/;

export interface Staging {
  readonly dir: string;
  readonly outDir: string;
  /** Write a new file `name` (a plain file name, or `.faultsheet-cache/<name>`). */
  write(name: string, data: Uint8Array | string): Promise<void>;
  /** Take `from` (a file of the previous OUT) as `name`, by a hard link where the filesystem allows. */
  adopt(name: string, from: string): Promise<void>;
  /** The path of a new file `name`, for a writer that streams into it itself. */
  pathOf(name: string): string;
  /** Size and modification time of a file already staged. */
  stat(name: string): Promise<import('node:fs').Stats>;
  /** Take back a file staged so far (to write it again). */
  remove(name: string): Promise<void>;
  /** Swap the staged folder into OUT. */
  commit(): Promise<void>;
  /** Remove the staged folder; OUT is untouched. */
  discard(): Promise<void>;
}

async function existing(p: string): Promise<import('node:fs').Stats | null> {
  try {
    return await stat(p);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw err;
  }
}

/** A filesystem refusal while preparing OUT, as a user error naming OUT. */
function outProblem(outDir: string, err: unknown): Error {
  const code = (err as NodeJS.ErrnoException)?.code;
  const why: Record<string, string> = {
    ENOTDIR: 'a part of its path is a file, not a folder',
    EACCES: 'permission denied',
    EPERM: 'permission denied',
    EROFS: 'the filesystem is read-only',
    ENOSPC: 'no space left on the device',
    EEXIST: 'a part of its path is a file, not a folder',
    ENAMETOOLONG: 'the path is too long',
    ELOOP: 'too many symbolic links in the path',
  };
  return code && why[code] ? new OutputDirError(`${outDir}: cannot be used as the output folder: ${why[code]}`) : (err as Error);
}

/** Check OUT, then create a staging folder beside it. Nothing in OUT is changed. */
export async function openStaging(outDir: string): Promise<Staging> {
  try {
    return await open(outDir);
  } catch (err) {
    throw err instanceof OutputDirError ? err : outProblem(outDir, err);
  }
}

async function open(outDir: string): Promise<Staging> {
  const out = path.resolve(outDir);
  const parent = path.dirname(out);
  const base = path.basename(out);
  const st = await existing(out);
  if (st && !st.isDirectory()) throw new OutputDirError(`${outDir}: exists and is not a folder`);
  if (st) {
    const foreign: string[] = [];
    for (const entry of (await readdir(out, { withFileTypes: true })).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      if (entry.isDirectory() && entry.name === CACHE_FOLDER) {
        for (const inner of await readdir(path.join(out, CACHE_FOLDER), { withFileTypes: true }))
          if (!inner.isFile() || !CACHE_FILE.test(inner.name)) foreign.push(`${CACHE_FOLDER}/${inner.name}${inner.isDirectory() ? '/' : ''}`);
        continue;
      }
      if (!entry.isFile() || !OWN_FILE.test(entry.name)) foreign.push(entry.name + (entry.isDirectory() ? '/' : ''));
    }
    if (foreign.length)
      throw new OutputDirError(
        `${outDir}: holds ${foreign.length === 1 ? 'an entry' : 'entries'} a build did not write (${foreign.slice(0, 5).join(', ')}${foreign.length > 5 ? ', …' : ''}); a build replaces the whole folder, so choose an empty folder or a previous output folder`,
      );
  }
  await mkdir(parent, { recursive: true });
  const dir = await mkdtemp(path.join(parent, `.tmp-${base}-`));
  await chmod(dir, 0o755); // mkdtemp makes it private; OUT is an ordinary folder
  let done = false;
  let cacheMade = false;
  const target = (name: string): string => {
    if (done) throw new Error('internal error: staging already committed or discarded');
    const inCache = name.startsWith(`${CACHE_FOLDER}/`) && CACHE_FILE.test(name.slice(CACHE_FOLDER.length + 1));
    if (!inCache && (name !== path.basename(name) || !OWN_FILE.test(name))) throw new Error(`internal error: bad output name ${name}`);
    return path.join(dir, name);
  };
  const cacheFolderFor = async (name: string): Promise<void> => {
    if (cacheMade || !name.startsWith(`${CACHE_FOLDER}/`)) return;
    await mkdir(path.join(dir, CACHE_FOLDER), { mode: 0o755 });
    cacheMade = true;
  };
  return {
    dir,
    outDir: out,
    async write(name, data) {
      const file = target(name);
      await cacheFolderFor(name);
      await writeFile(file, data, { flag: 'wx' });
    },
    async adopt(name, from) {
      const file = target(name);
      await cacheFolderFor(name);
      // synchronous: a thousand links take about 20 ms so, against 40 to 250 ms through the thread pool
      try {
        linkSync(from, file);
      } catch {
        copyFileSync(from, file, 1 /* COPYFILE_EXCL */);
      }
    },
    pathOf(name) {
      return target(name);
    },
    stat(name) {
      return stat(target(name));
    },
    remove(name) {
      return rm(target(name));
    },
    async commit() {
      if (done) throw new Error('internal error: staging already committed or discarded');
      done = true;
      const aside = `${dir}-old`;
      const hadOut = (await existing(out)) != null;
      if (hadOut) await rename(out, aside);
      try {
        await rename(dir, out);
      } catch (err) {
        if (hadOut) await rename(aside, out);
        await rm(dir, { recursive: true, force: true });
        throw err;
      }
      // The new OUT is in place; the old one is only clutter now.
      if (hadOut) await rm(aside, { recursive: true, force: true }).catch(() => undefined);
    },
    async discard() {
      if (done) return;
      done = true;
      await rm(dir, { recursive: true, force: true });
    },
  };
}
