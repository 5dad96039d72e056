// Loads a project folder into the solver-side Project: read the files, parse the YAML keeping
// positions, validate each part against the schema, apply and record defaults, check ids and the
// board tree. Every problem of every file is collected before the outcome is decided.

import { createHash } from 'node:crypto';
import { readProjectFolder, type ProjectFolder, type ReadProblem } from '../io/read.js';
import { hasErrors, sortIssues, type Issue } from './issues.js';
import { nearest, problem } from './messages.js';
import {
  normaliseCircuit,
  normaliseDevice,
  normaliseMeta,
  normaliseSettings,
  normaliseSignoff,
  normaliseSupply,
  reporterFor,
} from './normalise.js';
import {
  circuitSchema,
  deviceSchema,
  projectFileSchema,
  projectMetaSchema,
  settingsSchema,
  signoffSchema,
  supplySchema,
} from './schema.js';
import { ParseCache } from './parse-cache.js';
import { sourcePos, type PathSegment, type SourceFile } from './source.js';
import { checkProjectRefs, refAt, type CircuitRefs, type DeviceRefs, type ProjectRefs, type SupplyRefs, type UnreadParts } from './topology.js';
import type { AppliedDefault, Circuit, Device, Project, ProjectMeta, Settings, Signoff, Supply } from './types.js';
import { loadUnitLibrary, UnitLibraryNeeded } from './units.js';
import { describeValue, locationOf, validatePart } from './validate.js';

export type LoadOutcome =
  | { ok: true; project: Project; warnings: Issue[] } // warnings: problems that do not stop the solve
  | { ok: false; issues: Issue[] }; // errors and warnings, sorted by file, line, column

/** Read and check a project folder; with `cache`, files unchanged since it was written are not parsed again. */
export async function loadProject(dir: string, cache?: ParseCache): Promise<LoadOutcome> {
  const folder = await readProjectFolder(dir);
  try {
    return buildProject(folder, cache);
  } catch (error) {
    // A unit our own reader does not know: load mathjs's units and read the project again.
    if (!(error instanceof UnitLibraryNeeded)) throw error;
    await loadUnitLibrary();
    return buildProject(folder, cache);
  }
}

/** sha256 over the files sorted by relative path, each as path + NUL + content + NUL. */
export function inputSha256(files: ReadonlyArray<{ path: string; bytes: Uint8Array }>): string {
  const hash = createHash('sha256');
  const sorted = [...files].sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
  for (const file of sorted) {
    hash.update(Buffer.from(file.path, 'utf8'));
    hash.update(Buffer.from([0]));
    hash.update(file.bytes);
    hash.update(Buffer.from([0]));
  }
  return hash.digest('hex');
}

function readProblemIssue(p: ReadProblem): Issue {
  const at = { file: p.file, line: 0, col: 0, path: '' };
  switch (p.kind) {
    case 'missing-folder':
      return problem('missing-file', at, { detail: p.detail, expected: 'a project folder' });
    case 'missing-project-file':
      return problem('missing-file', at, { detail: p.detail, expected: 'a project.yaml at the top of the project folder' });
    case 'ignored-file':
      return problem('ignored-file', at, { detail: p.detail }, 'warning');
    case 'read-error':
      return problem('read-error', at, { detail: p.detail });
  }
}

const decoder = new TextDecoder('utf-8', { fatal: true });

type Mapping = Record<string, unknown>;

function isMapping(value: unknown): value is Mapping {
  return value !== null && typeof value === 'object' && !Array.isArray(value) && !(value instanceof Date);
}

/** The file's top level must be a mapping with only the given keys. */
function topLevelMapping(file: SourceFile, allowed: readonly string[], expected: string, issues: Issue[]): Mapping | undefined {
  if (!isMapping(file.value)) {
    issues.push(problem('not-a-mapping', locationOf(file, []), { detail: describeValue(file.value), expected }));
    return undefined;
  }
  for (const key of Object.keys(file.value)) {
    if (!allowed.includes(key)) {
      issues.push(problem('unknown-field', locationOf(file, [key], { key: true }), { key, allowed, suggestion: nearest(key, allowed) }));
    }
  }
  return file.value;
}

