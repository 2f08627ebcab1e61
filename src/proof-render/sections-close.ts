/** Verification, sign-off, safety cautions and the evidence digest. */
import QRCode from 'qrcode';
import { circuitName, heading, notice, type RenderContext } from './blocks';
import { chartStartHeight, drawCircuitChart, isCharted } from './chart';
import { evidenceDigest, publicProofUrl, qrPayload } from './digest';
import { conditionLines, formatRange, formatTime, formatTimeOr, personLine, sameConditions } from './format';
import type { Block } from './layout';
import { correctionSpan, supersededCell, testCell } from './sections-work';
import { approvalStatus, latestChecks } from './sections-head';
import { drawTable, tableStartHeight, type TableSpec } from './table';
import { COLOR, SIZE } from './theme';

const DECISION_WORDS = { approved: 'approved', returned: 'returned for rework', withdrawn: 'approval withdrawn' } as const;
import type { CautionCode, VerificationCheck } from './view';
import { CAUTION_CODES } from './view';

const T = SIZE.table;

export function drawVerification(ctx: RenderContext): void {
  const { flow, view } = ctx;
  if (view.verification.length === 0) {
    heading(ctx, 'Verification after the repair', 60);
    notice(flow, [
      { text: 'NOT VERIFIED', font: 'bold', size: SIZE.heading, color: COLOR.fail },
      { text: 'No readings were taken after the repair, so this document does not prove that the repair worked.', size: SIZE.body, gap: 3 },
    ], { strong: true, color: COLOR.fail });
    return;
  }
  const latestIds = new Set(latestChecks(view).map((c) => c.id));
  const spec: TableSpec = {
    caption: 'Verification after the repair',
    columns: [
      { title: 'Check', width: 52 },
      { title: 'Test repeated and conditions', width: 'flex' },
      { title: 'Expected', width: 72 },
      { title: 'Before', width: 62 },
      { title: 'After', width: 66 },
      { title: 'Result', width: 48 },
    ],
    rows: view.verification.map((c) => {
      const repeated = c.repeatsStepId === null ? undefined : ctx.steps.get(c.repeatsStepId);
      const conditions = !repeated
        ? ['Not a repeat of a diagnostic step:', ...conditionLines(c.request)]
        : sameConditions(c.request, repeated.request)
          ? [`Same conditions as diagnostic step ${repeated.seq}`]
          : [`Repeats diagnostic step ${repeated.seq}, now:`, ...conditionLines(c.request)];
      const taken = [...latestIds].includes(c.id) ? [] : [{ text: 'taken again later', size: SIZE.small, color: COLOR.muted, gap: 2 }];
      return {
        cells: [
          [{ text: String(c.seq), font: 'bold', size: T }, ...(c.provesFix ? [{ text: 'PROVES FIX', font: 'bold' as const, size: SIZE.small - 1.5, gap: 2 }] : [])],
          testCell(c.title, circuitName(ctx, c.circuitId), conditions, c.takenAt, c.takenBy),
          [{ text: c.expected ? formatRange(c.expected) : 'no band set', size: T }],
          [{ text: c.before ? c.before.entered : '—', size: T + 1 }],
          [{ text: c.after.entered, font: 'bold', size: T + 1 }, ...supersededCell(c.superseded)],
          c.pass === null
            ? [{ text: 'no band', size: T, color: COLOR.muted }]
            : [{ text: c.pass ? 'PASS' : 'FAIL', font: 'bold', size: T, badge: c.pass ? COLOR.pass : COLOR.fail }, ...taken],
        ],
        span: [...correctionSpan(c.superseded), ...(c.note ? [{ text: `Note: ${c.note}`, size: SIZE.small, gap: 1 }] : [])],
      };
    }),
  };
  heading(ctx, 'Verification after the repair', tableStartHeight(flow, spec));
  flow.paragraph({ text: 'PROVES FIX marks a repeat of a reading that decided the root cause: the same test, after the repair, where the healthy circuit reads.', size: SIZE.small, color: COLOR.muted });
  flow.y += 3;
  drawTable(flow, spec);

  const panels = view.circuits
    .map((circuit) => ({ circuit, checks: view.verification.filter((c: VerificationCheck) => c.circuitId === circuit.id && latestIds.has(c.id)).filter(isCharted) }))
    .filter((p) => p.checks.length > 0);
  if (panels.length === 0) return;
  flow.y += 12;
  flow.ensure(flow.lineHeight(SIZE.body + 1) + 4 + chartStartHeight(flow, panels[0]!.checks));
  flow.paragraph({ text: 'Before and after, by circuit', font: 'bold', size: SIZE.body + 1 });
  flow.y += 4;
  for (const { circuit, checks } of panels) {
    drawCircuitChart(flow, circuit, checks);
    flow.y += 10;
  }
}

