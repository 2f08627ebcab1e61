/**
 * Shared pieces of the proof's sections: the render context, section headings, label/value grids and boxed notices.
 */
import { drawStack, stackHeight, type Block, type Flow } from './layout';
import { COLOR, SIZE } from './theme';
import type { Circuit, DiagnosticStep, ProofView } from './view';

export interface RenderContext {
  flow: Flow;
  view: ProofView;
  digest: string;
  circuits: Map<string, Circuit>;
  steps: Map<string, DiagnosticStep>;
  /** Where the QR code went (for tests that read it back from the rendered page). */
  qr?: { page: number; x: number; y: number; module: number; size: number };
  sectionNumber: number;
  /** Where the document can be checked without an account (render option; not part of the evidence). */
  publicBase?: string;
}

/** A numbered section heading, kept on the page with at least `keepWith` points of what follows. */
export function heading(ctx: RenderContext, title: string, keepWith = 40): void {
  const { flow } = ctx;
  ctx.sectionNumber += 1;
  const size = SIZE.heading;
  const h = flow.lineHeight(size) + 7;
  if (flow.y > flow.top) flow.y += 14;
  // What must follow may be longer than a page: then only as much as a page holds is kept with the heading.
  flow.ensure(Math.min(h + keepWith, flow.bottom - flow.top));
  flow.drawBlock(flow.lay({ text: `${ctx.sectionNumber}  ${title}`, font: 'bold', size }, flow.width), flow.left, flow.y, flow.width);
  flow.y += flow.lineHeight(size) + 1;
  flow.rule(flow.y, 1.6, COLOR.ink);
  flow.y += 6;
}

export interface GridItem {
  label: string;
  value: Block[];
}

/** Label above value, `weights.length` columns per row (widths in proportion); each grid row stays on one page. */
export function grid(flow: Flow, items: GridItem[], weights: number[], gutter = 12): void {
  const columns = weights.length;
  const total = weights.reduce((a, b) => a + b, 0);
  const widths = weights.map((w) => ((flow.width - gutter * (columns - 1)) * w) / total);
  for (let start = 0; start < items.length; start += columns) {
    const rowItems = items.slice(start, start + columns).map((item, i) => [
      flow.lay({ text: item.label.toUpperCase(), font: 'bold', size: SIZE.small - 1, color: COLOR.muted }, widths[i]!),
      ...item.value.map((b) => flow.lay({ size: SIZE.body + 0.5, ...b }, widths[i]!)),
    ]);
    const h = Math.max(...rowItems.map(stackHeight)) + 6;
    flow.ensure(h);
    let x = flow.left;
    rowItems.forEach((blocks, i) => {
      drawStack(flow, blocks, x, flow.y, widths[i]!);
      x += widths[i]! + gutter;
    });
    flow.y += h;
  }
}

/** A bordered box holding blocks; the border is heavy and the text large when `strong` (a warning to be seen). */
export function notice(flow: Flow, blocks: Block[], options: { strong?: boolean; color?: string } = {}): void {
  const pad = 8;
  const laid = blocks.map((b) => flow.lay(b, flow.width - 2 * pad - (options.strong ? 6 : 0)));
  const h = noticeHeight(flow, blocks, options);
  const color = options.color ?? COLOR.ink;
  if (h > flow.bottom - flow.top) {
    // Longer than a page: no box, the text flows on with a heavy rule above and below.
    flow.ensure(24);
    flow.rule(flow.y, options.strong ? 2.2 : 1, color);
    flow.y += 6;
    for (const b of blocks) flow.paragraph(b);
    flow.y += 4;
    flow.rule(flow.y, options.strong ? 2.2 : 1, color);
    flow.y += 2;
    return;
  }
  flow.ensure(h);
  const doc = flow.doc;
  doc.save().lineWidth(options.strong ? 2.2 : 1).strokeColor(color).rect(flow.left, flow.y, flow.width, h).stroke().restore();
  if (options.strong) doc.save().rect(flow.left, flow.y, 6, h).fill(color).restore();
  drawStack(flow, laid, flow.left + pad + (options.strong ? 6 : 0), flow.y + pad, flow.width - 2 * pad);
  flow.y += h;
}

export function noticeHeight(flow: Flow, blocks: Block[], options: { strong?: boolean } = {}): number {
  return stackHeight(blocks.map((b) => flow.lay(b, flow.width - 16 - (options.strong ? 6 : 0)))) + 16;
}

export function circuitName(ctx: RenderContext, id: string): string {
  return ctx.circuits.get(id)?.name ?? id;
}
