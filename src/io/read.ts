// Reads a project folder from disk: project.yaml, every devices/**/*.yaml and circuits/**/*.yaml
// (nothing else), and notes whether a templates/ folder is present. The only module of loading
// that touches the file system; everything after it works on the bytes it returns.

// Synchronous calls: a project folder is read once at start-up, and one round trip per file through
// the thread pool costs more than the reads themselves on a project of a thousand files.
import { readdirSync as readdir, readFileSync as readFile, realpathSync as realpath, statSync as stat } from 'node:fs';
import path from 'node:path';

export interface InputFile {
  path: string; // relative to the project folder, posix separators
  bytes: Uint8Array;
}

export interface ReadProblem {
  kind: 'missing-folder' | 'missing-project-file' | 'read-error' | 'ignored-file';
  file: string; // relative path ("." for the folder)
  detail: string;
}

export interface ProjectFolder {
  dir: string; // absolute
  files: InputFile[]; // sorted by path (code-unit order)
  templatesDir?: string; // absolute, where DIR/templates is a folder
  problems: ReadProblem[];
}

export const PROJECT_FILE = 'project.yaml';
export const INPUT_FOLDERS = ['devices', 'circuits'] as const;

function errorText(error: unknown): string {
  if (error && typeof error === 'object' && 'code' in error) {
    const code = String((error as { code: unknown }).code);
    if (code === 'ENOENT') return 'no such file or folder';
    if (code === 'EACCES' || code === 'EPERM') return 'permission denied';
    if (code === 'EISDIR') return 'is a folder';
    return code;
  }
  return error instanceof Error ? error.message : String(error);
}

function isDirectory(target: string): boolean {
  try {
    return (stat(target)).isDirectory();
  } catch {
    return false;
  }
}

const compare = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

/**
 * Lists the *.yaml files below `folder` (relative to `root`), following symbolic links but never
 * the same real folder twice. Names starting with "." (editor lock and backup files) are skipped;
 * *.yml files are reported so that a misnamed file is not silently left out.
 */
function listYaml(root: string, folder: string, problems: ReadProblem[], seen: Set<string>): string[] {
  const absolute = path.join(root, folder);
  let real: string;
  try {
    real = realpath(absolute);
  } catch (error) {
    problems.push({ kind: 'read-error', file: folder, detail: errorText(error) });
    return [];
  }
  if (seen.has(real)) return [];
  seen.add(real);
  let names: string[];
  try {
    names = (readdir(absolute)).sort(compare);
  } catch (error) {
    problems.push({ kind: 'read-error', file: folder, detail: errorText(error) });
    return [];
  }
  const found: string[] = [];
  for (const name of names) {
    if (name.startsWith('.')) continue;
    const relative = `${folder}/${name}`;
    let info;
    try {
      info = stat(path.join(root, relative));
    } catch (error) {
      problems.push({ kind: 'read-error', file: relative, detail: errorText(error) });
      continue;
    }
    if (info.isDirectory()) for (const file of listYaml(root, relative, problems, seen)) found.push(file); // no spread: a folder may hold more names than a call takes arguments
    else if (info.isFile() && name.endsWith('.yaml')) found.push(relative);
    else if (info.isFile() && name.endsWith('.yml')) {
      problems.push({ kind: 'ignored-file', file: relative, detail: 'rename it to .yaml to have it read' });
    }
  }
  return found;
}

export async function readProjectFolder(dir: string): Promise<ProjectFolder> {
  const absolute = path.resolve(dir);
  const problems: ReadProblem[] = [];
  if (!(isDirectory(absolute))) {
    problems.push({ kind: 'missing-folder', file: '.', detail: `${absolute} is not a folder` });
    return { dir: absolute, files: [], problems };
  }
  const relativePaths: string[] = [];
  try {
    const info = stat(path.join(absolute, PROJECT_FILE));
    if (info.isFile()) relativePaths.push(PROJECT_FILE);
    else problems.push({ kind: 'read-error', file: PROJECT_FILE, detail: 'is not a file' });
  } catch {
    const alternative = (() => { try { return stat(path.join(absolute, 'project.yml')).isFile(); } catch { return false; } })();
    problems.push({
      kind: 'missing-project-file',
      file: PROJECT_FILE,
      detail: alternative ? 'found project.yml; rename it to project.yaml' : `no ${PROJECT_FILE} in ${absolute}`,
    });
  }
  const seen = new Set<string>();
  for (const folder of INPUT_FOLDERS) {
    if (isDirectory(path.join(absolute, folder))) {
      for (const file of listYaml(absolute, folder, problems, seen)) relativePaths.push(file);
    }
  }
  relativePaths.sort(compare);
  const files: InputFile[] = [];
  for (const relative of relativePaths) {
    try {
      files.push({ path: relative, bytes: readFile(path.join(absolute, relative)) });
    } catch (error) {
      problems.push({ kind: 'read-error', file: relative, detail: errorText(error) });
    }
  }
  const templates = path.join(absolute, 'templates');
  const folder: ProjectFolder = { dir: absolute, files, problems };
  if (isDirectory(templates)) folder.templatesDir = templates;
  return folder;
}
