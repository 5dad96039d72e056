// Builders for solver inputs in SI, so calculation tests do not depend on the YAML loader.

import type { Cable, Circuit, Device, Project, Settings, Supply } from '../../src/model/types.js';
import { tabulatedResistance20 } from '../../src/data/iec60228.js';

export const POS = { file: 'test.yaml', line: 1, col: 1 };

export function settings(over: Partial<Settings> = {}): Settings {
  return {
    systemVoltage: 400,
    frequency: 50,
    earthing: 'TN-S',
    voltageFactorMax: 1.05,
    voltageFactorMin: 0.95,
    minFaultTemperature: { mode: 'final' },
    withstandCriterion: 'any-point',
    ...over,
  };
}

export function cable(over: Partial<Cable> & { mm2?: number } = {}): Cable {
  const mm2 = over.mm2 ?? 16;
  const conductor = over.conductor ?? 'copper';
  const r = tabulatedResistance20(conductor, mm2);
  if (r === undefined) throw new Error(`no tabulated resistance for ${mm2} mm2`);
  const size = { label: `${mm2} mm2`, system: 'metric' as const, area: mm2 * 1e-6 };
  const base: Cable = {
    conductor,
    insulation: 'XLPE',
    size,
    parallel: 1,
    length: 20,
    resistance20: r / 1000,
    resistanceSource: 'IEC 60228 Table 2',
    resistanceGiven: false,
    reactance: 0.08e-3,
    protectiveConductor: {
      size,
      conductor,
      arrangement: 'in-cable',
      parallel: 1,
      resistance20: r / 1000,
      resistanceSource: 'IEC 60228 Table 2',
    },
    protectiveConductorDefaulted: true,
  };
  const { mm2: _ignored, ...rest } = over;
  void _ignored;
  return { ...base, ...rest };
}

export function device(over: Partial<Device> = {}): Device {
  return { id: 'D1', kind: 'mccb', rating: 100, breakingCapacity: 50_000, pos: POS, defaults: [], ...over };
}

export function circuit(over: Partial<Circuit> = {}): Circuit {
  return {
    id: 'C1',
    description: '',
    from: 'MSB',
    device: 'D1',
    cable: cable(),
    checks: { disconnectionTime: 5, voltageDropLimit: 5 },
    assumptions: [],
    pos: POS,
    defaults: [],
    ...over,
  };
}

export function serviceSupply(faultCurrent: number, xOverR: number, earthLoopImpedance?: number): Supply {
  return { kind: 'service', id: 'S1', feeds: 'MSB', faultCurrent, xOverR, earthLoopImpedance, pos: POS };
}

export function project(over: Partial<Project> = {}): Project {
  return {
    dir: '/tmp/p',
    inputSha256: '0'.repeat(64),
    meta: { name: 'Test', number: 'T-1', revision: 'A', date: '2026-01-01' },
    settings: settings(),
    supplies: [serviceSupply(20_000, 2, 0.2)],
    assumptions: [],
    signoff: {},
    devices: [device()],
    circuits: [circuit()],
    defaults: [],
    ...over,
  };
}
