/**
 * Before/after strips, one per verification check, grouped in a panel per circuit: the expected band as a grey bar,
 * the reading before the repair as a hollow circle, after as a filled diamond. Pure vector paths.
 */
import { drawStack, stackHeight, type Flow, type LaidBlock } from './layout';
import { COLOR, SIZE } from './theme';
import { formatRange } from './format';
import { convertTo } from './units';
import type { Circuit, ExpectedRange, Reading, VerificationCheck } from './view';

/** A check that repeats a diagnostic step against a band: what a before/after strip can show. */
export type ChartedCheck = VerificationCheck & { before: Reading; expected: ExpectedRange; pass: boolean };

export const isCharted = (c: VerificationCheck): c is ChartedCheck => c.before !== null && c.expected !== null && c.pass !== null;

const STRIP = 46;
const LABEL_W = 176;
const RESULT_W = 46;

export interface Scale {
  log: boolean;
  lo: number;
  hi: number;
}

/** Axis that holds the band edges and both readings, padded; logarithmic when positive values span ≥ 2 decades. */
export function chartScale(values: number[]): Scale {
  const finite = values.filter(Number.isFinite);
  if (finite.length === 0) return { log: false, lo: 0, hi: 1 };
  const min = Math.min(...finite);
  const max = Math.max(...finite);
  if (min > 0 && max / min >= 100) {
    const a = Math.log10(min);
    const b = Math.log10(max);
    const pad = (b - a) * 0.08;
    return { log: true, lo: a - pad, hi: b + pad };
  }
  const span = max - min;
  const pad = span > 0 ? span * 0.12 : Math.max(Math.abs(max) * 0.1, 1);
  return { log: false, lo: min - pad, hi: max + pad };
}

export function position(scale: Scale, value: number, x0: number, x1: number): number {
  const v = scale.log ? Math.log10(Math.max(value, 1e-300)) : value;
  const t = (v - scale.lo) / (scale.hi - scale.lo);
  return x0 + Math.min(1, Math.max(0, t)) * (x1 - x0);
}

function bounds(check: ChartedCheck): { lo: number | null; hi: number | null } {
  const unit = check.after.siUnit;
  return {
    lo: check.expected.min === null ? null : convertTo(check.expected.min, check.expected.unit, unit),
    hi: check.expected.max === null ? null : convertTo(check.expected.max, check.expected.unit, unit),
  };
}

function drawLegend(flow: Flow, xRight: number, y: number): void {
  const doc = flow.doc;
  const items: Array<[string, (x: number, cy: number) => void]> = [
    ['expected band', (x, cy) => doc.save().rect(x, cy - 4, 14, 8).fillAndStroke(COLOR.chartBand, '#555555').restore()],
    ['before repair', (x, cy) => doc.save().lineWidth(1.3).circle(x + 5, cy, 3.8).stroke(COLOR.ink).restore()],
    ['after repair', (x, cy) => diamond(flow, x + 5, cy, 4.6)],
  ];
  let x = xRight;
  for (const [label, mark] of [...items].reverse()) {
    const w = flow.width_(label, 'sans', SIZE.small - 0.5);
    x -= w;
    flow.drawBlock(flow.lay({ text: label, size: SIZE.small - 0.5, color: COLOR.muted }, w + 2), x, y - 5.5, w + 2);
    x -= 18;
    mark(x, y);
    x -= 12;
  }
}

function diamond(flow: Flow, cx: number, cy: number, r: number): void {
  flow.doc.save().moveTo(cx, cy - r).lineTo(cx + r, cy).lineTo(cx, cy + r).lineTo(cx - r, cy).closePath().fill(COLOR.ink).restore();
}

function centredLabel(flow: Flow, text: string, cx: number, y: number, x0: number, x1: number): void {
  const size = SIZE.small - 0.5;
  const w = flow.width_(text, 'sans', size);
  const x = Math.min(Math.max(cx - w / 2, x0), x1 - w);
  flow.drawBlock(flow.lay({ text, size }, w + 2), x, y, w + 2);
}

function stripLabel(flow: Flow, check: ChartedCheck): LaidBlock[] {
  return [
    flow.lay({ text: `${check.seq}. ${check.title}`, font: 'bold', size: SIZE.small }, LABEL_W - 8),
    flow.lay({ text: `expected ${formatRange(check.expected)}`, size: SIZE.small - 0.5, color: COLOR.muted }, LABEL_W - 8),
  ];
}

