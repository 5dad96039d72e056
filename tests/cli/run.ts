// Runs the command line in-process with fake streams (faster than spawning a process).

import { Writable } from 'node:stream';
import { cpSync, readFileSync, readdirSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { main } from '../../src/cli.js';

export const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
export const demoDir = (name: string) => path.join(repoRoot, 'projects-demo', name);

export interface Captured {
  stream: Writable & { isTTY?: boolean };
  text: () => string;
}

export function capture(isTTY = false): Captured {
  let text = '';
  const stream = new Writable({
    write(chunk, _encoding, done) {
      text += chunk.toString();
      done();
    },
  }) as Writable & { isTTY?: boolean };
  stream.isTTY = isTTY;
  return { stream, text: () => text };
}

export interface RunResult {
  code: number;
  stdout: string;
  stderr: string;
}

export async function run(argv: string[], cwd = repoRoot): Promise<RunResult> {
  const out = capture();
  const err = capture();
  const code = await main({ argv, cwd, stdout: out.stream, stderr: err.stream });
  return { code, stdout: out.text(), stderr: err.text() };
}

/** A fresh temporary folder, removed by the returned function. */
export async function tempDir(): Promise<{ dir: string; remove: () => Promise<void> }> {
  const dir = await mkdtemp(path.join(os.tmpdir(), 'faultsheet-cli-'));
  return { dir, remove: () => rm(dir, { recursive: true, force: true }) };
}

/** The compiled command line, as a user runs it (tests that need worker threads spawn it). */
export const binPath = path.join(repoRoot, 'bin', 'faultsheet.js');

/** A temporary folder holding a copy of a demo project as `p` (without its out/ folder). */
export async function demoCopy(name: string): Promise<{ dir: string; remove: () => Promise<void> }> {
  const tmp = await tempDir();
  cpSync(demoDir(name), path.join(tmp.dir, 'p'), { recursive: true, filter: (src) => !src.includes(`${path.sep}out`) });
  return tmp;
}

/** The files a build wrote into `dir` (not the cache folder), by name, as base64: to compare two builds. */
export function builtFiles(dir: string): Record<string, string> {
  return Object.fromEntries(
    readdirSync(dir)
      .filter((f) => f !== '.faultsheet-cache')
      .sort()
      .map((f) => [f, readFileSync(path.join(dir, f)).toString('base64')]),
  );
}

/** True where text looks like a JavaScript stack trace. */
export function hasStack(text: string): boolean {
  return /^\s+at .+[:(]/m.test(text);
}
