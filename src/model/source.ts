// A project file parsed as YAML with its node positions kept, so that every problem found later
// (schema, units, cross-references) can name the file, line and column it concerns.

import {
  isAlias,
  isMap,
  isPair,
  isScalar,
  isSeq,
  LineCounter,
  parseDocument,
  visit,
  type Document,
  type Node as YamlNode,
} from 'yaml';
import type { Issue } from './issues.js';
import { problem } from './messages.js';
import type { SourcePos } from './types.js';

export type PathSegment = string | number;

/** Above this many alias expansions a document is rejected (exponential "billion laughs" input). */
export const MAX_ALIAS_COUNT = 100;

export interface SourceFile {
  path: string; // relative to the project folder, posix separators
  doc: Document.Parsed;
  lineCounter: LineCounter;
  value: unknown; // the plain JS value of the document
}

/**
 * Keys whose values are free text or ids: a plain scalar such as `number: 0417` or `id: 101` is
 * taken as written, not as the number YAML would make of it.
 */
const TEXT_KEYS = new Set([
  'id',
  'name',
  'number',
  'revision',
  'client',
  'role',
  'feeds',
  'from',
  'to',
  'device',
  'description',
  'vector_group',
]);
const TEXT_LIST_KEYS = new Set(['assumptions']);

export type ParseOutcome = { ok: true; file: SourceFile; issues: Issue[] } | { ok: false; issues: Issue[] };

export function parseYamlFile(path: string, text: string): ParseOutcome {
  const source = text.startsWith('\uFEFF') ? text.slice(1) : text;
  const lineCounter = new LineCounter();
  const doc = parseDocument(source, { lineCounter, prettyErrors: false, merge: true, uniqueKeys: true });
  const at = (offset: number): { line: number; col: number } => lineCounter.linePos(offset);
  const warnings: Issue[] = doc.warnings.map((w) =>
    problem('yaml-warning', { file: path, ...at(w.pos[0]), path: '' }, { detail: w.message }, 'warning'),
  );
  if (doc.errors.length > 0) {
    // The first error only: after it the parser's recovery reports follow-on errors of the same mistake.
    const e = doc.errors[0]!;
    const pos = at(e.pos[0]);
    const key = keyOnLine(source, pos.line);
    const error = problem('yaml-syntax', { file: path, ...pos, path: key ?? '' }, { detail: firstLine(e.message) });
    return { ok: false, issues: [error, ...warnings] };
  }
  if (doc.contents === null || (isScalar(doc.contents) && doc.contents.value === null)) {
    return { ok: false, issues: [problem('empty-file', { file: path, line: 1, col: 1, path: '' }, { expected: expectedContent(path) }), ...warnings] };
  }
  let value: unknown;
  try {
    value = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
  } catch (error) {
    if (error instanceof ReferenceError) {
      const offset = firstAliasOffset(doc) ?? 0;
      return {
        ok: false,
        issues: [problem('yaml-alias-limit', { file: path, ...at(offset), path: '' }, { limit: MAX_ALIAS_COUNT }), ...warnings],
      };
    }
    throw error;
  }
  const file: SourceFile = { path, doc, lineCounter, value };
  keepTextAsWritten(file, source);
  return { ok: true, file, issues: warnings };
}

/** The key written on a line ("  length: 45 m" gives "length"), to name the field of a syntax error. */
function keyOnLine(source: string, line: number): string | undefined {
  const text = source.split(/\r?\n/)[line - 1] ?? '';
  return /^\s*(?:-\s+)?([A-Za-z_][A-Za-z0-9_-]*)\s*:/.exec(text)?.[1];
}

/** What a file of this place in the project folder holds, for a message about an empty file. */
function expectedContent(path: string): string {
  if (path.startsWith('devices/')) return 'a list of devices under "devices:"';
  if (path.startsWith('circuits/')) return 'a circuit (a mapping with "id", "from", "device", "cable") or a list under "circuits:"';
  return 'the sections "project:", "settings:" and "supplies:"';
}

function firstLine(message: string): string {
  return message.split('\n')[0]!.trim();
}

function firstAliasOffset(doc: Document.Parsed): number | undefined {
  let offset: number | undefined;
  visit(doc, {
    Alias(_key, node) {
      offset = node.range?.[0];
      return visit.BREAK;
    },
  });
  return offset;
}

