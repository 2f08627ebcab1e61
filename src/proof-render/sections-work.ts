/** The diagnostic path, the root cause and the repair. */
import { circuitName, heading, notice, noticeHeight, type RenderContext } from './blocks';
import { conditionLines, formatProbability, formatRange, formatTime } from './format';
import type { Block } from './layout';
import { drawTable, tableHeight, tableStartHeight, type Row, type TableSpec } from './table';
import { COLOR, SIZE } from './theme';
import type { RepairAction, SupersededReading } from './view';
import { inRange } from './validate';

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
      [
        { text: s.reading.entered, font: 'bold', size: T + 1 },
        ...(s.expected && !inRange(s.reading.si, s.reading.siUnit, s.expected) ? [{ text: 'OUTSIDE healthy range', font: 'bold' as const, size: S, color: COLOR.fail }] : []),
        ...supersededCell(s.superseded),
      ],
      [{ text: s.expected ? formatRange(s.expected) : 'no band set', size: T }],
      [{ text: s.outcome.label, size: T }],
    ],
    span: [...correctionSpan(s.superseded), ...(s.note ? [{ text: `Note: ${s.note}`, size: S, gap: 1 }] : [])],
  }));
  const spec: TableSpec = { caption: 'Diagnostic path', columns: READING_COLUMNS('Test and conditions'), rows };
  heading(ctx, 'Diagnostic path', tableStartHeight(flow, spec));
  drawTable(flow, spec);
}

/** Per diagnosed circuit: the root cause the engine proved with the readings that decided it, or "not proven". */
export function drawCauses(ctx: RenderContext): void {
  const { flow, view } = ctx;
  if (view.causes.length === 0) {
    heading(ctx, 'Root cause', 40);
    notice(flow, [{ text: 'ROOT CAUSE NOT ESTABLISHED: no circuit was diagnosed', font: 'bold', size: SIZE.body + 1, color: COLOR.fail }], { strong: true, color: COLOR.fail });
    return;
  }
  view.causes.forEach((c, i) => {
    const circuit = circuitName(ctx, c.circuitId);
    const blocks: Block[] = c.proven && c.cause
      ? [
          { text: `${circuit}: ${c.cause.label}`, font: 'bold', size: SIZE.body + 2 },
          { text: `Proven by the diagnosis: probability ${formatProbability(c.cause.probability)}.`, size: SIZE.body, gap: 3 },
        ]
      : [
          { text: `${circuit}: ROOT CAUSE NOT PROVEN`, font: 'bold', size: SIZE.body + 2, color: COLOR.fail },
          {
            text: c.leading.length
              ? `Leading candidates: ${c.leading.map((l) => `${l.label} (${formatProbability(l.probability)})`).join('; ')}. None of them reached the probability the diagnosis needs to name a root cause.`
              : 'No candidate stands out.',
            size: SIZE.body,
            gap: 3,
          },
        ];
    if (c.advice) blocks.push({ text: c.advice, size: SIZE.body, gap: 3 });
    const spec: TableSpec = {
      caption: `Readings that decided it: ${circuit}`,
      columns: READING_COLUMNS('Readings that decided it'),
      rows: c.decidingStepIds.flatMap((id) => {
        const s = ctx.steps.get(id);
        return s
          ? [{
              cells: [
                [{ text: String(s.seq), font: 'bold' as const, size: T }],
                [{ text: s.title, size: T }],
                [{ text: s.reading.entered, font: 'bold' as const, size: T + 1 }],
                [{ text: s.expected ? formatRange(s.expected) : 'no band set', size: T }],
                [{ text: s.outcome.label, size: T }],
              ],
            }]
          : [];
      }),
    };
    const keep = noticeHeight(flow, blocks, { strong: true }) + (spec.rows.length ? 6 + tableStartHeight(flow, spec) : 0);
    if (i === 0) heading(ctx, view.causes.length > 1 ? 'Root cause, by circuit' : 'Root cause', Math.min(keep, flow.bottom - flow.top - 40));
    else {
      flow.y += 10;
      flow.ensure(Math.min(keep, flow.bottom - flow.top - 40));
    }
    notice(flow, blocks, { strong: true, color: c.proven ? COLOR.ink : COLOR.fail });
    if (spec.rows.length) {
      flow.y += 6;
      drawTable(flow, spec);
    }
  });
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
      { title: 'Parts (quantity, part number)', width: 150 },
      { title: 'By, when, labour', width: 122 },
    ],
    rows: view.repairs.map((r, i) => ({
      cells: [
        [{ text: String(i + 1), font: 'bold', size: T }],
        [
          { text: r.action, font: 'bold', size: T },
          { text: `Where: ${r.location}`, size: T, gap: 1 },
          ...(r.circuitId ? [{ text: `Circuit: ${circuitName(ctx, r.circuitId)}`, size: S, color: COLOR.muted, gap: 1 }] : []),
        ],
        r.parts.length
          ? r.parts.map((p, j) => ({ text: `${p.quantity} × ${p.description}${p.number ? `, part no. ${p.number}` : ', no part number'}`, size: T, gap: j ? 2 : 0 }))
          : [{ text: 'No parts', size: T, color: COLOR.muted }],
        [{ text: r.by, size: T }, { text: `Recorded ${formatTime(r.at)}`, size: S, color: COLOR.muted }, ...labourCell(r.labour)],
      ],
      span: r.note ? [{ text: `Note: ${r.note}`, size: S }] : undefined,
    })),
  };
  heading(ctx, 'Repair performed', tableStartHeight(flow, spec));
  drawTable(flow, spec);
}

/** Clock-on and clock-off, and the minutes: what a warranty labour claim is checked against. */
function labourCell(l: RepairAction['labour']): Block[] {
  const lines: Block[] = [];
  if (l.clockOnAt) lines.push({ text: `Clock on ${formatTime(l.clockOnAt)}`, size: S, gap: 2 });
  if (l.clockOffAt) lines.push({ text: `Clock off ${formatTime(l.clockOffAt)}`, size: S });
  lines.push(l.minutes === null ? { text: 'Labour time not recorded', size: S, color: COLOR.fail, gap: 2 } : { text: `Labour ${formatMinutes(l.minutes)}`, font: 'bold', size: S, gap: 2 });
  return lines;
}

function formatMinutes(minutes: number): string {
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  return h ? `${h} h ${String(m).padStart(2, '0')} min` : `${m} min`;
}
