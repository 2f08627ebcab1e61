/**
 * Builds the proof view model (everything the PDF states) from what is stored on the repair order and what the
 * engine concludes from it. A pure mapping: the same evidence gives the same view, so the same digest.
 */
import { genericMeaning } from '../../engine/codes';
import { healthyOutcome, requestKey, type Diagnosis, type Tree } from '../../engine/diagnosis';
import type { CautionCode, DiagnosticStep, ExpectedRange, ProofView, Reading, SupersededReading, VerificationCheck } from '../../proof-render';
import { PROOF_FORMAT, requiredCautions } from '../../proof-render';
import type { MeasurementRow } from '../measurements/measurements.repository';
import type { RepairOrderDetail } from '../repair-orders/repair-orders.repository';
import type { RepairRow } from '../repairs/repairs.repository';
import type { ReviewRow } from '../reviews/reviews.repository';
import { requestOf } from '../measurements/measurements.view';

export interface ProofEvidence {
  shop: { name: string; address: string };
  order: RepairOrderDetail;
  foremanName: string;
  circuits: Array<{ id: string; label: string; kind: ProofView['circuits'][number]['kind']; tree: Tree; diagnosis: Diagnosis; readings: MeasurementRow[] }>;
  repairs: RepairRow[];
  reviews: ReviewRow[];
}

const iso = (d: Date) => d.toISOString();

function reading(m: MeasurementRow): Reading {
  if (m.overload) return { entered: 'OL', value: null, unit: m.unitEntered, si: null, siUnit: m.siUnit };
  return { entered: `${m.valueEntered} ${m.unitEntered}`, value: m.valueEntered, unit: m.unitEntered, si: m.valueSi, siUnit: m.siUnit };
}

/** The readings a current reading replaced, oldest first, each with who replaced it. */
function corrections(current: MeasurementRow, byId: Map<string, MeasurementRow>): SupersededReading[] {
  const chain: SupersededReading[] = [];
  let newer = current;
  while (newer.supersedesId) {
    const older = byId.get(newer.supersedesId);
    if (!older) break;
    chain.unshift({
      reading: reading(older),
      takenAt: iso(older.takenAt),
      takenBy: older.takenBy.name,
      correctedAt: iso(newer.takenAt),
      correctedBy: newer.takenBy.name,
      reason: newer.note || 'corrected reading',
    });
    newer = older;
  }
  return chain;
}

function expectedFor(tree: Tree, m: MeasurementRow): ExpectedRange | null {
  const test = tree.testByRequest.get(requestKey(requestOf(m)));
  const healthy = test && healthyOutcome(tree, test);
  return healthy ? { min: healthy.min, max: healthy.max, unit: healthy.unit } : null;
}

function titleFor(tree: Tree, m: MeasurementRow): string {
  return tree.testByRequest.get(requestKey(requestOf(m)))?.label ?? `Reading not asked for by the fault tree (${tree.title})`;
}

const isCurrent = (m: MeasurementRow) => m.supersededBy === null;

