// Output planning: file names from circuit ids, collisions found before anything is written.
import { describe, expect, it } from 'vitest';
import { OutputPlanError, planOutputs, sheetFileName } from '../../src/report/plan.js';
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
});
