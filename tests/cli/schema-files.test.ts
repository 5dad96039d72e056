// The JSON Schemas shipped under schema/ are exactly what `npm run schema` generates from the model.

import { readFile, readdir } from 'node:fs/promises';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { SCHEMA_OF, schemaFiles } from '../../src/init.js';
import { repoRoot } from './run.js';

describe('schema/', () => {
  it('holds the generated files, unchanged (run `npm run schema` after changing the format)', async () => {
    const generated = schemaFiles();
    const committed = (await readdir(path.join(repoRoot, 'schema'))).filter((f) => f.endsWith('.schema.json')).sort();
    expect(committed).toEqual(generated.map((g) => g.name));
    for (const g of generated) {
      expect(await readFile(path.join(repoRoot, 'schema', g.name), 'utf8'), g.name).toBe(g.text);
    }
  });

  it('has a schema for each kind of file the editor hints name', () => {
    const names = schemaFiles().map((g) => g.name);
    for (const file of Object.values(SCHEMA_OF)) expect(names).toContain(file);
  });
});
