// The compiled program as a user runs it, on a one-edit rebuild: the edited sheet renders on a
// worker thread while the main thread lays out the summary with the page counts of the last build
// (report/build.ts). The files must be those of a full build of the edited project, byte for byte,
// also when the edit changes the edited sheet's page count (the summary is then laid out again), and
// whatever state the parse cache in OUT is in.
import { spawnSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { binPath, builtFiles, demoCopy } from './run.js';
import { readShapedWords } from '../../src/report/shaped-words.js';

let tmp: { dir: string; remove: () => Promise<void> };
beforeAll(async () => {
  tmp = await demoCopy('nec-480v');
});
afterAll(async () => {
  await tmp.remove();
});

/** A build's exit code, the signal that ended it if one did, and its stderr (all shown when an assertion on them fails). */
function build(out: string, ...extra: string[]): { code: number | null; signal: NodeJS.Signals | null; stderr: string } {
  const r = spawnSync(process.execPath, [binPath, 'build', 'p', '--out', out, '--quiet', '--jobs', '2', ...extra], {
    cwd: tmp.dir,
    env: { ...process.env, FAULTSHEET_TIMINGS: '1' },
    encoding: 'utf8',
  });
  return { code: r.status, signal: r.signal, stderr: r.stderr };
}

const files = (dir: string): Record<string, string> => builtFiles(path.join(tmp.dir, dir));

const circuit = (): string => path.join(tmp.dir, 'p', 'circuits', 'DP2-1.yaml');
const pages = (pdf: string): number => Number(/\/Type \/Pages[^>]*\/Count (\d+)/.exec(readFileSync(path.join(tmp.dir, pdf), 'latin1'))?.[1]);

describe('a one-edit rebuild with the sheet on a worker thread', () => {
  it('gives the bytes of a full build, whether or not the edit changes the sheet\'s page count', async () => {
    expect(build('out')).toMatchObject({ code: 0 });
    const sheetPages = pages('out/DP2-1.pdf');
    // the words the workers shaped, kept for the next build's workers (report/shaped-words.ts)
    const shapedFile = path.join(tmp.dir, 'out', '.faultsheet-cache', 'shaped.bin');
    expect(Object.keys(readShapedWords(readFileSync(shapedFile))?.faces ?? {})).toContain('normal');

    // an edit that keeps the page count: the summary laid out beside the sheet is the one kept
    writeFileSync(circuit(), readFileSync(circuit(), 'utf8').replace('length: 150 ft', 'length: 160 ft'));
    const edit = build('out');
    expect(edit).toMatchObject({ code: 0 });
    expect(edit.stderr).toMatch(/plan and cache \(1 to render, \d+ kept\)/);
    expect(edit.stderr).toMatch(/sheets \(up to \d+ worker threads\)/);
    expect(edit.stderr).toMatch(/a worker started with [1-9]\d* shaped words/); // and its sheet's bytes are a fresh worker's (below)
    expect(pages('out/DP2-1.pdf')).toBe(sheetPages);
    expect(build('full', '--force')).toMatchObject({ code: 0 });
    expect(files('out')).toEqual(files('full'));

    // an edit that adds pages to the sheet (forty assumptions): every later sheet moves in the dossier
    const many = Array.from({ length: 40 }, (_, i) => `  - Assumption ${i + 1} of a long list, written to make the sheet longer than it was.`).join('\n');
    writeFileSync(circuit(), `${readFileSync(circuit(), 'utf8')}\nassumptions:\n${many}\n`);
    expect(build('out')).toMatchObject({ code: 0 });
    expect(pages('out/DP2-1.pdf')).toBeGreaterThan(sheetPages);
    expect(build('full2', '--force')).toMatchObject({ code: 0 });
    expect(files('out')).toEqual(files('full2'));

    // the parse cache (model/parse-cache.ts) damaged in OUT: read as empty, the same bytes again
    const parsed = path.join(tmp.dir, 'out', '.faultsheet-cache', 'parsed.bin');
    const cache = readFileSync(parsed);
    expect(cache.length).toBeGreaterThan(100);
    writeFileSync(parsed, cache.subarray(0, cache.length >> 1));
    // and so the shaped words: a worker then starts with none
    const shaped = readFileSync(shapedFile);
    writeFileSync(shapedFile, shaped.subarray(0, shaped.length >> 1));
    writeFileSync(circuit(), readFileSync(circuit(), 'utf8').replace('length: 160 ft', 'length: 170 ft'));
    const damaged = build('out');
    expect(damaged).toMatchObject({ code: 0 });
    expect(damaged.stderr).toMatch(/a worker started with 0 shaped words/);
    expect(build('full3', '--force')).toMatchObject({ code: 0 });
    expect(files('out')).toEqual(files('full3'));
    expect(readFileSync(parsed).length).toBeGreaterThan(100); // written whole again
    expect(readShapedWords(readFileSync(shapedFile))).not.toBeNull();

    // an edit of the feeder of DP-2: its sheet starts on a worker first (its file changed), and the
    // four sheets of DP-2, changed by it, follow once their keys are known
    const feeder = path.join(tmp.dir, 'p', 'circuits', 'MDB-1.yaml');
    writeFileSync(feeder, readFileSync(feeder, 'utf8').replace('length: 160 ft', 'length: 180 ft'));
    const upstream = build('out');
    expect(upstream).toMatchObject({ code: 0 });
    expect(upstream.stderr).toMatch(/plan and cache \(5 to render, \d+ kept\)/);
    expect(build('full4', '--force')).toMatchObject({ code: 0 });
    expect(files('out')).toEqual(files('full4'));
  }, 180_000);
});
