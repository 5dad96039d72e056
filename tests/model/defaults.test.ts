// The tool's defaults against the clauses they come from.

import { describe, expect, it } from 'vitest';
import { disconnectionTimeDefault, networkVoltageFactor, systemVoltageFactors } from '../../src/model/defaults.js';

describe('maximum disconnection time, IEC 60364-4-41:2005', () => {
  // Table 41.1 (a.c., final circuits not exceeding 32 A), from memory:
  //   TN: 0.8 s (50 V < U0 <= 120 V), 0.4 s (120-230 V), 0.2 s (230-400 V), 0.1 s (> 400 V)
  //   TT: 0.3 s, 0.2 s, 0.07 s, 0.04 s
  // 411.3.2.3: TN, other circuits 5 s; 411.3.2.4: TT, other circuits 1 s.
  it.each([
    [16, 'TN-S', 400, 0.4],
    [32, 'TN-C-S', 400, 0.4],
    [32.5, 'TN-S', 400, 5],
    [250, 'TN-C', 400, 5],
    [16, 'TT', 400, 0.2],
    [63, 'TT', 400, 1],
    [16, 'TN-S', 208, 0.8], // 120/208 V: U0 = 120 V
    [16, 'TN-S', 480, 0.2], // 277/480 V
    [16, 'TN-S', 690, 0.2], // 400/690 V: U0 = 400 V
    [16, 'TT', 690, 0.07],
    [16, 'TN-S', 1000, 0.1], // U0 = 577 V
    [16, 'IT', 400, 0.4], // second fault, exposed parts interconnected: TN conditions (411.6.4)
  ] as const)('rating %d A, %s, U_n %d V: %d s', (rating, earthing, un, seconds) => {
    const d = disconnectionTimeDefault(rating, earthing, un);
    expect(d.value).toBe(seconds);
    expect(d.text).toBe(`${seconds} s`);
    expect(d.source).toContain('IEC 60364-4-41:2005');
  });
});

describe('voltage factors, IEC 60909-0:2016 Table 1', () => {
  it('LV (+6 % tolerance): c_max 1.05, c_min 0.95', () => {
    const f = systemVoltageFactors(400);
    expect([f.max.value, f.min.value]).toEqual([1.05, 0.95]);
    expect(f.max.source).toContain('IEC 60909-0:2016 Table 1');
  });
  it('LV with c_max 1.10 written: c_min stays the format default 0.95 (FORMAT.md settings)', () => {
    const f = systemVoltageFactors(400, 1.1);
    expect(f.min.value).toBe(0.95);
    expect(systemVoltageFactors(400, 1.05).min.value).toBe(0.95);
  });
  it('network above 1 kV: c_max 1.10', () => {
    expect(networkVoltageFactor(11000).value).toBe(1.1);
    expect(networkVoltageFactor(11000).text).toBe('1.10');
  });
});
