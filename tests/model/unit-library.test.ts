// mathjs's units are loaded only when a project writes a unit our own reader does not know
// (src/model/units.ts). This file never loads them itself, so it sees the program's start: the common
// units read without the library, and the loader loads it on the first other unit and reads again.

import { cpSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadProject } from '../../src/model/load.js';
import { parseQuantity, UnitLibraryNeeded } from '../../src/model/units.js';

const work = mkdtempSync(path.join(tmpdir(), 'faultsheet-units-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** The NEC demo with one circuit's cable length rewritten from feet to the given text. */
function necDemoWithLength(name: string, length: string): { dir: string; circuitId: string } {
  const dir = path.join(work, name);
  cpSync('projects-demo/nec-480v', dir, { recursive: true });
  const circuits = path.join(dir, 'circuits');
  for (const file of readdirSync(circuits).sort()) {
    const full = path.join(circuits, file);
    const text = readFileSync(full, 'utf8');
    const match = /length: (\d+(?:\.\d+)?) ft/.exec(text);
    if (match === null) continue;
    writeFileSync(full, text.replace(match[0], `length: ${length}`));
    const id = /^id: (\S+)/m.exec(text);
    if (id === null) throw new Error(`${file}: no id`);
    return { dir, circuitId: id[1]! };
  }
  throw new Error('no circuit of the NEC demo writes its length in ft');
}

describe('the unit library, loaded on demand', () => {
  it('reads the units projects nearly always write without it', () => {
    expect(parseQuantity('45 m', 'length')).toEqual({ ok: true, value: 45 });
    expect(parseQuantity('150 ft', 'length')).toEqual({ ok: true, value: 45.72 }); // 1 ft = 0.3048 m exactly (international foot, 1959)
    expect(parseQuantity('1.5e5 A2s', 'joule-integral')).toEqual({ ok: true, value: 1.5e5 });
  });

  it('asks for it on any other unit, before it is loaded', () => {
    expect(() => parseQuantity('50 yd', 'length')).toThrow(UnitLibraryNeeded);
  });

  it('is loaded by loadProject, which then reads the project as if it had been there from the start', async () => {
    const { dir, circuitId } = necDemoWithLength('yards', '50 yd');
    const outcome = await loadProject(dir);
    if (!outcome.ok) throw new Error(JSON.stringify(outcome.issues));
    const circuit = outcome.project.circuits.find((c) => c.id === circuitId);
    expect(circuit?.cable.length).toBeCloseTo(45.72, 9); // 1 yd = 0.9144 m exactly (international yard, 1959)
    // and now without a second loading
    expect(parseQuantity('50 yd', 'length')).toEqual({ ok: true, value: 45.72 });
    const unknown = await loadProject(necDemoWithLength('fish', '50 fish').dir);
    expect(unknown.ok).toBe(false);
    if (!unknown.ok) expect(unknown.issues.some((i) => i.code === 'unknown-unit' || /fish/.test(i.message))).toBe(true);
  });
});
