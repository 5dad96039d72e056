// Chart.js configurations for the sheet's three charts, built from the solver's sampled series
// (the report never recomputes). Pure data plus small pure tick formatters; the marks (shaded
// current range, vertical markers) are plain options read by the plugin in render.ts.

import type { ChartConfiguration, ChartDataset, ScatterDataPoint } from 'chart.js';
import type { Circuit } from '../model/types.js';
import type { CircuitResult } from '../calc/types.js';
import { plain, unmark } from './typeset.js';
import { energy as energyText, seconds as secondsText, significant } from './format.js';

export const CHART_WIDTH = 900;
export const CHART_HEIGHT = 500;
export const CHART_FONT = 'FaultsheetSans';

export interface XBand {
  from: number;
  to: number;
  label: string;
  color: string;
}

export interface XLine {
  x: number;
  label: string;
  color: string;
  dash?: number[];
}

/** Options of the marks plugin (registered in render.ts under the id `fsMarks`). */
export interface MarksOptions {
  bands: XBand[];
  lines: XLine[];
}

export type SheetChart = ChartConfiguration<'scatter', Array<ScatterDataPoint | null>>;

const COLOUR = {
  device: '#1f5fa8',
  cable: '#b3261e',
  band: 'rgba(232, 150, 30, 0.20)',
  marker: '#333333',
  ik3: '#1f5fa8',
  ik1: '#2e7d32',
  energy: '#7b3fa0',
  limit: '#b3261e',
  grid: '#d9dde2',
  gridMajor: '#b9c0c8',
};

const SUPERSCRIPT_DIGITS = '⁰¹²³⁴⁵⁶⁷⁸⁹';

/** 10^n with Unicode superscripts: -3 -> "10⁻³". */
export function powerOfTen(n: number): string {
  const digits = String(Math.abs(n))
    .split('')
    .map((d) => SUPERSCRIPT_DIGITS[Number(d)])
    .join('');
  return `10${n < 0 ? '⁻' : ''}${digits}`;
}

function isDecade(v: number): number | null {
  const e = Math.log10(v);
  const r = Math.round(e);
  return Math.abs(e - r) < 1e-9 ? r : null;
}

/** Log-axis labels at 1, 2 and 5 times a power of ten, in plain decimals: 0.1, 0.2, 0.5, 1, 2 ... */
export function tickOneTwoFive(value: number | string): string {
  const v = Number(value);
  if (!(v > 0)) return '';
  const e = Math.floor(Math.log10(v) + 1e-9);
  const m = Math.round((v / 10 ** e) * 1000) / 1000;
  if (m !== 1 && m !== 2 && m !== 5) return '';
  return significant(v, 1);
}

/** Log-axis labels at powers of ten only, as 10ⁿ. */
export function tickDecade(value: number | string): string {
  const e = isDecade(Number(value));
  return e == null ? '' : powerOfTen(e);
}

/** Log-axis labels at powers of ten in plain decimals (time axis): 0.001 ... 1000. */
export function tickDecadePlain(value: number | string): string {
  const e = isDecade(Number(value));
  return e == null ? '' : significant(10 ** e, 1);
}

/** The next round number at or above `x` (1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8 times a power of ten). */
export function niceCeil(x: number): number {
  if (!(x > 0)) return 1;
  const mag = 10 ** Math.floor(Math.log10(x));
  for (const m of [1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10]) if (m * mag >= x - 1e-9 * mag) return Number((m * mag).toPrecision(6));
  return 10 * mag;
}

const decadeBelow = (v: number): number => 10 ** Math.floor(Math.log10(v) + 1e-9);
const decadeAbove = (v: number): number => 10 ** Math.ceil(Math.log10(v) - 1e-9);

function range(values: number[], fallback: [number, number]): [number, number] {
  const ok = values.filter((v) => Number.isFinite(v) && v > 0);
  if (ok.length === 0) return fallback;
  const lo = decadeBelow(Math.min(...ok));
  let hi = decadeAbove(Math.max(...ok));
  if (hi <= lo) hi = lo * 10;
  return [lo, hi];
}

function baseOptions(): SheetChart['options'] {
  return {
    animation: false,
    responsive: false,
    devicePixelRatio: 1,
    locale: 'en-US',
    font: { family: CHART_FONT, size: 15 },
    layout: { padding: { left: 4, right: 14, top: 6, bottom: 2 } },
    plugins: {
      legend: { position: 'top', align: 'start', labels: { font: { family: CHART_FONT, size: 15 }, boxWidth: 26, boxHeight: 3, padding: 12, color: '#222' } },
      tooltip: { enabled: false },
    },
  };
}

function axisTitle(text: string): { display: true; text: string; font: { family: string; size: number }; color: string } {
  return { display: true, text, font: { family: CHART_FONT, size: 15 }, color: '#222' };
}

