// The compiled program as a user runs it: sheets rendered on worker threads give the same files as
// rendering in the main thread, and an interrupted build (SIGINT) leaves OUT as it was.
import { spawn } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { binPath, builtFiles, demoCopy, hasStack } from './run.js';

let tmp: { dir: string; remove: () => Promise<void> };
beforeAll(async () => {
  tmp = await demoCopy('nec-480v');
});
afterAll(async () => {
  await tmp.remove();
});

interface Spawned {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

function faultsheet(args: string[], opts: { onStart?: (kill: () => void) => void } = {}): Promise<Spawned> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [binPath, ...args], { cwd: tmp.dir, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('error', reject);
    child.on('exit', (code, signal) => resolve({ code, signal, stdout, stderr }));
    opts.onStart?.(() => child.kill('SIGINT'));
  });
}

describe('the compiled program', () => {
  it('renders on two worker threads the same bytes as in the main thread', async () => {
    const pool = await faultsheet(['build', 'p', '--out', 'pool', '--jobs', '2']);
    expect(pool.stderr).toBe('');
    expect(pool.code).toBe(0);
    const serial = await faultsheet(['build', 'p', '--out', 'serial', '--jobs', '1']);
    expect(serial.code).toBe(0);
    expect(builtFiles(path.join(tmp.dir, 'pool'))).toEqual(builtFiles(path.join(tmp.dir, 'serial')));
  }, 120_000);

  it('leaves OUT as it was when the build is interrupted (SIGINT), and says so, whenever in the rendering it comes', async () => {
    const out = path.join(tmp.dir, 'pool');
    const before = builtFiles(out);
    // interrupt once the build has opened its staging folder beside OUT (it renders every sheet:
    // --force), at several moments of the rendering: a worker cut off inside the canvas addon
    // aborted the whole process with a fatal N-API error in about one interrupt in four
    for (const delay of [0, 50, 100, 150, 200, 300]) {
      const r = await faultsheet(['build', 'p', '--out', 'pool', '--force', '--quiet'], {
        onStart: (kill) => {
          const poll = setInterval(() => {
            if (readdirSync(tmp.dir).some((f) => f.startsWith('.tmp-pool-'))) {
              clearInterval(poll);
              setTimeout(kill, delay);
            }
          }, 20);
        },
      });
      expect([delay, r.signal, r.code]).toEqual([delay, null, 130]);
      expect(r.stderr).toMatch(/^interrupted: /);
      expect(hasStack(r.stderr)).toBe(false);
      expect(builtFiles(out)).toEqual(before);
      expect(readdirSync(tmp.dir).filter((f) => f.startsWith('.tmp-'))).toEqual([]);
      expect(existsSync(path.join(out, '.faultsheet-cache', 'manifest.json'))).toBe(true);
    }
  }, 180_000);
});
