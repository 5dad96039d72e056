// The calculation sheet of one circuit as a pdfmake document definition (DESIGN.md, "The
// calculation sheet"). Pure: the wording comes from the templates, every number from the result;
// the three chart images are referenced by name and supplied by the renderer.

import type { Content, TDocumentDefinitions, TableCell } from 'pdfmake/interfaces.js';
import type { AppliedDefault, Circuit, Device, Project, Supply } from '../model/types.js';
import type { CheckResult, CircuitResult, ImpedanceStep, Traced } from '../calc/types.js';
import * as fmt from './format.js';
import { literal, unmark, type Run } from './typeset.js';
import { projectContext, type TemplateSet } from './templates.js';
import {
  CONTENT_WIDTH,
  COLOURS,
  blocksToContent,
  breakable,
  dataTable,
  packageDocument,
  ruledLayout,
  pageText,
  projectDate,
  signoffBlocks,
  statusCell,
  statusColour,
  t,
} from './layout.js';
import { CHART_HEIGHT, CHART_WIDTH } from './charts.js';
import { sheetInputHash } from './fingerprint.js';

export const SHEET_IMAGES = { energy: 'chart-energy', time: 'chart-time', length: 'chart-length' } as const;

export interface SheetOptions {
  templates: TemplateSet;
  index: number; // 1-based position of the circuit in the project
  count: number; // circuits in the project
}

/** One numbered assumption as the templates see it. */
export interface AssumptionItem {
  number: string; // "A7"
  kind: 'project' | 'circuit' | 'default' | 'note';
  text: string; // project/circuit: literal user text; note: solver text
  field: string; // default: literal field path
  value: string; // default: the value applied (markup)
  source: string; // default: where it comes from (markup)
  scope: string; // default: "project", "device MCB-C20", "circuit"
}

const CHECK_ORDER = ['thermal_withstand', 'breaking_capacity', 'disconnection', 'voltage_drop'] as const;

export function checkValue(c: CheckResult, which: 'value' | 'limit'): string {
  const v = c[which];
  if (v == null) return which === 'limit' ? 'not given' : 'undetermined';
  switch (c.name) {
    case 'thermal_withstand':
      return fmt.energy(v);
    case 'breaking_capacity':
      return fmt.kiloamps(v);
    case 'disconnection':
      return fmt.seconds(v);
    case 'voltage_drop':
      return fmt.percent(v);
  }
}

/** A device default's own field: "device.x", "device MCB-C20: x" and "devices[2].x" all give "x". */
function deviceField(field: string): string {
  return field.replace(/^device(?:s\[[^\]]*\])?(?:\.|\s+[^:]*:\s*)/, '');
}

/** Match a row's field path against applied defaults ("cable.reactance" matches "circuits[3].cable.reactance"). */
function matches(d: AppliedDefault, field: string): boolean {
  const f = d.field;
  return f === field || f.endsWith(`.${field}`) || f.endsWith(`]${field}`) || field.startsWith(`${f}.`) || f.startsWith(`${field}.`);
}

interface Row {
  label: string; // markup
  value: string | Run[]; // markup or runs
  field?: string; // author field path for default marking
  scope: 'project' | 'device' | 'circuit';
  note?: string; // markup
}

