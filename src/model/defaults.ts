// The values the tool applies where the author wrote nothing, each with where it comes from, so
// that every one can be recorded in `defaults` and printed on the sheet.

import { VOLTAGE_FACTOR_REFERENCE, voltageFactorRow, VOLTAGE_FACTORS } from '../data/iec60909.js';
import type { Earthing, MinFaultTemperature, WithstandCriterion } from './types.js';

export interface DefaultValue<T> {
  value: T;
  text: string; // as the author would have written it
  source: string;
}

const FORMAT_DEFAULT = 'faultsheet default (docs/FORMAT.md)';
const FORMAT_DEFAULT_NO_SOURCE = 'faultsheet default (docs/FORMAT.md); common practice, no source';

export const SETTINGS_DEFAULTS = {
  frequency: { value: 50, text: '50 Hz', source: FORMAT_DEFAULT } satisfies DefaultValue<number>,
  earthing: { value: 'TN-S', text: 'TN-S', source: FORMAT_DEFAULT } satisfies DefaultValue<Earthing>,
  minFaultTemperature: {
    value: { mode: 'final' },
    text: 'final',
    source: `${FORMAT_DEFAULT}: the insulation's short-circuit temperature limit`,
  } satisfies DefaultValue<MinFaultTemperature>,
  withstandCriterion: {
    value: 'any-point',
    text: 'any-point',
    source: `${FORMAT_DEFAULT}, following IEC 60364-4-43:2008 434.5.2`,
  } satisfies DefaultValue<WithstandCriterion>,
};

/**
 * c_max and c_min for the system voltage, IEC 60909-0 Table 1, +6 % tolerance row for LV. c_min stays
 * 0.95 even where the author writes c_max = 1.10: that is the project format's default, and a checker
 * reading the sheet sees the value applied among the defaults.
 */
export function systemVoltageFactors(
  systemVoltage: number,
  writtenMax?: number,
): { max: DefaultValue<number>; min: DefaultValue<number> } {
  void writtenMax;
  const row = voltageFactorRow(systemVoltage, 6) ?? VOLTAGE_FACTORS.lowVoltageTolerance6;
  const source = `${VOLTAGE_FACTOR_REFERENCE} (${row.description})`;
  return {
    max: { value: row.cMax, text: row.cMax.toFixed(2), source },
    min: { value: row.cMin, text: row.cMin.toFixed(2), source },
  };
}

/** c_Q of the MV network feeder: c_max of Table 1 for its nominal voltage (1.10 above 1 kV). */
export function networkVoltageFactor(networkVoltage: number): DefaultValue<number> {
  const row = voltageFactorRow(networkVoltage, 6) ?? VOLTAGE_FACTORS.mediumVoltage;
  return { value: row.cMax, text: row.cMax.toFixed(2), source: `${VOLTAGE_FACTOR_REFERENCE} (c_max, ${row.description})` };
}

export const SUPPLY_DEFAULTS = {
  networkXOverR: {
    value: 10,
    text: '10',
    source: 'IEC 60909-0:2016, network feeder without known R_Q: R_Q = 0.1 X_Q, X_Q = 0.995 Z_Q',
  } satisfies DefaultValue<number>,
  vectorGroup: { value: 'Dyn11', text: 'Dyn11', source: FORMAT_DEFAULT } satisfies DefaultValue<string>,
  zeroSequenceRatio: {
    value: 1.0,
    text: '1.0',
    source: `${FORMAT_DEFAULT}: Z0T / Z1T = 1.0 for a Dyn transformer; common practice, no source`,
  } satisfies DefaultValue<number>,
  serviceXOverR: { value: 2, text: '2', source: 'faultsheet default; common practice, no source' } satisfies DefaultValue<number>,
};

export const DEVICE_DEFAULTS = {
  instantaneousClearingTime: { value: 0.01, text: '10 ms', source: FORMAT_DEFAULT_NO_SOURCE } satisfies DefaultValue<number>,
};

