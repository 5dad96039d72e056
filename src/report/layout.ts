// Building blocks shared by the sheet and the summary layouts: styles, template blocks to pdfmake
// content, tables, status cells, the title block, sign-off blocks. Pure: no I/O, no clock.

import type { Content, ContentTable, StyleDictionary, CustomTableLayout, TableCell, TDocumentDefinitions } from 'pdfmake/interfaces.js';
import type { Person, Project } from '../model/types.js';
import type { Status } from '../calc/types.js';
import type { Block, Rendered } from './templates.js';
import { typeset, unmark, type Run } from './typeset.js';

export const FONT = 'DejaVuSans';
export const PAGE_WIDTH = 595.28; // A4 portrait, pt
export const MARGIN_X = 40;
export const CONTENT_WIDTH = PAGE_WIDTH - 2 * MARGIN_X;

export const COLOURS = {
  ink: '#1b1b1b',
  accent: '#1f3b57',
  rule: '#9aa5b1',
  fill: '#e9eef3',
  faint: '#5a6470',
  pass: '#1d6b31',
  fail: '#b3261e',
  undetermined: '#8a5a00',
  noteFill: '#f6f1e3',
};

export const styles: StyleDictionary = {
  h1: { fontSize: 11.5, bold: true, color: COLOURS.accent, margin: [0, 10, 0, 4] },
  h2: { fontSize: 9, bold: true, color: COLOURS.accent, margin: [0, 6, 0, 3] },
  p: { margin: [0, 0, 0, 4] },
  small: { fontSize: 6.8, color: COLOURS.faint },
  th: { bold: true, fontSize: 7.2, fillColor: COLOURS.fill },
  td: { fontSize: 7.4 },
  caption: { fontSize: 7.2, italics: true, color: COLOURS.faint, margin: [0, 2, 0, 8] },
  label: { fontSize: 5.8, color: COLOURS.faint },
  value: { fontSize: 7.8, bold: true },
};

/** A table ruled all round in one width and colour, 3 pt either side of the text, `paddingY` above and below. */
export function ruledLayout(lineWidth: number, colour: string, paddingY: number) {
  return {
    hLineWidth: () => lineWidth,
    vLineWidth: () => lineWidth,
    hLineColor: () => colour,
    vLineColor: () => colour,
    paddingLeft: () => 3,
    paddingRight: () => 3,
    paddingTop: () => paddingY,
    paddingBottom: () => paddingY,
  };
}

export const gridLayout: CustomTableLayout = ruledLayout(0.4, COLOURS.rule, 1.6);

/**
 * Table layouts that content names instead of holding (`layout: 'grid'`), given to every document
 * (render.ts): content built from them is plain data, which a summary part needs to be laid out in
 * a worker thread (functions do not cross a thread boundary).
 */
export const TABLE_LAYOUTS: Record<'grid' | 'note', CustomTableLayout> = {
  grid: gridLayout,
  note: {
    hLineWidth: () => 0.6,
    vLineWidth: (i: number) => (i === 0 ? 2 : 0),
    hLineColor: () => '#d6c59a',
    vLineColor: () => '#b08a2e',
    fillColor: () => COLOURS.noteFill,
  },
};

/** Markup text to a pdfmake text value. */
export function t(markup: string, literals: readonly string[] = []): Run[] {
  return typeset(markup, literals);
}

/** User text as typed (never typeset or parsed). */
export function userText(text: string): string {
  return unmark(text);
}

/** Shorten user text for the title block (full text appears elsewhere on the sheet). */
export function clip(text: string, max: number): string {
  const s = unmark(text).replace(/\s+/g, ' ').trim();
  return s.length <= max ? s : `${s.slice(0, max - 1).trimEnd()}…`;
}

export function statusColour(s: Status): string {
  return COLOURS[s];
}

export function statusCell(s: Status, labels: Record<string, string>): TableCell {
  return { text: labels[`status.${s}`] ?? s.toUpperCase(), bold: true, color: statusColour(s), style: 'td' };
}