export function buildProofView(e: ProofEvidence): ProofView {
  const { order } = e;
  const steps: DiagnosticStep[] = [];
  const checks: VerificationCheck[] = [];
  const byCircuit = [...e.circuits];
  const all = byCircuit.flatMap((c) => c.readings.map((m) => ({ c, m })));
  const byId = new Map(all.map(({ m }) => [m.id, m]));
  const ordered = all.filter(({ m }) => isCurrent(m)).sort((a, b) => a.m.takenAt.getTime() - b.m.takenAt.getTime() || a.m.seq - b.m.seq);

  for (const { c, m } of ordered.filter(({ m }) => m.phase === 'diagnosis')) {
    const entry = c.diagnosis.path.find((p) => p.readingId === m.id);
    steps.push({
      id: m.id,
      seq: steps.length + 1,
      circuitId: c.id,
      title: titleFor(c.tree, m),
      request: requestOf(m),
      reading: reading(m),
      expected: expectedFor(c.tree, m),
      outcome: { code: entry?.outcomeId ?? entry?.verdict ?? 'not_classified', label: entry?.outcomeLabel ?? entry?.note ?? 'not classified' },
      takenAt: iso(m.takenAt),
      takenBy: m.takenBy.name,
      superseded: corrections(m, byId),
      ...(m.note ? { note: m.note } : {}),
    });
  }

  for (const { c, m } of ordered.filter(({ m }) => m.phase === 'verification')) {
    const key = requestKey(requestOf(m));
    const before = [...steps].reverse().find((s) => s.circuitId === c.id && requestKey(s.request) === key);
    // A check repeats a diagnostic step with a band; other after-repair readings stay in the readings API.
    if (!before?.expected) continue;
    const expected = before.expected;
    const si = m.overload ? Number.POSITIVE_INFINITY : (m.valueSi as number);
    const pass = (expected.min === null || si >= expected.min) && (expected.max === null || si <= expected.max);
    checks.push({
      id: m.id,
      seq: checks.length + 1,
      circuitId: c.id,
      repeatsStepId: before.id,
      title: before.title,
      request: requestOf(m),
      before: before.reading,
      after: reading(m),
      expected,
      pass,
      takenAt: iso(m.takenAt),
      takenBy: m.takenBy.name,
      superseded: corrections(m, byId),
      ...(m.note ? { note: m.note } : {}),
    });
  }

  const concluded = byCircuit
    .filter((c) => c.diagnosis.conclusion)
    .sort((a, b) => b.diagnosis.conclusion!.probability - a.diagnosis.conclusion!.probability)[0];
  const stepIds = new Set(steps.map((s) => s.id));
  const rootCause = concluded
    ? {
        code: concluded.diagnosis.conclusion!.hypothesisId,
        label: concluded.diagnosis.conclusion!.label,
        probability: concluded.diagnosis.conclusion!.probability,
        circuitId: concluded.id,
        decidingStepIds: concluded.diagnosis.conclusion!.decidedBy.filter((id) => stepIds.has(id)),
      }
    : null;

  const latestApproval = [...e.reviews].reverse()[0];
  const reached = (status: string) => order.statusLog.filter((s) => s.toStatus === status).at(-1)?.at ?? null;
  const repairedAt = reached('repaired');
  const verifiedAt = reached('verified');
  const view: ProofView = {
    format: PROOF_FORMAT,
    shop: { name: e.shop.name, addressLines: e.shop.address.split(/\s*[,\n]\s*/).filter(Boolean).slice(0, 4) },
    repairOrder: { number: order.number, openedAt: iso(order.createdAt), repairedAt: repairedAt && iso(repairedAt), verifiedAt: verifiedAt && iso(verifiedAt) },
    technician: { name: order.technician?.name ?? 'not assigned' },
    foreman: { name: latestApproval?.by.name ?? e.foremanName },
    vehicle: {
      vin: order.vehicle.vin,
      vinCheck: order.vehicle.outsideNorthAmerica ? 'not_checked_outside_na' : 'valid',
      year: order.vehicle.year,
      make: order.vehicle.make,
      model: order.vehicle.model,
      engine: order.vehicle.engine || 'not recorded',
      odometer: { value: order.odometerIn ?? order.vehicle.odometer, unit: order.vehicle.odometerUnit === 'km' ? 'km' : 'mi' },
    },
    // Cause and correction default to what the engine concluded and what was recorded as repaired: nobody retypes.
    concern: {
      complaint: order.complaint,
      cause: order.cause || rootCause?.label || 'Not recorded.',
      correction: order.correction || e.repairs.map((r) => r.action).join('; ') || 'Not recorded.',
    },
    troubleCodes: {
      found: order.codes.map((code) => ({ code, description: genericMeaning(code)?.meaning ?? 'see the manufacturer’s service information', status: 'current' as const })),
      afterRepair: order.codesAfter.map((code) => ({ code, description: genericMeaning(code)?.meaning ?? 'see the manufacturer’s service information', status: 'current' as const })),
    },
    circuits: byCircuit.map((c) => ({ id: c.id, name: c.label, kind: c.kind })),
    diagnosis: steps,
    rootCause,
    repairs: e.repairs.map((r) => ({
      action: r.action,
      location: [r.part, r.location].filter(Boolean).join(': '),
      parts: (r.parts as Array<{ name: string; number?: string; quantity: number }>).map((p) => ({ description: p.name, quantity: p.quantity, ...(p.number ? { number: p.number } : {}) })),
      by: r.by.name,
      at: iso(r.at),
      ...(r.note ? { note: r.note } : {}),
    })),
    verification: checks,
    signOff: {
      technicianSignedAt: verifiedAt ? iso(verifiedAt) : repairedAt ? iso(repairedAt) : null,
      foremanSignedAt: latestApproval?.decision === 'approved' ? iso(latestApproval.at) : null,
      decisions: e.reviews.map((r) => ({ decision: r.decision, by: r.by.name, at: iso(r.at), ...(r.comment ? { comment: r.comment } : {}) })),
    },
    cautions: [],
  };
  view.cautions = cautionsFor(view, order.vehicle.highVoltageSystem);
  return view;
}

/**
 * The cautions the work called for: those the readings' conditions imply, the airbag caution wherever an ohmmeter
 * was used, and the high-voltage caution on a vehicle marked as having a high-voltage system.
 */
function cautionsFor(view: ProofView, highVoltageSystem: boolean): CautionCode[] {
  const ohmmeter = [...view.diagnosis.map((s) => s.request), ...view.verification.map((c) => c.request)].some((r) => r.quantity === 'ohms');
  const implied = requiredCautions(view);
  const extra: CautionCode[] = [...(ohmmeter ? (['no_ohmmeter_on_airbag'] as const) : []), ...(highVoltageSystem ? (['high_voltage_system'] as const) : [])];
  return [...new Set<CautionCode>([...implied, ...extra])];
}
