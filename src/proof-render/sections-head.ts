/** First sections of the proof: the document head, the vehicle, the three Cs and the trouble codes. */
import { grid, heading, type RenderContext } from './blocks';
import { formatTimeOr, personLine } from './format';
import { drawStack, stackHeight, type Block } from './layout';
import { drawTable } from './table';
import { COLOR, SIZE } from './theme';
import { evidenceDigest } from './digest';
import type { CodeCheckMethod, ProofView, TroubleCode, VinCheck } from './view';

export interface Status {
  text: string;
  good: boolean;
}

/** The latest check of each test repeated after the repair: an earlier one taken again counts no more. */
export function latestChecks(view: ProofView): ProofView['verification'] {
  const latest = new Map<string, ProofView['verification'][number]>();
  for (const c of view.verification) latest.set(`${c.circuitId}|${c.repeatsStepId ?? c.id}`, c);
  return [...latest.values()];
}

export function verificationStatus(view: ProofView): Status {
  const checks = latestChecks(view).filter((c) => c.pass !== null);
  if (checks.length === 0) return { text: 'NOT VERIFIED: no readings were taken after the repair', good: false };
  const failed = checks.filter((c) => !c.pass).length;
  if (failed > 0) return { text: `VERIFICATION FAILED: ${failed} of ${checks.length} checks outside the healthy range`, good: false };
  if (view.repairOrder.verifiedAt === null) return { text: `NOT YET VERIFIED: ${checks.length} checks within the healthy range so far; the technician has not marked the repair verified`, good: false };
  return { text: `Verified: the latest reading of all ${checks.length} tests repeated after the repair is within the healthy range`, good: true };
}

const short = (digest: string) => `sha256:${digest.slice(0, 16)}…`;

export function approvalStatus(view: ProofView): Status {
  const latest = view.signOff.decisions[view.signOff.decisions.length - 1];
  if (latest?.decision === 'approved' && latest.evidenceDigest !== evidenceDigest(view)) {
    const on = latest.evidenceDigest ? ` on evidence ${short(latest.evidenceDigest)}` : '';
    return { text: `APPROVAL STALE: ${latest.by} approved${on} at ${formatTimeOr(latest.at, '')}; readings, repairs or the status changed since, so it needs a new approval`, good: false };
  }
  if (latest?.decision === 'approved') return { text: `Approved by ${latest.by}, ${formatTimeOr(latest.at, '')}, on evidence ${short(latest.evidenceDigest!)} (this document's)`, good: true };
  if (latest?.decision === 'returned') return { text: `NOT YET APPROVED: returned for rework by ${latest.by}, ${formatTimeOr(latest.at, '')}`, good: false };
  if (latest?.decision === 'withdrawn') return { text: `NOT APPROVED: approval withdrawn by ${latest.by}, ${formatTimeOr(latest.at, '')}`, good: false };
  return { text: 'NOT YET APPROVED: no foreman decision recorded', good: false };
}