/** Template blocks to content; `slots` fill `@@name` lines, and any slot the template leaves out is appended. */
export function blocksToContent(rendered: Rendered, slots: Record<string, Content[]> = {}): Content[] {
  const { blocks, literals } = rendered;
  const out: Content[] = [];
  const used = new Set<string>();
  let bullets: Block[] = [];
  const flushBullets = (): void => {
    if (bullets.length === 0) return;
    const list: Content = { ul: bullets.map((b) => ({ text: t(b.text, literals) })), margin: [4, 0, 0, 4] };
    // a long list may run over pages: it is not kept whole with its heading (an unbreakable block
    // taller than a page would not be printed at all)
    out.push(bullets.length > 8 ? breakable(list) : list);
    bullets = [];
  };
  for (const b of blocks) {
    if (b.kind !== 'bullet') flushBullets();
    switch (b.kind) {
      case 'h1':
        out.push({ text: t(b.text, literals), style: 'h1', headlineLevel: 1 });
        break;
      case 'h2':
        out.push({ text: t(b.text, literals), style: 'h2', headlineLevel: 2 });
        break;
      case 'p':
        out.push({ text: t(b.text, literals), style: 'p' });
        break;
      case 'bullet':
        bullets.push(b);
        break;
      case 'numbered':
        out.push({
          columns: [
            { width: 26, text: `${b.label}.`, bold: true },
            { width: '*', text: t(b.text, literals) },
          ],
          columnGap: 2,
          margin: [0, 0, 0, 2.5],
        });
        break;
      case 'note':
        out.push(note(t(b.text, literals)));
        break;
      case 'slot':
        if (slots[b.text] && !used.has(b.text)) {
          used.add(b.text);
          out.push(...slots[b.text]);
        }
        break;
    }
  }
  flushBullets();
  for (const [name, content] of Object.entries(slots)) if (!used.has(name)) out.push(...content);
  return keepHeadingsWithNext(out);
}

/**
 * A heading never ends a page: it is kept with what follows it up to and including the first item
 * that is neither a heading nor a paragraph (its table, chart or list), unless that is too long to
 * keep on one page.
 */
function keepHeadingsWithNext(items: Content[]): Content[] {
  const out: Content[] = [];
  const isBreakable = (c: Content | undefined): boolean => !!(c as { breakable?: boolean } | undefined)?.breakable;
  const isHeading = (c: Content | undefined): boolean => !!(c as { headlineLevel?: number } | undefined)?.headlineLevel;
  const isParagraph = (c: Content | undefined): boolean => !!c && (c as { style?: string }).style === 'p';
  for (let i = 0; i < items.length; i++) {
    if (!isHeading(items[i])) {
      out.push(items[i]);
      continue;
    }
    const group: Content[] = [items[i]];
    while (i + 1 < items.length && group.length < 6 && !isBreakable(items[i + 1])) {
      const next = items[++i];
      group.push(next);
      if (!isHeading(next) && !isParagraph(next)) break;
    }
    out.push(group.length > 1 ? { stack: group, unbreakable: true } : group[0]);
  }
  return out;
}

/** Mark content too long to keep on one page with its heading. */
export function breakable<T extends Content>(c: T): T {
  (c as { breakable?: boolean }).breakable = true;
  return c;
}

export function note(text: Run[] | string): Content {
  return {
    table: { widths: ['*'], body: [[{ text, fontSize: 7.6, margin: [3, 2, 3, 2] }]] },
    layout: 'note',
    margin: [0, 2, 0, 5],
  };
}

/** A data table with one header row. Cells are markup strings, runs or full cells. */
export function dataTable(
  widths: Array<number | string>,
  header: Array<string | TableCell>,
  rows: Array<Array<string | Run[] | TableCell>>,
  opts: { align?: Array<'left' | 'right' | 'center'>; bodyStyle?: string } = {},
): ContentTable {
  const cell = (c: string | Run[] | TableCell, col: number, head: boolean): TableCell => {
    const base: object = typeof c === 'string' ? { text: t(c) } : Array.isArray(c) ? { text: c } : (c as object);
    return { style: head ? 'th' : (opts.bodyStyle ?? 'td'), alignment: head ? 'left' : (opts.align?.[col] ?? 'left'), ...base } as TableCell;
  };
  const table: ContentTable = {
    table: {
      widths,
      headerRows: 1,
      dontBreakRows: true,
      keepWithHeaderRows: 1,
      body: [header.map((h, i) => cell(h, i, true)), ...rows.map((r) => r.map((c, i) => cell(c, i, false)))],
    },
    layout: 'grid',
    margin: [0, 1, 0, 6],
  };
  return rows.length > 14 ? breakable(table) : table;
}

