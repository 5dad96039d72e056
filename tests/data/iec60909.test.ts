// Checks src/data/iec60909.ts against IEC 60909-0:2016 Table 1.
import { describe, expect, it } from 'vitest';
import { VOLTAGE_FACTORS, voltageFactorRow } from '../../src/data/iec60909.js';

describe('IEC 60909-0:2016 Table 1, voltage factor c', () => {
  it('LV 100 V to 1000 V, +6 % tolerance: c_max 1.05, c_min 0.95 (footnote c)', () => {
    // IEC 60909-0:2016 Table 1, footnote c (from memory)
    expect(VOLTAGE_FACTORS.lowVoltageTolerance6.cMax).toBe(1.05);
    expect(VOLTAGE_FACTORS.lowVoltageTolerance6.cMin).toBe(0.95);
  });
  it('LV 100 V to 1000 V, +10 % tolerance: c_max 1.10, c_min 0.90 (footnote d)', () => {
    // IEC 60909-0:2016 Table 1, footnote d (from memory; c_min 0.90 is the 2016 edition's)
    expect(VOLTAGE_FACTORS.lowVoltageTolerance10.cMax).toBe(1.1);
    expect(VOLTAGE_FACTORS.lowVoltageTolerance10.cMin).toBe(0.9);
  });
  it('MV > 1 kV to 35 kV and HV > 35 kV: c_max 1.10, c_min 1.00', () => {
    // IEC 60909-0:2016 Table 1 (from memory)
    expect(VOLTAGE_FACTORS.mediumVoltage).toMatchObject({ cMax: 1.1, cMin: 1.0 });
    expect(VOLTAGE_FACTORS.highVoltage).toMatchObject({ cMax: 1.1, cMin: 1.0 });
  });

  // Footnote a: c_max U_n should not exceed U_m. For LV the highest voltage is U_n (1 + tolerance);
  // 400 V: 1.05 x 400 = 420 V <= 424 V (+6 %), 1.10 x 400 = 440 V <= 440 V (+10 %).
  it('c_max U_n stays within the highest voltage of the LV system (footnote a)', () => {
    expect(VOLTAGE_FACTORS.lowVoltageTolerance6.cMax).toBeLessThanOrEqual(1.06);
    expect(VOLTAGE_FACTORS.lowVoltageTolerance10.cMax).toBeLessThanOrEqual(1.1);
  });

  it('picks the row by nominal voltage', () => {
    expect(voltageFactorRow(400)).toBe(VOLTAGE_FACTORS.lowVoltageTolerance6);
    expect(voltageFactorRow(230, 10)).toBe(VOLTAGE_FACTORS.lowVoltageTolerance10);
    expect(voltageFactorRow(1000)).toBe(VOLTAGE_FACTORS.lowVoltageTolerance6);
    expect(voltageFactorRow(11000)).toBe(VOLTAGE_FACTORS.mediumVoltage);
    expect(voltageFactorRow(35000)).toBe(VOLTAGE_FACTORS.mediumVoltage);
    expect(voltageFactorRow(132000)).toBe(VOLTAGE_FACTORS.highVoltage);
    expect(voltageFactorRow(48)).toBeUndefined(); // below the table's 100 V
    expect(voltageFactorRow(Number.NaN)).toBeUndefined();
  });
});