const grid = { color: (ctx: { tick?: { major?: boolean; value: number } }) => (ctx.tick && isDecade(ctx.tick.value) != null ? COLOUR.gridMajor : COLOUR.grid) };
const ticks = (callback: (v: number | string) => string) => ({ callback, autoSkip: false, maxRotation: 0, font: { family: CHART_FONT, size: 14 }, color: '#222' });

function line(label: string, data: Array<ScatterDataPoint | null>, colour: string, extra: Partial<ChartDataset<'scatter'>> = {}): ChartDataset<'scatter', Array<ScatterDataPoint | null>> {
  return {
    label,
    data,
    showLine: true,
    borderColor: colour,
    backgroundColor: colour,
    borderWidth: 2.5,
    pointRadius: 0,
    spanGaps: false,
    ...extra,
  } as ChartDataset<'scatter', Array<ScatterDataPoint | null>>;
}

function marks(options: MarksOptions): Record<string, unknown> {
  return { fsMarks: options };
}

export interface ChartLabels {
  [key: string]: string;
}

const L = (labels: ChartLabels, key: string): string => plain(labels[key] ?? key);

/** (1) Let-through energy against prospective current: device curve, k^2 S^2 line, fault range shaded. */
export function energyChart(cr: CircuitResult, labels: ChartLabels): SheetChart {
  const kA = (a: number): number => a / 1000;
  const pts = cr.charts.energy.map((p) => ({ x: kA(p.current), y: p.energy as number }));
  const xs = [...cr.charts.energy.map((p) => kA(p.current)), kA(cr.energy.currentMin), kA(cr.energy.currentMax)];
  const [xMin, xMax] = range(xs, [0.1, 100]);
  const ys = [...cr.charts.energy.map((p) => p.energy ?? NaN), cr.withstand];
  const [yMin, yMax] = range(ys, [1e3, 1e9]);
  const datasets = [
    line(`${L(labels, 'chart.device')} ${unmark(cr.device)}`, pts.map((p) => (Number.isFinite(p.y) && p.y > 0 ? p : { x: p.x, y: null as unknown as number })), COLOUR.device),
    line(`${L(labels, 'chart.withstand')} = ${plain(energyText(cr.withstand))}`, [{ x: xMin, y: cr.withstand }, { x: xMax, y: cr.withstand }], COLOUR.cable, { borderDash: [10, 5] }),
  ];
  if (cr.energy.governingCurrent != null && cr.energy.letThrough != null)
    datasets.push(
      line(L(labels, 'chart.governing'), [{ x: kA(cr.energy.governingCurrent), y: cr.energy.letThrough }], COLOUR.marker, {
        showLine: false,
        pointRadius: 7,
        pointStyle: 'rectRot',
        backgroundColor: '#ffffff',
        borderWidth: 2.5,
      }),
    );
  const options = baseOptions()!;
  options.scales = {
    x: { type: 'logarithmic', min: xMin, max: xMax, title: axisTitle(L(labels, 'chart.axis.prospective')), ticks: ticks(tickOneTwoFive), grid },
    y: { type: 'logarithmic', min: yMin, max: yMax, title: axisTitle(L(labels, 'chart.axis.energy')), ticks: ticks(tickDecade), grid },
  };
  Object.assign(options.plugins!, marks({
    bands: [{ from: kA(cr.energy.currentMin), to: kA(cr.energy.currentMax), label: L(labels, 'chart.range'), color: COLOUR.band }],
    lines: [],
  }));
  return { type: 'scatter', data: { datasets }, options };
}

/** (2) Time against current: cable withstand t = (kS/I)^2 against the device's operating curve. */
export function timeChart(cr: CircuitResult, circuit: Circuit, labels: ChartLabels): SheetChart {
  const kA = (a: number): number => a / 1000;
  const clampT = (t: number): number => Math.min(Math.max(t, 1e-3), 1e4);
  const xs = [...cr.charts.time.map((p) => kA(p.current)), kA(cr.origin.ik3max), kA(cr.end.ik1min)];
  const [xMin, xMax] = range(xs, [0.1, 100]);
  const device = cr.charts.time.map((p) => ({ x: kA(p.current), y: p.time == null ? (null as unknown as number) : clampT(p.time) }));
  const cable = cr.charts.withstandTime.filter((p) => p.time >= 1e-3 && p.time <= 1e4).map((p) => ({ x: kA(p.current), y: p.time }));
  const td = circuit.checks.disconnectionTime;
  const datasets = [
    line(`${L(labels, 'chart.deviceTime')} ${unmark(cr.device)}`, device, COLOUR.device),
    line(L(labels, 'chart.withstandTime'), cable, COLOUR.cable, { borderDash: [10, 5] }),
    line(`${L(labels, 'chart.disconnectionLimit')} ${plain(secondsText(td))}`, [{ x: xMin, y: td }, { x: xMax, y: td }], '#6d6d6d', { borderDash: [3, 4], borderWidth: 2 }),
  ];
  const options = baseOptions()!;
  options.scales = {
    x: { type: 'logarithmic', min: xMin, max: xMax, title: axisTitle(L(labels, 'chart.axis.current')), ticks: ticks(tickOneTwoFive), grid },
    y: { type: 'logarithmic', min: 1e-3, max: 1e4, title: axisTitle(L(labels, 'chart.axis.time')), ticks: ticks(tickDecadePlain), grid },
  };
  Object.assign(options.plugins!, marks({
    bands: [],
    lines: [
      { x: kA(cr.end.ik1min), label: L(labels, 'chart.mark.endIk1min'), color: COLOUR.ik1, dash: [6, 4] },
      { x: kA(cr.end.ik3max), label: L(labels, 'chart.mark.endIk3max'), color: COLOUR.ik3, dash: [6, 4] },
      { x: kA(cr.origin.ik3max), label: L(labels, 'chart.mark.originIk3max'), color: COLOUR.marker, dash: [6, 4] },
    ],
  }));
  return { type: 'scatter', data: { datasets }, options };
}