/** A label over a value, for title blocks. */
export function field(label: string, value: Run[] | string, opts: { size?: number } = {}): TableCell {
  return {
    stack: [
      { text: label, style: 'label' },
      { text: value, style: 'value', fontSize: opts.size ?? 7.8 },
    ],
  };
}

const titleLayout = ruledLayout(0.6, COLOURS.accent, 1.5);

export interface TitleBlock {
  projectName: string;
  number: string;
  revision: string;
  date: string;
  subjectLabel: string;
  subject: string;
  pageLabel: string; // "Sheet 2 of 5"
  partLabel: string; // "Calculation", "Document"
  part: string; // "3 of 4"
  hashLabel: string;
  hash: string;
  signoff: Array<{ label: string; name: string }>; // Prepared / Checked / Approved
  labels: { project: string; number: string; revision: string; date: string; page: string };
}

/**
 * The title block at the top of every page. It must fit the top margin whatever the user wrote, so
 * user text is clipped: the project name and the subject to two lines, every other value to one
 * (widths estimated at 0.7 em a character, on the wide side for DejaVu Sans Bold).
 */
export function titleBlock(tb: TitleBlock): Content {
  const fit = (text: string, widthPt: number, sizePt = 7.8, lines = 1): string => clip(text, Math.max(4, Math.floor(((widthPt - 6) / (0.7 * sizePt)) * lines)));
  const wide = CONTENT_WIDTH - 78 - 52 - 74;
  return {
    margin: [MARGIN_X, 20, MARGIN_X, 0],
    stack: [
      {
        table: {
          widths: ['*', 78, 52, 74],
          body: [
            [
              field(tb.labels.project, fit(tb.projectName, wide, 8.6, 2), { size: 8.6 }),
              field(tb.labels.number, fit(tb.number, 78)),
              field(tb.labels.revision, fit(tb.revision, 52)),
              field(tb.labels.date, fit(tb.date, 74)),
            ],
            [
              field(tb.subjectLabel, fit(tb.subject, wide, 7.8, 2)),
              field(tb.labels.page, tb.pageLabel),
              field(tb.partLabel, tb.part),
              field(tb.hashLabel, tb.hash),
            ],
          ],
        },
        layout: titleLayout,
      },
      {
        table: {
          widths: ['*', '*', '*'],
          body: [tb.signoff.map((s) => field(s.label, fit(s.name, CONTENT_WIDTH / 3) || ' '))],
        },
        layout: { ...titleLayout, hLineWidth: (i: number) => (i === 0 ? 0 : 0.6) },
      },
    ],
  };
}

/** Top page margin: the title block at its tallest (two-line name and subject) plus a gap. */
export const TOP_MARGIN = 108;

export function personName(p: Person | undefined): string {
  return p ? p.name : '';
}

/** Sign-off blocks: role word, name, role, signature line, date line. */
export function signoffBlocks(
  people: Array<{ word: string; person: Person | undefined }>,
  labels: { name: string; role: string; signature: string; date: string },
): Content {
  // a fresh node each time: pdfmake annotates the nodes it lays out
  const line = (): Content => ({ canvas: [{ type: 'line', x1: 0, y1: 0, x2: 140, y2: 0, lineWidth: 0.6, lineColor: COLOURS.ink }], margin: [0, 16, 0, 1] });
  const block = (word: string, person: Person | undefined): TableCell => ({
    stack: [
      { text: word, bold: true, fontSize: 9, color: COLOURS.accent, margin: [0, 0, 0, 3] },
      { text: [{ text: `${labels.name}: `, color: COLOURS.faint }, { text: person ? person.name : '' }] },
      { text: [{ text: `${labels.role}: `, color: COLOURS.faint }, { text: person ? person.role : '' }] },
      line(),
      { text: labels.signature, style: 'small' },
      line(),
      { text: labels.date, style: 'small' },
    ],
    margin: [2, 2, 2, 4],
  });
  return {
    table: { widths: ['*', '*', '*'], body: [people.map((p) => block(p.word, p.person))] },
    layout: 'grid',
    unbreakable: true,
    margin: [0, 2, 0, 6],
  };
}