/** Every assumption and default of the sheet, numbered; project first, then circuit, defaults, notes. */
export function assumptionsOf(project: Project, cr: CircuitResult, circuit: Circuit, device: Device | undefined, supply: Supply | undefined): AssumptionItem[] {
  const items: AssumptionItem[] = [];
  const add = (i: Omit<AssumptionItem, 'number' | 'field' | 'value' | 'source' | 'scope'> & Partial<AssumptionItem>): void => {
    items.push({ field: '', value: '', source: '', scope: '', ...i, number: `A${items.length + 1}` });
  };
  for (const a of project.assumptions) add({ kind: 'project', text: literal(a) });
  for (const a of circuit.assumptions) add({ kind: 'circuit', text: literal(a) });
  const seen = new Set<string>();
  const addDefault = (d: AppliedDefault, scope: string): void => {
    const key = `${deviceField(d.field)}\u0000${d.value}`;
    if (seen.has(key)) return;
    seen.add(key);
    add({ kind: 'default', text: '', field: literal(d.field), value: d.value, source: d.source, scope });
  };
  for (const d of project.defaults) {
    const m = /supplies\[([^\]]+)\]/.exec(d.field);
    if (m && supply && m[1] !== supply.id && m[1] !== String(project.supplies.indexOf(supply))) continue;
    addDefault(d, 'project');
  }
  for (const d of cr.defaults) addDefault(d, d.field.startsWith('device') ? `device ${cr.device}` : 'circuit');
  for (const d of device?.defaults ?? []) addDefault(d, `device ${cr.device}`);
  const c = circuit.cable;
  if (!c.resistanceGiven && !cr.defaults.some((d) => matches(d, 'cable.resistance')))
    addDefault({ field: 'cable.resistance', value: fmt.ohmsPerKm(c.resistance20), source: c.resistanceSource }, 'circuit');
  if (c.protectiveConductorDefaulted && !cr.defaults.some((d) => matches(d, 'cable.protective_conductor')))
    addDefault(
      { field: 'cable.protective_conductor', value: `${c.protectiveConductor.size.label} ${c.protectiveConductor.conductor}, ${c.protectiveConductor.arrangement}`, source: 'faultsheet default (docs/FORMAT.md): the phase size, in the same cable' },
      'circuit',
    );
  for (const n of cr.notes) add({ kind: 'note', text: n });
  return items;
}

function criterionText(project: Project): string {
  return project.settings.withstandCriterion === 'any-point'
    ? 'any-point (IEC 60364-4-43 434.5.2): every prospective current from I\'\'k1min at the far end to I\'\'k3max at the origin'
    : 'through-fault: the far-end currents only';
}

function minTemperatureText(project: Project): string {
  const m = project.settings.minFaultTemperature;
  if (m.mode === 'final') return "final: the insulation's short-circuit limit theta_f";
  if (m.mode === 'operating') return "operating: the insulation's maximum operating temperature theta_i";
  return `${m.celsius} degC`;
}

function curveRange(points: Array<{ current: number; value: number }>, unit: 's' | 'A^2 s'): string {
  const a = points[0];
  const b = points[points.length - 1];
  const v = (x: number): string => (unit === 's' ? fmt.seconds(x) : fmt.energy(x));
  return `${points.length} points, ${fmt.amps(a.current)} (${v(a.value)}) to ${fmt.amps(b.current)} (${v(b.value)})`;
}

function supplyRows(supply: Supply | undefined): Row[] {
  if (!supply) return [{ label: 'Supply', value: 'not found in the project', scope: 'project' }];
  const rows: Row[] = [];
  if (supply.kind === 'transformer') {
    const n = supply.network;
    rows.push({ label: 'Supply', value: [{ text: unmark(supply.id) }, { text: ', transformer' }], scope: 'project' });
    if (n) {
      rows.push(
        { label: 'Network voltage U_nQ', value: fmt.volts(n.voltage), field: 'network.voltage', scope: 'project' },
        { label: "Network fault level S''kQ", value: fmt.voltAmps(n.faultLevel), field: 'network.fault_level', scope: 'project' },
        { label: "Minimum fault level S''kQmin", value: fmt.voltAmps(n.faultLevelMin), field: 'network.fault_level_min', scope: 'project' },
        { label: 'Network X_Q/R_Q', value: fmt.factor(n.xOverR), field: 'network.x_over_r', scope: 'project' },
        { label: 'Network voltage factor c_Q', value: n.voltageFactor.toFixed(2), field: 'network.voltage_factor', scope: 'project' },
      );
    } else rows.push({ label: 'Network', value: 'infinite bus (no MV feeder impedance)', field: 'network', scope: 'project' });
    const tr = supply.transformer;
    rows.push(
      { label: 'Rating S_rT', value: fmt.voltAmps(tr.rating, 1e7), field: 'transformer.rating', scope: 'project' },
      { label: 'Voltages U_rTHV / U_rTLV', value: `${fmt.volts(tr.primaryVoltage)} / ${fmt.volts(tr.secondaryVoltage)}`, field: 'transformer.primary_voltage', scope: 'project' },
      { label: 'Short-circuit voltage u_kr', value: `${fmt.significant(tr.impedance * 100, 3)} %`, field: 'transformer.impedance', scope: 'project' },
    );
    if (tr.loadLosses != null) rows.push({ label: 'Load losses P_krT', value: fmt.watts(tr.loadLosses), field: 'transformer.load_losses', scope: 'project' });
    if (tr.xOverR != null) rows.push({ label: 'Transformer X/R', value: fmt.factor(tr.xOverR), field: 'transformer.x_over_r', scope: 'project' });
    rows.push(
      { label: 'Vector group', value: [{ text: unmark(tr.vectorGroup) }], field: 'transformer.vector_group', scope: 'project' },
      { label: 'Z_0T / Z_1T', value: fmt.factor(tr.zeroSequenceRatio), field: 'transformer.zero_sequence_ratio', scope: 'project' },
    );
  } else {
    rows.push(
      { label: 'Supply', value: [{ text: unmark(supply.id) }, { text: ', LV service' }], scope: 'project' },
      { label: "Declared I''k at the origin", value: fmt.kiloamps(supply.faultCurrent), field: 'service.fault_current', scope: 'project' },
      { label: 'Service X/R', value: fmt.factor(supply.xOverR), field: 'service.x_over_r', scope: 'project' },
      {
        label: 'Earth loop impedance Z_e',
        value: supply.earthLoopImpedance != null ? fmt.milliohms(supply.earthLoopImpedance) : 'taken as the source impedance',
        field: 'service.earth_loop_impedance',
        scope: 'project',
      },
    );
  }
  return rows;
}

