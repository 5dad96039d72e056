// Measures `faultsheet solve DIR --json` on generated projects of 10 and 1000 circuits (wall time of the
// whole command, median of 5 runs). Run after `npm run build`:  npx tsx bench/solve-scaling.ts
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const root = mkdtempSync(join(tmpdir(), 'faultsheet-bench-'));
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const results: Record<number, number> = {};
try {
  for (const n of [10, 1000]) {
    const dir = join(root, `p${n}`);
    execFileSync('npx', ['tsx', 'bench/generate-project.ts', String(n), dir], { stdio: 'ignore' });
    const times: number[] = [];
    for (let i = 0; i < 5; i++) {
      const t0 = performance.now();
      const run = spawnSync('node', ['bin/faultsheet.js', 'solve', dir, '--json'], { maxBuffer: 1 << 28 });
      if (run.status !== 0) throw new Error(`solve failed: ${run.stderr}`);
      times.push((performance.now() - t0) / 1000);
    }
    results[n] = median(times);
    console.log(`${n} circuits: ${results[n]!.toFixed(2)} s (median of 5)`);
  }
  console.log(`ratio 1000/10: ${(results[1000]! / results[10]!).toFixed(2)} (target <= 3, and 1000 circuits < 5 s)`);
} finally {
  rmSync(root, { recursive: true, force: true });
}
