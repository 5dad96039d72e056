// Atomic output: staging beside OUT, swap by rename, OUT untouched until the swap.
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { OutputDirError, openStaging } from '../../src/io/write.js';

let root: string;
beforeEach(() => {
  root = mkdtempSync(path.join(tmpdir(), 'fs-write-'));
});
afterEach(() => rmSync(root, { recursive: true, force: true }));

const listing = (dir: string): Record<string, string> =>
  Object.fromEntries(readdirSync(dir).sort().map((f) => [f, readFileSync(path.join(dir, f), 'utf8')]));

describe('staging', () => {
  it('creates OUT (and its parents) on commit, and leaves nothing else beside it', async () => {
    const out = path.join(root, 'deep', 'out');
    const s = await openStaging(out);
    expect(path.dirname(s.dir)).toBe(path.dirname(out)); // same folder, so the rename stays on one filesystem
    await s.write('a.pdf', 'A');
    expect(existsSync(out)).toBe(false);
    await s.commit();
    expect(listing(out)).toEqual({ 'a.pdf': 'A' });
    expect(readdirSync(path.dirname(out))).toEqual(['out']);
  });

  it('replaces a previous OUT as a whole', async () => {
    const out = path.join(root, 'out');
    mkdirSync(out);
    writeFileSync(path.join(out, 'old.pdf'), 'old');
    writeFileSync(path.join(out, 'results.json'), '{}');
    const s = await openStaging(out);
    await s.write('new.pdf', 'new');
    expect(listing(out)).toEqual({ 'old.pdf': 'old', 'results.json': '{}' }); // untouched until the swap
    await s.commit();
    expect(listing(out)).toEqual({ 'new.pdf': 'new' });
    expect(readdirSync(root)).toEqual(['out']);
  });

  it('leaves OUT as it was when discarded', async () => {
    const out = path.join(root, 'out');
    mkdirSync(out);
    writeFileSync(path.join(out, 'a.pdf'), 'before');
    const s = await openStaging(out);
    await s.write('a.pdf', 'after');
    await s.discard();
    expect(listing(out)).toEqual({ 'a.pdf': 'before' });
    expect(readdirSync(root)).toEqual(['out']);
  });

  it('refuses an OUT holding files a build did not write, or a file', async () => {
    const out = path.join(root, 'project');
    mkdirSync(path.join(out, 'circuits'), { recursive: true });
    writeFileSync(path.join(out, 'project.yaml'), 'project: {}');
    await expect(openStaging(out)).rejects.toThrow(OutputDirError);
    await expect(openStaging(out)).rejects.toThrow(/circuits\/, project\.yaml/);
    writeFileSync(path.join(root, 'file'), 'x');
    await expect(openStaging(path.join(root, 'file'))).rejects.toThrow(/not a folder/);
    expect(readdirSync(root).sort()).toEqual(['file', 'project']); // no staging folder left behind
  });

  it('puts the old OUT back if the new one cannot be moved in', async () => {
    const out = path.join(root, 'out');
    mkdirSync(out);
    writeFileSync(path.join(out, 'a.pdf'), 'before');
    const s = await openStaging(out);
    await s.write('a.pdf', 'after');
    rmSync(s.dir, { recursive: true }); // the staged folder vanishes: the rename into OUT fails
    await expect(s.commit()).rejects.toThrow();
    expect(listing(out)).toEqual({ 'a.pdf': 'before' });
  });
});
