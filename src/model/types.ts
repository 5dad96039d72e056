// The validated, normalised project: every value in SI (A, V, ohm, s, m, m^2, W, VA, Hz),
// every default applied and recorded. The solver reads only this.

/** Where a value came from in the project folder (1-based line and column). */
export interface SourcePos {
  file: string; // path relative to the project folder, posix separators
  line: number;
  col: number;
}

/** A default the tool applied because the author did not write the field. */
export interface AppliedDefault {
  field: string; // field path as the author would write it, e.g. "cable.reactance"
  value: string; // the value applied, as text with unit, e.g. "0.08 ohm/km"
  source: string; // where the default comes from, e.g. "FORMAT default" or "IEC 60364-4-41 Table 41.1"
}

export type Earthing = 'TN-S' | 'TN-C-S' | 'TN-C' | 'TT' | 'IT';
export type Conductor = 'copper' | 'aluminium';
export type Insulation = 'PVC' | 'XLPE' | 'EPR' | 'rubber-60' | 'mineral-pvc' | 'mineral-bare';
export type WithstandCriterion = 'any-point' | 'through-fault';
export type DeviceKind = 'mcb' | 'mccb' | 'acb' | 'fuse' | 'relay';

export type MinFaultTemperature =
  | { mode: 'final' } // the insulation's short-circuit limit theta_f
  | { mode: 'operating' } // the insulation's maximum operating temperature theta_i
  | { mode: 'fixed'; celsius: number };

export interface ProjectMeta {
  name: string;
  number: string;
  revision: string;
  date: string; // ISO YYYY-MM-DD
  client?: string;
}

export interface Settings {
  systemVoltage: number; // U_n, V, line-to-line
  frequency: number; // Hz
  earthing: Earthing;
  voltageFactorMax: number; // c_max
  voltageFactorMin: number; // c_min
  minFaultTemperature: MinFaultTemperature;
  withstandCriterion: WithstandCriterion;
}

export interface NetworkFeeder {
  voltage: number; // U_nQ, V
  faultLevel: number; // S''_kQ for maximum currents, VA (fault_current converted: sqrt(3) U_nQ I''_kQ)
  faultLevelMin: number; // S''_kQmin for minimum currents, VA
  xOverR: number;
  voltageFactor: number; // c_Q
}

export interface Transformer {
  rating: number; // S_rT, VA
  primaryVoltage: number; // U_rTHV, V
  secondaryVoltage: number; // U_rTLV, V
  impedance: number; // u_kr as a fraction (5.75 % -> 0.0575)
  loadLosses?: number; // P_krT, W
  xOverR?: number; // used when loadLosses is absent (one of the two is required)
  vectorGroup: string;
  zeroSequenceRatio: number; // Z0T / Z1T
}

export interface TransformerSupply {
  kind: 'transformer';
  id: string;
  feeds: string;
  network?: NetworkFeeder; // absent: infinite bus
  transformer: Transformer;
  pos: SourcePos;
}

export interface ServiceSupply {
  kind: 'service';
  id: string;
  feeds: string;
  faultCurrent: number; // prospective 3-phase current at the origin, A
  xOverR: number;
  earthLoopImpedance?: number; // Z_e, ohm; absent: taken as the positive-sequence source impedance (recorded default)
  pos: SourcePos;
}

export type Supply = TransformerSupply | ServiceSupply;

export interface Person {
  name: string;
  role: string;
}

export interface Signoff {
  preparedBy?: Person;
  checkedBy?: Person;
  approvedBy?: Person;
}

/** Curve points already converted to SI: current in A, time in s or energy in A^2 s. */
export interface CurvePoint {
  current: number;
  value: number;
}

export interface Device {
  id: string;
  kind: DeviceKind;
  rating: number; // I_n, A
  breakingCapacity?: number; // I_cu / I_cn, A; absent: breaking check undetermined
  clearingTime?: number; // definite total clearing time, s
  instantaneous?: { pickup: number; clearingTime: number }; // pickup in A (x In resolved), s
  tripCurve?: CurvePoint[]; // total clearing time vs current, sorted by current ascending
  letThrough?: CurvePoint[]; // Joule integral vs prospective current, sorted by current ascending
  description?: string;
  illustrative?: boolean; // demo data flag, printed on the sheet
  pos: SourcePos;
  defaults: AppliedDefault[];
}

/** A conductor size as written, resolved to an area. */
export interface ConductorSize {
  label: string; // as the author wrote it, normalised: "95 mm2", "4/0 AWG", "250 kcmil"
  system: 'metric' | 'awg' | 'kcmil';
  area: number; // nominal cross-sectional area, m^2
}

export interface ProtectiveConductor {
  size: ConductorSize;
  conductor: Conductor;
  arrangement: 'in-cable' | 'separate';
  parallel: number; // default: the phase's `parallel` when in-cable, 1 when separate
  resistance20: number; // ohm/m of one conductor at 20 degC (table or given)
  resistanceSource: string; // "IEC 60228 Table 2 (class 2)", "NFPA 70 Ch. 9 Table 8 referred to 20 degC", "given"
}

export interface Cable {
  conductor: Conductor;
  insulation: Insulation;
  size: ConductorSize;
  parallel: number;
  length: number; // m
  lengthWritten?: string; // the length as the author wrote it ("150 ft"), so a sheet can repeat it
  resistance20: number; // ohm/m of one conductor at 20 degC
  resistanceSource: string;
  resistanceGiven: boolean; // true where the author wrote `resistance`
  reactance: number; // ohm/m of one conductor
  protectiveConductor: ProtectiveConductor;
  protectiveConductorDefaulted: boolean; // true where the PE is the default (phase size, same conductor, in cable)
}

export interface Load {
  current: number; // I_b, A
  powerFactor: number; // cos phi
  phases: 1 | 3; // 1: line to neutral at U_n / sqrt(3), drop in line and neutral; 3: balanced three-phase
}

export interface Circuit {
  id: string;
  description: string;
  from: string;
  to?: string;
  device: string;
  clearingTime?: number; // s; overrides the device's definite clearing time for this circuit
  load?: Load;
  cable: Cable;
  checks: {
    disconnectionTime: number; // s
    voltageDropLimit: number; // percent
  };
  assumptions: string[];
  pos: SourcePos;
  defaults: AppliedDefault[];
}

export interface Project {
  dir: string; // absolute path of the project folder
  inputSha256: string; // hash of every input file (sorted relative path + NUL + content + NUL)
  meta: ProjectMeta;
  settings: Settings;
  supplies: Supply[];
  assumptions: string[];
  signoff: Signoff;
  devices: Device[]; // sorted by id
  circuits: Circuit[]; // sorted by id
  defaults: AppliedDefault[]; // project-level defaults (settings, supplies)
  templatesDir?: string; // absolute path of the project's templates/ folder, if present
}
