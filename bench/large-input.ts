// Measures loading (read, parse, validate, normalise, cross-checks; no solve) of large project folders:
// 500 against 5000 circuit files, a 2 MB against a 20 MB single circuits file, and the refusal of
// hostile YAML (alias count, a doubling merge-key chain, a long merge-key chain, a mapping of many
// keys). Prints times and ratios; linear loading gives a ratio near 10 for ten times the input.
// A benchmark, not a test: nothing is asserted.
//   node --expose-gc --import tsx bench/large-input.ts     (without --expose-gc the heap figures include garbage)
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadProject } from '../src/model/load.js';
import { parseYamlFile } from '../src/model/source.js';

const PROJECT = `project:
  name: Large input benchmark (synthetic)
  number: BENCH-LARGE
  revision: A
  date: 2026-11-20
settings:
  system_voltage: 400 V
  earthing: TN-S
supplies:
  - id: TX1
    feeds: MSB
    network: { voltage: 11 kV, fault_level: 250 MVA }
    transformer: { rating: 1600 kVA, primary_voltage: 11 kV, secondary_voltage: 400 V, impedance: 6 %, load_losses: 14 kW }
`;

const DEVICES = `devices:
  - id: MCCB-250
    kind: mccb
    rating: 250 A
    breaking_capacity: 50 kA
    instantaneous: { pickup: 10 x In, clearing_time: 10 ms }
    trip_curve: { current_unit: x In, time_unit: s, points: [[1.3, 3600], [3, 60], [9.9, 5]] }
    let_through: { current_unit: kA, energy_unit: A^2 s, points: [[5, 1.5e5], [20, 4.0e5], [50, 8.0e5]] }
  - id: MCB-C32
    kind: mcb
    rating: 32 A
    breaking_capacity: 10 kA
    instantaneous: { pickup: 10 x In, clearing_time: 10 ms }
    trip_curve: { current_unit: x In, time_unit: s, points: [[1.45, 3600], [3, 40], [9.9, 2]] }
`;

/** Circuit i of n as YAML lines: sub-mains MSB -> DBk, finals from the boards (invented data). */
function circuitLines(i: number, n: number): string[] {
  const boards = Math.max(1, Math.floor(n / 40));
  const sub = i < boards;
  const board = `DB${i % boards}`;
  const id = sub ? `MSB-F${String(i).padStart(4, '0')}` : `${board}-C${String(i).padStart(6, '0')}`;
  const lines = [
    `id: ${id}`,
    `description: ${sub ? `Sub-main to ${board}` : `Final circuit ${i} of ${board}, socket outlets and small power`}`,
    `from: ${sub ? 'MSB' : board}`,
    ...(sub ? [`to: DB${i}`] : []),
    `device: ${sub ? 'MCCB-250' : 'MCB-C32'}`,
    `load: { current: ${sub ? 160 : 10 + (i % 20)} A, power_factor: 0.9 }`,
    'cable:',
    '  conductor: copper',
    `  insulation: ${i % 2 ? 'PVC' : 'XLPE'}`,
    `  size: ${sub ? 95 : [2.5, 4, 6, 10][i % 4]} mm2`,
    `  length: ${10 + (i % 60)} m`,
    ...(i % 5 === 0 ? ['  protective_conductor: { size: 2.5 mm2, conductor: copper, arrangement: separate }'] : []),
    'assumptions:',
    `  - Route length ${10 + (i % 60)} m from the layout drawing plus 5 % (synthetic).`,
  ];
  return lines;
}

function writeProject(dir: string): void {
  mkdirSync(join(dir, 'devices'), { recursive: true });
  mkdirSync(join(dir, 'circuits'), { recursive: true });
  writeFileSync(join(dir, 'project.yaml'), PROJECT);
  writeFileSync(join(dir, 'devices', 'devices.yaml'), DEVICES);
}

function manyFiles(dir: string, n: number): number {
  writeProject(dir);
  let bytes = 0;
  for (let i = 0; i < n; i++) {
    const text = `${circuitLines(i, n).join('\n')}\n`;
    const id = /^id: (.*)$/m.exec(text)![1]!;
    writeFileSync(join(dir, 'circuits', `${id}.yaml`), text);
    bytes += text.length;
  }
  return bytes;
}

