import { Injectable } from '@nestjs/common';
import { ConflictException, DomainException, InvalidInputException, NotFoundException } from '../../common/errors/domain.exception';
import { proofDigest, QR_PREFIX, sha256Hex, tryRenderProof, type ProofView } from '../../proof-render';
import { orderScope, type Actor } from '../identity/actor';
import { UsersRepository } from '../identity/users.repository';
import { DiagnosisService } from '../diagnosis/diagnosis.service';
import { RepairOrdersRepository } from '../repair-orders/repair-orders.repository';
import { RepairsRepository } from '../repairs/repairs.repository';
import { ReviewsRepository } from '../reviews/reviews.repository';
import { proofChanges } from './proof-changes';
import { buildProofView } from './proof-view.builder';
import type { VerifyProofInput } from './proofs.dto';
import { ProofsRepository } from './proofs.repository';

/** A proof exists once the repair is done: before that there is nothing to prove. */
const PROVABLE = new Set(['repaired', 'verified', 'closed']);
const DIGEST_IN_PDF = /sha256:([0-9a-f]{64})/;

/** The digest a Tracebay proof carries in its document information (plain or UTF-16 encoded). */
export function digestFromPdf(pdf: Buffer): string | null {
  if (pdf.subarray(0, 5).toString('latin1') !== '%PDF-') return null;
  const text = pdf.toString('latin1');
  const plain = DIGEST_IN_PDF.exec(text);
  if (plain) return plain[1]!;
  for (const hex of text.matchAll(/<FEFF([0-9A-Fa-f]+)>/g)) {
    const bytes = Buffer.from(hex[1]!, 'hex');
    const decoded = Buffer.from(bytes).swap16().toString('utf16le');
    const found = DIGEST_IN_PDF.exec(decoded);
    if (found) return found[1]!;
  }
  return null;
}

@Injectable()
export class ProofsService {
  constructor(
    private readonly orders: RepairOrdersRepository,
    private readonly users: UsersRepository,
    private readonly repairs: RepairsRepository,
    private readonly reviews: ReviewsRepository,
    private readonly diagnosis: DiagnosisService,
    private readonly proofs: ProofsRepository,
  ) {}

  /** Everything the proof of a repair order states, as of now. */
  async view(actor: Actor, repairOrderId: string): Promise<ProofView> {
    const order = await this.orders.find(orderScope(actor), repairOrderId);
    if (!order) throw new NotFoundException('repair_order', repairOrderId);
    if (!PROVABLE.has(order.status)) {
      throw new ConflictException('proof.not_yet', `Repair order ${order.number} is ${order.status}: the proof of repair exists once the repair is recorded (status repaired or later).`, {
        status: order.status,
      });
    }
    const [shop, repairs, reviews, foremanName, circuits] = await Promise.all([
      this.users.shop(actor.shopId),
      this.repairs.listForOrder(repairOrderId),
      this.reviews.listForOrder(repairOrderId),
      this.proofs.foremanName(actor.shopId),
      Promise.all(
        order.circuits.map(async (c) => {
          const { tree, diagnosis, readings } = await this.diagnosis.ofCircuit(actor, repairOrderId, c, { asDiagnosed: true });
          return { id: c.id, label: c.label, kind: c.kind, tree, diagnosis, readings };
        }),
      ),
    ]);
    return buildProofView({ shop, order, foremanName: foremanName ?? 'no foreman on file', circuits, repairs, reviews });
  }

  /** Renders the proof and remembers what it stated, so the document can be checked later. */
  async pdf(actor: Actor, repairOrderId: string): Promise<{ pdf: Buffer; digest: string; number: string }> {
    const view = await this.view(actor, repairOrderId);
    if (view.circuits.length === 0) {
      throw new ConflictException('proof.no_circuit', 'The repair order has no circuit under test, so there is no diagnostic path to prove.');
    }
    const rendered = await tryRenderProof(view);
    // The view is built from validated data; a refusal here is a defect, reported with its findings.
    if (!rendered.ok) throw new Error(`proof view refused: ${JSON.stringify(rendered.findings.slice(0, 3))}`);
    await this.proofs.remember(repairOrderId, rendered.digest, sha256Hex(rendered.pdf), view, actor.userId);
    return { pdf: rendered.pdf, digest: rendered.digest, number: view.repairOrder.number };
  }

  /** Whether a document (or its digest) still matches the repair order's evidence, and if not, what changed. */
  async verify(actor: Actor, input: VerifyProofInput | Buffer) {
    const file = Buffer.isBuffer(input) ? input : input.pdfBase64 ? Buffer.from(input.pdfBase64, 'base64') : null;
    const digest = file ? digestFromPdf(file) : normaliseDigest((input as VerifyProofInput).digest!);
    if (!digest) {
      throw new InvalidInputException([
        { code: 'proof.no_digest', path: file ? 'body.pdfBase64' : 'body.digest', message: 'no Tracebay evidence digest found: expected a proof PDF or 64 hexadecimal characters' },
      ]);
    }
    // A file must be one this shop handed out, byte for byte: a copy edited around the same digest is not.
    const issued = file ? await this.proofs.findIssued(actor.shopId, { fileSha256: sha256Hex(file) }) : await this.proofs.findIssued(actor.shopId, { digest });
    if (!issued) {
      const message = file
        ? 'This file is not a proof this shop issued: its bytes differ from every document handed out (altered, re-saved, or from elsewhere).'
        : 'No proof with this digest was issued by this shop: the document did not come from here, or it was altered.';
      return { matches: false, digest, known: false, message };
    }
    const then = issued.view as unknown as ProofView;
    let now: ProofView | null = null;
    try {
      now = await this.view(actor, issued.repairOrderId);
    } catch (error) {
      if (!(error instanceof DomainException) || error.code !== 'proof.not_yet') throw error;
    }
    const current = now ? proofDigest(now) : null;
    const base = { digest, known: true, repairOrder: { id: issued.repairOrderId, number: then.repairOrder.number }, issuedAt: issued.issuedAt.toISOString(), issuedBy: issued.issuedBy };
    if (current === digest) return { ...base, matches: true, currentDigest: current, changes: [] };
    const changes = now ? proofChanges(then, now) : [{ code: 'status.reopened', message: 'The repair order was reopened: the repair it proves is no longer current.' }];
    return { ...base, matches: false, currentDigest: current, changes };
  }
}

function normaliseDigest(text: string): string | null {
  const trimmed = text.trim();
  const hex = (trimmed.toUpperCase().startsWith(QR_PREFIX) ? trimmed.slice(QR_PREFIX.length) : trimmed).toLowerCase();
  return /^[0-9a-f]{64}$/.test(hex) ? hex : null;
}
