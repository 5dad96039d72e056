// Output planning: file names from circuit ids, collisions found before anything is written.
import { describe, expect, it } from 'vitest';
import { MAX_FILE_NAME, OutputPlanError, planOutputs, quotedId, sheetFileName } from '../../src/report/plan.js';
import { fixtureProject, fixtureResult } from '../fixtures/report/project.js';

function withIds(ids: string[]) {
  const project = fixtureProject();
  const result = fixtureResult();
  const baseC = project.circuits[0];
  const baseR = result.circuits[0];
  project.circuits = ids.map((id, i) => ({ ...structuredClone(baseC), id, pos: { file: `circuits/c${i}.yaml`, line: 1, col: 1 } }));
  result.circuits = ids.map((id) => ({ ...structuredClone(baseR), id }));
  return { project, result };
}

describe('output names', () => {
  it('replaces characters outside [A-Za-z0-9._-] with "_" (FORMAT.md section 4)', () => {
    expect(sheetFileName('MSB-Q4')).toBe('MSB-Q4.pdf');
    expect(sheetFileName('DB 1/C3 (spare)')).toBe('DB_1_C3__spare_.pdf');
    expect(sheetFileName('Tür-1.2')).toBe('T_r-1.2.pdf');
  });

  it('plans the sheets, then summary, dossier and results', () => {
    const { project, result } = withIds(['A', 'B']);
    expect(planOutputs(project, result).files).toEqual(['A.pdf', 'B.pdf', 'summary.pdf', 'dossier.pdf', 'results.json']);
  });

  it('reports two circuits mapping to one file, with their files and positions', () => {
    const { project, result } = withIds(['DB 1', 'DB/1', 'DB-2']);
    expect(() => planOutputs(project, result)).toThrow(OutputPlanError);
    try {
      planOutputs(project, result);
    } catch (err) {
      const e = err as OutputPlanError;
      expect(e.problems).toHaveLength(1);
      expect(e.message).toContain('circuit "DB 1" (circuits/c0.yaml:1:1) and circuit "DB/1" (circuits/c1.yaml:1:1) would both be written as DB_1.pdf');
    }
  });

  it('compares names without case and keeps summary.pdf and dossier.pdf for themselves', () => {
    const { project, result } = withIds(['q1', 'Q1', 'Summary']);
    try {
      planOutputs(project, result);
      expect.unreachable();
    } catch (err) {
      const e = err as OutputPlanError;
      expect(e.problems).toHaveLength(2);
      expect(e.message).toMatch(/circuit "q1".*and circuit "Q1".*q1\.pdf/);
      expect(e.message).toMatch(/the project summary and circuit "Summary"/);
    }
  });

  it('reports the results file and the dossier as taken too, with a circuit named like them', () => {
    const { project, result } = withIds(['DOSSIER', 'results.json', 'results']);
    try {
      planOutputs(project, result);
      expect.unreachable();
    } catch (err) {
      const e = err as OutputPlanError;
      expect(e.problems).toHaveLength(1); // results.json.pdf and results.pdf are not results.json
      expect(e.message).toMatch(/the dossier and circuit "DOSSIER"/);
    }
  });
});

// What the write side accepts as a file of a previous build (src/io/write.ts, OWN_FILE): every
// planned name must match it, or the next build would refuse its own OUT.
const OWN_FILE = /^(?:[A-Za-z0-9._-]+\.pdf|results\.json)$/;

const HOSTILE_IDS = [
  '..',
  '.',
  '...',
  '../../etc/passwd',
  '/abs/path',
  'C:\\Windows\\system32',
  '\\\\server\\share',
  'a\u0000b',
  '\u0000',
  'tab\there',
  'line\nbreak',
  '\u001b[2J',
  '\u007f',
  '.hidden',
  '..hidden',
  'trailing.',
  'trailing...',
  'trailing ',
  ' ',
  'CON',
  'con',
  'Nul',
  'aux.txt',
  'COM1',
  'lpt9.x.y',
  'COM0',
  'PRN.',
  'CON ',
  'Щит-1',
  '泵',
  '😀',
  'e\u0301',
  '\u202eevil',
  'x'.repeat(300),
  'é'.repeat(300),
  '.'.repeat(300),
];

