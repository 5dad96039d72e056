// One-pass propagation of source impedances and voltage drop from each supply down the board tree.

import type { AppliedDefault, Circuit, Project } from '../model/types.js';
import type { ImpedanceStep } from './types.js';
import type { SourceAtBoard } from './fault-point.js';
import { add, cableLoopImpedance, cablePhaseImpedance, chainOf, chainStep, defineSteps, type StepChain } from './impedance.js';
import { minFaultTemperature } from './fault-point.js';
import { cableVoltageDrop } from './circuit.js';
import { supplyState } from './sources.js';
import { fmt } from './quantity-text.js';

export interface BoardState {
  id: string;
  fedBy: string;
  supply: string;
  depth: number;
  source: SourceAtBoard;
  voltageDrop: number; // percent at this board
  voltageDropUnknownUpstream: boolean; // some circuit on the path has no load
  buildUpMax: ImpedanceStep[]; // written out from the chains when first read
  buildUpMin: ImpedanceStep[];
  chainMax: StepChain | undefined;
  chainMin: StepChain | undefined;
  notes: string[];
  defaults: AppliedDefault[];
}

/** Board states in tree order: supply by supply (as listed), depth first, circuits by id. */
export function propagate(project: Project): BoardState[] {
  const byFrom = new Map<string, Circuit[]>();
  for (const c of project.circuits) {
    if (!c.to) continue;
    const list = byFrom.get(c.from) ?? [];
    list.push(c);
    byFrom.set(c.from, list);
  }
  for (const list of byFrom.values()) list.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));

  const out: BoardState[] = [];
  const seen = new Set<string>();
  type Pending = Omit<BoardState, 'buildUpMax' | 'buildUpMin'>;
  const board = (state: Pending): BoardState =>
    defineSteps(defineSteps(state as BoardState, 'buildUpMax', state.chainMax), 'buildUpMin', state.chainMin);
  // Depth first without recursion (a chain of thousands of boards must not overflow the call stack).
  const visit = (root: BoardState) => {
    const work: Array<{ board: BoardState; circuits: Circuit[]; next: number }> = [];
    const open = (b: BoardState) => {
      if (seen.has(b.id)) return; // validation rejects loops and double feeds; never visit twice
      seen.add(b.id);
      out.push(b);
      work.push({ board: b, circuits: byFrom.get(b.id) ?? [], next: 0 });
    };
    open(root);
    while (work.length > 0) {
      const frame = work[work.length - 1]!;
      if (frame.next >= frame.circuits.length) {
        work.pop();
        continue;
      }
      const c = frame.circuits[frame.next++]!;
      const from = frame.board;
      const phase = cablePhaseImpedance(c.cable, c.cable.length, 20);
      const theta = minFaultTemperature(project.settings, c.cable);
      const loop = cableLoopImpedance(c.cable, c.cable.length, theta);
      const drop = c.load ? cableVoltageDrop(project.settings, c.cable, c.load).percent : 0;
      const label = `${c.cable.parallel > 1 ? `${c.cable.parallel} × ` : ''}${c.cable.size.label} ${c.cable.conductor}, ${fmt.length(c.cable.length)}`;
      open(
        board({
          id: c.to!,
          fedBy: c.id,
          supply: from.supply,
          depth: from.depth + 1,
          source: { zMax: add(from.source.zMax, phase), zLoopMin: add(from.source.zLoopMin, loop) },
          voltageDrop: from.voltageDrop + drop,
          voltageDropUnknownUpstream: from.voltageDropUnknownUpstream || !c.load,
          chainMax: chainStep(from.chainMax, `Circuit ${c.id} cable (phase, 20 °C)`, label, phase),
          chainMin: chainStep(from.chainMin, `Circuit ${c.id} cable (phase + PE, ${theta} °C)`, label, loop),
          notes: from.notes,
          defaults: from.defaults,
        }),
      );
    }
  };
  for (const supply of project.supplies) {
    const s = supplyState(supply, project.settings);
    visit(
      board({
        id: supply.feeds,
        fedBy: supply.id,
        supply: supply.id,
        depth: 0,
        source: s.source,
        voltageDrop: 0,
        voltageDropUnknownUpstream: false,
        chainMax: chainOf(s.buildUpMax),
        chainMin: chainOf(s.buildUpMin),
        notes: s.notes,
        defaults: s.defaults,
      }),
    );
  }
  return out;
}