/** The list at `key`: issues if it is missing (when required) or not a list. */
function listAt(file: SourceFile, root: Mapping, key: string, required: boolean, issues: Issue[]): unknown[] | undefined {
  const value = root[key];
  if (value === undefined) {
    if (required) issues.push(problem('missing-field', locationOf(file, [key]), { key, expected: 'a list' }));
    return undefined;
  }
  if (!Array.isArray(value)) {
    issues.push(problem('wrong-type', locationOf(file, [key]), { detail: describeValue(value), expected: 'a list' }));
    return undefined;
  }
  return value;
}

interface ProjectPart {
  meta?: ProjectMeta;
  settings?: Settings;
  supplies: Supply[];
  assumptions: string[];
  signoff: Signoff;
  defaults: AppliedDefault[];
}

function loadProjectFile(file: SourceFile, refs: ProjectRefs, issues: Issue[]): ProjectPart {
  const part: ProjectPart = { supplies: [], assumptions: [], signoff: {}, defaults: [] };
  const keys = Object.keys(projectFileSchema.shape);
  const root = topLevelMapping(file, keys, 'a mapping with "project", "settings" and "supplies"', issues);
  if (root === undefined) return part;

  const meta = validatePart(projectMetaSchema, root.project, file, ['project'], issues);
  if (meta !== undefined) part.meta = normaliseMeta(meta);
  const settings = validatePart(settingsSchema, root.settings, file, ['settings'], issues);
  if (settings !== undefined) part.settings = normaliseSettings(settings, part.defaults, reporterFor(file, ['settings'], issues));

  const supplies = listAt(file, root, 'supplies', true, issues);
  if (supplies !== undefined && supplies.length === 0) issues.push(problem('no-supplies', locationOf(file, ['supplies']), {}));
  (supplies ?? []).forEach((raw, index) => {
    const prefix: PathSegment[] = ['supplies', index];
    const supplyRefs: SupplyRefs = {};
    const id = refAt(raw, 'id', file, prefix);
    const feeds = refAt(raw, 'feeds', file, prefix);
    if (id) supplyRefs.id = id;
    if (feeds) supplyRefs.feeds = feeds;
    refs.supplies.push(supplyRefs);
    const parsed = validatePart(supplySchema, raw, file, prefix, issues);
    if (parsed === undefined) return;
    const supply = normaliseSupply(parsed, sourcePos(file, prefix), part.defaults, reporterFor(file, prefix, issues));
    if (supply !== undefined) part.supplies.push(supply);
  });

  const assumptions = validatePart(projectFileSchema.shape.assumptions, root.assumptions, file, ['assumptions'], issues);
  part.assumptions = assumptions ?? [];
  const signoff = validatePart(signoffSchema.optional(), root.signoff, file, ['signoff'], issues);
  part.signoff = normaliseSignoff(signoff);
  return part;
}

interface ParsedDeviceEntry {
  device: Device;
}

function loadDevicesFile(file: SourceFile, refs: ProjectRefs, devices: ParsedDeviceEntry[], issues: Issue[]): void {
  const root = topLevelMapping(file, ['devices'], 'a mapping with a list under "devices:"', issues);
  if (root === undefined) return;
  const list = listAt(file, root, 'devices', true, issues);
  (list ?? []).forEach((raw, index) => {
    const prefix: PathSegment[] = ['devices', index];
    const deviceRefs: DeviceRefs = {};
    const id = refAt(raw, 'id', file, prefix);
    if (id) deviceRefs.id = id;
    refs.devices.push(deviceRefs);
    const parsed = validatePart(deviceSchema, raw, file, prefix, issues);
    if (parsed === undefined) return;
    const device = normaliseDevice(parsed, sourcePos(file, prefix), reporterFor(file, prefix, issues));
    if (device !== undefined) devices.push({ device });
  });
}

interface PendingCircuit {
  file: SourceFile;
  prefix: PathSegment[];
  raw: unknown;
}

function collectCircuits(file: SourceFile, refs: ProjectRefs, pending: PendingCircuit[], issues: Issue[]): void {
  const expected = 'a circuit (a mapping with "id", "from", "device", "cable") or a list under "circuits:"';
  if (!isMapping(file.value)) {
    issues.push(problem('not-a-mapping', locationOf(file, []), { detail: describeValue(file.value), expected }));
    return;
  }
  let entries: Array<{ raw: unknown; prefix: PathSegment[] }>;
  if ('circuits' in file.value) {
    const root = topLevelMapping(file, ['circuits'], expected, issues)!;
    const list = listAt(file, root, 'circuits', true, issues) ?? [];
    entries = list.map((raw, index) => ({ raw, prefix: ['circuits', index] }));
  } else {
    entries = [{ raw: file.value, prefix: [] }];
  }
  for (const { raw, prefix } of entries) {
    const circuitRefs: CircuitRefs = {};
    for (const key of ['id', 'from', 'to', 'device'] as const) {
      const ref = refAt(raw, key, file, prefix);
      if (ref) circuitRefs[key] = ref;
    }
    refs.circuits.push(circuitRefs);
    pending.push({ file, prefix, raw });
  }
}

