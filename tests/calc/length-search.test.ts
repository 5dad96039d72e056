// Hand-worked length limits: closed forms solved with the same inputs, independent of the search.
import { describe, expect, it } from 'vitest';
import { solveProject } from '../../src/calc/solve.js';
import { conductorK } from '../../src/calc/adiabatic.js';
import { cable, circuit, device, project, serviceSupply, settings } from './builders.js';

/** Length at which |Z_source + L (r + j x)| = z, the positive root of the quadratic. */
function lengthForImpedance(source: { r: number; x: number }, r: number, x: number, z: number): number {
  const a = r * r + x * x;
  const b = 2 * (source.r * r + source.x * x);
  const c = source.r ** 2 + source.x ** 2 - z * z;
  return (-b + Math.sqrt(b * b - 4 * a * c)) / (2 * a);
}

describe('threshold length (hand-worked, our own case)', () => {
  // 20 kA service at X/R = 2, 400 V, c_max 1.05; 16 mm2 Cu XLPE (1.15 ohm/km, IEC 60228 Table 2;
  // 0.08 ohm/km); a relay clearing in 0.2 s whatever the current, through-fault criterion.
  const k = conductorK('copper', 'XLPE', 16).k; // 143.1 (Table A.54: 143)
  const withstand = (k * 16) ** 2;
  const iLimit = Math.sqrt(withstand / 0.2); // largest far-end current the cable survives for 0.2 s
  const zLimit = (1.05 * 400) / (Math.sqrt(3) * iLimit);
  const zs = (1.05 * 400) / (Math.sqrt(3) * 20_000);
  const source = { r: zs / Math.sqrt(5), x: (2 * zs) / Math.sqrt(5) };
  const expected = lengthForImpedance(source, 1.15e-3, 0.08e-3, zLimit); // about 34.7 m

  const solve = (length: number, criterion: 'any-point' | 'through-fault') =>
    solveProject(
      project({
        settings: settings({ withstandCriterion: criterion }),
        supplies: [serviceSupply(20_000, 2, 0.2)],
        devices: [device({ kind: 'relay', clearingTime: 0.2 })],
        circuits: [circuit({ cable: cable({ mm2: 16, length }) })],
      }),
    ).circuits[0]!;

  it('is where the far-end I"k3max falls to sqrt(k^2 S^2 / t): about 34.7 m', () => {
    expect(expected).toBeGreaterThan(34);
    expect(expected).toBeLessThan(35.5);
    expect(solve(10, 'through-fault').thresholdLength).toBeCloseTo(expected, 1);
  });
  it('a shorter cable fails the check, a longer one passes (through-fault)', () => {
    expect(solve(20, 'through-fault').checks[0]!.status).toBe('fail');
    expect(solve(50, 'through-fault').checks[0]!.status).toBe('pass');
  });
  it('under any-point the origin current still governs: length does not resolve it', () => {
    const c = solve(50, 'any-point');
    expect(c.checks[0]!.status).toBe('fail');
    expect(c.letThrough).toBeCloseTo(20_000 ** 2 * 0.2, -2);
  });
  it('no size near the chosen one passes at 10 m: a bigger conductor sees more current (through-fault)', () => {
    const c = solve(10, 'through-fault');
    const around = c.alternatives.filter((a) => a.area <= 35e-6);
    expect(around.length).toBeGreaterThan(2);
    for (const a of around) expect(a.verdict).toBe('fail');
  });
});

describe('maximum protected length (hand-worked, our own case)', () => {
  // 20 A breaker, instantaneous from 200 A (10 x In) in 10 ms, thermal curve slower than 0.4 s below.
  // 2.5 mm2 Cu PVC, PE the same; minimum currents at 160 degC (PVC final), c_min 0.95.
  // The limit is where I"k1min at the far end falls to the pickup, 200 A.
  const ze = 0.35;
  const r25 = 7.41e-3; // ohm/m, IEC 60228 Table 2, 2.5 mm2 plain copper
  const hot = 1 + 0.004 * (160 - 20);
  const zLoop = (0.95 * 400) / (Math.sqrt(3) * 200);
  const source = { r: ze / Math.sqrt(2), x: ze / Math.sqrt(2) }; // Z_e at X/R = 1
  const expected = lengthForImpedance(source, 2 * r25 * hot, 2 * 0.08e-3, zLoop);

  const result = (length: number) =>
    solveProject(
      project({
        supplies: [serviceSupply(10_000, 1, ze)],
        devices: [
          device({
            kind: 'mcb',
            rating: 20,
            breakingCapacity: 10_000,
            instantaneous: { pickup: 200, clearingTime: 0.01 },
            tripCurve: [
              { current: 26, value: 3600 },
              { current: 60, value: 40 },
              { current: 199, value: 1.5 },
            ],
          }),
        ],
        circuits: [circuit({ cable: { ...cable({ mm2: 2.5, length }), insulation: 'PVC' }, checks: { disconnectionTime: 0.4, voltageDropLimit: 5 } })],
      }),
    ).circuits[0]!;

  it('is where I"k1min at the far end equals the instantaneous pickup', () => {
    expect(expected).toBeGreaterThan(35); // about 35.5 m by hand
    expect(expected).toBeLessThan(36);
    expect(result(30).maxLength).toBeCloseTo(expected, 1);
  });
  it('the disconnection check fails beyond it and passes within it', () => {
    const long = result(expected + 5);
    expect(long.checks.find((c) => c.name === 'disconnection')!.status).toBe('fail');
    expect(result(expected - 5).checks.find((c) => c.name === 'disconnection')!.status).toBe('pass');
  });
  it('is null where the device clears in a definite time whatever the current', () => {
    const c = solveProject(project({ devices: [device({ clearingTime: 0.3 })] })).circuits[0]!;
    expect(c.maxLength).toBeNull();
  });
});