/** (3) Far-end fault current against cable length, with the withstand limit and the lengths marked. */
export function lengthChart(cr: CircuitResult, circuit: Circuit, labels: ChartLabels): SheetChart {
  const kA = (a: number): number => a / 1000;
  const s = cr.charts.length;
  const xMax = niceCeil(s.length ? Math.max(...s.map((p) => p.length)) : Math.max(10, circuit.cable.length * 2));
  const [yMin, yMax] = range([...s.map((p) => kA(p.ik3max)), ...s.map((p) => kA(p.ik1min))], [0.1, 100]);
  const [eMin, eMax] = range([...s.map((p) => p.letThrough ?? NaN), cr.withstand], [1e3, 1e9]);
  const datasets = [
    line(L(labels, 'chart.endIk3max'), s.map((p) => ({ x: p.length, y: kA(p.ik3max) })), COLOUR.ik3),
    line(L(labels, 'chart.endIk1min'), s.map((p) => ({ x: p.length, y: kA(p.ik1min) })), COLOUR.ik1),
    line(L(labels, 'chart.energyAtEnd'), s.map((p) => ({ x: p.length, y: p.letThrough == null ? (null as unknown as number) : p.letThrough })), COLOUR.energy, { yAxisID: 'y2', borderWidth: 2 }),
    line(`${L(labels, 'chart.withstand')} (${L(labels, 'chart.rightAxis')})`, [{ x: 0, y: cr.withstand }, { x: xMax, y: cr.withstand }], COLOUR.limit, { yAxisID: 'y2', borderDash: [10, 5], borderWidth: 2 }),
  ];
  const lines: XLine[] = [{ x: circuit.cable.length, label: `${L(labels, 'chart.mark.actual')} ${circuit.cable.length.toFixed(1)} m`, color: COLOUR.marker }];
  if (cr.thresholdLength != null && cr.thresholdLength <= xMax)
    lines.push({ x: cr.thresholdLength, label: `${L(labels, 'chart.mark.threshold')} ${cr.thresholdLength.toFixed(1)} m`, color: COLOUR.cable, dash: [6, 4] });
  if (cr.maxLength != null && cr.maxLength <= xMax)
    lines.push({ x: cr.maxLength, label: `${L(labels, 'chart.mark.maxLength')} ${cr.maxLength.toFixed(1)} m`, color: COLOUR.ik1, dash: [6, 4] });
  const options = baseOptions()!;
  options.scales = {
    x: { type: 'linear', min: 0, max: xMax, title: axisTitle(L(labels, 'chart.axis.length')), ticks: { font: { family: CHART_FONT, size: 14 }, color: '#222', maxRotation: 0 }, grid: { color: COLOUR.grid } },
    y: { type: 'logarithmic', min: yMin, max: yMax, position: 'left', title: axisTitle(L(labels, 'chart.axis.endCurrent')), ticks: ticks(tickOneTwoFive), grid },
    y2: { type: 'logarithmic', min: eMin, max: eMax, position: 'right', title: axisTitle(L(labels, 'chart.axis.energy')), ticks: ticks(tickDecade), grid: { drawOnChartArea: false } },
  };
  Object.assign(options.plugins!, marks({ bands: [], lines }));
  return { type: 'scatter', data: { datasets }, options };
}

/** The three charts of a sheet, in order: energy, time, length. */
export function sheetCharts(cr: CircuitResult, circuit: Circuit, labels: ChartLabels): { energy: SheetChart; time: SheetChart; length: SheetChart } {
  return { energy: energyChart(cr, labels), time: timeChart(cr, circuit, labels), length: lengthChart(cr, circuit, labels) };
}
