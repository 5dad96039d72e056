// One-pass propagation of source impedances and voltage drop from each supply down the board tree.

import type { AppliedDefault, Circuit, Project } from '../model/types.js';
import type { ImpedanceStep } from './types.js';
import type { SourceAtBoard } from './fault-point.js';
import { add, appendStep, cableLoopImpedance, cablePhaseImpedance } from './impedance.js';
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
  buildUpMax: ImpedanceStep[];
  buildUpMin: ImpedanceStep[];
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
  const visit = (board: BoardState) => {
    if (seen.has(board.id)) return; // validation rejects loops and double feeds; never recurse twice
    seen.add(board.id);
    out.push(board);
    for (const c of byFrom.get(board.id) ?? []) {
      const phase = cablePhaseImpedance(c.cable, c.cable.length, 20);
      const theta = minFaultTemperature(project.settings, c.cable);
      const loop = cableLoopImpedance(c.cable, c.cable.length, theta);
      const drop = c.load ? cableVoltageDrop(project.settings, c.cable, c.load).percent : 0;
      const label = `${c.cable.parallel > 1 ? `${c.cable.parallel} × ` : ''}${c.cable.size.label} ${c.cable.conductor}, ${fmt.length(c.cable.length)}`;
      visit({
        id: c.to!,
        fedBy: c.id,
        supply: board.supply,
        depth: board.depth + 1,
        source: { zMax: add(board.source.zMax, phase), zLoopMin: add(board.source.zLoopMin, loop) },
        voltageDrop: board.voltageDrop + drop,
        voltageDropUnknownUpstream: board.voltageDropUnknownUpstream || !c.load,
        buildUpMax: appendStep(board.buildUpMax, `Circuit ${c.id} cable (phase, 20 °C)`, label, phase),
        buildUpMin: appendStep(board.buildUpMin, `Circuit ${c.id} cable (phase + PE, ${theta} °C)`, label, loop),
        notes: board.notes,
        defaults: board.defaults,
      });
    }
  };
  for (const supply of project.supplies) {
    const s = supplyState(supply, project.settings);
    visit({
      id: supply.feeds,
      fedBy: supply.id,
      supply: supply.id,
      depth: 0,
      source: s.source,
      voltageDrop: 0,
      voltageDropUnknownUpstream: false,
      buildUpMax: s.buildUpMax,
      buildUpMin: s.buildUpMin,
      notes: s.notes,
      defaults: s.defaults,
    });
  }
  return out;
}
