// `init` writes a project that `check` and `solve` accept; input errors name file:line:col, no stack.

import { existsSync } from 'node:fs';
import { readFile, readdir, stat, writeFile, mkdir } from 'node:fs/promises';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { hasStack, run, tempDir } from './run.js';

let tmp: { dir: string; remove: () => Promise<void> };
beforeEach(async () => {
  tmp = await tempDir();
});
afterEach(async () => {
  await tmp.remove();
});

describe('init', () => {
  it('creates a project folder that check accepts', async () => {
    const r = await run(['init', 'new-project'], tmp.dir);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const project = path.join(tmp.dir, 'new-project');
    expect(existsSync(path.join(project, 'project.yaml'))).toBe(true);
    expect((await readdir(path.join(project, 'devices'))).filter((f) => f.endsWith('.yaml'))).toHaveLength(1);
    expect((await readdir(path.join(project, 'circuits'))).filter((f) => f.endsWith('.yaml'))).toHaveLength(1);

    const check = await run(['check', 'new-project'], tmp.dir);
    expect(check.stderr).toBe('');
    expect(check.code).toBe(0);
    expect(check.stdout).toBe('3 files, 1 circuit: no problems\n');
  });

  it('makes an ordinary folder that colleagues can read (the umask decides, not a private temp folder)', async () => {
    await run(['init', 'shared'], tmp.dir);
    const mode = (await stat(path.join(tmp.dir, 'shared'))).mode & 0o777;
    expect(mode).toBe(0o777 & ~process.umask());
  });

  it('puts an editor schema hint at the top of every file, pointing at a shipped schema', async () => {
    await run(['init', 'p'], tmp.dir);
    const project = path.join(tmp.dir, 'p');
    for (const rel of ['project.yaml', 'devices/devices.yaml', 'circuits/MSB-Q1.yaml']) {
      const file = path.join(project, rel);
      const first = (await readFile(file, 'utf8')).split('\n')[0]!;
      const match = /^# yaml-language-server: \$schema=(.+)$/.exec(first);
      expect(match, rel).not.toBeNull();
      const target = path.resolve(path.dirname(file), match![1]!);
      expect(existsSync(target), `${rel} -> ${target}`).toBe(true);
    }
  });

  it('gives a project whose one circuit passes every check (solve --strict exits 0)', async () => {
    await run(['init', 'p'], tmp.dir);
    const r = await run(['solve', 'p', '--strict'], tmp.dir);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Every check passes.');
  });

  it('refuses a folder that is not empty, and leaves it as it was', async () => {
    const dir = path.join(tmp.dir, 'busy');
    await mkdir(dir);
    await writeFile(path.join(dir, 'notes.txt'), 'keep me\n');
    const r = await run(['init', 'busy'], tmp.dir);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/^error: .*busy is not empty/);
    expect(hasStack(r.stderr)).toBe(false);
    expect(await readdir(dir)).toEqual(['notes.txt']);
    expect(await readFile(path.join(dir, 'notes.txt'), 'utf8')).toBe('keep me\n');
    expect((await readdir(tmp.dir)).filter((n) => n.startsWith('.'))).toEqual([]); // no temporary left behind
  });

  it('writes into an existing empty folder', async () => {
    await mkdir(path.join(tmp.dir, 'empty'));
    const r = await run(['init', 'empty'], tmp.dir);
    expect(r.code).toBe(0);
    expect(existsSync(path.join(tmp.dir, 'empty', 'project.yaml'))).toBe(true);
  });
});

describe('input errors', () => {
  it('name file:line:col and the field, one line each, exit 1, no stack, nothing on stdout', async () => {
    await run(['init', 'p'], tmp.dir);
    const circuit = path.join(tmp.dir, 'p', 'circuits', 'MSB-Q1.yaml');
    const lines = (await readFile(circuit, 'utf8')).split('\n');
    const lengthLine = lines.findIndex((l) => /^\s+length: 40 m/.test(l));
    expect(lengthLine).toBeGreaterThan(0);
    lines[lengthLine] = lines[lengthLine]!.replace('40 m', '40'); // a length without its unit
    const deviceLine = lines.findIndex((l) => l.startsWith('device:'));
    lines[deviceLine] = 'device: MCCB-999'; // a device that does not exist
    await writeFile(circuit, lines.join('\n'));

    for (const command of ['check', 'solve', 'build']) {
      const r = await run([command, 'p'], tmp.dir);
      expect(r.code, command).toBe(1);
      expect(r.stdout, command).toBe('');
      expect(hasStack(r.stderr), command).toBe(false);
      expect(r.stderr).not.toContain('internal error');
      const problems = r.stderr.trimEnd().split('\n');
      expect(problems.length, r.stderr).toBeGreaterThanOrEqual(2);
      expect(r.stderr).toMatch(new RegExp(`p/circuits/MSB-Q1\\.yaml:${lengthLine + 1}:\\d+ cable\\.length:`));
      expect(r.stderr).toMatch(new RegExp(`p/circuits/MSB-Q1\\.yaml:${deviceLine + 1}:\\d+ device:`));
    }
    expect(existsSync(path.join(tmp.dir, 'p', 'out'))).toBe(false); // build wrote nothing
  });

  it('a folder that does not exist is one clear line, exit 1', async () => {
    const r = await run(['check', 'no-such-folder'], tmp.dir);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(hasStack(r.stderr)).toBe(false);
    expect(r.stderr).toContain('no-such-folder');
  });
});