export function drawHead(ctx: RenderContext): void {
  const { flow, view } = ctx;
  const top = flow.y;
  const leftWidth = flow.width * 0.52;
  const rightWidth = flow.width - leftWidth - 10;
  const left = [
    flow.lay({ text: 'PROOF OF REPAIR', font: 'bold', size: SIZE.title }, leftWidth),
    flow.lay({ text: 'Sensor-circuit diagnosis, repair and after-repair readings', size: SIZE.small, color: COLOR.muted, gap: 2 }, leftWidth),
  ];
  const shop: Block[] = [
    { text: view.shop.name, font: 'bold', size: SIZE.body + 1.5 },
    ...view.shop.addressLines.map((l) => ({ text: l, size: SIZE.small + 0.5 })),
    ...(view.shop.phone ? [{ text: `Tel. ${view.shop.phone}`, size: SIZE.small + 0.5 }] : []),
  ];
  const right = shop.map((b) => flow.lay(b, rightWidth));
  drawStack(flow, left, flow.left, top, leftWidth);
  // Right-aligned shop block: each line placed at the right margin.
  let y = top;
  for (const b of right) {
    for (const line of b.lines) {
      const w = flow.width_(line, b.font ?? 'sans', b.size);
      flow.drawBlock({ ...b, lines: [line], gap: 0, height: 0 }, flow.right - w, y, rightWidth);
      y += flow.lineHeight(b.size);
    }
  }
  flow.y = Math.max(top + stackHeight(left), y) + 6;
  flow.rule(flow.y, 1.6, COLOR.ink);
  flow.y += 8;

  const ro = view.repairOrder;
  grid(flow, [
    { label: 'Repair order', value: [{ text: ro.number, font: 'bold', size: SIZE.heading }] },
    { label: 'Opened', value: [{ text: formatTimeOr(ro.openedAt, '') }] },
    { label: 'Repaired', value: [{ text: formatTimeOr(ro.repairedAt, 'not repaired yet') }] },
    { label: 'Verified', value: [{ text: formatTimeOr(ro.verifiedAt, 'not verified') }] },
    { label: 'Technician', value: [view.technician ? { text: personLine(view.technician) } : { text: 'nobody recorded', color: COLOR.muted }] },
    { label: 'Foreman', value: [view.foreman ? { text: personLine(view.foreman) } : { text: 'no foreman decision yet', color: COLOR.muted }] },
    { label: 'Times shown in', value: [{ text: view.shop.timeZone }] },
  ], [1, 1, 1]);

  // Status box: verification and approval, in words, visible without reading further.
  const statuses = [verificationStatus(view), approvalStatus(view)];
  const pad = 7;
  const laid = statuses.map((s) => flow.lay({ text: s.text, font: 'bold', size: SIZE.body, color: s.good ? COLOR.pass : COLOR.fail }, flow.width - 2 * pad));
  const h = stackHeight(laid) + 2 * pad + 3;
  flow.y += 2;
  flow.ensure(h);
  flow.doc.save().lineWidth(1.4).strokeColor(COLOR.ink).rect(flow.left, flow.y, flow.width, h).stroke().restore();
  let sy = flow.y + pad;
  laid.forEach((b) => {
    sy += flow.drawBlock(b, flow.left + pad, sy, flow.width - 2 * pad) + 3;
  });
  flow.y += h;
}

const VIN_WORDS: Record<VinCheck, { text: string; good: boolean }> = {
  valid: { text: 'Check digit valid (49 CFR 565)', good: true },
  invalid: { text: 'CHECK DIGIT DOES NOT MATCH: confirm the VIN on the vehicle', good: false },
  not_checked_outside_na: { text: 'Check digit not checked: vehicle built outside North America', good: true },
};

export function drawVehicle(ctx: RenderContext): void {
  const { flow, view } = ctx;
  const v = view.vehicle;
  heading(ctx, 'Vehicle', 60);
  const vinWords = VIN_WORDS[v.vinCheck];
  grid(flow, [
    {
      label: 'VIN',
      value: [
        { text: v.vin, font: 'mono', size: SIZE.body + 2 },
        { text: vinWords.text, size: SIZE.small, color: vinWords.good ? COLOR.muted : COLOR.fail, font: vinWords.good ? 'sans' : 'bold' },
      ],
    },
    { label: 'Year, make, model', value: [{ text: `${v.year} ${v.make} ${v.model}` }] },
    { label: 'Engine', value: [{ text: v.engine }] },
    {
      label: 'Odometer in / out',
      value: [
        { text: `In: ${groupThousands(v.odometer.in)} ${v.odometer.unit}` },
        v.odometer.out === null ? { text: 'Out: not recorded', color: COLOR.fail } : { text: `Out: ${groupThousands(v.odometer.out)} ${v.odometer.unit}` },
      ],
    },
  ], [1.45, 1.1, 1.05, 0.75]);
}

