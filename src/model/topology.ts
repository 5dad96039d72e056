// Project-wide checks on ids and the board tree: duplicate ids, references to unknown devices or
// boards, boards fed twice, boards no supply reaches, and loops. They read the ids as written
// (even in entries that failed validation), so they are reported together with every other issue.

import type { Issue } from './issues.js';
import { problem, suggester } from './messages.js';
import { locate, type PathSegment, type SourceFile } from './source.js';
import { locationOf } from './validate.js';

/** A text value as written, and where. */
export interface Ref {
  value: string;
  file: SourceFile;
  path: PathSegment[];
}

export interface SupplyRefs {
  id?: Ref;
  feeds?: Ref;
}

export interface CircuitRefs {
  id?: Ref;
  from?: Ref;
  to?: Ref;
  device?: Ref;
}

export interface DeviceRefs {
  id?: Ref;
}

export interface ProjectRefs {
  supplies: SupplyRefs[]; // in file order
  devices: DeviceRefs[]; // in file order (files sorted)
  circuits: CircuitRefs[]; // in file order (files sorted)
}

/** The text at `key` of a raw mapping, if it is non-empty text. */
export function refAt(raw: unknown, key: string, file: SourceFile, prefix: readonly PathSegment[]): Ref | undefined {
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) return undefined;
  const value = (raw as Record<string, unknown>)[key];
  if (typeof value !== 'string' || value === '') return undefined;
  return { value, file, path: [...prefix, key] };
}

function where(ref: Ref): string {
  const { line, col } = locate(ref.file, ref.path);
  return `${ref.file.path}:${line}:${col}`;
}

const compare = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

interface Feeder {
  kind: 'supply' | 'circuit';
  id: string;
  ref: Ref; // the `feeds` or `to` value
  from?: string; // a circuit's `from` board
}

/**
 * What could not be read whole: a reference into such a part cannot be judged, and reporting it would bury
 * the one real problem under follow-on errors.
 */
export interface UnreadParts {
  supplies: boolean; // project.yaml missing, unparsable, or its supplies unreadable
  devices: boolean; // a devices file unparsable or of the wrong shape
  circuits: boolean; // a circuits file unparsable or of the wrong shape
}

export function checkProjectRefs(refs: ProjectRefs, issues: Issue[], unread: UnreadParts = { supplies: false, devices: false, circuits: false }): void {
  checkDuplicates(
    refs.devices.flatMap((d) => (d.id ? [{ kind: 'device', ref: d.id }] : [])),
    issues,
  );
  checkDuplicates(
    [
      ...refs.supplies.flatMap((s) => (s.id ? [{ kind: 'supply', ref: s.id }] : [])),
      ...refs.circuits.flatMap((c) => (c.id ? [{ kind: 'circuit', ref: c.id }] : [])),
    ],
    issues,
  );

  const deviceSet = new Set(refs.devices.flatMap((d) => (d.id ? [d.id.value] : [])));
  const suggestDevice = suggester([...deviceSet].sort(compare));
  for (const circuit of refs.circuits) {
    if (unread.devices) break;
    if (circuit.device && !deviceSet.has(circuit.device.value)) {
      issues.push(
        problem('unknown-device', locationOf(circuit.device.file, circuit.device.path), {
          id: circuit.device.value,
          suggestion: suggestDevice(circuit.device.value),
        }),
      );
    }
  }

  // Boards: each fed by a supply (`feeds`) or by a circuit (`to`); supplies listed first.
  const feeders = new Map<string, Feeder[]>();
  const addFeeder = (board: string, feeder: Feeder): void => {
    const list = feeders.get(board) ?? [];
    list.push(feeder);
    feeders.set(board, list);
  };
  for (const supply of refs.supplies) {
    if (supply.feeds) addFeeder(supply.feeds.value, { kind: 'supply', id: supply.id?.value ?? '?', ref: supply.feeds });
  }
  for (const circuit of refs.circuits) {
    if (circuit.to) {
      addFeeder(circuit.to.value, { kind: 'circuit', id: circuit.id?.value ?? '?', ref: circuit.to, from: circuit.from?.value });
    }
  }
  const boards = [...feeders.keys()].sort(compare);

  for (const [board, list] of feeders) {
    const first = list[0]!;
    for (const other of list.slice(1)) {
      issues.push(
        problem('board-fed-twice', locationOf(other.ref.file, other.ref.path), {
          id: board,
          detail: `${first.kind} ${JSON.stringify(first.id)}`,
          other: where(first.ref),
        }),
      );
    }
  }

  if (unread.supplies || unread.circuits) {
    checkTree(refs.circuits, feeders, boards, issues, false);
    return;
  }
  const suggestBoard = suggester(boards);
  for (const circuit of refs.circuits) {
    if (circuit.from && !feeders.has(circuit.from.value)) {
      issues.push(
        problem('unknown-board', locationOf(circuit.from.file, circuit.from.path), {
          id: circuit.from.value,
          suggestion: suggestBoard(circuit.from.value),
        }),
      );
    }
  }

  checkTree(refs.circuits, feeders, boards, issues);
}

