// What the solver returns: numbers in SI plus, for the sheet, every quantity's working.

import type { AppliedDefault } from '../model/types.js';

/** A computed quantity with the working a checker reads: formula, substituted values, result. */
export interface Traced {
  symbol: string; // as the standards write it, plain text: "I''k3max", "i_p", "k", "k^2 S^2"
  value: number | null; // SI (A, ohm, s, A^2 s, m) or dimensionless; null where undetermined
  unit: string; // display unit of `value` as SI text: "A", "ohm", "A^2 s", "s", "m", "%", ""
  formula: string; // "c_max U_n / (sqrt(3) |Z_k|)"
  substitution: string; // "1.05 x 400 V / (sqrt(3) x 9.72 mohm)"
  reference?: string; // clause or table: "IEC 60909-0:2016 eq. (29)"
  note?: string;
}

export interface Impedance {
  r: number; // ohm
  x: number; // ohm
}

/** One element of the impedance build-up from the source to the fault point. */
export interface ImpedanceStep {
  element: string; // "Network feeder Q referred to LV", "Transformer TX1 (K_T applied)", "Circuit MSB-Q4 cable (phase + PE)"
  detail: string; // how it was obtained, with substitution
  z: Impedance; // this element
  total: Impedance; // running total after this element
}

export type CheckName = 'thermal_withstand' | 'breaking_capacity' | 'disconnection' | 'voltage_drop';
export type Status = 'pass' | 'fail' | 'undetermined';

export interface CheckResult {
  name: CheckName;
  status: Status;
  value: number | null; // A^2 s, A, s, percent
  limit: number | null;
  governing: string; // words: "fault at the origin, I''k3max = 23.8 kA", "I''k1min at far end"
  explanation: string; // a failing or undetermined check in words, with what would fix it
  reference: string; // clause the check follows
}

export interface BoardResult {
  id: string;
  fedBy: string; // supply id or circuit id
  supply: string; // the supply at the root of its path
  depth: number; // 0 for a board at a supply
  ik3max: number; // A
  ip: number; // A
  ik1min: number; // A
  zMax: Impedance; // source impedance for maximum currents (cables at 20 degC)
  zLoopMin: Impedance; // line-PE loop impedance for minimum currents
  voltageDrop: number; // percent, accumulated from the supply (0 where no upstream load is known)
  buildUpMax: ImpedanceStep[];
  buildUpMin: ImpedanceStep[];
}

/** The energy check over a range of prospective currents. */
export interface EnergyEvaluation {
  status: Status;
  governingCurrent: number | null; // A, the current giving the largest let-through energy
  letThrough: number | null; // A^2 s at the governing current
  rule: string | null; // which device rule gave it: "let-through curve", "instantaneous", "trip curve", "clearing time"
  currentMin: number; // the range considered, A
  currentMax: number;
}

export interface Alternative {
  size: string; // label, "120 mm2"
  area: number; // m^2 of one conductor
  k: number;
  withstand: number; // A^2 s
  endIk3max: number; // A
  endIk1min: number; // A
  letThrough: number | null;
  thresholdLength: number | null; // m
  maxLength: number | null; // m
  verdict: Status;
  failing: CheckName[];
  chosen: boolean;
}

/** Series for the sheet's charts, sampled by the solver so the report never recomputes. */
export interface ChartSeries {
  /** device let-through energy against prospective current; value null where no rule applies */
  energy: Array<{ current: number; energy: number | null }>;
  /** device operating time against current */
  time: Array<{ current: number; time: number | null }>;
  /** cable withstand time t = (k S / I)^2 against current */
  withstandTime: Array<{ current: number; time: number }>;
  /** far-end currents against this cable's length (other inputs fixed) */
  length: Array<{ length: number; ik3max: number; ik1min: number; letThrough: number | null; operatingTime: number | null }>;
}

export interface CircuitResult {
  id: string;
  description: string;
  from: string;
  to?: string;
  device: string;
  supply: string;
  origin: { ik3max: number; ip: number; ik1min: number; kappa: number };
  end: { ik3max: number; ip: number; ik1min: number; kappa: number };
  k: number;
  withstand: number; // k^2 S^2, A^2 s
  letThrough: number | null; // governing let-through energy, A^2 s
  thresholdLength: number | null; // m
  maxLength: number | null; // m
  voltageDrop: number | null; // percent at the far end, accumulated; null without load
  verdict: Status;
  checks: CheckResult[];
  /** The protective conductor's adiabatic check (IEC 60364-5-54 543.1.2), reported beside the four checks. */
  protectiveConductor?: {
    k: number;
    withstand: number;
    status: Status;
    worseThanPhase: boolean; // true where this check tells more than the withstand check already does
    explanation: string;
    reference: string;
  };
  energy: EnergyEvaluation;
  alternatives: Alternative[];
  smallestCompliantSize: string | null;
  buildUpMax: ImpedanceStep[]; // source to far end, maximum condition
  buildUpMin: ImpedanceStep[]; // source to far end, minimum condition (line-PE loop)
  quantities: Traced[]; // every derived quantity the sheet shows, in reading order
  notes: string[]; // tool notes: rules that could not be applied, assumptions the solver made
  defaults: AppliedDefault[]; // defaults applied to this circuit and its supply (the device's are in Device.defaults)
  charts: ChartSeries;
}

export interface ProjectResult {
  boards: BoardResult[]; // in tree order: supply by supply, depth first, ids sorted
  circuits: CircuitResult[]; // sorted by id
}