/** A strip is as tall as its label needs, and never lower than the plot needs. */
function stripHeight(flow: Flow, check: ChartedCheck): number {
  return Math.max(STRIP, stackHeight(stripLabel(flow, check)) + 10);
}

function drawStrip(flow: Flow, check: ChartedCheck, y: number): void {
  const doc = flow.doc;
  const label = stripLabel(flow, check);
  const height = stripHeight(flow, check);
  drawStack(flow, label, flow.left, y + (height - stackHeight(label)) / 2, LABEL_W - 8);
  const { lo, hi } = bounds(check);

  const x0 = flow.left + LABEL_W + 8;
  const x1 = flow.right - RESULT_W - 10;
  const mid = y + height / 2;
  const values = [lo, hi, check.before.si, check.after.si].filter((v): v is number => v !== null);
  const scale = chartScale(values);
  doc.save().moveTo(x0, mid).lineTo(x1, mid).lineWidth(0.7).strokeColor(COLOR.rule).stroke().restore();
  const bx0 = lo === null ? x0 : position(scale, lo, x0, x1);
  const bx1 = hi === null ? x1 : position(scale, hi, x0, x1);
  doc.save().rect(bx0, mid - 6, Math.max(bx1 - bx0, 1.5), 12).lineWidth(0.7).fillAndStroke(COLOR.chartBand, '#555555').restore();
  if (scale.log) centredLabel(flow, 'log scale', x1, mid + 8, x0, x1);

  const at = (si: number | null) => (si === null ? x1 : position(scale, si, x0, x1));
  const xb = at(check.before.si);
  const xa = at(check.after.si);
  doc.save().lineWidth(1.4).circle(xb, mid, 4.2).fillAndStroke(COLOR.white, COLOR.ink).restore();
  diamond(flow, xa, mid, 5.2);
  centredLabel(flow, `before ${check.before.entered}`, xb, mid - 19, x0, x1);
  centredLabel(flow, `after ${check.after.entered}`, xa, mid + 7, x0, x1);

  const verdict = check.pass ? 'PASS' : 'FAIL';
  const vw = flow.width_(verdict, 'bold', SIZE.small);
  doc.save().rect(flow.right - RESULT_W, mid - 8, RESULT_W, 16).fill(check.pass ? COLOR.pass : COLOR.fail).restore();
  flow.drawBlock(flow.lay({ text: verdict, font: 'bold', size: SIZE.small, color: COLOR.white }, vw + 2), flow.right - RESULT_W / 2 - vw / 2, mid - 6, vw + 2);
}

const titleHeight = (flow: Flow) => flow.lineHeight(SIZE.body) + 6;

/** A panel title with its first strips (up to three): what must fit before a panel starts on a page. */
export function chartStartHeight(flow: Flow, checks: ChartedCheck[]): number {
  return titleHeight(flow) + checks.slice(0, 3).reduce((h, c) => h + stripHeight(flow, c), 0);
}

/** One panel per circuit; a panel breaks between strips, never inside one, and repeats its title when it does. */
export function drawCircuitChart(flow: Flow, circuit: Circuit, checks: ChartedCheck[]): void {
  const titleH = titleHeight(flow);
  const title = (continued: boolean) => {
    flow.drawBlock(flow.lay({ text: `${circuit.name}${continued ? ' (continued)' : ''}`, font: 'bold', size: SIZE.body }, flow.width * 0.5), flow.left, flow.y, flow.width * 0.5);
    drawLegend(flow, flow.right, flow.y + flow.lineHeight(SIZE.body) / 2);
    flow.y += titleH;
    flow.rule(flow.y - 2, 0.6, COLOR.rule);
  };
  flow.ensure(chartStartHeight(flow, checks));
  title(false);
  checks.forEach((check, i) => {
    const h = stripHeight(flow, check);
    if (flow.ensure(h)) title(true);
    drawStrip(flow, check, flow.y);
    flow.y += h;
    if (i < checks.length - 1) flow.doc.save().moveTo(flow.left, flow.y).lineTo(flow.right, flow.y).lineWidth(0.3).dash(2, { space: 2 }).strokeColor(COLOR.rule).stroke().undash().restore();
  });
}