export function drawConcern(ctx: RenderContext): void {
  const { flow, view } = ctx;
  heading(ctx, 'Complaint, cause and correction', 50);
  const parts: Array<[string, string]> = [
    ['Complaint', view.concern.complaint],
    ['Cause', view.concern.cause],
    ['Correction', view.concern.correction],
  ];
  parts.forEach(([label, text], i) => {
    flow.ensure(flow.lineHeight(SIZE.small) + flow.lineHeight(SIZE.body) * 2 + (i ? 6 : 0));
    flow.paragraph({ text: label.toUpperCase(), font: 'bold', size: SIZE.small - 1, color: COLOR.muted, gap: i ? 6 : 0 });
    flow.paragraph({ text, size: SIZE.body });
  });

  flow.y += 8;
  const rows = (stage: string, codes: TroubleCode[]) =>
    codes.length
      ? codes.map((c, i) => ({
          cells: [
            [{ text: i === 0 ? stage : '', font: 'bold' as const, size: SIZE.table }],
            [{ text: c.code, font: 'mono' as const, size: SIZE.table + 0.5 }],
            [{ text: c.description, size: SIZE.table }],
            [{ text: c.status, size: SIZE.table }],
          ],
        }))
      : [{ cells: [[{ text: stage, font: 'bold' as const, size: SIZE.table }], [{ text: '—', size: SIZE.table }], [{ text: 'No codes stored', size: SIZE.table }], [{ text: '', size: SIZE.table }]] }];
  const after = view.troubleCodes.afterRepair;
  const afterRows = after.check === null
    ? [{ cells: [[{ text: 'After repair', font: 'bold' as const, size: SIZE.table }], [{ text: '—', size: SIZE.table }], [{ text: 'NOT RECORDED: nobody recorded reading the codes after the repair', font: 'bold' as const, size: SIZE.table, color: COLOR.fail }], [{ text: '', size: SIZE.table }]] }]
    : after.codes.length
      ? rows('After repair', after.codes)
      : [{ cells: [[{ text: 'After repair', font: 'bold' as const, size: SIZE.table }], [{ text: '—', size: SIZE.table }], [{ text: NONE_RETURNED[after.check.method](after.check.keyCycles), size: SIZE.table }], [{ text: '', size: SIZE.table }]] }];
  drawTable(flow, {
    caption: 'Trouble codes',
    columns: [
      { title: 'When read', width: 96 },
      { title: 'Code', width: 58 },
      { title: 'Description', width: 'flex' },
      { title: 'Status', width: 66 },
    ],
    rows: [...rows('Before repair', view.troubleCodes.found), ...afterRows],
  });
  if (after.check) {
    const c = after.check;
    flow.y += 3;
    flow.paragraph({
      text: `Codes after the repair read ${formatTimeOr(c.checkedAt, '')}: ${METHOD_WORDS[c.method](c.keyCycles)}.${c.note ? ` ${c.note}` : ''}`,
      size: SIZE.small,
    });
  }
}

const METHOD_WORDS: Record<CodeCheckMethod, (keyCycles: number | null) => string> = {
  cleared_then_key_cycles: (n) => `codes cleared, then read again after ${n ?? 'several'} key cycle${n === 1 ? '' : 's'}`,
  road_test: () => 'codes cleared, then read again after a road test',
  rescanned: () => 'codes read again with the scan tool after the repair (not cleared first)',
};

/** The after-repair row when no code came back: how they were read, in one line. */
const NONE_RETURNED: Record<CodeCheckMethod, (keyCycles: number | null) => string> = {
  cleared_then_key_cycles: (n) => `Codes cleared, none returned after ${n ?? 'several'} key cycle${n === 1 ? '' : 's'}`,
  road_test: () => 'Codes cleared, none returned after a road test',
  rescanned: () => 'None stored on a re-scan after the repair (not cleared first)',
};

/** "84215" → "84,215" without locale data (the integer part only). */
export function groupThousands(value: number): string {
  const [int, frac] = String(value).split('.');
  const grouped = int!.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return frac ? `${grouped}.${frac}` : grouped;
}
