// Atomic output: every file of a build is written into a staging folder beside OUT (same
// filesystem), then the folder is swapped into place with renames. Until the swap OUT is not
// touched; if the swap fails the old OUT is put back. A failed build leaves OUT as it was.

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

export interface Staging {
  readonly dir: string;
  readonly outDir: string;
  write(name: string, data: Uint8Array | string): Promise<void>;
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

/** Check OUT, then create a staging folder beside it. Nothing in OUT is changed. */
export async function openStaging(outDir: string): Promise<Staging> {
  const out = path.resolve(outDir);
  const parent = path.dirname(out);
  const base = path.basename(out);
  const st = await existing(out);
  if (st && !st.isDirectory()) throw new OutputDirError(`${outDir}: exists and is not a folder`);
  if (st) {
    const foreign: string[] = [];
    for (const entry of (await readdir(out, { withFileTypes: true })).sort((a, b) => (a.name < b.name ? -1 : 1)))
      if (!entry.isFile() || !OWN_FILE.test(entry.name)) foreign.push(entry.name + (entry.isDirectory() ? '/' : ''));
    if (foreign.length)
      throw new OutputDirError(
        `${outDir}: holds ${foreign.length === 1 ? 'an entry' : 'entries'} a build did not write (${foreign.slice(0, 5).join(', ')}${foreign.length > 5 ? ', …' : ''}); a build replaces the whole folder, so choose an empty folder or a previous output folder`,
      );
  }
  await mkdir(parent, { recursive: true });
  const dir = await mkdtemp(path.join(parent, `.tmp-${base}-`));
  await chmod(dir, 0o755); // mkdtemp makes it private; OUT is an ordinary folder
  let done = false;
  return {
    dir,
    outDir: out,
    async write(name, data) {
      if (done) throw new Error('internal error: staging already committed or discarded');
      if (name !== path.basename(name) || name === '.' || name === '..') throw new Error(`internal error: bad output name ${name}`);
      await writeFile(path.join(dir, name), data, { flag: 'wx' });
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
