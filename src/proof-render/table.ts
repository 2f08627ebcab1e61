/**
 * Tables that never split a row: each row is measured first; when it does not fit, the page breaks and the header
 * row is drawn again under a "continued" caption, so every page of a long table can be read on its own.
 */
import { drawStack, stackHeight, type Block, type Flow, type LaidBlock } from './layout';
import { COLOR, SIZE } from './theme';

export interface Column {
  title: string;
  /** Width in points; one column may be `flex` and takes what is left. */
  width: number | 'flex';
}

export interface Row {
  cells: Block[][];
  /** Optional full-width text under the row, from the second column to the last (corrections, notes). */
  span?: Block[];
}

export interface TableSpec {
  /** Printed above the repeated header on continuation pages: "<caption> (continued)". */
  caption: string;
  columns: Column[];
  rows: Row[];
}

const PAD_X = 4;
const PAD_Y = 3.5;

function columnWidths(flow: Flow, columns: Column[]): number[] {
  const fixed = columns.reduce((s, c) => s + (c.width === 'flex' ? 0 : c.width), 0);
  return columns.map((c) => (c.width === 'flex' ? flow.width - fixed : c.width));
}

interface LaidRow {
  cells: LaidBlock[][];
  span: LaidBlock[];
  height: number;
  spanHeight: number;
}

function layRow(flow: Flow, row: Row, widths: number[]): LaidRow {
  const cells = row.cells.map((blocks, i) => blocks.map((b) => flow.lay(b, widths[i]! - 2 * PAD_X)));
  const spanWidth = widths.slice(1).reduce((s, w) => s + w, 0) - 2 * PAD_X;
  const span = (row.span ?? []).map((b) => flow.lay(b, spanWidth));
  const cellHeight = Math.max(...cells.map(stackHeight)) + 2 * PAD_Y;
  const spanHeight = span.length ? stackHeight(span) + PAD_Y : 0;
  return { cells, span, height: cellHeight + spanHeight, spanHeight };
}

function drawHeader(flow: Flow, spec: TableSpec, widths: number[], continued: boolean): void {
  if (continued) {
    const cap = flow.lay({ text: `${spec.caption} (continued)`, font: 'bold', size: SIZE.small, color: COLOR.muted }, flow.width);
    flow.drawBlock(cap, flow.left, flow.y, flow.width);
    flow.y += cap.height + 2;
  }
  const heads = spec.columns.map((c, i) => [flow.lay({ text: c.title, font: 'bold', size: SIZE.small }, widths[i]! - 2 * PAD_X)]);
  const h = Math.max(...heads.map(stackHeight)) + 2 * PAD_Y;
  flow.doc.save().rect(flow.left, flow.y, flow.width, h).fill(COLOR.headFill).restore();
  let x = flow.left;
  heads.forEach((blocks, i) => {
    drawStack(flow, blocks, x + PAD_X, flow.y + PAD_Y, widths[i]! - 2 * PAD_X);
    x += widths[i]!;
  });
  flow.y += h;
  flow.rule(flow.y, 1, COLOR.ink);
}

function headerHeight(flow: Flow, spec: TableSpec, widths: number[]): number {
  const heads = spec.columns.map((c, i) => [flow.lay({ text: c.title, font: 'bold', size: SIZE.small }, widths[i]! - 2 * PAD_X)]);
  return Math.max(...heads.map(stackHeight)) + 2 * PAD_Y + 1;
}

/** Header plus first row: what a heading above the table must stay with. */
export function tableStartHeight(flow: Flow, spec: TableSpec): number {
  const widths = columnWidths(flow, spec.columns);
  return headerHeight(flow, spec, widths) + (spec.rows[0] ? layRow(flow, spec.rows[0], widths).height : 0);
}

