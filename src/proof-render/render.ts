/**
 * View model in, PDF bytes out. Deterministic: pdfkit's dates come from the view (the latest time stamp in it),
 * the file /ID is pdfkit's MD5 of the info dictionary, which carries the evidence digest, and nothing reads the
 * clock or a random source. Same view and options, same bytes.
 */
import PDFDocument from 'pdfkit';
import type { RenderContext } from './blocks';
import { proofDigest } from './digest';
import { ProofViewError, type Finding } from './findings';
import { latestTime } from './format';
import { Flow } from './layout';
import { drawCautions, drawDigest, drawSignOff, drawVerification } from './sections-close';
import { drawConcern, drawHead, drawVehicle } from './sections-head';
import { drawCauses, drawDiagnosis, drawRepairs } from './sections-work';
import { MARGIN, PAPER, fonts } from './theme';
import { validateProofView } from './validate';
import type { PaperSize, ProofView, RenderOptions } from './view';
import { PAPER_SIZES } from './view';

/** The document, section by section, in the order the proof states things. */
const SECTIONS: Array<(ctx: RenderContext) => void> = [
  drawHead,
  drawVehicle,
  drawConcern,
  drawDiagnosis,
  drawCauses,
  drawRepairs,
  drawVerification,
  drawSignOff,
  drawCautions,
  drawDigest,
];

export interface RenderedProof {
  pdf: Buffer;
  digest: string;
  pageCount: number;
  paper: PaperSize;
  /** Where the QR symbol lies (PDF points from the top-left of `page`, 1-based page). */
  qr: { page: number; x: number; y: number; module: number; size: number };
}

function optionFindings(options: RenderOptions): Finding[] {
  if (options.paper !== undefined && !PAPER_SIZES.includes(options.paper)) {
    return [{ code: 'options.paper', path: '/options/paper', message: `paper must be one of ${PAPER_SIZES.join(', ')}` }];
  }
  if (options.publicBase !== undefined && !/^https?:\/\/[A-Za-z0-9.:[\]-]+$/.test(options.publicBase)) {
    return [{ code: 'options.public_base', path: '/options/publicBase', message: 'an origin such as https://bay.example.org (scheme and host, no path)' }];
  }
  return [];
}

/** Render a view that has already passed `validateProofView` (the public functions below make sure of it). */
async function renderValid(view: ProofView, options: RenderOptions): Promise<RenderedProof> {
  const paper = options.paper ?? 'A4';
  const size = PAPER[paper];
  const digest = proofDigest(view);
  const when = latestTime(view);
  const doc = new PDFDocument({
    size: [size.width, size.height],
    margin: 0,
    autoFirstPage: false,
    bufferPages: true,
    font: fonts().sans,
    lang: 'en',
    displayTitle: true,
    info: {
      Title: `Proof of repair, repair order ${view.repairOrder.number}`,
      Author: view.shop.name,
      Subject: `VIN ${view.vehicle.vin}; evidence digest SHA-256 ${digest}`,
      Keywords: `proof of repair; ${view.repairOrder.number}; ${view.vehicle.vin}; sha256:${digest}`,
      Creator: 'Tracebay proof renderer',
      Producer: 'Tracebay (pdfkit)',
      CreationDate: when,
      ModDate: when,
    },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const flow = new Flow(doc, size);
  flow.newPage();
  const ctx: RenderContext = {
    flow,
    view,
    digest,
    circuits: new Map(view.circuits.map((c) => [c.id, c])),
    steps: new Map(view.diagnosis.map((s) => [s.id, s])),
    sectionNumber: 0,
    ...(options.publicBase ? { publicBase: options.publicBase } : {}),
  };
  // The head is not numbered; every later section is.
  SECTIONS.forEach((draw, i) => {
    if (i === 1) ctx.sectionNumber = 0;
    draw(ctx);
  });

  const range = doc.bufferedPageRange();
  const total = range.count;
  const footY = size.height - MARGIN.bottom - 8;
  for (let i = 0; i < total; i++) {
    doc.switchToPage(range.start + i);
    flow.rule(footY - 6, 0.6);
    flow.footerText(`Proof of repair · repair order ${view.repairOrder.number} · VIN ${view.vehicle.vin}`, flow.left, footY, 'left');
    flow.footerText(`Page ${i + 1} of ${total}`, flow.right, footY, 'right');
  }
  doc.end();
  const pdf = await done;
  if (!ctx.qr) throw new Error('proof renderer: the digest section placed no QR code');
  return { pdf, digest, pageCount: total, paper, qr: ctx.qr };
}

/** PDF bytes for a view; throws `ProofViewError` (with every finding) when the view or options are not valid. */
export async function renderProof(view: ProofView, options: RenderOptions = {}): Promise<Buffer> {
  return (await renderProofDetailed(view, options)).pdf;
}

/** As `renderProof`, with the digest, the page count and the QR placement. */
export async function renderProofDetailed(view: ProofView, options: RenderOptions = {}): Promise<RenderedProof> {
  const checked = validateProofView(view);
  const findings = [...optionFindings(options), ...(checked.ok ? [] : checked.findings)];
  if (findings.length) throw new ProofViewError(findings);
  return renderValid(view, options);
}

export type RenderOutcome = ({ ok: true } & RenderedProof) | { ok: false; findings: Finding[] };

/** For untrusted input (an HTTP body): findings instead of an exception. */
export async function tryRenderProof(input: unknown, options: RenderOptions = {}): Promise<RenderOutcome> {
  const checked = validateProofView(input);
  const findings = [...optionFindings(options), ...(checked.ok ? [] : checked.findings)];
  if (!checked.ok || findings.length) return { ok: false, findings };
  return { ok: true, ...(await renderValid(checked.view, options)) };
}
