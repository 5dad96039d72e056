// The drawing of the board tree on the summary, read from its SVG text (no PDF rendered).
import { describe, expect, it } from 'vitest';
import { boardTreeDrawing } from '../../src/report/tree-drawing.js';
import { summaryDocument } from '../../src/report/summary.js';
import { projectTemplates } from '../../src/report/build.js';
import { fixtureProject, fixtureResult } from '../fixtures/report/project.js';
import type { ProjectResult } from '../../src/calc/types.js';

const project = fixtureProject();
const result = fixtureResult();

describe('board tree drawing', () => {
  const drawing = boardTreeDrawing(project, result)!;
  it('draws every supply and board with its fault levels', () => {
    for (const s of project.supplies) expect(drawing.svg).toContain(`>${s.id}<`);
    for (const b of result.boards) expect(drawing.svg).toContain(`>${b.id}<`);
    expect(drawing.svg).toContain('I″k3max');
    expect(drawing.svg).toContain('I″k1min');
  });
  it('joins each sub-board to its board, labelled with the feeding circuit', () => {
    const fedByCircuit = result.boards.filter((b) => result.circuits.some((c) => c.id === b.fedBy));
    expect(fedByCircuit.length).toBeGreaterThan(0);
    for (const b of fedByCircuit) expect(drawing.svg).toContain(`>${b.fedBy}<`);
    expect((drawing.svg.match(/<path /g) ?? []).length).toBe(result.boards.length);
  });
  it('prints user text as text: markup in an id is escaped', () => {
    const odd: ProjectResult = { ...result, boards: result.boards.map((b, i) => (i === 0 ? { ...b, id: 'A<&>"B' } : b)) };
    const p = { ...project, supplies: project.supplies.map((s, i) => (i === 0 ? { ...s, feeds: 'A<&>"B' } : s)) };
    const svg = boardTreeDrawing(p, odd)!.svg;
    expect(svg).toContain('A&lt;&amp;&gt;&quot;B');
    expect(svg).not.toContain('A<&>"B');
  });
  it('is left out where too many boards stand side by side to read; the table remains', () => {
    const many: ProjectResult = {
      ...result,
      boards: [...result.boards, ...Array.from({ length: 30 }, (_, i) => ({ ...result.boards[0]!, id: `X${i}`, fedBy: `CX${i}`, depth: 1 }))],
      circuits: [...result.circuits, ...Array.from({ length: 30 }, (_, i) => ({ ...result.circuits[0]!, id: `CX${i}`, from: result.boards[0]!.id, to: `X${i}` }))],
    };
    expect(boardTreeDrawing(project, many)).toBeNull();
  });
  it('stands on the summary above the table of boards', () => {
    const doc = summaryDocument(project, result, { templates: projectTemplates(project) });
    expect(JSON.stringify(doc.content)).toContain('"svg":"<svg');
  });
});
