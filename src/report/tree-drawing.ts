// A drawing of the distribution: each supply and the boards below it as boxes with their fault levels,
// joined by the circuits that feed them. Pure: returns SVG text for pdfmake's `svg` node.

import type { Project, Supply } from '../model/types.js';
import type { BoardResult, ProjectResult } from '../calc/types.js';
import * as fmt from './format.js';
import { FONT } from './layout.js';

export interface TreeDrawing {
  svg: string;
  width: number;
  height: number;
}

interface Node {
  id: string;
  title: string;
  lines: string[];
  via?: string; // circuit feeding this board
  children: Node[];
  supply?: Supply;
  x: number;
  level: number;
  failing: number;
}

const PAGE_WIDTH = 515; // A4 less the margins, pt
const LEVEL_HEIGHT = 74;
const MAX_LEAVES = 18; // beyond this the boxes get too small to read: the table alone is shown

function escapeXml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

function supplyLines(s: Supply): string[] {
  if (s.kind === 'service') return ['LV service', `declared I″k ${fmt.kiloamps(s.faultCurrent)}`];
  const t = s.transformer;
  return [`${fmt.voltAmps(t.rating, 1e7)}, u_kr ${fmt.significant(t.impedance * 100, 3)} %`, `${fmt.volts(t.primaryVoltage)} / ${fmt.volts(t.secondaryVoltage)}`];
}

function boardLines(b: BoardResult): string[] {
  return [`I″k3max ${fmt.kiloamps(b.ik3max)}`, `i_p ${fmt.kiloamps(b.ip)}`, `I″k1min ${fmt.kiloamps(b.ik1min)}`];
}

/** The drawing, or null where there is nothing to draw or too many boards side by side to read. */
export function boardTreeDrawing(project: Project, result: ProjectResult): TreeDrawing | null {
  const boards = new Map(result.boards.map((b) => [b.id, b]));
  const failingAt = (boardId: string) => result.circuits.filter((c) => c.from === boardId && c.verdict !== 'pass').length;
  const seen = new Set<string>();
  const boardNode = (b: BoardResult, level: number, via?: string): Node => {
    seen.add(b.id);
    const kids = result.circuits
      .filter((c) => c.from === b.id && c.to && boards.has(c.to) && !seen.has(c.to))
      .sort((a, z) => (a.id < z.id ? -1 : 1));
    return {
      id: b.id,
      title: b.id,
      lines: boardLines(b),
      via,
      children: kids.map((c) => boardNode(boards.get(c.to!)!, level + 1, c.id)),
      x: 0,
      level,
      failing: failingAt(b.id),
    };
  };
  const roots: Node[] = project.supplies.map((s) => {
    const fed = boards.get(s.feeds);
    return { id: s.id, title: s.id, lines: supplyLines(s), supply: s, children: fed ? [boardNode(fed, 1)] : [], x: 0, level: 0, failing: 0 };
  });
  if (roots.length === 0) return null;

  let leaves = 0;
  let depth = 0;
  const place = (n: Node): void => {
    depth = Math.max(depth, n.level);
    if (n.children.length === 0) {
      n.x = leaves + 0.5;
      leaves += 1;
      return;
    }
    n.children.forEach(place);
    n.x = (n.children[0]!.x + n.children[n.children.length - 1]!.x) / 2;
  };
  roots.forEach(place);
  if (leaves > MAX_LEAVES) return null;

  const slot = Math.min(150, PAGE_WIDTH / leaves);
  const font = Math.max(5.2, Math.min(7.5, slot / 17));
  const lineHeight = font * 1.3;
  const boxWidth = slot * 0.86;
  const boxHeight = lineHeight * 5 + 5; // title, three values, and a line for circuits not passing
  const width = Math.min(PAGE_WIDTH, slot * leaves);
  const height = (depth + 1) * LEVEL_HEIGHT - (LEVEL_HEIGHT - boxHeight) + 2;
  const top = (n: Node) => n.level * LEVEL_HEIGHT + 1;
  const cx = (n: Node) => n.x * slot;

  const parts: string[] = [];
  const text = (x: number, y: number, s: string, opts: { bold?: boolean; size?: number; colour?: string; anchor?: string } = {}) =>
    parts.push(
      `<text x="${x.toFixed(2)}" y="${y.toFixed(2)}" font-family="${FONT}" font-size="${(opts.size ?? font).toFixed(2)}"` +
        `${opts.bold ? ' font-weight="bold"' : ''} fill="${opts.colour ?? '#1b2330'}" text-anchor="${opts.anchor ?? 'middle'}">${escapeXml(s)}</text>`,
    );
  const draw = (n: Node): void => {
    const x0 = cx(n) - boxWidth / 2;
    const y0 = top(n);
    const supply = n.supply !== undefined;
    parts.push(
      `<rect x="${x0.toFixed(2)}" y="${y0.toFixed(2)}" width="${boxWidth.toFixed(2)}" height="${boxHeight.toFixed(2)}" rx="2" ` +
        `fill="${supply ? '#eef2f7' : '#ffffff'}" stroke="${n.failing ? '#b3261e' : '#5b6b80'}" stroke-width="${n.failing ? 1.1 : 0.7}"/>`,
    );
    if (!supply) parts.push(`<line x1="${x0.toFixed(2)}" y1="${y0.toFixed(2)}" x2="${(x0 + boxWidth).toFixed(2)}" y2="${y0.toFixed(2)}" stroke="#1f3a5f" stroke-width="2.2"/>`);
    if (supply && n.supply!.kind === 'transformer') {
      // the winding symbol: two overlapping circles
      const r = font * 0.62;
      parts.push(`<circle cx="${(x0 + 4 + r).toFixed(2)}" cy="${(y0 + 3 + r).toFixed(2)}" r="${r.toFixed(2)}" fill="none" stroke="#1f3a5f" stroke-width="0.7"/>`);
      parts.push(`<circle cx="${(x0 + 4 + r * 2.2).toFixed(2)}" cy="${(y0 + 3 + r).toFixed(2)}" r="${r.toFixed(2)}" fill="none" stroke="#1f3a5f" stroke-width="0.7"/>`);
    }
    text(cx(n), y0 + 3 + lineHeight * 0.85, n.title, { bold: true });
    n.lines.forEach((line, i) => text(cx(n), y0 + 3 + lineHeight * (i + 1.85), line, { size: font * 0.92, colour: '#2d3a4a' }));
    if (n.failing) text(cx(n), y0 + 3 + lineHeight * 4.85, `${n.failing} circuit${n.failing > 1 ? 's' : ''} not passing`, { size: font * 0.85, colour: '#b3261e', bold: true });
    const bottom = y0 + boxHeight;
    for (const child of n.children) {
      const mid = bottom + (top(child) - bottom) / 2;
      parts.push(
        `<path d="M ${cx(n).toFixed(2)} ${bottom.toFixed(2)} V ${mid.toFixed(2)} H ${cx(child).toFixed(2)} V ${top(child).toFixed(2)}" fill="none" stroke="#5b6b80" stroke-width="0.8"/>`,
      );
      if (child.via) text(cx(child) + 2.5, mid + (top(child) - mid) / 2 + font * 0.35, child.via, { size: font * 0.8, colour: '#5b6b80', anchor: 'start' });
      draw(child);
    }
  };
  roots.forEach(draw);
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width.toFixed(2)}" height="${height.toFixed(2)}" viewBox="0 0 ${width.toFixed(2)} ${height.toFixed(2)}">${parts.join('')}</svg>`;
  return { svg, width, height };
}
