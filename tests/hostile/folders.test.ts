// Hostile and broken project folders through the real command line (in process, tests/cli/run.ts):
// each ends in exit 1 with a message naming the file (and line and field where there is one), or in
// exit 0 with a sound result; never a stack trace or an internal error, never NaN or Infinity on
// stdout, stderr or in results.json, and nothing created or changed outside OUT. Robustness, not
// engineering numbers: no value here is checked against a reference.
//
// Most folders run `check` or `solve --json` (fast); only a few run `build`, which renders PDFs.

import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sheetFileName } from '../../src/report/plan.js';
import { hasStack, run, type RunResult } from '../cli/run.js';
import { baseProject, changes, circuitYaml, deviceYaml, projectYaml, snapshot, writeTree, type Tree } from './project-files.js';

let root: string;
beforeAll(() => {
  root = mkdtempSync(path.join(os.tmpdir(), 'faultsheet-hostile-'));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

type Command = 'check' | 'solve' | 'build';

interface Case {
  name: string;
  tree: Tree;
  command: Command;
  /** OUT for a build, relative to the case folder (default `out`) */
  out?: string;
  /** exit 1 with stderr matching this, or exit 0 ('ok') */
  expect: RegExp | 'ok';
  /** before the run, with the case folder (the project is `<case>/p`, OUT is `<case>/out`) */
  setup?: (dir: string) => void;
  /** after the run */
  after?: (r: RunResult, dir: string) => void;
}

const BAD_NUMBER = /NaN|Infinity/;
const OWN_FILE = /^(?:[A-Za-z0-9._-]+\.pdf|results\.json)$/; // src/io/write.ts

const withCircuit = (text: string | Uint8Array, file = 'circuits/MSB-Q1.yaml'): Tree => ({ ...baseProject(), [file]: text });
const withDevice = (opts: Parameters<typeof deviceYaml>[0]): Tree => ({ ...baseProject(), 'devices/devices.yaml': `devices:\n${deviceYaml(opts)}` });
const garbage = (n: number): Buffer => {
  // deterministic bytes, all 256 values, no valid text
  const b = Buffer.alloc(n);
  let x = 0x2545f491;
  for (let i = 0; i < n; i++) {
    x ^= x << 13;
    x ^= x >>> 17;
    x ^= x << 5;
    b[i] = x & 0xff;
  }
  return b;
};

/** One final circuit per id, all fed from MSB. */
const circuitsWithIds = (ids: string[]): Tree => {
  const tree: Tree = { 'project.yaml': projectYaml(), 'devices/devices.yaml': `devices:\n${deviceYaml()}` };
  ids.forEach((id, i) => {
    tree[`circuits/c${String(i).padStart(2, '0')}.yaml`] = circuitYaml({ id: JSON.stringify(id) });
  });
  return tree;
};

const RCE_TEMPLATE =
  '{{#with "s" as |string|}}{{#with "e"}}{{#with split as |conslist|}}{{this.pop}}{{this.push (lookup string.sub "constructor")}}{{this.pop}}' +
  '{{#with string.split as |codelist|}}{{this.pop}}{{this.push "return globalThis.__hostilePwned = 1;"}}{{this.pop}}' +
  '{{#each conslist}}{{#with (string.sub.apply 0 codelist)}}{{this}}{{/with}}{{/each}}{{/with}}{{/with}}{{/with}}{{/with}}\n';

const HOSTILE_IDS = ['../escape', '/abs/sheet', 'CON', 'nul.txt', '.hidden', '..', 'Щит-1', 'a\u0000b\u001b[2J', `L${'x'.repeat(300)}`];
/** The ones built (a build renders a PDF per circuit); the file names of the others are unit-tested (tests/report/plan.test.ts). */
const BUILT_IDS = ['../escape', '/abs/sheet', 'CON', '.hidden', 'a\u0000b\u001b[2J', `L${'x'.repeat(300)}`];

const CASES: Case[] = [
  // ---- files that are not what they claim to be
  { name: 'binary garbage in a circuit .yaml', tree: withCircuit(garbage(600)), command: 'check', expect: /circuits\/MSB-Q1\.yaml/ },
  { name: 'binary garbage as project.yaml', tree: { ...baseProject(), 'project.yaml': garbage(300) }, command: 'solve', expect: /project\.yaml/ },
  { name: 'an empty project.yaml', tree: { ...baseProject(), 'project.yaml': '' }, command: 'check', expect: /project\.yaml/ },
  { name: 'an empty circuit file', tree: withCircuit(''), command: 'check', expect: /circuits\/MSB-Q1\.yaml/ },
  { name: 'a folder named like a yaml file', tree: { ...baseProject(), 'circuits/folder.yaml': null, 'circuits/folder.yaml/inner.txt': 'x' }, command: 'check', expect: 'ok' },
  { name: 'project.yaml is a folder', tree: { ...baseProject(), 'project.yaml': null }, command: 'check', expect: /project\.yaml/ },
  { name: 'a YAML syntax error', tree: withCircuit('id: [unclosed\nfrom: MSB\n'), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+/ },
  { name: 'a YAML alias bomb', tree: withCircuit(`a: &a ["x","x","x","x","x","x","x","x","x"]\n${Array.from({ length: 9 }, (_, i) => `${String.fromCharCode(98 + i)}: &${String.fromCharCode(98 + i)} [*${String.fromCharCode(97 + i)},*${String.fromCharCode(97 + i)},*${String.fromCharCode(97 + i)},*${String.fromCharCode(97 + i)},*${String.fromCharCode(97 + i)},*${String.fromCharCode(97 + i)},*${String.fromCharCode(97 + i)},*${String.fromCharCode(97 + i)},*${String.fromCharCode(97 + i)}]`).join('\n')}\n`), command: 'check', expect: /circuits\/MSB-Q1\.yaml/ },
  { name: 'two YAML documents in one file', tree: withCircuit(`${circuitYaml()}---\n${circuitYaml({ id: 'MSB-Q2' })}`), command: 'check', expect: /circuits\/MSB-Q1\.yaml/ },
  { name: 'a byte-order mark and CRLF line ends', tree: withCircuit(`\uFEFF${circuitYaml().replace(/\n/g, '\r\n')}`), command: 'solve', expect: 'ok' },
  { name: 'a __proto__ key in a circuit', tree: withCircuit(`${circuitYaml()}__proto__:\n  polluted: 1\nconstructor:\n  prototype:\n    polluted: 1\n`), command: 'solve', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+/ },

  { name: 'deeply nested YAML', tree: withCircuit(`${circuitYaml()}assumptions: ${'['.repeat(3000)}${']'.repeat(3000)}\n`), command: 'check', expect: /circuits\/MSB-Q1\.yaml/ },
  { name: 'a description of a million characters', tree: withCircuit(circuitYaml().replace('Final circuit to the workshop', 'w'.repeat(1_000_000))), command: 'check', expect: 'ok' },
  { name: 'NUL and escape characters in a description', tree: withCircuit(circuitYaml().replace('description: Final circuit to the workshop', 'description: "a\\0b\\e[2J\\u202e"')), command: 'solve', expect: 'ok' },
  { name: 'circuits/ is a file', tree: { 'project.yaml': projectYaml(), 'devices/devices.yaml': `devices:\n${deviceYaml()}`, circuits: 'not a folder' }, command: 'check', expect: 'ok' },
  {
    name: 'a link loop in circuits/',
    tree: baseProject(),
    setup: (dir) => symlinkSync('.', path.join(dir, 'p/circuits/loop')),
    command: 'check',
    expect: 'ok',
  },
  {
    name: 'a link in circuits/ to the project folder',
    tree: baseProject(),
    setup: (dir) => symlinkSync('..', path.join(dir, 'p/circuits/up')),
    command: 'check',
    expect: /circuits\/up\/project\.yaml:1:1/,
  },
  {
    name: 'two circuits feeding each other',
    tree: {
      ...baseProject(),
      'circuits/MSB-Q1.yaml': circuitYaml().replace('from: MSB', 'from: MSB\nto: DB1'),
      'circuits/DB1-Q1.yaml': circuitYaml({ id: 'DB1-Q1' }).replace('from: MSB', 'from: DB1\nto: MSB'),
    },
    command: 'check',
    expect: /circuits\/(?:DB1|MSB)-Q1\.yaml:\d+:\d+/,
  },
  { name: 'a circuit from a board nothing feeds', tree: withCircuit(circuitYaml().replace('from: MSB', 'from: NOWHERE')), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ from/ },

  // ---- numbers and units
  { name: 'a length without a unit', tree: withCircuit(circuitYaml({ length: '30' })), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ cable\.length/ },
  { name: 'a negative length', tree: withCircuit(circuitYaml({ length: '-5 m' })), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ cable\.length/ },
  { name: 'a zero length', tree: withCircuit(circuitYaml({ length: '0 m' })), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ cable\.length: "0 m" must be greater than zero/ },
  { name: 'a length of 1e400 m', tree: withCircuit(circuitYaml({ length: '1e400 m' })), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ cable\.length/ },
  { name: 'a cable length beyond the range', tree: withCircuit(circuitYaml({ length: '1e12 m' })), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ cable\.length: .*out of range/ },
  { name: 'a cable length below the range', tree: withCircuit(circuitYaml({ length: '1e-9 m' })), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ cable\.length: .*out of range/ },
  { name: 'a cable length at the top of the range', tree: withCircuit(circuitYaml({ length: '999 km' })), command: 'solve', expect: 'ok' },
  { name: 'a cable length at the bottom of the range', tree: withCircuit(circuitYaml({ length: '0.002 mm' })), command: 'solve', expect: 'ok' },
  { name: 'a load current of 999 MA', tree: withCircuit(circuitYaml({ load: '{ current: 999 MA, power_factor: 0.9 }' })), command: 'solve', expect: 'ok' },
  { name: 'a device rated 1 µA', tree: withDevice({ rating: '1 µA' }), command: 'solve', expect: 'ok' },
  { name: 'a rating of zero', tree: withDevice({ rating: '0 A' }), command: 'check', expect: /devices\/devices\.yaml:\d+:\d+ .*rating/ },
  { name: 'a negative breaking capacity', tree: withDevice({ breaking: '-36 kA' }), command: 'check', expect: /devices\/devices\.yaml:\d+:\d+ .*breaking_capacity/ },
  { name: 'a breaking capacity beyond the range', tree: withDevice({ breaking: '1e300 kA' }), command: 'check', expect: /devices\/devices\.yaml:\d+:\d+ devices\[0\]\.breaking_capacity: .*out of range/ },
  { name: 'a let-through energy beyond the range', tree: withDevice({ letThrough: '[[2, 2.0e4], [36, 2.2e300]]' }), command: 'check', expect: /devices\/devices\.yaml:\d+:\d+ devices\[0\]\.let_through\.points\[1\]\[1\]/ },
  {
    name: 'an extreme network (999 000 MVA, X/R 1e9)',
    tree: { ...baseProject(), 'project.yaml': projectYaml().replace('fault_level: 200 MVA', 'fault_level: 999000 MVA').replace('x_over_r: 10', 'x_over_r: 1e9') },
    command: 'solve',
    expect: 'ok',
  },
  { name: 'a trip curve with currents out of order', tree: withDevice({ tripPoints: '[[2, 300], [1.3, 3600], [3, 80]]' }), command: 'check', expect: /devices\/devices\.yaml:\d+:\d+ .*trip_curve/ },
  { name: 'a let-through curve that falls', tree: withDevice({ letThrough: '[[2, 9.0e4], [5, 5.5e4]]' }), command: 'check', expect: /devices\/devices\.yaml:\d+:\d+ .*let_through/ },
  { name: 'a curve point that is not a pair', tree: withDevice({ tripPoints: '[[1.3], [2, 300, 7], "x"]' }), command: 'check', expect: /devices\/devices\.yaml:\d+:\d+ .*trip_curve/ },
  { name: 'a curve with a negative current', tree: withDevice({ tripPoints: '[[-2, 300], [3, 80]]' }), command: 'check', expect: /devices\/devices\.yaml:\d+:\d+ .*trip_curve/ },
  { name: 'a system voltage of 0 V', tree: { ...baseProject(), 'project.yaml': projectYaml({ settings: '  system_voltage: 0 V\n  frequency: 50 Hz\n  earthing: TN-S' }) }, command: 'check', expect: /project\.yaml:\d+:\d+ settings\.system_voltage/ },
  { name: 'a voltage in amperes', tree: { ...baseProject(), 'project.yaml': projectYaml({ settings: '  system_voltage: 400 A\n  frequency: 50 Hz\n  earthing: TN-S' }) }, command: 'check', expect: /project\.yaml:\d+:\d+ settings\.system_voltage/ },

  // ---- ids and references
  { name: 'a numeric id (kept as written)', tree: withCircuit(circuitYaml({ id: '1.50' })), command: 'solve', expect: 'ok', after: (r) => expect(r.stdout).toContain('"id": "1.50"') },
  { name: 'an id of null', tree: withCircuit(circuitYaml({ id: '~' })), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ id: has no value/ },
  { name: 'an id that is a list', tree: withCircuit(circuitYaml({ id: '[a, b]' })), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ id/ },
  { name: 'an empty id', tree: withCircuit(circuitYaml({ id: '""' })), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ id/ },
  { name: 'two circuits with one id', tree: { ...baseProject(), 'circuits/again.yaml': circuitYaml() }, command: 'check', expect: /circuits\/(?:again|MSB-Q1)\.yaml/ },
  { name: 'a device that does not exist', tree: withCircuit(circuitYaml({ device: 'NOWHERE' })), command: 'check', expect: /circuits\/MSB-Q1\.yaml:\d+:\d+ device/ },
  { name: 'hostile ids in check and solve', tree: circuitsWithIds(HOSTILE_IDS), command: 'solve', expect: 'ok' },

  // ---- the output folder
  {
    name: 'hostile ids, built',
    tree: circuitsWithIds(BUILT_IDS),
    command: 'build',
    expect: 'ok',
    after: (_r, dir) => {
      const names = readdirSync(path.join(dir, 'out'));
      for (const id of BUILT_IDS) expect(names).toContain(sheetFileName(id));
      for (const n of names.filter((x) => x.endsWith('.pdf'))) expect(n).toMatch(OWN_FILE);
      expect(existsSync('/abs/sheet.pdf')).toBe(false);
    },
  },
  { name: 'unicode ids that collide', tree: circuitsWithIds(['Щит-1', 'Пул-1']), command: 'build', expect: /^error: output: circuit "(?:Щит|Пул)-1" \(circuits\/c0[01]\.yaml:\d+:\d+\) and circuit "(?:Щит|Пул)-1" \(circuits\/c0[01]\.yaml:\d+:\d+\) would both be written as ___-1\.pdf/ },
  { name: 'ids that collide ignoring case, and with a reserved name', tree: circuitsWithIds(['CON', 'con_', 'Summary']), command: 'build', expect: /circuit "CON".*and circuit "con_"[\s\S]*the project summary and circuit "Summary"/ },
  { name: 'ids whose control characters would reach the terminal', tree: circuitsWithIds(['a\u001bb', 'a\u0007b']), command: 'build', expect: /circuit "a\\u001bb".*would both be written as a_b\.pdf/ },
  { name: 'OUT is a file', tree: { ...baseProject(), '../out': 'not a folder' }, command: 'build', expect: /out: exists and is not a folder/ },
  {
    name: 'OUT holds foreign files',
    tree: { ...baseProject(), '../out/thesis.docx': 'keep me', '../out/old.pdf': '%PDF-' },
    command: 'build',
    expect: /out: holds an entry a build did not write \(thesis\.docx\)/,
  },
  {
    name: 'OUT holds a link named like a sheet',
    tree: baseProject(),
    setup: (dir) => {
      mkdirSync(path.join(dir, 'out'));
      writeFileSync(path.join(dir, 'victim.txt'), 'keep me');
      symlinkSync(path.join(dir, 'victim.txt'), path.join(dir, 'out', 'MSB-Q1.pdf'));
    },
    command: 'build',
    expect: /out: holds an entry a build did not write \(MSB-Q1\.pdf\)/,
  },

  { name: 'OUT is the project folder', tree: baseProject(), command: 'build', out: 'p', expect: /p: holds entries a build did not write/ },
  {
    name: 'an extreme project, built',
    tree: {
      ...baseProject(),
      'project.yaml': projectYaml().replace('fault_level: 200 MVA', 'fault_level: 999000 MVA').replace('x_over_r: 10', 'x_over_r: 1e9'),
      'circuits/MSB-Q2.yaml': circuitYaml({ id: 'MSB-Q2', length: '999 km', load: '{ current: 999 MA, power_factor: 0.9 }' }),
      'circuits/MSB-Q3.yaml': circuitYaml({ id: 'MSB-Q3', length: '0.002 mm', device: 'TINY' }),
      'devices/devices.yaml': `devices:\n${deviceYaml()}${deviceYaml({ id: 'TINY', rating: '1 µA', letThrough: null })}`,
    },
    command: 'build',
    expect: 'ok',
  },

  // ---- the project's templates
  { name: 'a template running code', tree: { ...baseProject(), 'templates/sheet/verdict.hbs': RCE_TEMPLATE }, command: 'build', expect: /p\/templates\/sheet\/verdict\.hbs:1:\d+: field "split" is not allowed/ },
  { name: 'a template reading the prototype', tree: { ...baseProject(), 'templates/sheet/verdict.hbs': '# 1 Verdict\n{{#with __proto__}}{{/with}}{{lookup this "__proto__"}}\n' }, command: 'build', expect: /p\/templates\/sheet\/verdict\.hbs:2:\d+: field "__proto__" is not allowed/ },
  { name: 'a template including a file', tree: { ...baseProject(), 'templates/sheet/verdict.hbs': '{{> ../../../../etc/passwd}}\n' }, command: 'build', expect: /p\/templates\/sheet\/verdict\.hbs:1:1: no partial "\.\.\/\.\.\/\.\.\/\.\.\/etc\/passwd"/ },
  { name: 'a template with a field that is not there', tree: { ...baseProject(), 'templates/sheet/verdict.hbs': '# 1 Verdict\n{{circuit.nothing}}\n' }, command: 'build', expect: /p\/templates\/sheet\/verdict\.hbs:2:\d+: cannot render sheet\/verdict\.hbs: "nothing" not defined/ },
  { name: 'a binary template', tree: { ...baseProject(), 'templates/sheet/verdict.hbs': garbage(200) }, command: 'build', expect: /p\/templates\/sheet\/verdict\.hbs: is not UTF-8 text/ },
  {
    name: 'a template failing while the sheets render, over a previous OUT',
    tree: { ...baseProject(), 'templates/sheet/verdict.hbs': '# 1 Verdict\n{{kA circuit.id}}\n', '../out/MSB-Q1.pdf': '%PDF- a previous build', '../out/results.json': '{}' },
    command: 'build',
    expect: /p\/templates\/sheet\/verdict\.hbs: cannot render sheet\/verdict\.hbs: helper "kA" takes a number, got string/,
  },
  { name: 'a partial reading the prototype', tree: { ...baseProject(), 'templates/partials/cautions.hbs': '{{#each this}}{{@key}}{{/each}}{{this.constructor.prototype}}\n' }, command: 'build', expect: /p\/templates\/partials\/cautions\.hbs:1:\d+: field "constructor" is not allowed/ },
  { name: 'a partial that includes itself', tree: { ...baseProject(), 'templates/partials/cautions.hbs': '{{> cautions}}\n' }, command: 'build', expect: /p\/templates\/partials\/cautions\.hbs: cannot render .*a partial that includes itself/ },
  { name: 'labels running code', tree: { ...baseProject(), 'templates/sheet/labels.hbs': 'title: {{#with "x" as |s|}}{{s.constructor.constructor}}{{/with}}\n' }, command: 'build', expect: /p\/templates\/sheet\/labels\.hbs:1:\d+: field "constructor" is not allowed/ },
  {
    name: 'a template linked from outside the project',
    tree: { ...baseProject(), '../shared/verdict.hbs': '# 1 Verdict\n' },
    setup: (dir) => {
      mkdirSync(path.join(dir, 'p/templates/sheet'), { recursive: true });
      symlinkSync(path.join(dir, 'shared/verdict.hbs'), path.join(dir, 'p/templates/sheet/verdict.hbs'));
    },
    command: 'build',
    expect: /p\/templates\/sheet\/verdict\.hbs: is a link to .*shared\/verdict\.hbs, outside the project folder/,
  },
  {
    name: 'a templates folder linked to /etc',
    tree: baseProject(),
    setup: (dir) => symlinkSync('/etc', path.join(dir, 'p/templates')),
    command: 'build',
    expect: /p\/templates: is a link to \/etc, outside the project folder/,
  },
];

function outcome(r: RunResult): string {
  return `exit ${r.code}\n--- stdout\n${r.stdout.slice(0, 2000)}\n--- stderr\n${r.stderr.slice(0, 2000)}`;
}

describe('hostile project folders', () => {
  it.each(CASES.map((c) => [c.name, c]))('%s', async (_name, c) => {
    const dir = path.join(root, c.name.replace(/[^A-Za-z0-9]+/g, '-'));
    mkdirSync(dir);
    writeTree(path.join(dir, 'p'), c.tree);
    c.setup?.(dir);
    const before = snapshot(dir);
    const protoBefore = Object.getOwnPropertyNames(Object.prototype).sort();
    const argv = c.command === 'check' ? ['check', 'p'] : c.command === 'solve' ? ['solve', 'p', '--json'] : ['build', 'p', '--out', c.out ?? 'out', '--quiet'];
    const r = await run(argv, dir);

    expect(hasStack(r.stdout) || hasStack(r.stderr), outcome(r)).toBe(false);
    expect(r.stderr, outcome(r)).not.toMatch(/internal error/);
    expect(r.stdout + r.stderr, outcome(r)).not.toMatch(BAD_NUMBER);
    expect(r.stderr, outcome(r)).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f\u202e]/); // no control character reaches the terminal
    if (c.expect === 'ok') {
      expect(r.code, outcome(r)).toBe(0);
      if (c.command === 'solve') expect(() => JSON.parse(r.stdout), outcome(r)).not.toThrow();
    } else {
      expect(r.code, outcome(r)).toBe(1);
      expect(r.stdout, outcome(r)).toBe('');
      expect(r.stderr, outcome(r)).toMatch(c.expect);
    }

    const after = snapshot(dir);
    const changed = changes(before, after);
    if (c.command === 'build' && c.expect === 'ok') {
      // only OUT is new: nothing beside it, no staging folder left over
      expect(changed.filter((x) => !/^added out(?:\/|$)/.test(x))).toEqual([]);
      const results = readFileSync(path.join(dir, 'out', 'results.json'), 'utf8');
      expect(results).not.toMatch(BAD_NUMBER);
      expect(results).not.toMatch(/\[object|undefined/);
    } else expect(changed).toEqual([]); // a failed build, a check and a solve write nothing
    expect(Object.getOwnPropertyNames(Object.prototype).sort()).toEqual(protoBefore);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect((globalThis as Record<string, unknown>).__hostilePwned).toBeUndefined();
    c.after?.(r, dir);
  });
});
