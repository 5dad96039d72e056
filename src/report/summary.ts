// The project summary as a pdfmake document definition: cover, the board tree with each board's
// fault levels, the index of circuits (failing first) and every non-passing check in words.

import { sheetFileName } from './plan.js';
import { boardTreeDrawing } from './tree-drawing.js';
import type { Column, Content, TDocumentDefinitions, TableCell } from 'pdfmake/interfaces.js';
import type { Project, Supply } from '../model/types.js';
import type { BoardResult, CircuitResult, ProjectResult, Status } from '../calc/types.js';
import * as fmt from './format.js';
import { literal, unmark } from './typeset.js';
import { projectContext, type TemplateSet } from './templates.js';
import { COLOURS, FONT, blocksToContent, dataTable, packageDocument, signoffBlocks, statusCell, t } from './layout.js';
import { checkValue } from './sheet.js';

export interface SummaryOptions {
  templates: TemplateSet;
  /** First page of each circuit's sheet in dossier.pdf (1-based), where known. */
  dossierPages?: ReadonlyMap<string, number>;
}

const VERDICT_ORDER: Record<Status, number> = { fail: 0, undetermined: 1, pass: 2 };

/** Circuits in index order: failing first, then undetermined, then passing; by id within each. */
export function indexOrder(circuits: readonly CircuitResult[]): CircuitResult[] {
  return [...circuits].sort((a, b) => VERDICT_ORDER[a.verdict] - VERDICT_ORDER[b.verdict] || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
}

function supplyText(s: Supply): string {
  if (s.kind === 'transformer') {
    const tr = s.transformer;
    const net = s.network ? `, network ${fmt.voltAmps(s.network.faultLevel)}` : ', infinite bus';
    return `transformer ${fmt.voltAmps(tr.rating, 1e7)}, ${fmt.volts(tr.primaryVoltage)} / ${fmt.volts(tr.secondaryVoltage)}, u_kr = ${fmt.significant(tr.impedance * 100, 3)} %${net}`;
  }
  return `LV service, declared I''k = ${fmt.kiloamps(s.faultCurrent)}`;
}

interface TreeRow {
  depth: number;
  last: boolean[]; // for each level, whether the node on the path is its parent's last child
  kind: 'supply' | 'board';
  id: string;
  via: string; // circuit feeding the board
  board?: BoardResult;
  supply?: Supply;
}

/** The tree supply -> board -> boards fed by its circuits, depth first, ids sorted. */
export function boardTree(project: Project, result: ProjectResult): TreeRow[] {
  const boards = new Map(result.boards.map((b) => [b.id, b]));
  const feeder = new Map<string, CircuitResult>(); // board id -> circuit feeding it
  for (const c of result.circuits) if (c.to && boards.has(c.to)) feeder.set(c.to, c);
  const children = (boardId: string): BoardResult[] =>
    result.circuits
      .filter((c) => c.from === boardId && c.to && boards.has(c.to))
      .map((c) => boards.get(c.to!)!)
      .sort((a, b) => (a.id < b.id ? -1 : 1));
  const rows: TreeRow[] = [];
  const seen = new Set<string>();
  const walk = (b: BoardResult, depth: number, last: boolean[]): void => {
    if (seen.has(b.id)) return; // a loop would be a validation error upstream; never recurse twice
    seen.add(b.id);
    rows.push({ depth, last, kind: 'board', id: b.id, via: feeder.get(b.id)?.id ?? '', board: b });
    const kids = children(b.id);
    kids.forEach((k, i) => walk(k, depth + 1, [...last, i === kids.length - 1]));
  };
  const supplies = [...project.supplies];
  supplies.forEach((s, si) => {
    rows.push({ depth: 0, last: [si === supplies.length - 1], kind: 'supply', id: s.id, via: '', supply: s });
    const roots = result.boards.filter((b) => b.fedBy === s.id).sort((a, b) => (a.id < b.id ? -1 : 1));
    roots.forEach((b, i) => walk(b, 1, [si === supplies.length - 1, i === roots.length - 1]));
  });
  for (const b of result.boards) if (!seen.has(b.id)) walk(b, 1, [true, true]); // orphan: still listed
  return rows;
}

function treeCell(row: TreeRow): TableCell {
  const STEP = 13;
  const cols: Column[] = [];
  for (let level = 1; level < row.depth; level++) cols.push({ width: STEP, text: row.last[level] ? '' : '│', color: COLOURS.rule });
  if (row.depth > 0) cols.push({ width: STEP, text: row.last[row.depth] ? '└─' : '├─', color: COLOURS.rule });
  const label: Column =
    row.kind === 'supply'
      ? { width: '*', text: [{ text: unmark(row.id), bold: true, color: COLOURS.accent }, { text: '  ' }, ...t(supplyText(row.supply!)).map((r) => ({ ...r, fontSize: 6.8, color: COLOURS.faint }))] }
      : { width: '*', text: [{ text: unmark(row.id), bold: true }, ...(row.via ? [{ text: `  via ${unmark(row.via)}`, fontSize: 6.8, color: COLOURS.faint }] : [])] };
  return { columns: [...cols, label], columnGap: 0, style: 'td' } as TableCell;
}

/**
 * How much of a page a part of the index or of the list of checks may fill, in points, by an
 * estimate of each row's lines (a part that runs over only takes a second page). The estimate
 * depends on the row's own text alone, so an edit to one circuit moves no boundary unless it
 * changes how many lines that circuit's row takes.
 */
export const SUMMARY_PART_HEIGHT = { index: 650, indexFirst: 590, failing: 650, failingFirst: 610 };

const textLength = (n: unknown): number => {
  if (typeof n === 'string') return n.length;
  if (Array.isArray(n)) return n.reduce((a: number, x) => a + textLength(x), 0);
  if (n && typeof n === 'object') {
    const o = n as { text?: unknown; stack?: unknown };
    return textLength(o.text) + textLength(o.stack);
  }
  return 0;
};

/** Estimated height of an index row, from the characters each column holds a line (7 pt text). */
function indexRowHeight(row: TableCell[]): number {
  const perLine = [6, 15, 44, 15, 16, 12, 12, 6];
  const lines = row.map((cell, i) => {
    const stack = (cell as { stack?: unknown[] }).stack;
    if (stack) return stack.reduce((a: number, x) => a + Math.max(1, Math.ceil(textLength(x) / perLine[i])), 0);
    return Math.max(1, Math.ceil(textLength(cell) / perLine[i]));
  });
  return 5 + 9.6 * Math.max(...lines);
}

/** Estimated height of a bullet of the list of checks (about 115 characters a line). */
const bulletHeight = (item: unknown): number => 3 + 9.6 * Math.max(1, Math.ceil(textLength(item) / 110));

/** Cut `items` into runs whose estimated heights stay within `first`, then `rest`, points. */
function cut<T>(items: T[], height: (x: T) => number, first: number, rest: number): T[][] {
  const runs: T[][] = [[]];
  let used = 0;
  for (const item of items) {
    const h = height(item);
    const room = runs.length === 1 ? first : rest;
    if (runs[runs.length - 1].length > 0 && used + h > room) {
      runs.push([]);
      used = 0;
    }
    runs[runs.length - 1].push(item);
    used += h;
  }
  return runs;
}

/**
 * The summary in parts, each laid out as a document of its own and starting a page: the cover and
 * the board tree; the index, about a page a part; the checks that do not pass, about a page a part;
 * the assumptions with the last. Parts are laid out and cached one by one (build.ts), so an edit to
 * one circuit lays out again only the parts that show it. `summaryPartDocument` makes a part a document.
 */
export function summaryParts(project: Project, result: ProjectResult, opts: SummaryOptions): Content[][] {
  const c = summaryContent(project, result, opts);
  const parts: Content[][] = [c.front];
  cut(c.indexRows, indexRowHeight, SUMMARY_PART_HEIGHT.indexFirst, SUMMARY_PART_HEIGHT.index).forEach((rows, i) => {
    const table = c.indexTable(rows);
    parts.push(i === 0 ? c.indexSection(table) : [table]);
  });
  // the list of checks: its bulleted lists are cut into runs of about a page
  let part: Content[] = [];
  for (const node of [...c.failing, ...c.assumptions]) {
    const items = (node as { ul?: Content[] }).ul;
    if (!items) {
      part.push(node);
      continue;
    }
    cut(items, bulletHeight, SUMMARY_PART_HEIGHT.failingFirst, SUMMARY_PART_HEIGHT.failing).forEach((run, i) => {
      if (i > 0) {
        parts.push(part);
        part = [];
      }
      part.push({ ...(node as object), ul: run } as Content);
    });
  }
  parts.push(part);
  return parts;
}

/** One part of the summary as a document, its pages numbered from offset + 1 out of total. */
export function summaryPartDocument(project: Project, circuits: number, templates: TemplateSet, content: Content[], pageNumbers: { offset: number; total: number }): TDocumentDefinitions {
  return summaryFrame(project, circuits, templates, content, pageNumbers);
}

/** The whole summary as one document definition (the parts one after the other). */
export function summaryDocument(project: Project, result: ProjectResult, opts: SummaryOptions): TDocumentDefinitions {
  const parts = summaryParts(project, result, opts);
  const content = parts.flatMap((p, i) => (i === 0 ? p : [{ text: '', pageBreak: 'before' } as Content, ...p]));
  return summaryFrame(project, result.circuits.length, opts.templates, content);
}

function summaryFrame(project: Project, circuits: number, templates: TemplateSet, content: Content[], pageNumbers?: { offset: number; total: number }): TDocumentDefinitions {
  const labels = templates.labels('summary/labels.hbs');
  const sheetLabels = templates.labels('sheet/labels.hbs');
  return packageDocument(
    project,
    sheetLabels,
    {
      title: `${unmark(project.meta.name)} — ${labels['document']}`,
      subject: labels['info.subject']!,
      subjectLabel: labels['documentLabel']!,
      subjectText: labels['document']!,
      partLabel: labels['circuitsLabel']!,
      part: String(circuits),
      footerName: labels['document']!,
      // the title block of every page would otherwise change with every edit to any file: the
      // project's input hash is printed in full on the cover
      hash: { label: sheetLabels['inputHash']!, value: labels['titleHash'] ?? 'on the cover' },
      pageNumbers,
    },
    content,
  );
}

interface SummaryContent {
  front: Content[];
  indexRows: TableCell[][];
  indexTable: (rows: TableCell[][]) => Content;
  indexSection: (table: Content) => Content[];
  failing: Content[];
  assumptions: Content[];
}

function summaryContent(project: Project, result: ProjectResult, opts: SummaryOptions): SummaryContent {
  const tpl = opts.templates;
  const labels = tpl.labels('summary/labels.hbs');
  const sheetLabels = tpl.labels('sheet/labels.hbs');
  const statusWord = (s: Status): string => sheetLabels[`status.${s}`] ?? s.toUpperCase();
  const checkLabel = (n: string): string => sheetLabels[`check.${n}`] ?? n;
  const ordered = indexOrder(result.circuits);
  const numberOf = new Map(result.circuits.map((c, i) => [c.id, i + 1]));
  const counts = {
    total: result.circuits.length,
    pass: result.circuits.filter((c) => c.verdict === 'pass').length,
    fail: result.circuits.filter((c) => c.verdict === 'fail').length,
    undetermined: result.circuits.filter((c) => c.verdict === 'undetermined').length,
  };
  const illustrative = project.devices.filter((d) => d.illustrative && result.circuits.some((c) => c.device === d.id));
  const failing = ordered
    .filter((c) => c.verdict !== 'pass')
    .flatMap((c) =>
      c.checks
        .filter((k) => k.status !== 'pass')
        .map((k) => ({
          circuit: literal(c.id),
          check: checkLabel(k.name),
          status: k.status,
          statusWord: statusWord(k.status),
          value: checkValue(k, 'value'),
          limit: checkValue(k, 'limit'),
          explanation: k.explanation || k.governing,
          fail: k.status === 'fail',
        })),
    );
  const context = {
    project: {
      ...projectContext(project),
      voltage: fmt.volts(project.settings.systemVoltage),
      earthing: project.settings.earthing,
    },
    counts,
    anyFailing: failing.length > 0,
    failing,
    illustrative: illustrative.length > 0,
    illustrativeDevices: illustrative.map((d) => literal(d.id)),
    assumptions: project.assumptions.map((a, i) => ({ number: `P${i + 1}`, text: literal(a) })),
    defaults: project.defaults.map((d, i) => ({ number: `P${project.assumptions.length + i + 1}`, field: literal(d.field), value: d.value, source: d.source })),
    labels,
  };
  const section = (name: string, slots: Record<string, Content[]>): Content[] => blocksToContent(tpl.render(`summary/${name}.hbs`, context), slots);

  const title: Content = {
    stack: [
      { text: t(labels['cover.kicker']), fontSize: 9, color: COLOURS.faint, margin: [0, 30, 0, 4] },
      { text: unmark(project.meta.name), fontSize: 22, bold: true, color: COLOURS.accent },
      { text: t(labels['cover.title']), fontSize: 13, margin: [0, 4, 0, 16] },
    ],
  };
  const facts = dataTable(
    [150, '*'],
    [labels['facts.item'], labels['facts.value']],
    [
      [labels['facts.number'], [{ text: unmark(project.meta.number) }]],
      [labels['facts.revision'], [{ text: unmark(project.meta.revision) }]],
      [labels['facts.date'], [{ text: unmark(project.meta.date) }]],
      ...(project.meta.client ? [[labels['facts.client'], [{ text: unmark(project.meta.client) }]]] : []),
      [labels['facts.system'], `${fmt.volts(project.settings.systemVoltage)}, ${fmt.significant(project.settings.frequency, 2)} Hz, ${project.settings.earthing}`],
      [labels['facts.criterion'], project.settings.withstandCriterion],
      ...project.supplies.map((s) => [`${labels['facts.supply']} ${unmark(s.id)}`, supplyText(s)]),
      [labels['facts.circuits'], `${counts.total}: ${counts.pass} ${statusWord('pass')}, ${counts.fail} ${statusWord('fail')}, ${counts.undetermined} ${statusWord('undetermined')}`],
      [labels['facts.hash'], { text: project.inputSha256, fontSize: 6.6, style: 'td' } as TableCell],
    ] as Array<Array<string | TableCell>>,
  );
  const signoff = signoffBlocks(
    [
      { word: sheetLabels['prepared'], person: project.signoff.preparedBy },
      { word: sheetLabels['checked'], person: project.signoff.checkedBy },
      { word: sheetLabels['approved'], person: project.signoff.approvedBy },
    ],
    { name: sheetLabels['name'], role: sheetLabels['role'], signature: sheetLabels['signature'], date: sheetLabels['signDate'] },
  );

  const treeRows = boardTree(project, result);
  const drawing = boardTreeDrawing(project, result);
  const boardCircuits = (id: string): CircuitResult[] => result.circuits.filter((c) => c.from === id);
  const tree = dataTable(
    ['*', 52, 52, 52, 40, 84],
    [labels['tree.node'], "I''k3max", 'i_p', "I''k1min", 'Delta u', labels['tree.circuits']],
    treeRows.map((r) => {
      if (r.kind === 'supply') return [{ ...(treeCell(r) as object), colSpan: 6 } as TableCell, '', '', '', '', ''];
      const b = r.board!;
      const cs = boardCircuits(b.id);
      const bad = cs.filter((c) => c.verdict !== 'pass').length;
      return [
        treeCell(r),
        fmt.kiloamps(b.ik3max),
        fmt.kiloamps(b.ip),
        fmt.kiloamps(b.ik1min),
        fmt.percent(b.voltageDrop),
        { text: bad ? `${cs.length} (${bad} ${labels['tree.notPassing']})` : String(cs.length), color: bad ? COLOURS.fail : COLOURS.ink, style: 'td' } as TableCell,
      ];
    }),
    { align: ['left', 'right', 'right', 'right', 'right', 'left'] },
  );

  const indexHeader = ['No.', labels['index.circuit'], labels['index.description'], labels['index.fromTo'], labels['index.device'], labels['index.cable'], labels['index.verdict'], labels['index.page']];
  const circuitById = new Map(project.circuits.map((x) => [x.id, x]));
  const indexRows = ordered.map((c) => {
    const circuit = circuitById.get(c.id);
    const cable = circuit ? `${circuit.cable.size.label}${circuit.cable.parallel > 1 ? ` x ${circuit.cable.parallel}` : ''}, ${fmt.metres(circuit.cable.length)}` : '';
    const bad = c.checks.filter((k) => k.status !== 'pass').map((k) => sheetLabels[`short.${k.name}`] ?? k.name);
    const page = opts.dossierPages?.get(c.id);
    return [
      String(numberOf.get(c.id) ?? ''),
      // a link to the sheet's own file; in the dossier it becomes a jump to the sheet's first page
      { text: unmark(c.id), bold: true, style: 'td', link: sheetFileName(c.id), color: COLOURS.accent } as TableCell,
      { text: unmark(c.description), style: 'td' } as TableCell,
      { text: `${unmark(c.from)} → ${c.to ? unmark(c.to) : '—'}`, style: 'td' } as TableCell,
      { text: unmark(c.device), style: 'td' } as TableCell,
      { text: t(cable), style: 'td' } as TableCell,
      { stack: [statusCell(c.verdict, sheetLabels) as Content, ...(bad.length ? [{ text: bad.join(', '), style: 'small' }] : [])], style: 'td' } as TableCell,
      { text: page != null ? String(page) : '', alignment: 'right', style: 'td', link: sheetFileName(c.id) } as TableCell,
    ] as TableCell[];
  });

  return {
    front: [
      ...section('cover', { title: [title], facts: [facts], signoff: [signoff] }),
      { text: '', pageBreak: 'after' },
      ...section('tree', { tree: [...(drawing ? [{ svg: drawing.svg, width: drawing.width, font: FONT, alignment: 'center', margin: [0, 4, 0, 10] } as Content] : []), tree] }),
    ],
    indexRows,
    indexTable: (rows) => dataTable([18, 60, '*', 60, 62, 52, 64, 24], indexHeader, rows),
    indexSection: (table) => section('index', { index: [table] }),
    failing: section('failing', {}),
    assumptions: section('assumptions', {}),
  };
}
