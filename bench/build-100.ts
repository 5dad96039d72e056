// Benchmark (not a test): build the dossier of a 100-circuit project and report the time per sheet.
// Target: at most 0.25 s per sheet on a 2-core machine, summary and dossier included.
//
//   npx tsc -p bench/tsconfig.json && node node_modules/.cache/faultsheet-bench/bench/build-100.js [circuits] [out] [jobs]
//
// jobs: sheet processes (default: the build's own choice; 1 renders in process). With
// FAULTSHEET_BENCH_COMPARE=1 the project is built a second time in process and the two outputs
// are compared byte for byte (parallel and serial rendering must give the same files).
//
// The project is the report fixture (tests/fixtures/report/project.ts) with its four circuits
// repeated under new ids until there are [circuits] of them (default 100).

import { mkdtempSync, readFileSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { buildDossier } from '../src/report/build.js';
import { fixtureProject, fixtureResult, fixtureResultsJson } from '../tests/fixtures/report/project.js';
import type { Project } from '../src/model/types.js';
import type { ProjectResult } from '../src/calc/types.js';

function scaled(n: number): { project: Project; result: ProjectResult } {
  const project = fixtureProject();
  const result = fixtureResult();
  const baseCircuits = project.circuits;
  const baseResults = result.circuits;
  project.circuits = [];
  result.circuits = [];
  for (let i = 0; project.circuits.length < n; i++) {
    const k = i % baseCircuits.length;
    const tag = String(Math.floor(i / baseCircuits.length) + 1).padStart(2, '0');
    const c = structuredClone(baseCircuits[k]);
    const r = structuredClone(baseResults[k]);
    c.id = r.id = `${baseCircuits[k].id}-${tag}`;
    c.description = r.description = `${baseCircuits[k].description} (${tag})`;
    project.circuits.push(c);
    result.circuits.push(r);
  }
  const byId = (a: { id: string }, b: { id: string }): number => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0);
  project.circuits.sort(byId);
  result.circuits.sort(byId);
  return { project, result };
}

async function main(): Promise<void> {
  const n = Number(process.argv[2] ?? 100);
  const keep = !!process.argv[3] && process.argv[3] !== '-';
  const out = keep ? process.argv[3] : path.join(mkdtempSync(path.join(tmpdir(), 'faultsheet-bench-')), 'out');
  const jobs = process.argv[4] ? Number(process.argv[4]) : undefined;
  const { project, result } = scaled(n);
  const t0 = performance.now();
  let firstSheet = 0;
  let lastSheet = 0;
  await buildDossier(project, result, fixtureResultsJson(project, result), out, {
    jobs,
    onProgress: (done, all) => {
      if (done === 1) firstSheet = performance.now() - t0;
      if (done === all) lastSheet = performance.now() - t0;
    },
  });
  const total = (performance.now() - t0) / 1000;
  const files = readdirSync(out);
  const bytes = files.reduce((s, f) => s + statSync(path.join(out, f)).size, 0);
  console.log(`${n} circuits: ${total.toFixed(2)} s total, ${(total / n).toFixed(3)} s per sheet (first sheet incl. start-up ${(firstSheet / 1000).toFixed(2)} s, all sheets ${(lastSheet / 1000).toFixed(2)} s, summary + dossier + swap ${(total - lastSheet / 1000).toFixed(2)} s)`);
  console.log(`${files.length} files, ${(bytes / 1e6).toFixed(1)} MB, dossier ${(statSync(path.join(out, 'dossier.pdf')).size / 1e6).toFixed(1)} MB in ${out}`);
  if (process.env.FAULTSHEET_BENCH_COMPARE === '1') {
    const again = path.join(mkdtempSync(path.join(tmpdir(), 'faultsheet-bench-')), 'out');
    const t1 = performance.now();
    await buildDossier(project, result, fixtureResultsJson(project, result), again, { jobs: 1 });
    console.log(`in process: ${((performance.now() - t1) / 1000).toFixed(2)} s`);
    const differ = files.filter((f) => !readFileSync(path.join(out, f)).equals(readFileSync(path.join(again, f))));
    console.log(differ.length ? `DIFFERENT: ${differ.join(', ')}` : 'byte-identical to the in-process build');
    rmSync(path.dirname(again), { recursive: true, force: true });
    if (differ.length) process.exitCode = 1;
  }
  if (!keep) rmSync(path.dirname(out), { recursive: true, force: true });
}

main().catch((err) => {
  console.error(err);
  process.exitCode = 1;
});
