// Benchmark (not a test): `npm run bench [sizes...]`, default 10 100 1000 2000 circuits.
// For each size: generate a project (bench/generate-project.ts, invented data), then time the
// compiled command line as a user runs it:
//   solve       `faultsheet solve DIR --json` (load, validate, solve, print), median of 3
//   full build  `faultsheet build DIR --out OUT --force` (every sheet, summary, dossier)
//   per sheet   full build / circuits
//   one edit    change the length of the last final circuit, then `faultsheet build DIR --out OUT`;
//               the median of three such edits, one after the other (each 1 m longer)
//   page edit   then give that circuit forty assumptions (its sheet gains a page, so every later
//               sheet's dossier page moves), and build again: the costlier kind of one-edit rebuild
//   peak memory the largest resident set of the full build (all threads), from the OS
// Before each timed run the bench calls `sync` (untimed), so that no run pays for the writing back
// of the one before it.
// Targets (issue 5, 2-core machine): solve 2000 circuits < 2 s; full build < 0.1 s per sheet;
// one-edit rebuild of 1000 circuits < 3 s; peak memory of a 2000-circuit build < 1.5 GiB.

import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, tmpdir, totalmem } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { generateProject, lastFinalCircuitFile } from './generate-project.js';

const here = path.dirname(fileURLToPath(import.meta.url));
const bin = path.join(here, '..', 'bin', 'faultsheet.js');
const preload = path.join(here, 'peak-rss.mjs');
const sizes = process.argv.slice(2).map(Number).filter((n) => n > 0);

interface Run {
  seconds: number;
  peakMiB: number;
}

function faultsheet(args: string[], work: string): Run {
  const rssFile = path.join(work, 'rss');
  rmSync(rssFile, { force: true });
  // Each timed run starts with the disk settled: the last build's hundreds of megabytes flushed
  // (untimed), as when edits come minutes apart, not with the kernel still writing them back.
  spawnSync('sync');
  const started = performance.now();
  const r = spawnSync(process.execPath, ['--import', preload, bin, ...args], {
    env: { ...process.env, FAULTSHEET_BENCH_RSS: rssFile },
    stdio: ['ignore', 'ignore', 'pipe'],
    maxBuffer: 1 << 26,
  });
  const seconds = (performance.now() - started) / 1000;
  if (r.status !== 0) throw new Error(`faultsheet ${args.join(' ')} exited ${r.status}: ${r.stderr.toString()}`);
  return { seconds, peakMiB: Number(readFileSync(rssFile, 'utf8')) / 1024 };
}

const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

console.log(`faultsheet benchmark — ${cpus().length} × ${cpus()[0]?.model.trim() ?? 'unknown CPU'}, ${(totalmem() / 2 ** 30).toFixed(0)} GiB, node ${process.version}`);
console.log('| circuits | solve (s) | full build (s) | per sheet (s) | one-edit rebuild (s) | one edit adding a sheet page (s) | peak memory, full build (MiB) |');
console.log('|---:|---:|---:|---:|---:|---:|---:|');
for (const n of sizes.length ? sizes : [10, 100, 1000, 2000]) {
  const work = mkdtempSync(path.join(tmpdir(), `faultsheet-bench-${n}-`));
  try {
    const dir = path.join(work, 'project');
    const out = path.join(work, 'out');
    generateProject(n, dir);
    const solve = median([0, 1, 2].map(() => faultsheet(['solve', dir, '--json'], work).seconds));
    const full = faultsheet(['build', dir, '--out', out, '--force', '--quiet'], work);
    const file = lastFinalCircuitFile(n, dir);
    const edits = [0, 1, 2].map(() => {
      writeFileSync(file, readFileSync(file, 'utf8').replace(/length: (\d+) m/, (_m, l: string) => `length: ${Number(l) + 1} m`));
      return faultsheet(['build', dir, '--out', out, '--quiet'], work).seconds;
    });
    const edit = { seconds: median(edits) };
    const many = Array.from({ length: 40 }, (_, i) => `  - Assumption ${i + 1} of a long list, written to make the sheet a page longer.`).join('\n');
    writeFileSync(file, `${readFileSync(file, 'utf8').trimEnd()}\nassumptions:\n${many}\n`);
    const pageEdit = faultsheet(['build', dir, '--out', out, '--quiet'], work);
    console.log(`| ${n} | ${solve.toFixed(2)} | ${full.seconds.toFixed(1)} | ${(full.seconds / n).toFixed(3)} | ${edit.seconds.toFixed(2)} | ${pageEdit.seconds.toFixed(2)} | ${full.peakMiB.toFixed(0)} |`);
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}