function checkDuplicates(entries: Array<{ kind: string; ref: Ref }>, issues: Issue[]): void {
  const first = new Map<string, { kind: string; ref: Ref }>();
  for (const entry of entries) {
    const earlier = first.get(entry.ref.value);
    if (earlier === undefined) {
      first.set(entry.ref.value, entry);
      continue;
    }
    issues.push(
      problem('duplicate-id', locationOf(entry.ref.file, entry.ref.path), {
        kind: entry.kind,
        id: entry.ref.value,
        detail: earlier.kind,
        other: where(earlier.ref),
      }),
    );
  }
}

interface Edge {
  circuit: string;
  from: string;
  to: string;
  ref: Ref; // the circuit's `to`
}

/** Loops (Tarjan's strongly connected components) and boards that no supply reaches. */
function checkTree(circuits: CircuitRefs[], feeders: Map<string, Feeder[]>, boards: string[], issues: Issue[], reachability = true): void {
  const edges: Edge[] = [];
  for (const c of circuits) {
    if (c.from && c.to) edges.push({ circuit: c.id?.value ?? '?', from: c.from.value, to: c.to.value, ref: c.to });
  }
  const outgoing = new Map<string, Edge[]>();
  for (const edge of edges) {
    const list = outgoing.get(edge.from) ?? [];
    list.push(edge);
    outgoing.set(edge.from, list);
  }

  const inCycle = new Set<string>();
  for (const edge of edges) {
    if (edge.from === edge.to) {
      inCycle.add(edge.to);
      issues.push(problem('self-loop', locationOf(edge.ref.file, edge.ref.path), { id: edge.circuit, detail: edge.from }));
    }
  }
  const components = stronglyConnected([...new Set([...boards, ...edges.map((e) => e.from)])].sort(compare), outgoing);
  const componentOf = new Map<string, number>();
  components.forEach((component, index) => {
    if (component.length >= 2) for (const board of component) componentOf.set(board, index);
  });
  const insideOf = new Map<number, Edge[]>();
  for (const e of edges) {
    const index = componentOf.get(e.from);
    if (index === undefined || e.from === e.to || componentOf.get(e.to) !== index) continue;
    const list = insideOf.get(index) ?? [];
    list.push(e);
    insideOf.set(index, list);
  }
  components.forEach((component, index) => {
    if (component.length < 2) return;
    for (const board of component) inCycle.add(board);
    const inside = insideOf.get(index)!.sort((a, b) => compare(a.circuit, b.circuit));
    const first = inside[0]!;
    const shown = inside.slice(0, LISTED).map((e) => `${e.circuit} (${e.from} -> ${e.to})`);
    if (inside.length > LISTED) shown.push(`and ${inside.length - LISTED} more circuits`);
    issues.push(problem('loop', locationOf(first.ref.file, first.ref.path), { list: shown }));
  });

  if (!reachability) return; // a supply or circuit file was not read: which boards are fed is not known
  // Reachability from the boards the supplies feed.
  const reached = new Set<string>();
  const queue = boards.filter((b) => feeders.get(b)!.some((f) => f.kind === 'supply'));
  for (const board of queue) reached.add(board);
  for (let head = 0; head < queue.length; head++) {
    const board = queue[head]!;
    for (const edge of outgoing.get(board) ?? []) {
      if (!reached.has(edge.to)) {
        reached.add(edge.to);
        queue.push(edge.to);
      }
    }
  }
  const ends = new Map<string, string>();
  for (const board of boards) {
    if (reached.has(board) || inCycle.has(board)) continue;
    const feeder = feeders.get(board)![0]!;
    issues.push(
      problem('unreachable-board', locationOf(feeder.ref.file, feeder.ref.path), { id: board, list: feedChain(board, feeders, inCycle, ends) }),
    );
  }
}