/** Ids and free text as written; dates (from a YAML 1.1 timestamp) as YYYY-MM-DD. */
function keepTextAsWritten(file: SourceFile, source: string): void {
  const walk = (node: unknown, path: PathSegment[]): void => {
    if (isMap(node)) {
      for (const pair of node.items) {
        if (!isScalar(pair.key)) continue;
        const key = String(pair.key.value);
        const child = pair.value;
        const childPath = [...path, key];
        if (isScalar(child)) {
          if (TEXT_KEYS.has(key) && (typeof child.value === 'number' || typeof child.value === 'boolean')) {
            setAt(file.value, childPath, scalarSource(child, source));
          } else if (key === 'date' && child.value instanceof Date) {
            setAt(file.value, childPath, child.value.toISOString().slice(0, 10));
          }
        } else if (isSeq(child) && TEXT_LIST_KEYS.has(key)) {
          child.items.forEach((item, index) => {
            if (isScalar(item) && (typeof item.value === 'number' || typeof item.value === 'boolean')) {
              setAt(file.value, [...childPath, index], scalarSource(item, source));
            }
          });
        } else {
          walk(child, childPath);
        }
      }
    } else if (isSeq(node)) {
      node.items.forEach((item, index) => walk(item, [...path, index]));
    }
  };
  walk(file.doc.contents, []);
}

function scalarSource(node: { value: unknown; range?: [number, number, number] | null }, source: string): string {
  if (node.range) return source.slice(node.range[0], node.range[1]);
  return String(node.value);
}

function setAt(root: unknown, path: PathSegment[], value: unknown): void {
  let current: unknown = root;
  for (const segment of path.slice(0, -1)) {
    if (current === null || typeof current !== 'object') return;
    current = (current as Record<PathSegment, unknown>)[segment];
  }
  if (current !== null && typeof current === 'object') {
    (current as Record<PathSegment, unknown>)[path[path.length - 1]!] = value;
  }
}

/** The plain value at a path of the file's JS value; undefined where there is none. */
export function valueAt(root: unknown, path: readonly PathSegment[]): unknown {
  let current: unknown = root;
  for (const segment of path) {
    if (current === null || typeof current !== 'object') return undefined;
    if (Array.isArray(current) && typeof segment !== 'number') return undefined;
    current = (current as Record<PathSegment, unknown>)[segment];
  }
  return current;
}

interface Located {
  node: YamlNode;
  keyNode?: YamlNode; // the key under which it sits, for a mapping value
}

function resolveAlias(doc: Document.Parsed, node: unknown): unknown {
  return isAlias(node) ? node.resolve(doc) : node;
}

/**
 * Where a field path points in the file. A path that does not exist (a missing field) points at
 * its deepest existing parent: the parent's key where it has one, else the parent itself.
 * With `key`, a mapping's key rather than its value (an unknown field).
 */
export function locate(file: SourceFile, path: readonly PathSegment[], options: { key?: boolean } = {}): { line: number; col: number } {
  let current: Located = { node: file.doc.contents as YamlNode };
  let complete = true;
  for (const segment of path) {
    const node = resolveAlias(file.doc, current.node);
    let next: Located | undefined;
    if (isMap(node)) {
      const pair = node.items.find((p) => isPair(p) && isScalar(p.key) && String(p.key.value) === String(segment));
      if (pair !== undefined) {
        const keyNode = pair.key as YamlNode;
        next = { node: (pair.value as YamlNode | null) ?? keyNode, keyNode };
      }
    } else if (isSeq(node) && typeof segment === 'number') {
      const item = node.items[segment];
      if (item !== undefined && item !== null) next = { node: item as YamlNode };
    }
    if (next === undefined) {
      complete = false;
      break;
    }
    current = next;
  }
  // An empty value (`to:` with nothing after it) is shown at its key.
  const emptyValue = isScalar(current.node) && current.node.value === null && current.node.range?.[0] === current.node.range?.[1];
  const target = (!complete || options.key || emptyValue) && current.keyNode !== undefined ? current.keyNode : current.node;
  const offset = target?.range?.[0] ?? 0;
  return file.lineCounter.linePos(offset);
}

export function sourcePos(file: SourceFile, path: readonly PathSegment[]): SourcePos {
  return { file: file.path, ...locate(file, path) };
}

/** "circuits[3].cable.length" */
export function formatPath(path: readonly PathSegment[]): string {
  let text = '';
  for (const segment of path) {
    if (typeof segment === 'number') text += `[${segment}]`;
    else text += text === '' ? segment : `.${segment}`;
  }
  return text;
}