function deviceRows(device: Device | undefined, circuit: Circuit): Row[] {
  if (!device) return [{ label: 'Device', value: [{ text: unmark(circuit.device) }, { text: ' (not found)' }], scope: 'device' }];
  const rows: Row[] = [
    { label: 'Device', value: [{ text: unmark(device.id) }, { text: ` (${device.kind})` }], scope: 'device' },
  ];
  if (device.description) rows.push({ label: 'Description', value: [{ text: unmark(device.description) }], scope: 'device' });
  rows.push(
    { label: 'Rated current I_n', value: fmt.amps(device.rating), field: 'rating', scope: 'device' },
    { label: 'Breaking capacity', value: device.breakingCapacity != null ? fmt.kiloamps(device.breakingCapacity) : 'not given', field: 'breaking_capacity', scope: 'device' },
  );
  if (device.clearingTime != null) rows.push({ label: 'Clearing time (device)', value: fmt.seconds(device.clearingTime), field: 'clearing_time', scope: 'device' });
  if (circuit.clearingTime != null) rows.push({ label: 'Clearing time (this circuit)', value: fmt.seconds(circuit.clearingTime), field: 'clearing_time', scope: 'circuit' });
  if (device.instantaneous) {
    rows.push(
      { label: 'Instantaneous pickup I_i', value: `${fmt.amps(device.instantaneous.pickup)} (${fmt.significant(device.instantaneous.pickup / device.rating, 3)} I_n)`, field: 'instantaneous.pickup', scope: 'device' },
      { label: 'Instantaneous clearing time', value: fmt.seconds(device.instantaneous.clearingTime), field: 'instantaneous.clearing_time', scope: 'device' },
    );
  }
  if (device.tripCurve?.length) rows.push({ label: 'Time-current curve', value: curveRange(device.tripCurve, 's'), field: 'trip_curve', scope: 'device' });
  if (device.letThrough?.length) rows.push({ label: 'Let-through curve', value: curveRange(device.letThrough, 'A^2 s'), field: 'let_through', scope: 'device' });
  if (device.illustrative) rows.push({ label: 'Data', value: "illustrative, not from a maker's datasheet", scope: 'device' });
  return rows;
}

