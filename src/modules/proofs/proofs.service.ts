import { Injectable } from '@nestjs/common';
import { ConflictException, DomainException, InvalidInputException } from '../../common/errors/domain.exception';
import { parseDigest, proofDigest, sha256Hex, tryRenderProof, type ProofView } from '../../proof-render';
import type { Actor } from '../identity/actor';
import { ShopSettingsService } from '../shop-settings/shop-settings.service';
import { zonedIso } from '../shop-settings/zoned-time';
import { EvidenceService } from './evidence.service';
import { proofChanges } from './proof-changes';
import { ProofsRepository } from './proofs.repository';

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

/** What changed, as kinds of change only: the public check names no readings and no people. */
const CHANGE_KINDS: Array<[RegExp, string]> = [
  [/^reading\./, 'readings added or corrected'],
  [/^repair\./, 'a repair recorded'],
  [/^(approval|decision)\./, 'the foreman’s decision'],
  [/^root_cause\./, 'the diagnosis'],
  [/^status\./, 'the repair order’s status'],
  [/^concern\./, 'the complaint, cause or correction text'],
];

export type VerifyInput = { digest: string } | { pdf: Buffer; field: string };

@Injectable()
export class ProofsService {
  constructor(
    private readonly evidence: EvidenceService,
    private readonly proofs: ProofsRepository,
    private readonly shops: ShopSettingsService,
  ) {}

  /** Renders the proof on the shop's paper and remembers what it stated, so the document can be checked later. */
  async pdf(actor: Actor, repairOrderId: string, publicBase?: string): Promise<{ pdf: Buffer; digest: string; number: string }> {
    const view = await this.evidence.view(actor, repairOrderId);
    if (view.circuits.length === 0) {
      throw new ConflictException('proof.no_circuit', 'The repair order has no circuit under test, so there is no diagnostic path to prove.');
    }
    const shop = await this.shops.of(actor.shopId);
    const rendered = await tryRenderProof(view, { paper: shop.paperSize === 'Letter' ? 'LETTER' : 'A4', ...(publicBase ? { publicBase } : {}) });
    // The view is built from validated data; a refusal here is a defect, reported with its findings.
    if (!rendered.ok) throw new Error(`proof view refused: ${JSON.stringify(rendered.findings.slice(0, 3))}`);
    await this.proofs.remember(repairOrderId, rendered.digest, sha256Hex(rendered.pdf), view, actor.userId);
    return { pdf: rendered.pdf, digest: rendered.digest, number: view.repairOrder.number };
  }

  /** Whether a document (or its digest) still matches the repair order's evidence, and if not, what changed. */
  async verify(actor: Actor, input: VerifyInput) {
    const file = 'pdf' in input ? input.pdf : null;
    const digest = file ? digestFromPdf(file) : parseDigest((input as { digest: string }).digest);
    if (!digest) {
      throw new InvalidInputException([
        { code: 'proof.no_digest', path: 'pdf' in input ? input.field : 'body.digest', message: 'no Tracebay evidence digest found: expected a proof PDF, or 64 hexadecimal characters (with or without "sha256:")' },
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
    const { current, changes } = await this.compare(actor, issued.repairOrderId, issued.view as unknown as ProofView);
    const base = { digest, known: true, repairOrder: { id: issued.repairOrderId, number: (issued.view as unknown as ProofView).repairOrder.number }, issuedAt: issued.issuedAt.toISOString(), issuedBy: issued.issuedBy };
    return { ...base, matches: current === digest, currentDigest: current, changes };
  }

  /**
   * The check anyone holding the document may make, signed out: whether the digest is known, which shop issued it
   * when, for which repair order and VIN, and whether it is still current (or what kind of change superseded it).
   * No names of people, no readings. A shop that switched the public check off answers like an unknown digest.
   */
  async publicCheck(text: string) {
    const digest = parseDigest(text);
    if (!digest) {
      throw new InvalidInputException([{ code: 'proof.digest_malformed', path: 'params.digest', message: 'a proof digest: 64 hexadecimal characters, with or without "sha256:"' }]);
    }
    const issued = await this.proofs.findIssued(null, { digest });
    if (!issued || !issued.repairOrder.shop.publicProofCheck) {
      return { known: false as const, digest, message: 'No proof with this digest can be checked here: it was not issued by this service, it was altered, or its shop does not offer the check.' };
    }
    const then = issued.view as unknown as ProofView;
    const shop = issued.repairOrder.shop;
    const system: Actor = { userId: issued.issuedBy.id, shopId: issued.repairOrder.shopId, name: 'public check', role: 'foreman' };
    const { current, changes } = await this.compare(system, issued.repairOrderId, then);
    const kinds = [...new Set(changes.map((c) => CHANGE_KINDS.find(([re]) => re.test(c.code))?.[1] ?? 'other details of the document'))];
    return {
      known: true as const,
      digest,
      shop: shop.name,
      issuedOn: zonedIso(issued.issuedAt, shop.timeZone).slice(0, 10),
      repairOrderNumber: then.repairOrder.number,
      vin: then.vehicle.vin,
      current: current === digest,
      supersededBy: current === digest ? [] : kinds,
    };
  }

  private async compare(actor: Actor, repairOrderId: string, then: ProofView) {
    let now: ProofView | null = null;
    try {
      now = await this.evidence.view(actor, repairOrderId);
    } catch (error) {
      if (!(error instanceof DomainException) || error.code !== 'proof.not_yet') throw error;
    }
    const current = now ? proofDigest(now) : null;
    const changes =
      current === proofDigest(then) ? [] : now ? proofChanges(then, now) : [{ code: 'status.reopened', message: 'The repair order was reopened: the repair it proves is no longer current.' }];
    return { current, changes };
  }
}