/** Entries of a loop or a feed chain written out in a message; a longer one is shortened. */
const LISTED = 12;

/**
 * "MCC-1 <- circuit Q4 <- DB9, which nothing feeds": the way up from a board until it stops. A long way
 * shows its first steps and its end; the end of each board's way is remembered in `ends`, so that a
 * long unfed chain costs one walk, not one per board.
 */
function feedChain(board: string, feeders: Map<string, Feeder[]>, inCycle: Set<string>, ends: Map<string, string>): string[] {
  const chain = [board];
  const walked = [board];
  const seen = new Set([board]);
  let current = board;
  let end: string;
  for (;;) {
    const known = ends.get(current);
    if (known !== undefined && current !== board) {
      end = known;
      break;
    }
    const feeder = feeders.get(current)?.[0];
    if (feeder === undefined || feeder.kind !== 'circuit' || feeder.from === undefined) {
      end = `${current}, which nothing feeds`;
      break;
    }
    const next = feeder.from;
    if (chain.length < LISTED) chain.push(`circuit ${feeder.id}`);
    if (seen.has(next) || inCycle.has(next)) {
      if (chain.length < LISTED) chain.push(next);
      end = `${next}, which is in a loop`;
      break;
    }
    seen.add(next);
    walked.push(next);
    if (chain.length < LISTED) chain.push(next);
    current = next;
  }
  for (const b of walked) ends.set(b, end);
  const last = chain[chain.length - 1]!;
  if (end.startsWith(`${last},`)) chain[chain.length - 1] = end;
  else chain.push('…', end);
  return chain;
}

/** Tarjan's algorithm with an explicit stack: a chain of thousands of boards must not overflow the call stack. */
function stronglyConnected(nodes: string[], outgoing: Map<string, Edge[]>): string[][] {
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const onStack = new Set<string>();
  const stack: string[] = [];
  const components: string[][] = [];
  let counter = 0;
  const open = (node: string, work: Array<{ node: string; edges: Edge[]; next: number }>): void => {
    index.set(node, counter);
    low.set(node, counter);
    counter++;
    stack.push(node);
    onStack.add(node);
    work.push({ node, edges: outgoing.get(node) ?? [], next: 0 });
  };
  for (const start of nodes) {
    if (index.has(start)) continue;
    const work: Array<{ node: string; edges: Edge[]; next: number }> = [];
    open(start, work);
    while (work.length > 0) {
      const frame = work[work.length - 1]!;
      if (frame.next < frame.edges.length) {
        const to = frame.edges[frame.next++]!.to;
        if (!index.has(to)) open(to, work);
        else if (onStack.has(to)) low.set(frame.node, Math.min(low.get(frame.node)!, index.get(to)!));
        continue;
      }
      work.pop();
      const node = frame.node;
      const parent = work[work.length - 1];
      if (parent) low.set(parent.node, Math.min(low.get(parent.node)!, low.get(node)!));
      if (low.get(node) === index.get(node)) {
        const component: string[] = [];
        let member: string;
        do {
          member = stack.pop()!;
          onStack.delete(member);
          component.push(member);
        } while (member !== node);
        components.push(component.sort(compare));
      }
    }
  }
  return components;
}
