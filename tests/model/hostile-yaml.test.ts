// Regressions of the hostile-input work on the loader: YAML that used to escape as an exception, expand
// without bound, take quadratic time, or read as a misleading message. Each is a user error at a line.

import { describe, expect, it } from 'vitest';
import { parseYamlFile, MAX_ALIASES, MAX_NESTING } from '../../src/model/source.js';
import { outcomeProblems, runPipeline, type TextFile } from '../hostile/harness.js';
import type { Issue } from '../../src/model/issues.js';

function parseIssue(text: string): Issue {
  const outcome = parseYamlFile('circuits/c.yaml', text);
  if (outcome.ok) throw new Error('parsed without errors');
  expect(outcome.issues).toHaveLength(1);
  return outcome.issues[0]!;
}

const at = (i: Issue) => `${i.line}:${i.col}`;

describe('YAML the parser reads but the loader must refuse', () => {
  it('a merge key naming a scalar is a YAML error at its value, not an exception', () => {
    const issue = parseIssue('base: &b 1\nid: C1\nx: { <<: *b }\n');
    expect(issue.code).toBe('yaml-syntax');
    expect(at(issue)).toBe('3:10');
    expect(issue.message).toContain('merge key');
  });
  it('an alias with no anchor before it names the alias', () => {
    const issue = parseIssue('id: C1\nfrom: *board\n');
    expect(issue.code).toBe('yaml-syntax');
    expect(at(issue)).toBe('2:7');
    expect(issue.message).toContain('*board has no anchor');
  });
  it('an alias inside the node it names (an endless expansion) is refused', () => {
    const issue = parseIssue('id: C1\nassumptions: &a [x, *a]\n');
    expect(issue.code).toBe('yaml-alias-limit');
    expect(issue.message).toContain('contains it');
  });
  it('more than the allowed number of aliases in one file is refused at the first one over', () => {
    const anchors = Array.from({ length: MAX_ALIASES + 1 }, (_, i) => `  - &a${i} t${i}\n`).join('');
    const aliases = Array.from({ length: MAX_ALIASES + 1 }, (_, i) => `  - *a${i}\n`).join('');
    const issue = parseIssue(`id: C1\nx:\n${anchors}assumptions:\n${aliases}`);
    expect(issue.code).toBe('yaml-alias-limit');
    expect(issue.line).toBe(2 + (MAX_ALIASES + 1) + 1 + (MAX_ALIASES + 1));
    expect(issue.message).toContain(`more than ${MAX_ALIASES}`);
  });
  it('a merge-key chain that doubles at each step is refused before it is expanded', () => {
    let text = 'a0: &a0 { k: 1 }\n';
    for (let i = 1; i <= 30; i++) text += `a${i}: &a${i} { <<: [*a${i - 1}, *a${i - 1}], k${i}: 1 }\n`;
    const issue = parseIssue(text);
    expect(issue.code).toBe('yaml-alias-limit');
    expect(at(issue)).toBe('2:16'); // the first alias of the expansion
  });
  it('a long merge-key chain is refused', () => {
    let text = 'a0: &a0 { k0: 1 }\n';
    for (let i = 1; i <= 2000; i++) text += `a${i}: &a${i} { <<: *a${i - 1}, k${i}: 1 }\n`;
    expect(parseIssue(text).code).toBe('yaml-alias-limit');
  });
  it('a few aliases and merge keys, as an author writes them, are read', () => {
    const outcome = parseYamlFile('circuits/c.yaml', 'base: &cable { conductor: copper, insulation: XLPE }\nid: C1\ncable: { <<: *cable, size: 16 mm2 }\nother: *cable\n');
    expect(outcome.ok).toBe(true);
    if (outcome.ok) expect(outcome.file.value).toMatchObject({ cable: { conductor: 'copper', insulation: 'XLPE', size: '16 mm2' } });
  });
  it('lists nested deeper than the format could need are refused', () => {
    const issue = parseIssue(`id: C1\nx: ${'['.repeat(MAX_NESTING + 5)}${']'.repeat(MAX_NESTING + 5)}\n`);
    expect(issue.code).toBe('yaml-alias-limit');
    expect(issue.message).toContain('nested more than');
    expect(issue.expected).toContain('fewer levels');
  });
  it('a duplicate key is still a YAML error at the second key, also in a mapping of 50 000 keys', () => {
    expect(at(parseIssue('id: C1\nfrom: MSB\nid: C2\n'))).toBe('3:1');
    const many = Array.from({ length: 50_000 }, (_, i) => `k${i}: ${i}\n`).join('');
    const issue = parseIssue(`${many}k17: again\n`);
    expect(issue.message).toContain('Map keys must be unique');
    expect(issue.line).toBe(50_001);
  });
});