/** One circuits file of about `megabytes` MB: a list under `circuits:`. Returns the circuit count. */
function oneFile(dir: string, megabytes: number): number {
  writeProject(dir);
  const target = megabytes * 1e6;
  const perCircuit = circuitLines(1000, 100_000).join('\n    ').length + 8;
  const n = Math.ceil(target / perCircuit);
  const parts: string[] = ['circuits:\n'];
  for (let i = 0; i < n; i++) parts.push(`  - ${circuitLines(i, n).join('\n    ')}\n`);
  writeFileSync(join(dir, 'circuits', 'all.yaml'), parts.join(''));
  return n;
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

async function timeLoad(dir: string, runs: number): Promise<{ seconds: number; circuits: number; ok: boolean; heapMb: number }> {
  const times: number[] = [];
  let circuits = 0;
  let ok = false;
  let heapMb = 0;
  for (let r = 0; r < runs; r++) {
    global.gc?.();
    const before = process.memoryUsage().heapUsed;
    const t0 = performance.now();
    const outcome = await loadProject(dir);
    times.push((performance.now() - t0) / 1000);
    global.gc?.();
    heapMb = Math.max(heapMb, (process.memoryUsage().heapUsed - before) / 1e6); // what the outcome keeps
    ok = outcome.ok;
    circuits = outcome.ok ? outcome.project.circuits.length : 0;
    if (!outcome.ok) console.log(`  not loaded: ${outcome.issues[0]?.message}`);
  }
  return { seconds: median(times), circuits, ok, heapMb };
}

function timeParse(label: string, text: string): void {
  const t0 = performance.now();
  const outcome = parseYamlFile('circuits/hostile.yaml', text);
  const ms = performance.now() - t0;
  const verdict = outcome.ok ? 'read' : `refused: ${outcome.issues[0]!.message}`;
  console.log(`  ${label.padEnd(44)} ${(text.length / 1e6).toFixed(2).padStart(6)} MB ${ms.toFixed(0).padStart(6)} ms  ${verdict}`);
}

const root = mkdtempSync(join(tmpdir(), 'faultsheet-large-'));
try {
  await loadProject(join(root, 'warm-up-missing')); // imports and mathjs set up before timing
  console.log('circuit files (median of 3 loads):');
  const counts = [500, 5000];
  const files: Record<number, number> = {};
  for (const n of counts) {
    const dir = join(root, `files-${n}`);
    const bytes = manyFiles(dir, n);
    const t = await timeLoad(dir, 3);
    files[n] = t.seconds;
    console.log(`  ${String(n).padStart(5)} files, ${(bytes / 1e6).toFixed(1)} MB: ${t.seconds.toFixed(2)} s (${((1000 * t.seconds) / n).toFixed(3)} ms per circuit), ${t.circuits} circuits, the outcome keeps ${t.heapMb.toFixed(0)} MB of heap`);
  }
  console.log(`  ratio 5000/500: ${(files[5000]! / files[500]!).toFixed(2)} (10 for linear)`);

  console.log('one circuits file (median of 3 loads):');
  const sizes = [2, 20];
  const single: Record<number, number> = {};
  for (const mb of sizes) {
    const dir = join(root, `single-${mb}`);
    const n = oneFile(dir, mb);
    const t = await timeLoad(dir, 3);
    single[mb] = t.seconds;
    console.log(`  ${String(mb).padStart(2)} MB, ${n} circuits: ${t.seconds.toFixed(2)} s (${((1000 * t.seconds) / n).toFixed(3)} ms per circuit), the outcome keeps ${t.heapMb.toFixed(0)} MB of heap`);
  }
  console.log(`  ratio 20 MB/2 MB: ${(single[20]! / single[2]!).toFixed(2)} (10 for linear)`);

  console.log('hostile YAML, parse only:');
  let bomb = 'a0: &a0 [x, x, x, x, x, x, x, x, x, x]\n';
  for (let i = 1; i <= 9; i++) bomb += `a${i}: &a${i} [${Array(10).fill(`*a${i - 1}`).join(', ')}]\n`;
  timeParse('alias bomb (10^10 values)', bomb);
  for (const n of [1000, 20_000]) {
    const anchors = Array.from({ length: n }, (_, i) => `  - &n${i} v${i}\n`).join('');
    const aliases = Array.from({ length: n }, (_, i) => `  - *n${i}\n`).join('');
    timeParse(`${n} anchors each aliased once`, `x:\n${anchors}y:\n${aliases}`);
  }
  let doubling = 'a0: &a0 { k: 1 }\n';
  for (let i = 1; i <= 40; i++) doubling += `a${i}: &a${i} { <<: [*a${i - 1}, *a${i - 1}], k${i}: 1 }\n`;
  timeParse('merge-key chain doubling 40 times', doubling);
  let chain = 'a0: &a0 { k0: 1 }\n';
  for (let i = 1; i <= 5000; i++) chain += `a${i}: &a${i} { <<: *a${i - 1}, k${i}: 1 }\n`;
  timeParse('merge-key chain 5000 deep', chain);
  for (const n of [20_000, 200_000]) timeParse(`one mapping of ${n} keys`, Array.from({ length: n }, (_, i) => `k${i}: ${i}\n`).join(''));
} finally {
  rmSync(root, { recursive: true, force: true });
}
