// The solver: a validated Project in, every board's fault levels and every circuit's checks out.
// Pure: no I/O, no clock, no randomness.

import type { Project } from '../model/types.js';
import type { BoardResult, CircuitResult, ProjectResult } from './types.js';
import { lineToEarthCurrent, peakCurrent, peakFactor, threePhaseCurrent } from './fault-current.js';
import { propagate } from './network.js';
import { defineSteps } from './impedance.js';
import { circuitResult } from './circuit-result.js';

export function solveProject(project: Project): ProjectResult {
  const { settings } = project;
  const states = propagate(project);
  const boards: BoardResult[] = states.map((b) => {
    const ik3max = threePhaseCurrent(settings.voltageFactorMax, settings.systemVoltage, b.source.zMax);
    const board: Omit<BoardResult, 'buildUpMax' | 'buildUpMin'> = {
      id: b.id,
      fedBy: b.fedBy,
      supply: b.supply,
      depth: b.depth,
      ik3max,
      ip: peakCurrent(peakFactor(b.source.zMax), ik3max),
      ik1min: lineToEarthCurrent(settings.voltageFactorMin, settings.systemVoltage, b.source.zLoopMin),
      zMax: b.source.zMax,
      zLoopMin: b.source.zLoopMin,
      voltageDrop: b.voltageDrop,
    };
    return defineSteps(defineSteps(board as BoardResult, 'buildUpMax', b.chainMax), 'buildUpMin', b.chainMin);
  });
  const stateById = new Map(states.map((s) => [s.id, s]));
  const deviceById = new Map(project.devices.map((d) => [d.id, d]));
  const circuits: CircuitResult[] = [];
  for (const circuit of project.circuits) {
    const board = stateById.get(circuit.from);
    const device = deviceById.get(circuit.device);
    if (!board || !device) throw new Error(`circuit ${circuit.id}: board or device missing after validation`);
    circuits.push(circuitResult(project, circuit, device, board));
  }
  return { boards, circuits };
}
