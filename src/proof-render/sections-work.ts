/** The diagnostic path, the root cause and the repair. */
import { circuitName, heading, notice, noticeHeight, type RenderContext } from './blocks';
import { conditionLines, formatProbability, formatRange, formatTime } from './format';
import type { Block } from './layout';
import { drawTable, tableHeight, tableStartHeight, type Row, type TableSpec } from './table';
import { COLOR, SIZE } from './theme';
import type { SupersededReading } from './view';

const T = SIZE.table;
const S = SIZE.small;

const READING_COLUMNS = (test: string) => [
  { title: 'Step', width: 36 },
  { title: test, width: 'flex' as const },
  { title: 'Reading', width: 66 },
  { title: 'Expected', width: 72 },
  { title: 'Outcome', width: 104 },
];

/** The struck-through readings of a test, for its reading cell. */
export function supersededCell(list: SupersededReading[]): Block[] {
  return list.map((s) => ({ text: s.reading.entered, size: S, strike: true, color: COLOR.muted, gap: 2 }));
}

/** One line per correction under the row: who took the struck value, who replaced it, when and why. */
export function correctionSpan(list: SupersededReading[]): Block[] {
  return list.map((s, i) => ({
    text:
      `Correction${list.length > 1 ? ` ${i + 1}` : ''}: ${s.reading.entered} (struck through) taken ${formatTime(s.takenAt)} by ${s.takenBy}; ` +
      `replaced ${formatTime(s.correctedAt)} by ${s.correctedBy}. Reason: ${s.reason}`,
    size: S,
    color: COLOR.muted,
    gap: i ? 1 : 0,
  }));
}

/** Title, conditions (or a pointer to identical ones), and circuit, time and person in one muted line. */
export function testCell(title: string, circuit: string, conditions: string[], takenAt: string, takenBy: string): Block[] {
  return [
    { text: title, font: 'bold', size: T },
    ...conditions.map((line) => ({ text: line, size: S })),
    { text: `${circuit} · ${formatTime(takenAt)} · ${takenBy}`, size: S, color: COLOR.muted, gap: 1 },
  ];
}

export function drawDiagnosis(ctx: RenderContext): void {
  const { flow, view } = ctx;
  if (view.diagnosis.length === 0) {
    heading(ctx, 'Diagnostic path', 40);
    notice(flow, [{ text: 'No diagnostic readings recorded.', font: 'bold' }]);
    return;
  }
  const rows: Row[] = view.diagnosis.map((s) => ({
    cells: [
      [{ text: String(s.seq), font: 'bold', size: T }],
      testCell(s.title, circuitName(ctx, s.circuitId), conditionLines(s.request), s.takenAt, s.takenBy),
      [{ text: s.reading.entered, font: 'bold', size: T + 1 }, ...supersededCell(s.superseded)],
      [{ text: s.expected ? formatRange(s.expected) : 'no band set', size: T }],
      [{ text: s.outcome.label, size: T }],
    ],
    span: [...correctionSpan(s.superseded), ...(s.note ? [{ text: `Note: ${s.note}`, size: S, gap: 1 }] : [])],
  }));
  const spec: TableSpec = { caption: 'Diagnostic path', columns: READING_COLUMNS('Test and conditions'), rows };
  heading(ctx, 'Diagnostic path', tableStartHeight(flow, spec));
  drawTable(flow, spec);
}

export function drawRootCause(ctx: RenderContext): void {
  const { flow, view } = ctx;
  const rc = view.rootCause;
  if (!rc) {
    heading(ctx, 'Root cause', 40);
    notice(flow, [{ text: 'ROOT CAUSE NOT ESTABLISHED', font: 'bold', size: SIZE.body + 1, color: COLOR.fail }], { strong: true, color: COLOR.fail });
    return;
  }
  const blocks: Block[] = [
    { text: rc.label, font: 'bold', size: SIZE.body + 2 },
    { text: `${circuitName(ctx, rc.circuitId)}. Probability from the diagnosis engine: ${formatProbability(rc.probability)}`, size: SIZE.body, gap: 3 },
  ];
  if (rc.explanation) blocks.push({ text: rc.explanation, size: SIZE.body, gap: 3 });
  const spec: TableSpec = {
    caption: 'Readings that decided the root cause',
    columns: READING_COLUMNS('Readings that decided it'),
    rows: rc.decidingStepIds.map((id) => {
      const s = ctx.steps.get(id)!;
      return {
        cells: [
          [{ text: String(s.seq), font: 'bold', size: T }],
          [{ text: s.title, size: T }],
          [{ text: s.reading.entered, font: 'bold', size: T + 1 }],
          [{ text: s.expected ? formatRange(s.expected) : 'no band set', size: T }],
          [{ text: s.outcome.label, size: T }],
        ],
      };
    }),
  };
  // Statement and its deciding readings belong together: keep them on one page when they fit on one.
  const whole = noticeHeight(flow, blocks, { strong: true }) + 6 + tableHeight(flow, spec);
  heading(ctx, 'Root cause', Math.min(whole, flow.bottom - flow.top - 40));
  notice(flow, blocks, { strong: true });
  flow.y += 6;
  drawTable(flow, spec);
}

export function drawRepairs(ctx: RenderContext): void {
  const { flow, view } = ctx;
  if (view.repairs.length === 0) {
    heading(ctx, 'Repair performed', 40);
    notice(flow, [{ text: 'NO REPAIR RECORDED', font: 'bold', size: SIZE.body + 1, color: COLOR.fail }], { strong: true, color: COLOR.fail });
    return;
  }
  const spec: TableSpec = {
    caption: 'Repair performed',
    columns: [
      { title: '#', width: 22 },
      { title: 'Action and where on the circuit', width: 'flex' },
      { title: 'Parts', width: 150 },
      { title: 'By and when', width: 112 },
    ],
    rows: view.repairs.map((r, i) => ({
      cells: [
        [{ text: String(i + 1), font: 'bold', size: T }],
        [{ text: r.action, font: 'bold', size: T }, { text: `Where: ${r.location}`, size: T, gap: 1 }],
        r.parts.length
          ? r.parts.map((p, j) => ({ text: `${p.quantity} × ${p.description}${p.number ? ` (${p.number})` : ''}`, size: T, gap: j ? 2 : 0 }))
          : [{ text: 'No parts', size: T, color: COLOR.muted }],
        [{ text: r.by, size: T }, { text: formatTime(r.at), size: S, color: COLOR.muted }],
      ],
      span: r.note ? [{ text: `Note: ${r.note}`, size: S }] : undefined,
    })),
  };
  heading(ctx, 'Repair performed', tableStartHeight(flow, spec));
  drawTable(flow, spec);
}