/** "Sheet 2 of 5" etc. from a label pattern with {n} and {total}. */
export function pageText(pattern: string, n: number, total: number): string {
  return pattern.replace('{n}', String(n)).replace('{total}', String(total));
}

/** The project date as the PDFs' creation and modification date (midnight UTC: reproducible). */
export function projectDate(iso: string): Date {
  const d = new Date(`${iso}T00:00:00Z`);
  if (Number.isNaN(d.getTime())) throw new Error(`internal error: project date "${iso}" is not YYYY-MM-DD`);
  return d;
}

/** What differs between the package's documents around the same A4 frame and title block. */
export interface DocumentFrame {
  title: string; // PDF info title
  subject: string; // PDF info subject
  subjectLabel: string; // title block: what the document is about ("Circuit", "Document")
  subjectText: string;
  partLabel: string; // title block: the document's place in the package
  part: string;
  footerName: string; // before "sheet n of N" in the footer
  /** The title block's fingerprint cell: a sheet's own input hash; the summary points to its cover. */
  hash: { label: string; value: string };
  /** A document laid out in parts: its pages are numbered from offset + 1 and out of total. */
  pageNumbers?: { offset: number; total: number };
}

/**
 * An A4 document of the package: PDF info dated from the project, the title block on every page and the
 * footer. `labels` are the sheet labels (templates/sheet/labels.hbs), shared by every document.
 */
export function packageDocument(project: Project, labels: Record<string, string>, frame: DocumentFrame, content: Content[]): TDocumentDefinitions {
  const date = projectDate(project.meta.date);
  const numbered = frame.pageNumbers;
  const pageOf = (pattern: string, page: number, pages: number): string => (numbered ? pageText(pattern, numbered.offset + page, numbered.total) : pageText(pattern, page, pages));
  return {
    info: { title: frame.title, subject: frame.subject, creator: 'faultsheet', producer: 'faultsheet', creationDate: date, modDate: date },
    pageSize: 'A4',
    pageMargins: [MARGIN_X, TOP_MARGIN, MARGIN_X, 40],
    defaultStyle: { font: FONT, fontSize: 7.8, lineHeight: 1.12, color: COLOURS.ink },
    styles,
    header: (page: number, pages: number) =>
      titleBlock({
        projectName: project.meta.name,
        number: project.meta.number,
        revision: project.meta.revision,
        date: project.meta.date,
        subjectLabel: frame.subjectLabel,
        subject: frame.subjectText,
        pageLabel: pageOf(labels['pageOf']!, page, pages),
        partLabel: frame.partLabel,
        part: frame.part,
        hashLabel: frame.hash.label,
        hash: frame.hash.value,
        signoff: [
          { label: labels['prepared']!, name: project.signoff.preparedBy?.name ?? '' },
          { label: labels['checked']!, name: project.signoff.checkedBy?.name ?? '' },
          { label: labels['approved']!, name: project.signoff.approvedBy?.name ?? '' },
        ],
        labels: { project: labels['project']!, number: labels['number']!, revision: labels['revision']!, date: labels['date']!, page: labels['sheet']! },
      }),
    footer: (page: number, pages: number) => ({
      margin: [MARGIN_X, 12, MARGIN_X, 0],
      columns: [
        { text: t(labels['footer']!), style: 'small', width: '*' },
        { text: `${frame.footerName} · ${pageOf(labels['sheetOf']!, page, pages)}`, style: 'small', alignment: 'right', width: 'auto' },
      ],
    }),
    content,
  };
}