const PROJECT = `project: { name: Loader regressions (invented), number: R-1, revision: A, date: 2026-11-20 }
settings: { system_voltage: 400 V }
supplies:
  - id: SVC
    feeds: MDB
    service: { fault_current: 16 kA }
`;
const DEVICES = `devices:
  - id: D1
    kind: mcb
    rating: 32 A
    clearing_time: 0.1 s
`;
const CIRCUIT = `id: C1
from: MDB
device: D1
cable: { conductor: copper, insulation: XLPE, size: 16 mm2, length: 30 m }
`;

function loadIssues(over: Partial<Record<'project' | 'devices' | 'circuit', string>>): Issue[] {
  const files: TextFile[] = [
    { path: 'circuits/c1.yaml', text: over.circuit ?? CIRCUIT },
    { path: 'devices/d.yaml', text: over.devices ?? DEVICES },
    { path: 'project.yaml', text: over.project ?? PROJECT },
  ];
  const outcome = runPipeline(files);
  expect(outcomeProblems(outcome, files)).toEqual([]);
  return outcome.kind === 'issues' ? outcome.issues : [];
}

describe('fields as a mutation leaves them', () => {
  it('a missing enum field reads "is missing", not "\\"undefined\\" is not an accepted value"', () => {
    const [issue] = loadIssues({ devices: DEVICES.replace('    kind: mcb\n', '') });
    expect(issue!.code).toBe('missing-field');
    expect(issue!.message).toBe('required field "kind" is missing');
    expect(issue!.expected).toContain('"mcb"');
  });
  it('an empty enum field and a list in its place are told apart', () => {
    expect(loadIssues({ devices: DEVICES.replace('kind: mcb', 'kind:') })[0]!.code).toBe('empty-value');
    expect(loadIssues({ devices: DEVICES.replace('kind: mcb', 'kind: [mcb]') })[0]!.message).toBe('a list is not accepted here');
  });
  it('magnitudes that would overflow the solve are refused at their field', () => {
    const cases: Array<[Partial<Record<'project' | 'devices' | 'circuit', string>>, string]> = [
      [{ circuit: CIRCUIT.replace('30 m', '1e308 m') }, 'cable.length'],
      [{ circuit: `${CIRCUIT}load: { current: 1e300 A }\n` }, 'load.current'],
      [{ circuit: CIRCUIT.replace('16 mm2', '1e300 mm2') }, 'cable.size'],
      [{ project: PROJECT.replace('16 kA', '5e-324 kA') }, 'supplies[0].service.fault_current'],
      [{ project: PROJECT.replace('{ fault_current: 16 kA }', '{ fault_current: 16 kA, x_over_r: 1e308 }') }, 'supplies[0].service.x_over_r'],
      [{ devices: DEVICES.replace('0.1 s', '1e300 s') }, 'devices[0].clearing_time'],
    ];
    for (const [over, field] of cases) {
      const issues = loadIssues(over);
      expect(issues.map((i) => `${i.code} ${i.path}`), field).toEqual([`out-of-range ${field}`]);
      expect(issues[0]!.expected, field).toBeDefined();
    }
  });
});

