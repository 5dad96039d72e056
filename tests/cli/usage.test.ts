// Usage: help, unknown options and commands, exit codes for usage errors.

import { describe, expect, it } from 'vitest';
import { hasStack, run } from './run.js';

describe('help', () => {
  it('lists the commands, an example and the exit codes, exit 0', async () => {
    const r = await run(['--help']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    for (const command of ['solve', 'check', 'build', 'init', 'demo']) expect(r.stdout).toContain(command);
    expect(r.stdout).toContain('Examples:');
    expect(r.stdout).toMatch(/Exit codes:[\s\S]*0[\s\S]*1[\s\S]*2/);
  });

  it.each(['solve', 'check', 'build', 'init', 'demo'])('%s --help shows an example and exits 0', async (command) => {
    const r = await run([command, '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Example:');
    expect(r.stdout).toContain(`faultsheet ${command === 'demo' ? '' : command}`.trim());
  });

  it('--version prints the version, exit 0', async () => {
    const r = await run(['--version']);
    expect(r.code).toBe(0);
    expect(r.stdout.trim()).toMatch(/^\d+\.\d+\.\d+/);
  });
});

describe('usage errors', () => {
  it('rejects an unknown option with a clear message and a hint, exit 1, nothing on stdout', async () => {
    const r = await run(['solve', 'projects-demo/iec-400v', '--frobnicate']);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain("unknown option '--frobnicate'");
    expect(r.stderr).toContain("faultsheet solve --help");
    expect(hasStack(r.stderr)).toBe(false);
  });

  it('suggests the option meant for a near miss', async () => {
    const r = await run(['solve', 'projects-demo/iec-400v', '--jsn']);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('--json');
  });

  it('rejects an unknown command, exit 1', async () => {
    const r = await run(['solvee', 'x']);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/unknown command 'solvee'/);
  });

  it('rejects a missing folder argument, exit 1', async () => {
    const r = await run(['solve']);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/missing required argument/);
  });

  it('rejects no command at all, exit 1 (usage on stderr)', async () => {
    const r = await run([]);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('Usage: faultsheet');
  });
});
