// The demo projects: valid, invented, device data marked illustrative, editor hints that resolve.

import { existsSync } from 'node:fs';
import { readFile, readdir } from 'node:fs/promises';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadProject } from '../../src/model/load.js';
import { SCHEMA_OF } from '../../src/init.js';
import { demoProjectDirs } from '../../src/demo.js';
import { repoRoot, run } from './run.js';

async function yamlFiles(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const entry of await readdir(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    if (entry.isDirectory() && entry.name !== 'out') out.push(...(await yamlFiles(p)));
    else if (entry.isFile() && entry.name.endsWith('.yaml')) out.push(p);
  }
  return out.sort();
}

describe('projects-demo/', () => {
  it('has the two demo projects', async () => {
    const dirs = (await demoProjectDirs()).map((d) => path.relative(repoRoot, d).split(path.sep).join('/'));
    expect(dirs).toEqual(['projects-demo/iec-400v', 'projects-demo/nec-480v']);
  });

  it.each(['iec-400v', 'nec-480v'])('%s checks with no problem and no warning', async (name) => {
    const r = await run(['check', `projects-demo/${name}`]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^\d+ files, \d+ circuits: no problems\n$/);
  });

  it.each(['iec-400v', 'nec-480v'])('%s marks every device as illustrative, not any maker\'s (RULES.md)', async (name) => {
    const loaded = await loadProject(path.join(repoRoot, 'projects-demo', name));
    expect(loaded.ok).toBe(true);
    if (!loaded.ok) return;
    expect(loaded.project.devices.length).toBeGreaterThan(0);
    for (const d of loaded.project.devices) {
      expect(d.illustrative, d.id).toBe(true);
      expect(d.description, d.id).toContain("illustrative data, not any maker's");
    }
  });

  it.each(['iec-400v', 'nec-480v'])('%s: every file names its schema on the first line, and the path resolves', async (name) => {
    const dir = path.join(repoRoot, 'projects-demo', name);
    for (const file of await yamlFiles(dir)) {
      const rel = path.relative(dir, file).split(path.sep).join('/');
      const kind = rel === 'project.yaml' ? SCHEMA_OF.project : rel.startsWith('devices/') ? SCHEMA_OF.devices : SCHEMA_OF.circuit;
      const first = (await readFile(file, 'utf8')).split('\n')[0]!;
      const match = /^# yaml-language-server: \$schema=(.+)$/.exec(first);
      expect(match, rel).not.toBeNull();
      expect(path.basename(match![1]!), rel).toBe(kind);
      expect(existsSync(path.resolve(path.dirname(file), match![1]!)), rel).toBe(true);
    }
  });
});