describe('hostile circuit ids', () => {
  it.each(HOSTILE_IDS.map((id) => [quotedId(id), id]))('%s becomes a plain file name inside OUT', (_shown, id) => {
    const name = sheetFileName(id);
    expect(name).toMatch(OWN_FILE);
    expect(name).not.toMatch(/^\./); // no hidden file, never "." or ".."
    expect(name.endsWith('.pdf')).toBe(true);
    expect(name).not.toMatch(/\.\.pdf$/);
    expect(Buffer.byteLength(name, 'utf8')).toBeLessThanOrEqual(MAX_FILE_NAME);
    expect(name).not.toMatch(/^(?:CON|PRN|AUX|NUL|COM[0-9]|LPT[0-9])(?:\.|$)/i); // Windows device names, with any extension
    expect(name).toBe(sheetFileName(id)); // deterministic
  });

  it('maps the examples as documented', () => {
    expect(sheetFileName('..')).toBe('__.pdf');
    expect(sheetFileName('.')).toBe('_.pdf');
    expect(sheetFileName('../../etc/passwd')).toBe('___.._etc_passwd.pdf'); // no separator survives
    expect(sheetFileName('/abs')).toBe('_abs.pdf');
    expect(sheetFileName('a\u0000b')).toBe('a_b.pdf');
    expect(sheetFileName('.hidden')).toBe('_hidden.pdf');
    expect(sheetFileName('A.')).toBe('A_.pdf');
    expect(sheetFileName('con')).toBe('con_.pdf');
    expect(sheetFileName('NUL.1')).toBe('NUL_.1.pdf');
    expect(sheetFileName('COM1-A')).toBe('COM1-A.pdf'); // only the whole part before the first dot is reserved
    expect(sheetFileName('CONSOLE')).toBe('CONSOLE.pdf');
    expect(sheetFileName('😀')).toBe('__.pdf'); // one astral character is two UTF-16 code units
  });

  it('cuts long ids to 255 bytes with a hash of the whole id, distinct and stable', () => {
    const a = `${'A'.repeat(300)}-1`;
    const b = `${'A'.repeat(300)}-2`;
    const na = sheetFileName(a);
    const nb = sheetFileName(b);
    expect(na.length).toBe(MAX_FILE_NAME);
    expect(nb.length).toBe(MAX_FILE_NAME);
    expect(na).not.toBe(nb);
    expect(na).toMatch(/^A+-[0-9a-f]{10}\.pdf$/);
    expect(sheetFileName('A'.repeat(MAX_FILE_NAME - 4))).toBe(`${'A'.repeat(MAX_FILE_NAME - 4)}.pdf`); // exactly at the limit: not cut
    expect(sheetFileName('A'.repeat(MAX_FILE_NAME - 3))).toMatch(/-[0-9a-f]{10}\.pdf$/);
    // cut at a dot: no trailing dot before the hash
    expect(sheetFileName(`${'B'.repeat(239)}.${'C'.repeat(100)}`)).toMatch(/^B{239}_-[0-9a-f]{10}\.pdf$/);
  });

  it('plans long ids that differ only after the cut as two files', () => {
    const { project, result } = withIds([`${'L'.repeat(400)}1`, `${'L'.repeat(400)}2`]);
    const plan = planOutputs(project, result);
    expect(new Set(plan.sheets.map((s) => s.file)).size).toBe(2);
  });

  it('reports unicode ids that differ only in replaced characters as a collision', () => {
    const { project, result } = withIds(['Щит-1', 'Пульт-1'.slice(0, 3) + '-1', 'ok']);
    expect(() => planOutputs(project, result)).toThrow(/circuit "Щит-1" \(circuits\/c0\.yaml:1:1\) and circuit "Пул-1" \(circuits\/c1\.yaml:1:1\) would both be written as ___-1\.pdf/);
  });

  it('reports a reserved name and its escaped twin, and hidden-file twins, as collisions', () => {
    const { project, result } = withIds(['CON', 'con_', '.x', '_x']);
    try {
      planOutputs(project, result);
      expect.unreachable();
    } catch (err) {
      const e = err as OutputPlanError;
      expect(e.problems).toHaveLength(2);
      expect(e.message).toMatch(/circuit "CON".*and circuit "con_".*CON_\.pdf/);
      expect(e.message).toMatch(/circuit "\.x".*and circuit "_x".*_x\.pdf/);
    }
  });

  it('shows control and direction-changing characters of an id escaped in the message', () => {
    const { project, result } = withIds(['a\u001b[2Jb', 'a\u202e[2Jb']);
    try {
      planOutputs(project, result);
      expect.unreachable();
    } catch (err) {
      const e = err as OutputPlanError;
      expect(e.message).toContain('circuit "a\\u001b[2Jb"');
      expect(e.message).toContain('circuit "a\\u202e[2Jb"');
      // eslint-disable-next-line no-control-regex
      expect(e.message).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f\u202e]/);
    }
    expect(quotedId('x'.repeat(500))).toMatch(/^"x{60}…x{12} \(500 characters\)"$/);
  });
});
