// `build`: the dossier files, the closing line, --quiet, --out, --strict, and a planned-output error.

import { existsSync } from 'node:fs';
import { readFile, readdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hasStack, run, tempDir } from './run.js';

let tmp: { dir: string; remove: () => Promise<void> };
beforeAll(async () => {
  tmp = await tempDir();
  expect((await run(['init', 'p'], tmp.dir)).code).toBe(0);
});
afterAll(async () => {
  await tmp.remove();
});

describe('build', () => {
  it('writes the sheet, summary, dossier and results.json into out/, and says so in one closing line', async () => {
    const r = await run(['build', 'p', '--strict'], tmp.dir);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^1 sheet written, 0 checks failed in \d+\.\d s: p\/out\/dossier\.pdf\n$/);
    const out = path.join(tmp.dir, 'p', 'out');
    expect((await readdir(out)).sort()).toEqual(['.faultsheet-cache', 'MSB-Q1.pdf', 'dossier.pdf', 'results.json', 'summary.pdf']);
    const pdf = await readFile(path.join(out, 'dossier.pdf'));
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');

    const solved = await run(['solve', 'p', '--json'], tmp.dir);
    expect(JSON.parse(await readFile(path.join(out, 'results.json'), 'utf8'))).toEqual(JSON.parse(solved.stdout));
  });

  it('--quiet prints nothing; --out chooses the folder', async () => {
    const r = await run(['build', 'p', '--quiet', '--out', 'elsewhere'], tmp.dir);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe('');
    expect(existsSync(path.join(tmp.dir, 'elsewhere', 'dossier.pdf'))).toBe(true);
  });

  it('two circuit ids that map to one file name are an input error, and nothing is written', async () => {
    const circuits = path.join(tmp.dir, 'p', 'circuits');
    const text = await readFile(path.join(circuits, 'MSB-Q1.yaml'), 'utf8');
    await writeFile(path.join(circuits, 'clash-a.yaml'), text.replace('id: MSB-Q1', 'id: "F:1"').replace('to: DB1', 'to: DB2'));
    await writeFile(path.join(circuits, 'clash-b.yaml'), text.replace('id: MSB-Q1', 'id: "F/1"').replace('to: DB1', 'to: DB3'));
    const r = await run(['build', 'p', '--out', 'clash-out'], tmp.dir);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/^error: .*F_1/);
    expect(hasStack(r.stderr)).toBe(false);
    expect(existsSync(path.join(tmp.dir, 'clash-out'))).toBe(false);
  });

  it('an OUT below a file is an input error naming OUT, not a crash', async () => {
    expect((await run(['init', 'q'], tmp.dir)).code).toBe(0);
    await writeFile(path.join(tmp.dir, 'plain-file'), 'not a folder\n');
    const r = await run(['build', 'q', '--out', 'plain-file/out', '--quiet'], tmp.dir);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/^error: .*plain-file\/out: cannot be used as the output folder: a part of its path is a file/);
    expect(hasStack(r.stderr)).toBe(false);
  });
});