const byId = <T extends { id: string }>(a: T, b: T): number => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0);

/** Pure: from the files read to the outcome. Throws UnitLibraryNeeded where a unit needs mathjs and it is
 * not loaded (loadProject loads it and calls again). */
export function buildProject(folder: ProjectFolder, cache: ParseCache = ParseCache.empty()): LoadOutcome {
  const issues: Issue[] = folder.problems.map(readProblemIssue);
  const sources: SourceFile[] = [];
  for (const input of folder.files) {
    let text: string;
    try {
      text = decoder.decode(input.bytes);
    } catch {
      issues.push(problem('invalid-encoding', { file: input.path, line: 0, col: 0, path: '' }, {}));
      continue;
    }
    const parsed = cache.parse(input.path, input.bytes, () => text);
    issues.push(...parsed.issues);
    if (parsed.ok) sources.push(parsed.file);
  }

  const refs: ProjectRefs = { supplies: [], devices: [], circuits: [] };
  const projectFile = sources.find((s) => s.path === 'project.yaml');
  const part: ProjectPart = projectFile
    ? loadProjectFile(projectFile, refs, issues)
    : { supplies: [], assumptions: [], signoff: {}, defaults: [] };

  const deviceEntries: ParsedDeviceEntry[] = [];
  const pending: PendingCircuit[] = [];
  // A file that does not parse, or whose top level has the wrong shape, leaves its part of the project
  // unknown: the cross-file checks that depend on that part are skipped rather than reported falsely.
  const parsedPaths = new Set(sources.map((s) => s.path));
  const unread: UnreadParts = {
    supplies: !parsedPaths.has('project.yaml') || refs.supplies.length === 0,
    devices: folder.files.some((f) => f.path.startsWith('devices/') && !parsedPaths.has(f.path)),
    circuits: folder.files.some((f) => f.path.startsWith('circuits/') && !parsedPaths.has(f.path)),
  };
  for (const source of sources) {
    const before = issues.length;
    if (source.path.startsWith('devices/')) {
      loadDevicesFile(source, refs, deviceEntries, issues);
      if (issues.slice(before).some((i) => i.severity === 'error' && i.path === '')) unread.devices = true;
    } else if (source.path.startsWith('circuits/')) {
      collectCircuits(source, refs, pending, issues);
      if (issues.slice(before).some((i) => i.severity === 'error' && i.path === '')) unread.circuits = true;
    }
  }
  checkProjectRefs(refs, issues, unread);

  const devicesById = new Map<string, Device>();
  for (const { device } of deviceEntries) if (!devicesById.has(device.id)) devicesById.set(device.id, device);
  const circuits: Circuit[] = [];
  for (const { file, prefix, raw } of pending) {
    const parsed = validatePart(circuitSchema, raw, file, prefix, issues);
    if (parsed === undefined) continue;
    const circuit = normaliseCircuit(
      parsed,
      sourcePos(file, prefix),
      devicesById.get(parsed.device),
      part.settings,
      reporterFor(file, prefix, issues),
    );
    if (circuit !== undefined) {
      const written = (raw as { cable?: { length?: unknown } })?.cable?.length;
      if (typeof written === 'string') circuit.cable.lengthWritten = written.trim();
      circuits.push(circuit);
    }
  }

  if (hasErrors(issues) || part.meta === undefined || part.settings === undefined) {
    return { ok: false, issues: sortIssues(issues) };
  }
  const project: Project = {
    dir: folder.dir,
    inputSha256: inputSha256(folder.files),
    meta: part.meta,
    settings: part.settings,
    supplies: part.supplies,
    assumptions: part.assumptions,
    signoff: part.signoff,
    devices: deviceEntries.map((e) => e.device).sort(byId),
    circuits: circuits.sort(byId),
    defaults: part.defaults,
  };
  if (folder.templatesDir !== undefined) project.templatesDir = folder.templatesDir;
  return { ok: true, project, warnings: sortIssues(issues) };
}