export function drawSignOff(ctx: RenderContext): void {
  const { flow, view } = ctx;
  heading(ctx, 'Sign-off', 110);
  const s = view.signOff;
  const colW = (flow.width - 16) / 2;
  const cell = (role: string, who: string, at: string | null): Block[] => [
    { text: role.toUpperCase(), font: 'bold', size: SIZE.small - 1, color: COLOR.muted },
    { text: who, font: 'bold', size: SIZE.body + 0.5, gap: 1 },
    at === null
      ? { text: 'Not signed', font: 'bold', size: SIZE.body, color: COLOR.fail, gap: 2 }
      : { text: `Signed ${formatTime(at)}`, size: SIZE.body, gap: 2 },
  ];
  const cols = [
    cell('Technician', view.technician ? personLine(view.technician) : 'nobody recorded', s.technicianSignedAt),
    cell('Foreman', view.foreman ? personLine(view.foreman) : 'no foreman decision yet', s.foremanSignedAt),
  ];
  const laid = cols.map((blocks) => blocks.map((b) => flow.lay(b, colW)));
  const h = Math.max(...laid.map((l) => l.reduce((a, b) => a + b.height, 0))) + 6;
  flow.ensure(h);
  laid.forEach((blocks, i) => {
    let y = flow.y;
    for (const b of blocks) y += flow.drawBlock(b, flow.left + i * (colW + 16), y, colW);
  });
  flow.y += h + 4;

  const status = approvalStatus(view);
  const latest = s.decisions[s.decisions.length - 1];
  const blocks: Block[] = [{ text: status.text, font: 'bold', size: SIZE.body + 2, color: status.good ? COLOR.pass : COLOR.fail }];
  if (latest?.evidenceDigest) blocks.push({ text: `Decided on evidence sha256:${latest.evidenceDigest}`, font: 'mono', size: SIZE.small, gap: 3 });
  blocks.push({ text: `This document's evidence: sha256:${evidenceDigest(view)}`, font: 'mono', size: SIZE.small, gap: 2 });
  if (latest?.comment) blocks.push({ text: `Foreman's comment: ${latest.comment}`, size: SIZE.body, gap: 3 });
  notice(flow, blocks, { strong: true, color: status.good ? COLOR.pass : COLOR.fail });
  if (s.decisions.length > 1) {
    flow.y += 4;
    flow.paragraph({ text: 'Earlier decisions', font: 'bold', size: SIZE.small });
    s.decisions.slice(0, -1).forEach((d) => {
      flow.paragraph({
        text: `${formatTimeOr(d.at, '')}: ${DECISION_WORDS[d.decision]} by ${d.by}${d.evidenceDigest ? ` (evidence sha256:${d.evidenceDigest})` : ''}${d.comment ? `: ${d.comment}` : ''}`,
        size: SIZE.small,
      });
    });
  }
}

