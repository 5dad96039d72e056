// A bug in the tool says "internal error:" and keeps its stack (unlike a user error).

import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { hasStack, run, tempDir } from './run.js';

vi.mock('../../src/calc/solve.js', () => ({
  solveProject: () => {
    throw new Error('solver exploded');
  },
}));

let tmp: { dir: string; remove: () => Promise<void> };
beforeEach(async () => {
  tmp = await tempDir();
});
afterEach(async () => {
  await tmp.remove();
});

describe('internal errors', () => {
  it('print "internal error:" with the stack on stderr, exit 1, nothing on stdout', async () => {
    expect((await run(['init', 'p'], tmp.dir)).code).toBe(0);
    const r = await run(['solve', 'p', '--json'], tmp.dir);
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/^internal error: Error: solver exploded/);
    expect(hasStack(r.stderr)).toBe(true);
  });
});