describe('YAML types with no place in a project file', () => {
  it('binary data, sets and ordered maps are YAML errors, not mappings of their bytes', () => {
    for (const text of ['!!binary aGVsbG8=\n', 'id: C1\ncable: !!set { a, b }\n', '%YAML 1.1\n---\nid: C1\ncable: !!binary aGVsbG8=\n', 'id: !!omap [a: 1]\n']) {
      const issue = parseIssue(text);
      expect(issue.code, text).toBe('yaml-syntax');
      expect(issue.message, text).toContain('is not read here');
    }
  });
  it('a list or a mapping as a key is a YAML error (it would be stringified silently)', () => {
    expect(parseIssue('? [a]\n: 1\nid: X\n').message).toContain('a key must be a plain value');
    expect(parseIssue('x: &k [a]\n*k : 1\n').message).toContain('a key must be a plain value');
  });
  it('a number too large for a double reads as .inf in the message, as YAML writes it', () => {
    const [issue] = loadIssues({ circuit: CIRCUIT.replace('length: 30 m', 'length: 30 m, parallel: 1e999') });
    expect(issue!.message).toBe('the value .inf is not accepted here');
  });
  it('a YAML 1.1 date in a text field is kept as written', () => {
    const outcome = parseYamlFile('circuits/c.yaml', '%YAML 1.1\n---\nid: C1\ndescription: 2020-01-01\n');
    expect(outcome.ok && (outcome.file.value as { description: unknown }).description).toBe('2020-01-01');
  });
});

describe('device data that would overflow the solve or its charts', () => {
  const WITH_CURVE = `devices:
  - id: D1
    kind: mccb
    rating: 32 A
    instantaneous: { pickup: 10 x In }
    trip_curve: { current_unit: A, time_unit: s, points: [[50, 100], [300, 0.1]] }
`;
  it('an instantaneous pickup of 1e308 x In is refused (it made the chart currents Infinity)', () => {
    const issues = loadIssues({ devices: WITH_CURVE.replace('10 x In', '1e308 x In') });
    expect(issues.map((i) => `${i.code} ${i.path}`)).toEqual(['out-of-range devices[0].instantaneous.pickup']);
    expect(loadIssues({ devices: WITH_CURVE.replace('10 x In', '1e300 kA') }).map((i) => i.code)).toEqual(['out-of-range']);
  });
  it('a number in a curve unit is refused, not dropped ("10 A" read as A)', () => {
    const issues = loadIssues({ devices: WITH_CURVE.replace('current_unit: A', 'current_unit: 10 A') });
    expect(issues.map((i) => `${i.code} ${i.path}`)).toEqual(['unknown-unit devices[0].trip_curve.current_unit']);
  });
  it('curve points out of range once in SI are refused at the point', () => {
    const issues = loadIssues({ devices: WITH_CURVE.replace('time_unit: s', 'time_unit: Ys') });
    expect(issues.map((i) => `${i.code} ${i.path}`)).toEqual(['out-of-range devices[0].trip_curve.points[0][1]', 'out-of-range devices[0].trip_curve.points[1][1]']);
  });
});

describe('many problems in one file', () => {
  it('5000 unknown fields of one circuit are each reported at their own line (large mappings are indexed)', () => {
    const extra = Array.from({ length: 5000 }, (_, i) => `k${i}: ${i}\n`).join('');
    const issues = loadIssues({ circuit: CIRCUIT + extra });
    expect(issues).toHaveLength(5000);
    expect(issues.every((i) => i.code === 'unknown-field' && i.path === `k${i.line - 5}` && i.col === 1)).toBe(true);
  });
});

describe('temperatures', () => {
  it('a minimum-fault conductor temperature at or below -230 degC (zero resistance by the linear law) is refused', () => {
    const setting = (t: string) => ({ project: PROJECT.replace('system_voltage: 400 V', `system_voltage: 400 V, min_fault_conductor_temperature: ${t}`) });
    expect(loadIssues(setting('-230 degC')).map((i) => `${i.code} ${i.path}`)).toEqual(['out-of-range settings.min_fault_conductor_temperature']);
    expect(loadIssues(setting('-40 degC'))).toEqual([]);
  });
});
