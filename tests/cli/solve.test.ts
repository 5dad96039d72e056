// `solve`: the JSON document alone on stdout, the terminal table, and exit codes with and without --strict.
// The demo projects are invented (projects-demo/); the expectations here are what each demo circuit is
// there to show, with the hand calculation beside each number.

import { describe, expect, it } from 'vitest';
import { run } from './run.js';
import { printable } from '../../src/cli.js';

interface Doc {
  project: { name: string; input_sha256: string };
  boards: Array<{ id: string; ik3max_a: number; fed_by: string }>;
  circuits: Array<{
    id: string;
    verdict: string;
    threshold_length_m: number | null;
    max_length_m: number | null;
    checks: Array<{ name: string; status: string; value: number | null; limit: number | null }>;
  }>;
}

async function solveJson(dir: string): Promise<Doc> {
  const r = await run(['solve', dir, '--json']);
  expect(r.stderr).toBe('');
  expect(r.code).toBe(0);
  return JSON.parse(r.stdout) as Doc;
}

const statusOf = (doc: Doc, id: string, check: string) =>
  doc.circuits.find((c) => c.id === id)!.checks.find((k) => k.name === check)!.status;

describe('solve --json', () => {
  it('prints only the JSON document on stdout', async () => {
    const r = await run(['solve', 'projects-demo/nec-480v', '--json']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout.startsWith('{')).toBe(true);
    expect(r.stdout.endsWith('}\n')).toBe(true);
    const doc = JSON.parse(r.stdout) as Doc;
    expect(doc.project.input_sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('shows the declared service current at the service board', async () => {
    const doc = await solveJson('projects-demo/nec-480v');
    const mdb = doc.boards.find((b) => b.id === 'MDB')!;
    // FORMAT.md section 2: a service's Z_1 is chosen so that the origin shows the declared current (35 kA in project.yaml)
    expect(mdb.ik3max_a).toBeCloseTo(35_000, -1);
    expect(mdb.fed_by).toBe('UTILITY');
  });

  it('exits 0 although checks fail (without --strict)', async () => {
    const doc = await solveJson('projects-demo/iec-400v');
    expect(doc.circuits.some((c) => c.verdict === 'fail')).toBe(true);
  });
});

describe('solve --strict', () => {
  it('exits 2 where a check fails', async () => {
    const r = await run(['solve', 'projects-demo/iec-400v', '--strict']);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe('');
  });

  it('exits 0 where every check passes', async () => {
    const r = await run(['solve', 'projects-demo/nec-480v', '--strict']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
  });
});

describe('the terminal table', () => {
  it('lists board fault levels, then failing checks, then circuits with failing ones first', async () => {
    const r = await run(['solve', 'projects-demo/iec-400v']);
    expect(r.code).toBe(0);
    const out = r.stdout;
    const boards = out.indexOf('Boards');
    const problems = out.indexOf('Checks that fail');
    const circuits = out.indexOf('\nCircuits');
    expect(boards).toBeGreaterThanOrEqual(0);
    expect(problems).toBeGreaterThan(boards);
    expect(circuits).toBeGreaterThan(problems);
    for (const board of ['MSB', 'MCC-HL', 'DB-ADM', 'DB-CHEM']) expect(out.slice(boards, problems)).toContain(board);
    const rows = out.slice(circuits).split('\n').filter((l) => /^\s+(FAIL|UNDET|pass)\s/.test(l));
    expect(rows.length).toBe(18);
    const firstPass = rows.findIndex((l) => /^\s+pass\s/.test(l));
    expect(rows.slice(0, firstPass).every((l) => /^\s+(FAIL|UNDET)\s/.test(l))).toBe(true);
    expect(rows.slice(firstPass).every((l) => /^\s+pass\s/.test(l))).toBe(true);
  });
});

describe('the IEC demo shows what it is built to show', () => {
  it('MSB-F07: a short cable under a 0.35 s relay fails the energy check at every size shown', async () => {
    const doc = await solveJson('projects-demo/iec-400v');
    const c = doc.circuits.find((x) => x.id === 'MSB-F07')!;
    expect(c.verdict).toBe('fail');
    expect(statusOf(doc, 'MSB-F07', 'thermal_withstand')).toBe('fail');
    // Hand calculation (FORMAT.md section 2, through-fault): the far-end current must not exceed
    // k S / sqrt(t) = 143 x 25 / sqrt(0.35) = 6.04 kA, i.e. |Z| >= 1.05 x 400 / (sqrt(3) x 6.04 kA) = 40.1 mohm;
    // with the source at about 1.09 + j6.39 mohm and 0.727 + j0.08 mohm/m of cable, that is about 52 m.
    expect(c.threshold_length_m).not.toBeNull();
    expect(c.threshold_length_m!).toBeGreaterThan(45);
    expect(c.threshold_length_m!).toBeLessThan(60);
  });

  it('MSB-F08: the same cable behind a current-limiting fuse passes', async () => {
    const doc = await solveJson('projects-demo/iec-400v');
    expect(doc.circuits.find((x) => x.id === 'MSB-F08')!.verdict).toBe('pass');
  });

  it('ADM-C1: 100 m of 2.5 mm2 on a 20 A type C breaker passes the energy check but not disconnection', async () => {
    const doc = await solveJson('projects-demo/iec-400v');
    const c = doc.circuits.find((x) => x.id === 'ADM-C1')!;
    expect(statusOf(doc, 'ADM-C1', 'thermal_withstand')).toBe('pass');
    expect(statusOf(doc, 'ADM-C1', 'disconnection')).toBe('fail');
    // Hand calculation: 0.4 s needs the instantaneous pickup 10 x 20 A = 200 A, so the loop may be at most
    // 0.95 x 230.9 V / 200 A = 1.10 ohm; 2.5 mm2 phase + PE at 160 degC is 2 x 7.41 x 1.56 = 23.1 mohm/m, so
    // after the board's loop (about 0.1 ohm) roughly 43 m.
    expect(c.max_length_m).not.toBeNull();
    expect(c.max_length_m!).toBeGreaterThan(35);
    expect(c.max_length_m!).toBeLessThan(50);
  });

  it('every other circuit passes', async () => {
    const doc = await solveJson('projects-demo/iec-400v');
    const others = doc.circuits.filter((c) => !['MSB-F07', 'ADM-C1'].includes(c.id));
    expect(others.filter((c) => c.verdict !== 'pass').map((c) => c.id)).toEqual([]);
  });
});

describe('text for the terminal', () => {
  it('shows control and bidirectional characters from the input as escapes, so an id cannot drive the terminal', () => {
    expect(printable('MSB-Q1\u001b[31mRED\u0000\u202e')).toBe('MSB-Q1\\u001b[31mRED\\u0000\\u202e');
    expect(printable('line one\nline two, Ω, 漢')).toBe('line one\nline two, Ω, 漢');
  });
});
