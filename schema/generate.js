// Writes the JSON Schemas in this folder from the model's schemas: `npm run schema` (builds dist/ first).
// The *.schema.json files are generated: edit src/model/, then run this; tests/cli/schema-files.test.ts
// fails while the committed files differ from what the model generates.

import { readdir, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { schemaDir, schemaFiles } from '../dist/init.js';

const files = schemaFiles();
const keep = new Set(files.map((f) => f.name));
for (const name of await readdir(schemaDir)) {
  if (name.endsWith('.schema.json') && !keep.has(name)) await rm(path.join(schemaDir, name));
}
for (const f of files) await writeFile(path.join(schemaDir, f.name), f.text);
console.log(`wrote ${files.map((f) => f.name).join(', ')} in ${path.relative(process.cwd(), schemaDir) || '.'}`);
