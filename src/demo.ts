// Where the program's own files are: the demo projects and the shipped JSON Schemas sit beside dist/ and src/.

import { readFile, readdir, stat } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/** The package root: one level above this module (src/ when run from source, dist/ when compiled). */
export const packageRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export const demoRoot = path.join(packageRoot, 'projects-demo');

/** Every demo project folder (one with a project.yaml), sorted by name. */
export async function demoProjectDirs(root = demoRoot): Promise<string[]> {
  let names: string[];
  try {
    names = await readdir(root);
  } catch {
    return [];
  }
  const dirs: string[] = [];
  for (const name of names.sort()) {
    const dir = path.join(root, name);
    if (await isFile(path.join(dir, 'project.yaml'))) dirs.push(dir);
  }
  return dirs;
}

export async function packageVersion(): Promise<string> {
  try {
    const pkg = JSON.parse(await readFile(path.join(packageRoot, 'package.json'), 'utf8')) as { version?: string };
    return pkg.version ?? '0.0.0';
  } catch {
    return '0.0.0';
  }
}

async function isFile(p: string): Promise<boolean> {
  try {
    return (await stat(p)).isFile();
  } catch {
    return false;
  }
}