function cableRows(circuit: Circuit): Row[] {
  const c = circuit.cable;
  const pe = c.protectiveConductor;
  const rows: Row[] = [
    { label: 'From / to', value: [{ text: unmark(circuit.from) }, { text: ' → ' }, { text: circuit.to ? unmark(circuit.to) : 'load' }], scope: 'circuit' },
    { label: 'Conductor, insulation', value: `${c.conductor}, ${c.insulation}`, field: 'cable.conductor', scope: 'circuit' },
    { label: 'Size S', value: [{ text: unmark(c.size.label).replace(/mm2\b/, 'mm²') }, ...(c.parallel > 1 ? [{ text: ` × ${c.parallel} in parallel` }] : [])], field: 'cable.size', scope: 'circuit' },
    { label: 'Conductors in parallel', value: String(c.parallel), field: 'cable.parallel', scope: 'circuit' },
    { label: 'Length L', value: lengthText(c.length, '', inFeet(circuit)), field: 'cable.length', scope: 'circuit' },
    { label: 'Resistance R_20', value: fmt.ohmsPerKm(c.resistance20), field: 'cable.resistance', scope: 'circuit', note: c.resistanceGiven ? 'given' : c.resistanceSource },
    { label: 'Reactance X', value: fmt.ohmsPerKm(c.reactance), field: 'cable.reactance', scope: 'circuit' },
    {
      label: 'Protective conductor',
      value: [{ text: `${unmark(pe.size.label).replace(/mm2\b/, 'mm²')} ${pe.conductor}, ${pe.arrangement}${pe.parallel > 1 ? `, × ${pe.parallel}` : ''}` }],
      field: 'cable.protective_conductor',
      scope: 'circuit',
    },
    { label: 'PE resistance R_20', value: fmt.ohmsPerKm(pe.resistance20), field: 'cable.protective_conductor.resistance', scope: 'circuit', note: pe.resistanceSource },
  ];
  if (circuit.load)
    rows.push(
      { label: 'Design current I_b', value: fmt.amps(circuit.load.current), field: 'load.current', scope: 'circuit' },
      { label: 'Power factor cos phi', value: circuit.load.powerFactor.toFixed(2), field: 'load.power_factor', scope: 'circuit' },
      // single-phase stands out; three phases (the format's default) is listed among the defaults
      ...(circuit.load.phases === 1 ? [{ label: 'Load phases', value: '1 (line to neutral)', field: 'load.phases', scope: 'circuit' as const }] : []),
    );
  else rows.push({ label: 'Load', value: 'not given: voltage drop not checked', field: 'load', scope: 'circuit' });
  rows.push(
    { label: 'Disconnection time t_d', value: fmt.seconds(circuit.checks.disconnectionTime), field: 'checks.disconnection_time', scope: 'circuit' },
    { label: 'Voltage drop limit', value: fmt.percent(circuit.checks.voltageDropLimit), field: 'checks.voltage_drop_limit', scope: 'circuit' },
  );
  return rows;
}

function systemRows(project: Project): Row[] {
  const s = project.settings;
  return [
    { label: 'Nominal voltage U_n', value: fmt.volts(s.systemVoltage), field: 'settings.system_voltage', scope: 'project' },
    { label: 'Frequency f', value: `${fmt.significant(s.frequency, 2)} Hz`, field: 'settings.frequency', scope: 'project' },
    { label: 'Earthing', value: s.earthing, field: 'settings.earthing', scope: 'project' },
    { label: 'Voltage factor c_max', value: s.voltageFactorMax.toFixed(2), field: 'settings.voltage_factor_max', scope: 'project' },
    { label: 'Voltage factor c_min', value: s.voltageFactorMin.toFixed(2), field: 'settings.voltage_factor_min', scope: 'project' },
    { label: 'Conductor temperature, minimum currents', value: minTemperatureText(project), field: 'settings.min_fault_conductor_temperature', scope: 'project' },
    { label: 'Withstand criterion', value: s.withstandCriterion, field: 'settings.withstand_criterion', scope: 'project' },
  ];
}

