// Reading a project folder: which files are inputs, in which order.

import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readProjectFolder } from '../../src/io/read.js';

describe('readProjectFolder', () => {
  it('reads project.yaml and the *.yaml under devices/ and circuits/, sorted by path', async () => {
    const folder = await readProjectFolder('tests/fixtures/model/good');
    expect(folder.files.map((f) => f.path)).toEqual([
      'circuits/mcc/finals.yaml',
      'circuits/mdb-q1.yaml',
      'circuits/msb-q4.yaml',
      'devices/breakers.yaml',
      'devices/fuses.yaml',
      'project.yaml',
    ]);
    expect(folder.problems).toEqual([]);
    expect(folder.dir).toBe(path.resolve('tests/fixtures/model/good'));
    expect(folder.templatesDir).toBe(path.resolve('tests/fixtures/model/good/templates'));
  });

  const scratch = mkdtempSync(path.join(os.tmpdir(), 'faultsheet-read-'));
  afterAll(() => rmSync(scratch, { recursive: true, force: true }));

  it('skips hidden files, reports *.yml, and does not loop on a symbolic link cycle', async () => {
    mkdirSync(path.join(scratch, 'circuits', 'sub'), { recursive: true });
    writeFileSync(path.join(scratch, 'project.yaml'), 'project: {}\n');
    writeFileSync(path.join(scratch, 'circuits', 'a.yaml'), 'id: A\n');
    writeFileSync(path.join(scratch, 'circuits', '.#a.yaml'), 'lock\n');
    writeFileSync(path.join(scratch, 'circuits', 'b.yml'), 'id: B\n');
    writeFileSync(path.join(scratch, 'circuits', 'sub', 'c.yaml'), 'id: C\n');
    symlinkSync(path.join(scratch, 'circuits'), path.join(scratch, 'circuits', 'sub', 'back'));
    const folder = await readProjectFolder(scratch);
    expect(folder.files.map((f) => f.path)).toEqual(['circuits/a.yaml', 'circuits/sub/c.yaml', 'project.yaml']);
    expect(folder.problems).toEqual([{ kind: 'ignored-file', file: 'circuits/b.yml', detail: 'rename it to .yaml to have it read' }]);
    expect(folder.templatesDir).toBeUndefined();
  });
});
