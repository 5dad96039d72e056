// Source: IEC 60909-0:2016 (2nd edition), "Short-circuit currents in three-phase a.c. systems —
// Part 0: Calculation of currents", Table 1 "Voltage factor c".
// Footnotes used:
//   a) c_max U_n should not exceed the highest voltage U_m for equipment of power systems.
//   b) If no nominal voltage is defined, c_max U_n = U_m or c_min U_n = 0.90 U_m should be applied.
//   c) For low-voltage systems with a tolerance of +6 %, for example systems renamed from 380 V to 400 V.
//   d) For low-voltage systems with a tolerance of +10 %.
// Values as printed, from memory. The 2016 edition gives c_min = 0.90 with footnote d (the
// 2001 edition had 0.95 for all LV systems); this is recalled, not checked against a copy here.

export interface VoltageFactorRow {
  description: string;
  minVoltage: number; // V, lower end of the nominal-voltage range (exclusive where `minExclusive`)
  maxVoltage: number; // V, upper end (inclusive); Infinity for high voltage
  minExclusive: boolean;
  cMax: number;
  cMin: number;
  footnote: string;
}

export const VOLTAGE_FACTORS = Object.freeze({
  lowVoltageTolerance6: Object.freeze<VoltageFactorRow>({
    description: 'Low voltage, 100 V to 1000 V, tolerance +6 %',
    minVoltage: 100,
    maxVoltage: 1000,
    minExclusive: false,
    cMax: 1.05,
    cMin: 0.95,
    footnote: 'c',
  }),
  lowVoltageTolerance10: Object.freeze<VoltageFactorRow>({
    description: 'Low voltage, 100 V to 1000 V, tolerance +10 %',
    minVoltage: 100,
    maxVoltage: 1000,
    minExclusive: false,
    cMax: 1.1,
    cMin: 0.9,
    footnote: 'd',
  }),
  mediumVoltage: Object.freeze<VoltageFactorRow>({
    description: 'Medium voltage, > 1 kV to 35 kV',
    minVoltage: 1000,
    maxVoltage: 35000,
    minExclusive: true,
    cMax: 1.1,
    cMin: 1.0,
    footnote: 'a',
  }),
  highVoltage: Object.freeze<VoltageFactorRow>({
    description: 'High voltage, > 35 kV',
    minVoltage: 35000,
    maxVoltage: Infinity,
    minExclusive: true,
    cMax: 1.1,
    cMin: 1.0,
    footnote: 'a, b',
  }),
});

export const VOLTAGE_FACTOR_REFERENCE = 'IEC 60909-0:2016 Table 1';

/**
 * The Table 1 row for a nominal voltage U_n (V); for LV the tolerance (+6 % or +10 %) picks the
 * row. Undefined below 100 V, which the table does not cover.
 */
export function voltageFactorRow(nominalVoltage: number, lowVoltageTolerancePercent: 6 | 10 = 6): VoltageFactorRow | undefined {
  if (!(nominalVoltage >= 100)) return undefined;
  if (nominalVoltage <= 1000) {
    return lowVoltageTolerancePercent === 10 ? VOLTAGE_FACTORS.lowVoltageTolerance10 : VOLTAGE_FACTORS.lowVoltageTolerance6;
  }
  return nominalVoltage <= 35000 ? VOLTAGE_FACTORS.mediumVoltage : VOLTAGE_FACTORS.highVoltage;
}