/** The first assumption number recording a default for this row, or null. */
function defaultFor(row: Row, items: AssumptionItem[], supply: Supply | undefined): string | null {
  if (!row.field) return null;
  for (const a of items) {
    if (a.kind !== 'default') continue;
    const f = unmark(a.field);
    const scopeOk =
      row.scope === 'project' ? a.scope === 'project' : row.scope === 'device' ? a.scope.startsWith('device') : a.scope === 'circuit';
    if (!scopeOk) continue;
    if (row.scope === 'project' && /supplies\[/.test(f) && supply && !f.includes(`[${supply.id}]`) && !/supplies\[\d+\]/.test(f)) continue;
    if (matches({ field: row.scope === 'device' ? deviceField(f) : f, value: '', source: '' }, row.field)) return a.number;
  }
  return null;
}

function inputTable(title: string, rows: Row[], items: AssumptionItem[], supply: Supply | undefined, labels: Record<string, string>): Content {
  const body: TableCell[][] = [[{ text: t(title), style: 'th', colSpan: 2 }, {}]];
  for (const r of rows) {
    const d = defaultFor(r, items, supply);
    const value: Run[] = typeof r.value === 'string' ? t(r.value) : [...r.value];
    if (d) value.push({ text: ` ${labels['default.tag'] ?? '(default)'} ${d}`, bold: true });
    const cell: TableCell = r.note
      ? { stack: [{ text: value }, { text: t(r.note), style: 'small' }], style: 'td' }
      : { text: value, style: 'td' };
    if (d) (cell as { fillColor?: string }).fillColor = '#fbf3dc';
    body.push([{ text: t(r.label), style: 'td', color: COLOURS.faint }, cell]);
  }
  return { table: { widths: [92, '*'], body, dontBreakRows: true, headerRows: 1 }, layout: { ...gridLayoutLite }, margin: [0, 0, 0, 6] };
}

const gridLayoutLite = ruledLayout(0.4, COLOURS.rule, 1.4);

function impedanceTable(steps: ImpedanceStep[], labels: Record<string, string>, totalLabel: string): Content {
  const n = (ohm: number): string => fmt.milliohmNumber(ohm);
  const rows = steps.map((s) => [
    { stack: [{ text: t(s.element), bold: true }, { text: t(s.detail), style: 'small' }], style: 'td' } as TableCell,
    n(s.z.r),
    n(s.z.x),
    n(Math.hypot(s.z.r, s.z.x)),
    n(s.total.r),
    n(s.total.x),
    n(Math.hypot(s.total.r, s.total.x)),
  ]);
  const last = steps[steps.length - 1];
  if (last)
    rows.push([
      { text: t(totalLabel), bold: true, style: 'td' } as TableCell,
      '',
      '',
      '',
      { text: n(last.total.r), bold: true, style: 'td' } as TableCell,
      { text: n(last.total.x), bold: true, style: 'td' } as TableCell,
      { text: n(Math.hypot(last.total.r, last.total.x)), bold: true, style: 'td' } as TableCell,
    ]);
  const w = 37;
  return dataTable(
    ['*', w, w, w, w, w, w + 4],
    [labels['col.element'], 'R', 'X', '|Z|', 'ΣR', 'ΣX', '|ΣZ|'].map((h) => ({ text: t(h ?? ''), style: 'th' })),
    rows,
    { align: ['left', 'right', 'right', 'right', 'right', 'right', 'right'] },
  );
}

function quantityResult(q: Traced, labels: Record<string, string>): string {
  if (q.value != null) return fmt.quantity(q.value, q.unit);
  if (/^L_?(thr|min)/.test(q.symbol)) return labels['length.noThreshold'] ?? 'none';
  if (/^L_?max/.test(q.symbol)) return labels['length.noMax'] ?? 'none';
  return labels['undetermined'] ?? 'undetermined';
}

function quantityTable(qs: Traced[], labels: Record<string, string>): Content {
  // a short note ("at the origin") goes under the symbol, a long one under the working
  const rows = qs.map((q) => [
    {
      stack: [{ text: t(q.symbol), bold: true, fontSize: 8.4 }, ...(q.note && q.note.length <= 40 ? [{ text: t(q.note), style: 'small' }] : [])],
      style: 'td',
    } as TableCell,
    {
      stack: [
        { text: [{ text: '= ' }, ...t(q.formula)] },
        { text: [{ text: '= ' }, ...t(q.substitution)] },
        ...(q.note && q.note.length > 40 ? [{ text: t(q.note), style: 'small' }] : []),
        ...(q.reference ? [{ text: t(q.reference), style: 'small' }] : []),
      ],
      style: 'td',
    } as TableCell,
    { text: q.value == null ? t(quantityResult(q, labels)) : [{ text: '= ' }, ...t(quantityResult(q, labels))], bold: true, style: 'td', alignment: 'right' } as TableCell,
  ]);
  return dataTable([82, '*', 84], [labels['col.quantity'], labels['col.working'], labels['col.result']], rows);
}

type Group = 'fault' | 'energy' | 'time' | 'length';

/** Which section shows a traced quantity, by its unit (the solver's symbols may vary). */
export function quantityGroup(q: Traced): Group {
  const u = q.unit.replace(/\s+/g, ' ').trim();
  if (q.symbol === 'k' || /^k[ _]PE/.test(q.symbol) || /^k\^?2/.test(q.symbol) || u === 'A^2 s' || u === 'A2s' || /^(K|beta|theta)/.test(q.symbol)) return 'energy';
  if (u === 's') return 'time';
  if (u === 'm' || u === '%') return 'length';
  return 'fault';
}

function chartImage(name: string, caption: Run[]): Content {
  const width = CONTENT_WIDTH;
  return {
    stack: [
      { image: name, width, height: (width * CHART_HEIGHT) / CHART_WIDTH },
      { text: caption, style: 'caption' },
    ],
    unbreakable: true,
  };
}

/** True where the author wrote this cable's length in feet: the sheet then repeats lengths in feet. */
function inFeet(circuit: Circuit | undefined): boolean {
  return /\b(ft|feet|foot)\s*$/i.test(circuit?.cable.lengthWritten ?? '');
}

function lengthText(v: number | null, none: string, feet = false): string {
  if (v == null) return none;
  return feet ? `${fmt.metres(v)} (${Math.round(v / 0.3048)} ft)` : fmt.metres(v);
}

/** The pdfmake document definition of one circuit's calculation sheet. */
export function sheetDocument(project: Project, cr: CircuitResult, opts: SheetOptions): TDocumentDefinitions {
  const tpl = opts.templates;
  const labels = tpl.labels('sheet/labels.hbs');
  const circuit = project.circuits.find((c) => c.id === cr.id);
  if (!circuit) throw new Error(`internal error: circuit ${cr.id} is in the result but not in the project`);
  const device = project.devices.find((d) => d.id === cr.device);
  const supply = project.supplies.find((s) => s.id === cr.supply);
  const assumptions = assumptionsOf(project, cr, circuit, device, supply);
  const checks = [...cr.checks].sort((a, b) => CHECK_ORDER.indexOf(a.name) - CHECK_ORDER.indexOf(b.name));
  const checkLabel = (c: CheckResult): string => labels[`check.${c.name}`] ?? c.name;
  const statusWord = (s: string): string => labels[`status.${s}`] ?? s.toUpperCase();

  const none = labels['none'] ?? 'none';
  const sheetHash = sheetInputHash(project, cr);
  const context = {
    // what this sheet is computed from (fingerprint.ts); project.hash is every input file's
    sheet: { hash: sheetHash, hashShort: sheetHash.slice(0, 12) },
    project: {
      ...projectContext(project),
      criterionText: criterionText(project),
      cMax: project.settings.voltageFactorMax.toFixed(2),
      cMin: project.settings.voltageFactorMin.toFixed(2),
      minTemperature: minTemperatureText(project),
    },
    circuit: {
      id: literal(cr.id),
      description: cr.description ? literal(cr.description) : '', // empty stays falsy for {{#if}}
      from: literal(cr.from),
      to: cr.to ? literal(cr.to) : null,
      device: literal(cr.device),
      supply: literal(cr.supply),
      index: opts.index,
      count: opts.count,
      size: circuit.cable.size.label, // normalised by the validator ("95 mm2", "4/0 AWG")
      length: fmt.metres(circuit.cable.length),
    },
    device: {
      id: literal(cr.device),
      illustrative: !!device?.illustrative,
      timeOnly: !!device && !device.tripCurve?.length && !device.letThrough?.length && !device.instantaneous,
    },
    verdict: { status: cr.verdict, word: statusWord(cr.verdict), pass: cr.verdict === 'pass', fail: cr.verdict === 'fail', undetermined: cr.verdict === 'undetermined' },
    checks: checks.map((c) => ({
      name: c.name,
      label: checkLabel(c),
      status: c.status,
      statusWord: statusWord(c.status),
      value: checkValue(c, 'value'),
      limit: checkValue(c, 'limit'),
      governing: c.governing,
      explanation: c.explanation,
      reference: c.reference,
      pass: c.status === 'pass',
    })),
    failing: checks
      .filter((c) => c.status !== 'pass')
      .map((c) => ({ name: c.name, label: checkLabel(c), status: c.status, statusWord: statusWord(c.status), explanation: c.explanation || c.governing, fail: c.status === 'fail' })),
    smallestCompliantSize: cr.smallestCompliantSize, // a standard size label from the solver
    origin: { ik3max: fmt.kiloamps(cr.origin.ik3max), ip: fmt.kiloamps(cr.origin.ip), ik1min: fmt.kiloamps(cr.origin.ik1min) },
    end: { ik3max: fmt.kiloamps(cr.end.ik3max), ip: fmt.kiloamps(cr.end.ip), ik1min: fmt.kiloamps(cr.end.ik1min) },
    k: fmt.significant(cr.k, 3),
    withstand: fmt.energy(cr.withstand),
    letThrough: fmt.energy(cr.letThrough),
    energy: {
      status: cr.energy.status,
      statusWord: statusWord(cr.energy.status),
      rule: cr.energy.rule ?? none,
      governingCurrent: fmt.kiloamps(cr.energy.governingCurrent),
      currentMin: fmt.kiloamps(cr.energy.currentMin),
      currentMax: fmt.kiloamps(cr.energy.currentMax),
    },
    thresholdLength: lengthText(cr.thresholdLength, labels['length.noThreshold'] ?? none, inFeet(circuit)),
    maxLength: lengthText(cr.maxLength, labels['length.noMax'] ?? none, inFeet(circuit)),
    hasThreshold: cr.thresholdLength != null,
    hasMaxLength: cr.maxLength != null,
    voltageDrop: cr.voltageDrop == null ? null : fmt.percent(cr.voltageDrop),
    disconnectionTime: fmt.seconds(circuit.checks.disconnectionTime),
    assumptions,
    signoff: {
      prepared: project.signoff.preparedBy ? { name: literal(project.signoff.preparedBy.name), role: literal(project.signoff.preparedBy.role) } : null,
      checked: project.signoff.checkedBy ? { name: literal(project.signoff.checkedBy.name), role: literal(project.signoff.checkedBy.role) } : null,
      approved: project.signoff.approvedBy ? { name: literal(project.signoff.approvedBy.name), role: literal(project.signoff.approvedBy.role) } : null,
    },
    labels,
  };

  const byGroup = (g: Group): Traced[] => cr.quantities.filter((q) => quantityGroup(q) === g);
  const section = (name: string, slots: Record<string, Content[]>): Content[] => blocksToContent(tpl.render(`sheet/${name}.hbs`, context), slots);

  // 1 verdict
  const checksTable = dataTable(
    [104, 70, 70, 68, '*'], // the status column fits UNDETERMINED on one line
    [labels['col.check'], labels['col.value'], labels['col.limit'], labels['col.status'], labels['col.governing']],
    checks.map((c) => [
      { stack: [{ text: t(checkLabel(c)), bold: true }, { text: t(c.reference), style: 'small' }], style: 'td' } as TableCell,
      checkValue(c, 'value'),
      checkValue(c, 'limit'),
      statusCell(c.status, labels),
      c.governing,
    ]),
  );
  const banner: Content = {
    table: {
      widths: ['*'],
      body: [[{ text: [{ text: `${labels['verdict'] ?? 'Verdict'}: ` }, { text: statusWord(cr.verdict), color: statusColour(cr.verdict) }], bold: true, fontSize: 11, margin: [4, 3, 4, 3] }]],
    },
    layout: { hLineWidth: () => 1, vLineWidth: () => 1, hLineColor: () => statusColour(cr.verdict), vLineColor: () => statusColour(cr.verdict) },
    margin: [0, 2, 0, 6],
  };

  // 2 inputs
  const inputs: Content = breakable({
    columns: [
      { width: '*', stack: [inputTable(labels['inputs.system'], systemRows(project), assumptions, supply, labels), inputTable(labels['inputs.supply'], supplyRows(supply), assumptions, supply, labels)] },
      { width: '*', stack: [inputTable(labels['inputs.device'], deviceRows(device, circuit), assumptions, supply, labels), inputTable(labels['inputs.cable'], cableRows(circuit), assumptions, supply, labels)] },
    ],
    columnGap: 8,
  });

  // 5 energy comparison
  const ratio = cr.letThrough != null && cr.withstand > 0 ? cr.letThrough / cr.withstand : null;
  const comparison = dataTable(
    [190, '*'],
    [labels['col.quantity'], labels['col.value']],
    [
      [labels['energy.withstand'], fmt.energy(cr.withstand)],
      [labels['energy.letThrough'], fmt.energy(cr.letThrough)],
      [labels['energy.governingCurrent'], fmt.kiloamps(cr.energy.governingCurrent)],
      [labels['energy.rule'], cr.energy.rule ?? none],
      [labels['energy.range'], `${fmt.kiloamps(cr.energy.currentMin)} to ${fmt.kiloamps(cr.energy.currentMax)}`],
      [labels['energy.ratio'], ratio == null ? none : fmt.significant(ratio, 3)],
      [labels['energy.status'], statusCell(cr.energy.status, labels)],
    ],
  );

  // 7 lengths
  const lengths = dataTable(
    [190, '*'],
    [labels['col.quantity'], labels['col.value']],
    [
      [labels['length.actual'], lengthText(circuit.cable.length, none, inFeet(circuit))],
      [labels['length.threshold'], lengthText(cr.thresholdLength, labels['length.noThreshold'] ?? none, inFeet(circuit))],
      [labels['length.max'], lengthText(cr.maxLength, labels['length.noMax'] ?? none, inFeet(circuit))],
      ...(cr.voltageDrop != null ? [[labels['length.voltageDrop'], fmt.percent(cr.voltageDrop)]] : []),
    ],
  );

  // 8 alternatives
  const failingShort = (names: string[]): string => (names.length ? names.map((n) => labels[`short.${n}`] ?? n).join(', ') : '');
  const alternatives = dataTable(
    [40, 24, 62, 42, 42, 62, 34, 36, 46, '*'],
    [labels['alt.size'], 'k', 'k^2 S^2', labels['alt.endIk3max'], labels['alt.endIk1min'], 'I^2 t', labels['alt.threshold'], labels['alt.max'], labels['col.status'], labels['alt.failing']],
    cr.alternatives.map((a) => {
      const row: Array<string | TableCell> = [
        a.size,
        fmt.significant(a.k, 3),
        fmt.energy(a.withstand),
        fmt.kiloamps(a.endIk3max),
        fmt.kiloamps(a.endIk1min),
        fmt.energy(a.letThrough),
        lengthText(a.thresholdLength, '—'),
        lengthText(a.maxLength, '—'),
        statusCell(a.verdict, labels),
        failingShort(a.failing),
      ];
      return a.chosen ? row.map((c) => (typeof c === 'string' ? ({ text: t(c), bold: true, fillColor: '#eef3f8', style: 'td' } as TableCell) : ({ ...(c as object), fillColor: '#eef3f8' } as TableCell))) : row;
    }),
    { align: ['left', 'right', 'right', 'right', 'right', 'right', 'right', 'right', 'left', 'left'] },
  );

  const signoff = signoffBlocks(
    [
      { word: labels['prepared'], person: project.signoff.preparedBy },
      { word: labels['checked'], person: project.signoff.checkedBy },
      { word: labels['approved'], person: project.signoff.approvedBy },
    ],
    { name: labels['name'], role: labels['role'], signature: labels['signature'], date: labels['signDate'] },
  );

  const content: Content[] = [
    ...section('verdict', { banner: [banner], checks: [checksTable] }),
    ...section('inputs', { tables: [inputs] }),
    ...section('impedance', {
      max: [impedanceTable(cr.buildUpMax, labels, labels['impedance.totalMax'])],
      min: [impedanceTable(cr.buildUpMin, labels, labels['impedance.totalMin'])],
    }),
    ...section('fault-currents', { quantities: [quantityTable(byGroup('fault'), labels)] }),
    ...section('energy', {
      quantities: [quantityTable(byGroup('energy'), labels)],
      comparison: [comparison],
      chart: [chartImage(SHEET_IMAGES.energy, t(tpl.text('sheet/caption-energy.hbs', context)))],
    }),
    ...section('time', {
      quantities: byGroup('time').length ? [quantityTable(byGroup('time'), labels)] : [],
      chart: [chartImage(SHEET_IMAGES.time, t(tpl.text('sheet/caption-time.hbs', context)))],
    }),
    ...section('length', {
      lengths: [lengths],
      quantities: byGroup('length').length ? [quantityTable(byGroup('length'), labels)] : [],
      chart: [chartImage(SHEET_IMAGES.length, t(tpl.text('sheet/caption-length.hbs', context)))],
    }),
    ...section('alternatives', { table: [alternatives] }),
    ...section('assumptions', {}),
    { stack: [...section('signoff', { blocks: [signoff] }), ...section('cautions', {})], unbreakable: true },
  ];

  return packageDocument(
    project,
    labels,
    {
      title: `${unmark(project.meta.name)} — ${unmark(cr.id)}`,
      subject: labels['info.subject'] ?? 'Calculation sheet',
      subjectLabel: labels['circuit']!,
      subjectText: cr.description ? `${unmark(cr.id)} — ${unmark(cr.description)}` : unmark(cr.id),
      partLabel: labels['calculation']!,
      part: pageText(labels['calculationOf']!, opts.index, opts.count),
      footerName: unmark(cr.id),
      hash: { label: labels['sheetHash'] ?? labels['inputHash']!, value: sheetHash.slice(0, 12) },
    },
    content,
  );
}

export { projectDate };