/** Caution wording, one entry per code (printed in `CAUTION_CODES` order whatever the view's order). */
export const CAUTION_TEXT: Record<CautionCode, { lead: string; text: string }> = {
  engine_in_bay: {
    lead: 'Engine cranked or running in the bay.',
    text: 'Extract or ventilate the exhaust, set the parking brake and block the wheels, and keep hands, sleeves and test leads clear of belts, pulleys and the cooling fan, which can start on its own.',
  },
  fused_jumpers_only: {
    lead: 'Fused jumpers only.',
    text: 'Never put battery voltage on a 5 V reference or signal circuit: it can destroy the control module.',
  },
  no_ohmmeter_on_airbag: {
    lead: 'Airbag circuits.',
    text: 'Never connect an ohmmeter or test light to an airbag or seat-belt pretensioner circuit; the meter current can fire it. Disable the system as the service information describes.',
  },
  high_voltage_system: {
    lead: 'High-voltage hybrid or electric system.',
    text: "Work on or near high-voltage parts (orange cables) only if you are qualified and equipped for it, after disabling the high-voltage system by the service information's procedure.",
  },
  backprobe_gently: {
    lead: 'Back-probing.',
    text: 'Use back-probe pins along the wire seal; never force or spread the terminals, which causes the next intermittent fault.',
  },
};

export function drawCautions(ctx: RenderContext): void {
  const { flow, view } = ctx;
  heading(ctx, 'Safety cautions for this work', 60);
  const applying = CAUTION_CODES.filter((c) => view.cautions.includes(c));
  if (applying.length === 0) flow.paragraph({ text: 'No particular cautions recorded for this work.', size: SIZE.body });
  for (const code of applying) {
    const { lead, text } = CAUTION_TEXT[code];
    const laid = [flow.lay({ text: lead, font: 'bold', size: SIZE.body }, flow.width - 18), flow.lay({ text, size: SIZE.body }, flow.width - 18)];
    const h = laid[0]!.height + laid[1]!.height + 5;
    flow.ensure(h);
    flow.doc.save().rect(flow.left, flow.y + 2, 5, h - 6).fill(COLOR.ink).restore();
    let y = flow.y;
    for (const b of laid) y += flow.drawBlock(b, flow.left + 14, y, flow.width - 18);
    flow.y += h;
  }
  flow.y += 4;
  flow.paragraph({
    text: "The vehicle manufacturer's service information and local regulations take precedence over this document and over these cautions.",
    font: 'bold',
    size: SIZE.body,
  });
}

export function drawDigest(ctx: RenderContext): void {
  const { flow, digest } = ctx;
  const qr = QRCode.create(qrPayload(digest, ctx.publicBase), { errorCorrectionLevel: 'M' });
  const n = qr.modules.size;
  const quiet = 4; // ISO/IEC 18004 quiet zone, in modules
  const module = 2.3;
  const side = (n + 2 * quiet) * module;
  heading(ctx, 'Evidence digest', side + 4);
  const textW = flow.width - side - 16;
  const top = flow.y;
  const blocks: Block[] = [
    { text: 'SHA-256 of the RFC 8785 canonical JSON of everything this document states:', size: SIZE.body },
    { text: digest, font: 'mono', size: SIZE.body - 0.5, gap: 4 },
    ...(ctx.publicBase
      ? [
          { text: 'Check this document, without an account, at:', size: SIZE.small, gap: 6 },
          { text: publicProofUrl(digest, ctx.publicBase), font: 'mono' as const, size: SIZE.small, gap: 1 },
          { text: 'The page says whether the issuing shop knows this digest, for which repair order and vehicle, and whether the document is still current. The QR code carries the same address.', size: SIZE.small, color: COLOR.muted, gap: 3 },
        ]
      : [{ text: 'To check this proof, hash the same proof data again (for example through the verification service) and compare all 64 characters. The QR code carries the same digest.', size: SIZE.small, color: COLOR.muted, gap: 6 }]),
  ];
  let y = top;
  for (const b of blocks) y += flow.drawBlock(flow.lay(b, textW), flow.left, y, textW);

  // QR modules as vector squares, one path, one fill; white quiet zone around it.
  const x0 = flow.right - side;
  const doc = flow.doc;
  doc.save().rect(x0, top, side, side).fill(COLOR.white).restore();
  doc.save();
  for (let row = 0; row < n; row++) {
    for (let col = 0; col < n; col++) {
      if (qr.modules.get(row, col)) doc.rect(x0 + (quiet + col) * module, top + (quiet + row) * module, module, module);
    }
  }
  doc.fill(COLOR.ink).restore();
  ctx.qr = { page: flow.pageCount, x: x0 + quiet * module, y: top + quiet * module, module, size: n };
  flow.y = Math.max(y, top + side);
}
