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
  type Pair,
  type YAMLMap,
} from 'yaml';
import type { Issue } from './issues.js';
import { problem } from './messages.js';
import type { SourcePos } from './types.js';

export type PathSegment = string | number;

/** Above this many alias expansions a document is rejected (exponential "billion laughs" input). */
export const MAX_ALIAS_COUNT = 100;

/** A file's YAML tree, kept for finding where a field was written. */
export interface SourceTree {
  doc: Document.Parsed;
  lineCounter: LineCounter;
  aliasTargets?: ReadonlyMap<YamlNode, YamlNode>; // each alias node's anchor, found once when parsed
}

export interface SourceFile {
  path: string; // relative to the project folder, posix separators
  value: unknown; // the plain JS value of the document
  /** The tree: the one just parsed, or, for a file taken from the parse cache, parsed again on first need. */
  tree: () => SourceTree;
  /** Positions found in the file so far (locate), by path and kind: kept by the parse cache (parse-cache.ts). */
  located: Map<string, { line: number; col: number }>;
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

/** Alias nodes in one file: each costs a lookup among the file's anchors when the document is read. */
export const MAX_ALIASES = 1000;
/** Nodes that aliases may add to a document when expanded (merge keys included). */
export const MAX_ALIAS_EXPANSION = 100_000;
/** Collections nested deeper than this are refused (the format needs six levels). */
export const MAX_NESTING = 64;

export function parseYamlFile(path: string, text: string): ParseOutcome {
  const source = text.startsWith('\uFEFF') ? text.slice(1) : text;
  const lineCounter = new LineCounter();
  // Duplicate keys are found below with one set per mapping: the parser's own check compares each key
  // with every earlier one, quadratic in a mapping's size.
  const doc = parseDocument(source, { lineCounter, prettyErrors: false, merge: true, uniqueKeys: false });
  const at = (offset: number): { line: number; col: number } => lineCounter.linePos(offset);
  const warnings: Issue[] = doc.warnings.map((w) =>
    problem('yaml-warning', { file: path, ...at(w.pos[0]), path: '' }, { detail: w.message }, 'warning'),
  );
  const structure = checkStructure(doc);
  const firstError = doc.errors[0];
  if (firstError !== undefined || structure.syntax !== undefined) {
    // The first error only: after it the parser's recovery reports follow-on errors of the same mistake.
    const offset = firstError !== undefined && (structure.syntax === undefined || firstError.pos[0] <= structure.syntax.offset) ? firstError.pos[0] : structure.syntax!.offset;
    const detail = firstError !== undefined && offset === firstError.pos[0] ? firstLine(firstError.message) : structure.syntax!.detail;
    const pos = at(offset);
    const key = keyOnLine(source, offset, pos.col);
    const error = problem('yaml-syntax', { file: path, ...pos, path: key ?? '' }, { detail });
    return { ok: false, issues: [error, ...warnings] };
  }
  if (doc.contents === null || (isScalar(doc.contents) && doc.contents.value === null)) {
    return { ok: false, issues: [problem('empty-file', { file: path, line: 1, col: 1, path: '' }, { expected: expectedContent(path) }), ...warnings] };
  }
  if (structure.limit !== undefined) {
    return { ok: false, issues: [problem('yaml-alias-limit', { file: path, ...at(structure.limit.offset), path: '' }, { detail: structure.limit.detail }), ...warnings] };
  }
  let value: unknown;
  try {
    value = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
  } catch (error) {
    // The structure was checked above: what is left is the parser's own count of repeated expansion.
    const offset = firstAliasOffset(doc) ?? 0;
    const detail = error instanceof ReferenceError ? `aliases expand more than ${MAX_ALIAS_COUNT} times` : firstLine(error instanceof Error ? error.message : String(error));
    return { ok: false, issues: [problem('yaml-alias-limit', { file: path, ...at(offset), path: '' }, { detail }), ...warnings] };
  }
  const tree: SourceTree = { doc, lineCounter, aliasTargets: structure.aliasTargets };
  const file: SourceFile = { path, value, tree: () => tree, located: new Map() };
  keepTextAsWritten(file, doc, source);
  return { ok: true, file, issues: warnings };
}

interface Structure {
  syntax?: { offset: number; detail: string }; // a duplicate key, an alias without anchor, a bad merge
  limit?: { offset: number; detail: string }; // too many aliases, too large an expansion, too deep
  aliasTargets: Map<YamlNode, YamlNode>;
}

const MERGE_KEY = '<<';
const TAG_PREFIX = 'tag:yaml.org,2002:';
/** YAML types that read as binary data, sets or maps of non-text keys: refused rather than mistaken for a mapping. */
const UNREAD_TAGS = new Set(['binary', 'set', 'omap', 'pairs'].map((t) => TAG_PREFIX + t));

/**
 * One pass over the document's nodes, in document order and without recursion: duplicate keys (one set
 * per mapping), aliases resolved to their anchors (the last one before them, as YAML reads them) and
 * counted, the size an expansion would reach (each anchor's expanded size computed once), merge keys
 * that do not name a mapping, and the nesting depth. Anchors no alias uses are dropped from the
 * document, so that reading it compares each alias with the used anchors only.
 */
function checkStructure(doc: Document.Parsed): Structure {
  const out: Structure = { aliasTargets: new Map() };
  const root = doc.contents as YamlNode | null;
  if (root === null) return out;
  const anchors = new Map<string, YamlNode>();
  const used = new Set<YamlNode>();
  const expanded = new Map<YamlNode, number>(); // finished nodes: their size with aliases expanded
  let aliases = 0;
  let added = 0;
  let firstAlias: YamlNode | undefined; // where an expansion that grows too large is shown
  const offsetOf = (node: unknown): number => (node as { range?: [number, number, number] | null })?.range?.[0] ?? 0;
  const syntax = (node: unknown, detail: string) => {
    if (out.syntax === undefined) out.syntax = { offset: offsetOf(node), detail };
  };
  const limit = (node: unknown, detail: string) => {
    if (out.limit === undefined) out.limit = { offset: offsetOf(node), detail };
  };
  interface Frame {
    node: YamlNode;
    children: YamlNode[];
    next: number;
    size: number;
    depth: number;
  }
  const childrenOf = (node: YamlNode): YamlNode[] => {
    if (isMap(node)) {
      const list: YamlNode[] = [];
      const keys = new Set<unknown>();
      for (const pair of node.items) {
        const key = pair.key as YamlNode | null;
        const value = pair.value as YamlNode | null;
        if (isScalar(key)) {
          const k = key.value;
          if (typeof k === 'symbol' || (k === MERGE_KEY && key.type === 'PLAIN')) {
            checkMerge(value); // a merge key, which may come more than once
          } else {
            const id = typeof k === 'string' ? `s:${k}` : typeof k === 'number' ? `n:${k}` : k === null ? 'null' : `${typeof k}:${String(k)}`;
            if (keys.has(id)) syntax(key, 'Map keys must be unique');
            keys.add(id);
          }
        }
        if (isMap(key) || isSeq(key) || (isAlias(key) && !isScalar(resolve(key)))) syntax(key, 'a key must be a plain value, not a list or a mapping');
        if (key !== null && typeof key === 'object') list.push(key);
        if (value !== null && typeof value === 'object') list.push(value);
      }
      return list;
    }
    if (isSeq(node)) return node.items.filter((i): i is YamlNode => i !== null && typeof i === 'object');
    return [];
  };
  const resolve = (node: unknown): YamlNode | undefined => (isAlias(node) ? anchors.get(node.source) : (node as YamlNode | undefined));
  const checkMerge = (value: YamlNode | null) => {
    const target = resolve(value);
    const sources = isSeq(target) ? target.items.map(resolve) : [target];
    if (sources.some((s) => !isMap(s))) syntax(value, 'a merge key "<<" needs a mapping, an alias of one, or a list of them');
  };
  const stack: Frame[] = [];
  const enter = (node: YamlNode, depth: number): void => {
    const anchor = (node as { anchor?: string }).anchor;
    if (anchor) anchors.set(anchor, node);
    const tag = (node as { tag?: string }).tag;
    if (tag !== undefined && UNREAD_TAGS.has(tag)) syntax(node, `the tag !!${tag.slice(TAG_PREFIX.length)} is not read here (binary data, sets and ordered maps have no place in a project file)`);
    if (depth > MAX_NESTING) limit(node, `collections are nested more than ${MAX_NESTING} levels deep`);
    stack.push({ node, children: out.limit === undefined ? childrenOf(node) : [], next: 0, size: 1, depth });
  };
  const finish = (size: number): void => {
    const parent = stack[stack.length - 1];
    if (parent) parent.size += size;
  };
  enter(root, 1);
  while (stack.length > 0) {
    const frame = stack[stack.length - 1]!;
    if (frame.next < frame.children.length && out.limit === undefined) {
      const child = frame.children[frame.next++]!;
      if (isAlias(child)) {
        aliases++;
        firstAlias ??= child;
        const target = anchors.get(child.source);
        if (target === undefined) {
          syntax(child, `alias *${child.source} has no anchor &${child.source} before it`);
          continue;
        }
        out.aliasTargets.set(child, target);
        used.add(target);
        const size = expanded.get(target);
        if (size === undefined) limit(child, `alias *${child.source} refers to a node that contains it (an endless expansion)`);
        else {
          added += size;
          finish(size);
        }
        if (aliases > MAX_ALIASES) limit(child, `aliases are more than ${MAX_ALIASES} in one file`);
        else if (added > MAX_ALIAS_EXPANSION) limit(firstAlias ?? child, `aliases would expand the document by more than ${MAX_ALIAS_EXPANSION} values`);
        continue;
      }
      enter(child, frame.depth + 1);
      continue;
    }
    stack.pop();
    expanded.set(frame.node, frame.size);
    finish(frame.size);
  }
  if (out.syntax === undefined && out.limit === undefined) {
    // Unused anchors: reading an alias compares it with every anchor before it.
    for (const node of expanded.keys()) {
      const withAnchor = node as { anchor?: string };
      if (withAnchor.anchor && !used.has(node)) withAnchor.anchor = undefined;
    }
  }
  return out;
}

/** The key written on a line ("  length: 45 m" gives "length"), to name the field of a syntax error. */
function keyOnLine(source: string, offset: number, col: number): string | undefined {
  const start = Math.max(0, offset - (col - 1));
  const end = source.indexOf('\n', start);
  const text = source.slice(start, end < 0 ? undefined : end).replace(/\r$/, '');
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
function keepTextAsWritten(file: SourceFile, doc: Document.Parsed, source: string): void {
  const walk = (node: unknown, path: PathSegment[]): void => {
    if (isMap(node)) {
      for (const pair of node.items) {
        if (!isScalar(pair.key)) continue;
        const key = String(pair.key.value);
        const child = pair.value;
        const childPath = [...path, key];
        if (isScalar(child)) {
          if (TEXT_KEYS.has(key) && (typeof child.value === 'number' || typeof child.value === 'boolean' || child.value instanceof Date)) {
            setAt(file.value, childPath, scalarSource(child, source));
          } else if (key === 'date' && child.value instanceof Date) {
            setAt(file.value, childPath, child.value.toISOString().slice(0, 10));
          }
        } else if (isSeq(child) && TEXT_LIST_KEYS.has(key)) {
          child.items.forEach((item, index) => {
            if (isScalar(item) && (typeof item.value === 'number' || typeof item.value === 'boolean' || item.value instanceof Date)) {
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
  walk(doc.contents, []);
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

function resolveAlias(tree: SourceTree, node: unknown): unknown {
  if (!isAlias(node)) return node;
  return tree.aliasTargets?.get(node) ?? node.resolve(tree.doc);
}

const pairIndexes = new WeakMap<object, Map<string, Pair>>();

/** The first pair of a mapping with this key; a large mapping is indexed once, so that an issue per key stays linear. */
function pairFor(map: YAMLMap, key: string): Pair | undefined {
  const matches = (p: unknown): p is Pair => isPair(p) && isScalar(p.key) && String(p.key.value) === key;
  if (map.items.length <= 16) return map.items.find(matches);
  let index = pairIndexes.get(map);
  if (index === undefined) {
    index = new Map();
    for (const p of map.items) {
      if (isPair(p) && isScalar(p.key) && !index.has(String(p.key.value))) index.set(String(p.key.value), p);
    }
    pairIndexes.set(map, index);
  }
  return index.get(key);
}

/**
 * Where a field path points in the file. A path that does not exist (a missing field) points at
 * its deepest existing parent: the parent's key where it has one, else the parent itself.
 * With `key`, a mapping's key rather than its value (an unknown field).
 */
export function locate(file: SourceFile, path: readonly PathSegment[], options: { key?: boolean } = {}): { line: number; col: number } {
  const known = `${options.key ? 'key' : 'value'} ${JSON.stringify(path)}`;
  const found = file.located.get(known);
  if (found !== undefined) return { line: found.line, col: found.col };
  const pos = locateInTree(file.tree(), path, options);
  file.located.set(known, { line: pos.line, col: pos.col });
  return pos;
}

function locateInTree(tree: SourceTree, path: readonly PathSegment[], options: { key?: boolean }): { line: number; col: number } {
  let current: Located = { node: tree.doc.contents as YamlNode };
  let complete = true;
  for (const segment of path) {
    const node = resolveAlias(tree, current.node);
    let next: Located | undefined;
    if (isMap(node)) {
      const pair = pairFor(node, String(segment));
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
  return tree.lineCounter.linePos(offset);
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