export function drawTable(flow: Flow, spec: TableSpec): void {
  const widths = columnWidths(flow, spec.columns);
  const rows = spec.rows.map((r) => layRow(flow, r, widths));
  const headH = headerHeight(flow, spec, widths);
  const capH = flow.lineHeight(SIZE.small) + 2;
  // Keep the header with the first row (with its first lines, when the row is taller than a page).
  flow.ensure(Math.min(headH + (rows[0]?.height ?? 0), headH + 6 * flow.lineHeight(SIZE.table)));
  drawHeader(flow, spec, widths, false);
  rows.forEach((row, index) => {
    if (flow.y + row.height > flow.bottom + 0.01) {
      if (capH + headH + row.height > flow.bottom - flow.top) {
        // Taller than a page: the row continues, line by line, on the pages after.
        drawRowAcrossPages(flow, spec, widths, row, headH + capH);
        return;
      }
      flow.newPage();
      drawHeader(flow, spec, widths, true);
    }
    if (index % 2 === 1) flow.doc.save().rect(flow.left, flow.y, flow.width, row.height).fill(COLOR.bandFill).restore();
    let x = flow.left;
    row.cells.forEach((blocks, i) => {
      drawStack(flow, blocks, x + PAD_X, flow.y + PAD_Y, widths[i]! - 2 * PAD_X);
      x += widths[i]!;
    });
    if (row.span.length) {
      const spanWidth = widths.slice(1).reduce((s, w) => s + w, 0) - 2 * PAD_X;
      drawStack(flow, row.span, flow.left + widths[0]! + PAD_X, flow.y + row.height - row.spanHeight, spanWidth);
    }
    flow.y += row.height;
    flow.rule(flow.y, 0.5, COLOR.rule);
  });
}

interface LineItem {
  block: LaidBlock;
  height: number;
}

/** A stack of blocks as single lines (a badge stays whole), so a row can break between any two lines. */
function lineItems(flow: Flow, blocks: LaidBlock[]): LineItem[] {
  return blocks.flatMap((b) => {
    if (b.badge) return [{ block: b, height: b.height }];
    const lh = flow.lineHeight(b.size);
    return b.lines.map((line, i) => {
      const gap = i === 0 ? (b.gap ?? 0) : 0;
      return { block: { ...b, lines: [line], gap, height: gap + lh }, height: gap + lh };
    });
  });
}

function drawRowAcrossPages(flow: Flow, spec: TableSpec, widths: number[], row: LaidRow, headerSpace: number): void {
  const columns = row.cells.map((blocks) => lineItems(flow, blocks));
  const span = lineItems(flow, row.span);
  const spanWidth = widths.slice(1).reduce((s, w) => s + w, 0) - 2 * PAD_X;
  // Start on this page when a few lines still fit, else on the next.
  if (flow.bottom - flow.y < 6 * flow.lineHeight(SIZE.table)) {
    flow.newPage();
    drawHeader(flow, spec, widths, true);
  }
  for (let first = true; columns.some((q) => q.length) || span.length; first = false) {
    if (!first) {
      flow.newPage();
      drawHeader(flow, spec, widths, true);
    }
    const top = flow.y + PAD_Y;
    const limit = flow.bottom - PAD_Y;
    let bottom = top;
    let x = flow.left;
    columns.forEach((queue, i) => {
      let y = top;
      while (queue.length && (y + queue[0]!.height <= limit || y === top)) {
        const item = queue.shift()!;
        flow.drawBlock(item.block, x + PAD_X, y, widths[i]! - 2 * PAD_X);
        y += item.height;
      }
      bottom = Math.max(bottom, y);
      x += widths[i]!;
    });
    if (columns.every((q) => q.length === 0)) {
      let y = bottom + (span.length ? PAD_Y : 0);
      while (span.length && (y + span[0]!.height <= limit || y === top)) {
        const item = span.shift()!;
        flow.drawBlock(item.block, flow.left + widths[0]! + PAD_X, y, spanWidth);
        y += item.height;
      }
      bottom = Math.max(bottom, y);
    }
    flow.y = bottom + PAD_Y;
    flow.rule(flow.y, 0.5, COLOR.rule);
  }
  void headerSpace;
}

/** Height of the whole table on one page (for short tables kept together with what precedes them). */
export function tableHeight(flow: Flow, spec: TableSpec): number {
  const widths = columnWidths(flow, spec.columns);
  return headerHeight(flow, spec, widths) + spec.rows.reduce((h, r) => h + layRow(flow, r, widths).height, 0);
}
