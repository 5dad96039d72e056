// Project-wide checks on ids and the board tree: duplicate ids, references to unknown devices or
// boards, boards fed twice, boards no supply reaches, and loops. They read the ids as written
// (even in entries that failed validation), so they are reported together with every other issue.

import type { Issue } from './issues.js';
import { nearest, problem } from './messages.js';
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

  const deviceIds = [...new Set(refs.devices.flatMap((d) => (d.id ? [d.id.value] : [])))].sort(compare);
  for (const circuit of refs.circuits) {
    if (unread.devices) break;
    if (circuit.device && !deviceIds.includes(circuit.device.value)) {
      issues.push(
        problem('unknown-device', locationOf(circuit.device.file, circuit.device.path), {
          id: circuit.device.value,
          suggestion: nearest(circuit.device.value, deviceIds),
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
  for (const circuit of refs.circuits) {
    if (circuit.from && !feeders.has(circuit.from.value)) {
      issues.push(
        problem('unknown-board', locationOf(circuit.from.file, circuit.from.path), {
          id: circuit.from.value,
          suggestion: nearest(circuit.from.value, boards),
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
  for (const component of stronglyConnected([...new Set([...boards, ...edges.map((e) => e.from)])].sort(compare), outgoing)) {
    if (component.length < 2) continue;
    const members = new Set(component);
    for (const board of component) inCycle.add(board);
    const inside = edges
      .filter((e) => members.has(e.from) && members.has(e.to) && e.from !== e.to)
      .sort((a, b) => compare(a.circuit, b.circuit));
    const first = inside[0]!;
    issues.push(
      problem('loop', locationOf(first.ref.file, first.ref.path), {
        list: inside.map((e) => `${e.circuit} (${e.from} -> ${e.to})`),
      }),
    );
  }

  if (!reachability) return; // a supply or circuit file was not read: which boards are fed is not known
  // Reachability from the boards the supplies feed.
  const reached = new Set<string>();
  const queue = boards.filter((b) => feeders.get(b)!.some((f) => f.kind === 'supply'));
  for (const board of queue) reached.add(board);
  while (queue.length > 0) {
    const board = queue.shift()!;
    for (const edge of outgoing.get(board) ?? []) {
      if (!reached.has(edge.to)) {
        reached.add(edge.to);
        queue.push(edge.to);
      }
    }
  }
  for (const board of boards) {
    if (reached.has(board) || inCycle.has(board)) continue;
    const feeder = feeders.get(board)![0]!;
    issues.push(
      problem('unreachable-board', locationOf(feeder.ref.file, feeder.ref.path), { id: board, list: feedChain(board, feeders, inCycle) }),
    );
  }
}

/** "MCC-1 <- circuit Q4 <- DB9, which nothing feeds": the way up from a board until it stops. */
function feedChain(board: string, feeders: Map<string, Feeder[]>, inCycle: Set<string>): string[] {
  const chain = [board];
  const seen = new Set([board]);
  let current = board;
  for (;;) {
    const feeder = feeders.get(current)?.[0];
    if (feeder === undefined || feeder.kind !== 'circuit' || feeder.from === undefined) {
      chain[chain.length - 1] += ', which nothing feeds';
      return chain;
    }
    chain.push(`circuit ${feeder.id}`);
    current = feeder.from;
    if (seen.has(current) || inCycle.has(current)) {
      chain.push(`${current}, which is in a loop`);
      return chain;
    }
    seen.add(current);
    chain.push(current);
  }
}

function stronglyConnected(nodes: string[], outgoing: Map<string, Edge[]>): string[][] {
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const onStack = new Set<string>();
  const stack: string[] = [];
  const components: string[][] = [];
  let counter = 0;
  const visit = (node: string): void => {
    index.set(node, counter);
    low.set(node, counter);
    counter++;
    stack.push(node);
    onStack.add(node);
    for (const edge of outgoing.get(node) ?? []) {
      if (!index.has(edge.to)) {
        visit(edge.to);
        low.set(node, Math.min(low.get(node)!, low.get(edge.to)!));
      } else if (onStack.has(edge.to)) {
        low.set(node, Math.min(low.get(node)!, index.get(edge.to)!));
      }
    }
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
  };
  for (const node of nodes) if (!index.has(node)) visit(node);
  return components;
}