export const CIRCUIT_DEFAULTS = {
  description: { value: '', text: '""', source: FORMAT_DEFAULT } satisfies DefaultValue<string>,
  parallel: { value: 1, text: '1', source: FORMAT_DEFAULT } satisfies DefaultValue<number>,
  reactance: { value: 0.08e-3, text: '0.08 ohm/km', source: FORMAT_DEFAULT_NO_SOURCE } satisfies DefaultValue<number>,
  powerFactor: {
    value: 0.8,
    text: '0.8',
    source: 'IEC 60364-5-52:2009 Annex G: cos phi = 0.8 in the absence of precise data',
  } satisfies DefaultValue<number>,
  phases: { value: 3 as 1 | 3, text: '3', source: `${FORMAT_DEFAULT} (three-phase voltage drop)` } satisfies DefaultValue<1 | 3>,
  voltageDropLimit: {
    value: 5,
    text: '5 %',
    source: 'IEC 60364-5-52:2009 Annex G, Table G.52.1 (installation type A, other uses)',
  } satisfies DefaultValue<number>,
  protectiveConductorArrangement: { value: 'in-cable', text: 'in-cable', source: FORMAT_DEFAULT } satisfies DefaultValue<'in-cable'>,
};

// IEC 60364-4-41:2005 Table 41.1, maximum disconnection times for final circuits not exceeding
// 32 A, a.c., by nominal line-to-earth voltage U0 (from memory):
//   system   50 V < U0 <= 120 V   120 V < U0 <= 230 V   230 V < U0 <= 400 V   U0 > 400 V
//   TN       0.8 s                0.4 s                 0.2 s                 0.1 s
//   TT       0.3 s                0.2 s                 0.07 s                0.04 s
// Otherwise (distribution circuits, circuits above 32 A): TN 5 s (411.3.2.3), TT 1 s (411.3.2.4).
interface VoltageBand {
  upTo: number; // U0, V (inclusive)
  label: string;
  tn: number;
  tt: number;
}
const TABLE_41_1: readonly VoltageBand[] = [
  { upTo: 120, label: '50 V < U0 <= 120 V', tn: 0.8, tt: 0.3 },
  { upTo: 230, label: '120 V < U0 <= 230 V', tn: 0.4, tt: 0.2 },
  { upTo: 400, label: '230 V < U0 <= 400 V', tn: 0.2, tt: 0.07 },
  { upTo: Infinity, label: 'U0 > 400 V', tn: 0.1, tt: 0.04 },
];
export const FINAL_CIRCUIT_LIMIT_A = 32;

/**
 * Maximum disconnection time by IEC 60364-4-41:2005: Table 41.1 where the device rating is at most
 * 32 A (taken for every such circuit, the safe side), else 411.3.2.3 (TN) / 411.3.2.4 (TT).
 * IT is treated as TN: on a second fault with interconnected exposed parts 411.6.4 applies the TN
 * conditions. U0 = U_n / sqrt(3); nominal systems (230/400 V, 120/208 V, 400/690 V) sit 0.5 % above
 * a band edge after the division, hence the 1 % allowance.
 */
export function disconnectionTimeDefault(deviceRating: number, earthing: Earthing, systemVoltage: number): DefaultValue<number> {
  const tt = earthing === 'TT';
  const system = tt ? 'TT' : earthing === 'IT' ? 'IT, taken as TN per 411.6.4' : 'TN';
  if (deviceRating > FINAL_CIRCUIT_LIMIT_A) {
    const value = tt ? 1 : 5;
    const clause = tt ? '411.3.2.4' : '411.3.2.3';
    return { value, text: `${value} s`, source: `IEC 60364-4-41:2005 ${clause} (${system}, circuit above 32 A)` };
  }
  const u0 = systemVoltage / Math.sqrt(3);
  const band = TABLE_41_1.find((b) => u0 <= b.upTo * 1.01) ?? TABLE_41_1[TABLE_41_1.length - 1]!;
  const value = tt ? band.tt : band.tn;
  return {
    value,
    text: `${value} s`,
    source: `IEC 60364-4-41:2005 Table 41.1 (${system}, ${band.label}, circuit up to 32 A)`,
  };
}
