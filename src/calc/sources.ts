// Source impedances at the board a supply feeds, for maximum and minimum currents (FORMAT.md section 2).

import type { AppliedDefault, Settings, Supply } from '../model/types.js';
import type { ImpedanceStep } from './types.js';
import { ZERO, add, appendStep, fromMagnitude, networkFeederImpedance, scale, serviceImpedance, transformerImpedance } from './impedance.js';
import type { SourceAtBoard } from './fault-point.js';
import { fmt, sig } from './quantity-text.js';

export interface SupplyState {
  source: SourceAtBoard;
  buildUpMax: ImpedanceStep[];
  buildUpMin: ImpedanceStep[];
  notes: string[];
  defaults: AppliedDefault[];
}

function steps(parts: Array<{ element: string; detail: string; z: { r: number; x: number } }>): ImpedanceStep[] {
  return parts.reduce<ImpedanceStep[]>((acc, p) => appendStep(acc, p.element, p.detail, p.z), []);
}

export function supplyState(supply: Supply, settings: Settings): SupplyState {
  const cMax = settings.voltageFactorMax;
  if (supply.kind === 'service') {
    const zs = serviceImpedance(supply, cMax, settings.systemVoltage);
    const notes: string[] = [];
    const defaults: AppliedDefault[] = [];
    let loop = zs.z;
    let loopDetail: string;
    if (supply.earthLoopImpedance !== undefined) {
      loop = fromMagnitude(supply.earthLoopImpedance, supply.xOverR);
      loopDetail = `Z_e = ${fmt.ohm(supply.earthLoopImpedance)} declared by the supplier, at the angle of X/R = ${sig(supply.xOverR, 3)}`;
    } else {
      loopDetail = `Z_e not declared: Z_loop = (2 Z_1 + Z_0)/3 with Z_0 = Z_1, i.e. Z_loop = Z_S = ${fmt.ohm(Math.hypot(zs.z.r, zs.z.x))}`;
      notes.push(`Supply ${supply.id}: earth loop impedance not declared; the line-PE loop at the origin is taken equal to the positive-sequence source impedance (Z_0 = Z_1). Obtain Z_e from the supplier.`);
      defaults.push({ field: `supplies.${supply.id}.service.earth_loop_impedance`, value: fmt.ohm(Math.hypot(zs.z.r, zs.z.x)), source: 'tool default: Z_0 = Z_1' });
    }
    return {
      source: { zMax: zs.z, zLoopMin: loop },
      buildUpMax: steps([{ element: `Service ${supply.id} (declared ${fmt.current(supply.faultCurrent)})`, detail: zs.detail, z: zs.z }]),
      buildUpMin: steps([{ element: `Service ${supply.id} earth loop`, detail: loopDetail, z: loop }]),
      notes,
      defaults,
    };
  }

  const t = supply.transformer;
  const ratio = t.primaryVoltage / t.secondaryVoltage;
  const tx = transformerImpedance(t, cMax);
  const partsMax: Array<{ element: string; detail: string; z: { r: number; x: number } }> = [];
  const partsMin: typeof partsMax = [];
  let zqMin = ZERO;
  if (supply.network) {
    const qMax = networkFeederImpedance(supply.network, supply.network.faultLevel, ratio);
    const qMin = networkFeederImpedance(supply.network, supply.network.faultLevelMin, ratio);
    zqMin = qMin.z;
    partsMax.push({ element: `Network feeder ${supply.id} (S″kQ max) referred to LV`, detail: qMax.detail, z: qMax.z });
    partsMin.push({
      element: `Network feeder ${supply.id} (S″kQ min), 2/3 Z_Qt`,
      detail: `${qMin.detail}; not seen by the zero sequence through ${t.vectorGroup}: contributes 2 Z_Qt/3 to the loop`,
      z: scale(qMin.z, 2 / 3),
    });
  } else {
    partsMax.push({ element: `Network feeder ${supply.id}`, detail: 'infinite bus: no network data given, Z_Q = 0', z: ZERO });
  }
  partsMax.push({ element: `Transformer ${supply.id}, K_T Z_T`, detail: tx.detail, z: tx.zTK });
  const loopFactor = (2 + t.zeroSequenceRatio) / 3;
  partsMin.push({
    element: `Transformer ${supply.id}, (2 K_T Z_T + Z_0T)/3`,
    detail: `Z_0T = ${sig(t.zeroSequenceRatio, 3)} × K_T Z_T; K_T = ${sig(tx.kT, 4)} (computed with c_max); factor (2 + ${sig(t.zeroSequenceRatio, 3)})/3 = ${sig(loopFactor, 4)}`,
    z: scale(tx.zTK, loopFactor),
  });
  const zMax = partsMax.reduce((s, p) => add(s, p.z), ZERO);
  const zLoop = add(scale(zqMin, 2 / 3), scale(tx.zTK, loopFactor));
  return {
    source: { zMax, zLoopMin: zLoop },
    buildUpMax: steps(partsMax),
    buildUpMin: steps(partsMin),
    notes: supply.network ? [] : [`Supply ${supply.id}: no network data; the MV network is taken as an infinite bus (largest currents).`],
    defaults: [],
  };
}
