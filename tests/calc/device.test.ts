import { describe, expect, it } from 'vitest';
import { logLogInterpolate, operatingPoint, isDefiniteTimeOnly } from '../../src/calc/device.js';
import { dcHeatFactor } from '../../src/calc/fault-current.js';
import { device } from './builders.js';

const pts = (xs: Array<[number, number]>) => xs.map(([current, value]) => ({ current, value }));

describe('log-log interpolation of a maker\'s curve (FORMAT.md section 2)', () => {
  it('a straight line on log-log paper: halfway in log I gives the geometric mean (common practice)', () => {
    const curve = pts([[1000, 1e4], [100_000, 1e6]]);
    expect(logLogInterpolate(curve, 10_000)).toBeCloseTo(1e5, 6);
  });
  it('is not extrapolated outside the given range', () => {
    const curve = pts([[1000, 1e4], [100_000, 1e6]]);
    expect(logLogInterpolate(curve, 999)).toBeUndefined();
    expect(logLogInterpolate(curve, 100_001)).toBeUndefined();
  });
});

describe('device rules in order: let-through, instantaneous, trip curve, clearing time', () => {
  const d = device({
    rating: 100,
    letThrough: pts([[5000, 1e5], [50_000, 4e5]]),
    instantaneous: { pickup: 1000, clearingTime: 0.01 },
    tripCurve: pts([[150, 400], [300, 30], [1500, 0.5]]),
    clearingTime: 0.3,
  });
  const use = { device: d, clearingTime: d.clearingTime, frequency: 50 };
  it('reads energy from the let-through curve inside its range; time is the virtual time E / I^2', () => {
    const op = operatingPoint(use, 10_000, 1.8);
    expect(op.rule).toBe('let-through curve');
    // slope ln(4e5/1e5)/ln(50e3/5e3) on log-log paper: E = 1e5 x 2^(ln 4 / ln 10) = 1.518e5 A^2 s
    expect(op.energy).toBeCloseTo(1e5 * 2 ** (Math.log(4) / Math.log(10)), 3);
    expect(op.time).toBeCloseTo(op.energy! / 1e8, 12);
  });
  it('uses the instantaneous band at and above its pickup, with the DC-component factor m under 0.1 s', () => {
    const op = operatingPoint(use, 2000, 1.5);
    expect(op.rule).toBe('instantaneous');
    expect(op.energy).toBeCloseTo(2000 ** 2 * 0.01 * (1 + dcHeatFactor(1.5, 50, 0.01)), 6);
  });
  it('uses the trip curve below the pickup, without m above 0.1 s', () => {
    const op = operatingPoint(use, 300, 1.5);
    expect(op.rule).toBe('trip curve');
    expect(op.energy).toBeCloseTo(300 ** 2 * 30, 6);
  });
  it('falls back to the definite clearing time outside the curves', () => {
    const op = operatingPoint(use, 120, 1.5);
    expect(op.rule).toBe('clearing time');
    expect(op.time).toBe(0.3);
  });
  it('reports undetermined (never passes silently) where no rule applies', () => {
    const bare = device({ tripCurve: pts([[150, 400], [1500, 0.5]]) });
    const op = operatingPoint({ device: bare, frequency: 50 }, 100_000, 1.8);
    expect(op.rule).toBeNull();
    expect(op.energy).toBeNull();
  });
  it('a device with a clearing time alone does not depend on current', () => {
    expect(isDefiniteTimeOnly(device({ clearingTime: 0.2 }))).toBe(true);
    expect(isDefiniteTimeOnly(d)).toBe(false);
  });
});
