// The parse cache (src/model/parse-cache.ts) must be invisible: a project read with the cache a
// previous reading left gives the same project, warnings and issues (every file, line, column and
// field) as a reading from scratch, whatever changed in between.

import { cpSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadProject, type LoadOutcome } from '../../src/model/load.js';
import { ParseCache } from '../../src/model/parse-cache.js';
import { locate, parseYamlFile } from '../../src/model/source.js';

const work = mkdtempSync(path.join(tmpdir(), 'faultsheet-parse-cache-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));
let files = 0;

/** The cache a reading of `dir` leaves, as the next build would read it from OUT. */
async function cacheAfter(dir: string, before = ParseCache.empty()): Promise<{ cache: ParseCache; outcome: LoadOutcome }> {
  const outcome = await loadProject(dir, before);
  const file = path.join(work, `parsed-${files++}.bin`);
  writeFileSync(file, before.bytes());
  return { cache: ParseCache.read(file), outcome };
}

/** The cached reading equals a reading from scratch (the project folder's path aside, which is the same). */
async function expectSameReading(dir: string, cache: ParseCache): Promise<LoadOutcome> {
  const fresh = await loadProject(dir);
  const cached = await loadProject(dir, cache);
  expect(cached).toStrictEqual(fresh);
  return fresh;
}

function copy(from: string, name: string): string {
  const dir = path.join(work, name);
  cpSync(from, dir, { recursive: true });
  return dir;
}

function firstYaml(dir: string): string {
  const found = (readdirSync(dir, { recursive: true }) as string[]).filter((f) => f.endsWith('.yaml')).sort()[0];
  if (found === undefined) throw new Error(`${dir}: no YAML file`);
  return path.join(dir, found);
}

const FIXTURES = path.resolve('tests/fixtures/model');

describe('a project read again from the parse cache', () => {
  it.each(['projects-demo/iec-400v', 'projects-demo/nec-480v'])('%s: the same project and warnings, unchanged or after an edit', async (demo) => {
    const dir = copy(demo, path.basename(demo));
    const { cache, outcome } = await cacheAfter(dir);
    expect(outcome.ok).toBe(true);
    await expectSameReading(dir, cache);
    // one circuit file edited: that file is parsed, the others come from the cache
    const name = firstYaml(path.join(dir, 'circuits'));
    const text = readFileSync(name, 'utf8');
    writeFileSync(name, `# edited\n${text}`);
    const edited = await expectSameReading(dir, cache);
    expect(edited.ok).toBe(true);
  });

  // Each fixture is a project with its own kind of bad input (tests/model/load.test.ts): the cache of a
  // good reading must not change where any of its issues is reported.
  it.each(readdirSync(FIXTURES).sort())('fixture %s: the same outcome, issues and their positions included', async (name) => {
    const dir = path.join(FIXTURES, name);
    const { cache } = await cacheAfter(dir);
    await expectSameReading(dir, cache);
  });

  it('answers a position it was not asked for last time by parsing that file again', async () => {
    const dir = copy('projects-demo/iec-400v', 'iec-new-issue');
    const { cache } = await cacheAfter(dir);
    // every circuit file is unchanged and cached; the devices file loses its devices, so every
    // circuit's `device` field is now reported, at positions the last reading never looked up
    const devices = path.join(dir, 'devices');
    for (const file of readdirSync(devices)) writeFileSync(path.join(devices, file), 'devices: []\n');
    const outcome = await expectSameReading(dir, cache);
    expect(outcome.ok).toBe(false);
    if (!outcome.ok) expect(outcome.issues.filter((i) => i.path.endsWith('device') && i.line > 1).length).toBeGreaterThan(3);
  });

  it('is an empty cache when the file is missing, damaged or not a cache', async () => {
    const dir = copy('projects-demo/nec-480v', 'nec-damaged');
    const good = path.join(work, `parsed-${files++}.bin`);
    writeFileSync(good, (await cacheAfter(dir)).cache.bytes());
    const bytes = readFileSync(good);
    const damaged = [bytes.subarray(0, bytes.length >> 1), Buffer.from('not a cache'), Buffer.alloc(0), Buffer.from(bytes).fill(0xff, 40, 80)];
    for (const [i, data] of damaged.entries()) {
      const file = path.join(work, `damaged-${i}.bin`);
      writeFileSync(file, data);
      await expectSameReading(dir, ParseCache.read(file));
    }
    await expectSameReading(dir, ParseCache.read(path.join(work, 'no-such-file.bin')));
  });

  it('keeps only files that read cleanly to plain data', async () => {
    const dir = copy('projects-demo/nec-480v', 'nec-odd-values');
    // a YAML 1.1 timestamp reads as a Date, which a copy would not give back as the loader had it
    const name = firstYaml(path.join(dir, 'circuits'));
    writeFileSync(name, `%YAML 1.1\n---\n${readFileSync(name, 'utf8')}note_date: 2020-01-01\n`);
    const before = ParseCache.empty();
    await loadProject(dir, before);
    const file = path.join(work, `parsed-${files++}.bin`);
    writeFileSync(file, before.bytes());
    const all = (readdirSync(dir, { recursive: true }) as string[]).filter((f) => f.endsWith('.yaml')).length;
    // every file but the odd one has an entry
    const { deserialize } = await import('node:v8');
    expect((deserialize(readFileSync(file)) as { entries: unknown[] }).entries).toHaveLength(all - 1);
    await expectSameReading(dir, ParseCache.read(file));
  });
});

describe('positions kept per file', () => {
  it('tells a key from its value, whichever is asked for first', () => {
    const text = 'id: C1\ncable:\n  length:\n    45 m\n';
    for (const keyFirst of [true, false]) {
      const parsed = parseYamlFile('circuits/c.yaml', text);
      if (!parsed.ok) throw new Error('does not parse');
      const ask = (key: boolean) => locate(parsed.file, ['cable', 'length'], { key });
      const [first, second] = keyFirst ? [ask(true), ask(false)] : [ask(false), ask(true)];
      const [key, value] = keyFirst ? [first, second] : [second, first];
      expect(key).toEqual({ line: 3, col: 3 });
      expect(value).toEqual({ line: 4, col: 5 });
      expect(ask(true)).toEqual(key);
      expect(ask(false)).toEqual(value);
    }
  });
});
