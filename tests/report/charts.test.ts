// The three chart configurations, built from the solver's series (pure data; no canvas here).
import { describe, expect, it } from 'vitest';
import { energyChart, lengthChart, powerOfTen, tickDecade, tickOneTwoFive, timeChart, type MarksOptions } from '../../src/report/charts.js';
import { projectTemplates } from '../../src/report/build.js';
import { fixtureProject, fixtureResult } from '../fixtures/report/project.js';

const project = fixtureProject();
const result = fixtureResult();
const labels = projectTemplates(project).labels('sheet/labels.hbs');
const cr = result.circuits.find((c) => c.id === 'MSB-Q4')!;
const circuit = project.circuits.find((c) => c.id === 'MSB-Q4')!;
const marks = (cfg: { options?: { plugins?: unknown } }): MarksOptions => (cfg.options!.plugins as { fsMarks: MarksOptions }).fsMarks;
type Scale = { type: string; min: number; max: number };

describe('energy chart', () => {
  const cfg = energyChart(cr, labels);
  it('plots let-through energy against prospective current on log-log axes', () => {
    const scales = cfg.options!.scales as Record<string, Scale>;
    expect(scales.x.type).toBe('logarithmic');
    expect(scales.y.type).toBe('logarithmic');
    expect(cfg.data.datasets[0].data).toHaveLength(cr.charts.energy.length);
    // x in kA: the first sample of the series
    expect((cfg.data.datasets[0].data[0] as { x: number }).x).toBeCloseTo(cr.charts.energy[0].current / 1000, 9);
  });
  it("draws the cable's k^2 S^2 as a horizontal line and shades the circuit's fault currents", () => {
    const line = cfg.data.datasets[1].data as Array<{ y: number }>;
    expect(line.map((p) => p.y)).toEqual([cr.withstand, cr.withstand]);
    expect(cfg.data.datasets[1].label).toContain('k²S²');
    expect(marks(cfg).bands).toEqual([expect.objectContaining({ from: cr.energy.currentMin / 1000, to: cr.energy.currentMax / 1000 })]);
  });
});

describe('time chart', () => {
  const cfg = timeChart(cr, circuit, labels);
  it('has the withstand curve, the device curve and the fault currents marked', () => {
    expect(cfg.data.datasets.map((d) => d.label)).toEqual([
      'Operating time of MCCB-250-SD',
      'Cable withstand t = (k S / I)²',
      'Required disconnection time 5.00 s',
    ]);
    const xs = marks(cfg).lines.map((l) => [l.label, l.x]);
    expect(xs).toEqual([
      ['I″ₖ₁ₘᵢₙ end', cr.end.ik1min / 1000],
      ['I″ₖ₃ₘₐₓ end', cr.end.ik3max / 1000],
      ['I″ₖ₃ₘₐₓ origin', cr.origin.ik3max / 1000],
    ]);
  });
  it('keeps the withstand curve t = (kS/I)^2 from the series', () => {
    const first = cr.charts.withstandTime.find((p) => p.time <= 1e4)!;
    const pt = cfg.data.datasets[1].data[0] as { x: number; y: number };
    expect(pt.y).toBe(first.time);
  });
});

describe('length chart', () => {
  it('marks the actual and threshold lengths, and the maximum protected length where there is one', () => {
    const q4 = marks(lengthChart(cr, circuit, labels)).lines.map((l) => l.x);
    expect(q4).toEqual([8, 3.7]); // MSB-Q4: definite-time device, no maximum protected length
    const c3 = result.circuits.find((c) => c.id === 'DB-1-C3')!;
    const c3Circuit = project.circuits.find((c) => c.id === 'DB-1-C3')!;
    const cfg = lengthChart(c3, c3Circuit, labels);
    expect(marks(cfg).lines.map((l) => l.x)).toEqual([140, 0, 73.8]);
    const scales = cfg.options!.scales as Record<string, Scale>;
    expect(scales.x.type).toBe('linear');
    expect(scales.y2.type).toBe('logarithmic'); // energy against the withstand limit, right axis
  });
});

describe('tick labels', () => {
  it('labels log axes at 1-2-5 and at decades', () => {
    expect([0.1, 0.2, 0.3, 0.5, 1, 2, 7, 50].map(tickOneTwoFive)).toEqual(['0.1', '0.2', '', '0.5', '1', '2', '', '50']);
    expect([1e8, 2e8, 1e-3].map(tickDecade)).toEqual(['10⁸', '', '10⁻³']);
    expect(powerOfTen(10)).toBe('10¹⁰');
  });
});
