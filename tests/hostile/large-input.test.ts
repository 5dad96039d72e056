// Large and deep inputs load and solve cleanly (correctness only: timings are for bench/large-input.ts).
// Thousands of circuit files, a board chain thousands deep (once a stack overflow), and the messages
// of broken large projects: one line each of bounded length (once a chain of every board per line).

import { describe, expect, it } from 'vitest';
import { outcomeProblems, runPipeline, type TextFile } from './harness.js';
import { buildProject } from '../../src/model/load.js';
import { folderOf } from './harness.js';
import { propagate } from '../../src/calc/network.js';

const PROJECT = (feeds: string) => `project: { name: Large input (synthetic), number: L-1, revision: A, date: 2026-11-20 }
settings: { system_voltage: 400 V }
supplies:
  - id: TX1
    feeds: ${feeds}
    transformer: { rating: 1600 kVA, primary_voltage: 11 kV, secondary_voltage: 400 V, impedance: 6 %, load_losses: 14 kW }
`;
const DEVICES = `devices:
  - id: MCCB-250
    kind: mccb
    rating: 250 A
    breaking_capacity: 50 kA
    instantaneous: { pickup: 10 x In, clearing_time: 10 ms }
    trip_curve: { current_unit: x In, time_unit: s, points: [[1.3, 3600], [3, 60], [9.9, 5]] }
  - id: MCB-C32
    kind: mcb
    rating: 32 A
    breaking_capacity: 10 kA
    instantaneous: { pickup: 10 x In, clearing_time: 10 ms }
    trip_curve: { current_unit: x In, time_unit: s, points: [[1.45, 3600], [3, 40], [9.9, 2]] }
`;

function base(feeds = 'MSB'): TextFile[] {
  return [
    { path: 'devices/devices.yaml', text: DEVICES },
    { path: 'project.yaml', text: PROJECT(feeds) },
  ];
}

/** `n` circuits, one file each: sub-mains from MSB to DB boards, finals from the boards. */
function manyFiles(n: number): TextFile[] {
  const boards = Math.max(1, Math.floor(n / 40));
  const files = base();
  for (let i = 0; i < n; i++) {
    const sub = i < boards;
    const id = sub ? `MSB-F${i}` : `DB${i % boards}-C${i}`;
    files.push({
      path: `circuits/${sub ? 'msb' : `db${i % boards}`}/${id}.yaml`,
      text: `id: ${id}\nfrom: ${sub ? 'MSB' : `DB${i % boards}`}\n${sub ? `to: DB${i}\n` : ''}device: ${sub ? 'MCCB-250' : 'MCB-C32'}\nload: { current: ${10 + (i % 20)} A }\ncable: { conductor: copper, insulation: XLPE, size: ${sub ? 95 : 4} mm2, length: ${10 + (i % 60)} m }\n`,
    });
  }
  return files.sort((a, b) => (a.path < b.path ? -1 : 1));
}

/** A chain of boards B0 -> B1 -> ... -> Bn in one list file. */
function chain(n: number, feeds = 'B0', extra = ''): TextFile[] {
  let text = 'circuits:\n';
  for (let i = 0; i < n; i++) {
    text += `  - { id: C${i}, from: B${i}, to: B${i + 1}, device: MCCB-250, cable: { conductor: copper, insulation: XLPE, size: 95 mm2, length: 0.01 m } }\n`;
  }
  return [...base(feeds), { path: 'circuits/chain.yaml', text: text + extra }].sort((a, b) => (a.path < b.path ? -1 : 1));
}

describe('large inputs', () => {
  it('2000 circuit files load cleanly', () => {
    const files = manyFiles(2000);
    const outcome = buildProject(folderOf(files));
    expect(outcome.ok).toBe(true);
    if (outcome.ok) {
      expect(outcome.warnings).toEqual([]);
      expect(outcome.project.circuits).toHaveLength(2000);
      expect(new Set(outcome.project.circuits.map((c) => c.id)).size).toBe(2000);
    }
  });

  it('a chain of 5000 boards loads and propagates, each board one level below its feeder', () => {
    const outcome = buildProject(folderOf(chain(5000)));
    if (!outcome.ok) throw new Error(outcome.issues[0]!.message);
    const boards = propagate(outcome.project);
    expect(boards).toHaveLength(5001);
    expect(boards.map((b) => b.depth)).toEqual(boards.map((_, i) => i));
    // each 1 cm of cable adds impedance: the loop grows along the chain (behaviour, not a value)
    for (let i = 1; i < boards.length; i++) expect(boards[i]!.source.zLoopMin.r).toBeGreaterThan(boards[i - 1]!.source.zLoopMin.r);
    expect(boards[5000]!.buildUpMax).toHaveLength(boards[0]!.buildUpMax.length + 5000);
  });

  it('a chain of 300 boards solves to finite numbers', () => {
    const files = chain(300);
    const outcome = runPipeline(files);
    expect(outcomeProblems(outcome, files)).toEqual([]);
  });

  it('a chain of 1000 boards that no supply reaches gives one short line per board', () => {
    const files = chain(1000, 'ELSEWHERE');
    const outcome = runPipeline(files);
    expect(outcomeProblems(outcome, files)).toEqual([]);
    if (outcome.kind !== 'issues') throw new Error('loaded');
    const unreachable = outcome.issues.filter((i) => i.code === 'unreachable-board');
    expect(unreachable).toHaveLength(1000);
    expect(Math.max(...unreachable.map((i) => i.message.length))).toBeLessThan(400);
    const last = unreachable.find((i) => i.message.startsWith('board "B1000"'))!;
    expect(last.message).toContain('B1000 <- circuit C999 <- B999');
    expect(last.message).toContain('B0, which nothing feeds');
  });

  it('a loop of 1000 circuits is one issue with a shortened list', () => {
    const files = chain(1000, 'ELSEWHERE', '  - { id: CLOSE, from: B1000, to: B0, device: MCCB-250, cable: { conductor: copper, insulation: XLPE, size: 95 mm2, length: 1 m } }\n');
    const outcome = runPipeline(files);
    expect(outcomeProblems(outcome, files)).toEqual([]);
    if (outcome.kind !== 'issues') throw new Error('loaded');
    const loops = outcome.issues.filter((i) => i.code === 'loop');
    expect(loops).toHaveLength(1);
    expect(loops[0]!.message).toContain('and 989 more circuits');
  });

  it('1000 circuits from unknown boards each get their line', () => {
    let text = 'circuits:\n';
    for (let i = 0; i < 1000; i++) text += `  - { id: C${i}, from: X${i}, device: MCB-C32, cable: { conductor: copper, insulation: XLPE, size: 4 mm2, length: 1 m } }\n`;
    const files = [...base(), { path: 'circuits/all.yaml', text }];
    const outcome = runPipeline(files);
    expect(outcomeProblems(outcome, files)).toEqual([]);
    if (outcome.kind !== 'issues') throw new Error('loaded');
    expect(outcome.issues.filter((i) => i.code === 'unknown-board')).toHaveLength(1000);
  });
});
