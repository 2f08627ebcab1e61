/**
 * Builds the proof view model (everything the PDF states) from what is stored on the repair order and what the
 * engine concludes from it. A pure mapping: the same evidence gives the same view, so the same digest.
 */
import { LIMITS } from '../../common/limits';
import { genericMeaning } from '../../engine/codes';
import { healthyOutcome, requestKey, type Diagnosis, type Tree } from '../../engine/diagnosis';
import type {
  CautionCode, CircuitCause, CodeCheckMethod, DiagnosticStep, ExpectedRange, ProofView, Reading, SupersededReading, TroubleCode, VerificationCheck,
} from '../../proof-render';
import { CODE_CHECK_METHODS, evidenceDigest, inRange, PROOF_FORMAT, requiredCautions } from '../../proof-render';
import type { MeasurementRow } from '../measurements/measurements.repository';
import type { RepairOrderDetail } from '../repair-orders/repair-orders.repository';
import type { RepairRow } from '../repairs/repairs.repository';
import type { ReviewRow } from '../reviews/reviews.repository';
import { requestOf } from '../measurements/measurements.view';
import { zonedIso } from '../shop-settings/zoned-time';
import { isProven } from './proven';

export interface ProofEvidence {
  shop: { name: string; address: string; timeZone: string };
  order: RepairOrderDetail & {
    odometerOut?: number | null;
    codesAfterMethod?: string | null;
    codesAfterKeyCycles?: number | null;
    codesAfterNote?: string;
    codesAfterCheckedAt?: Date | null;
  };
  circuits: Array<{ id: string; label: string; kind: ProofView['circuits'][number]['kind']; tree: Tree; diagnosis: Diagnosis; readings: MeasurementRow[] }>;
  repairs: RepairRow[];
  reviews: ReviewRow[];
}

/** Text as the document can carry it: lone surrogates shown as U+FFFD, and cut (marked) where a limit bounds it. */
function fit(text: string, max: number = Number.MAX_SAFE_INTEGER): string {
  const clean = text.replace(/\p{Surrogate}/gu, '\uFFFD');
  return clean.length > max ? `${clean.slice(0, max - 1)}…` : clean;
}

const isCurrent = (m: MeasurementRow) => m.supersededBy === null;

export function buildProofView(e: ProofEvidence): ProofView {
  const { order } = e;
  const tz = e.shop.timeZone;
  const time = (d: Date) => zonedIso(d, tz);
  const name = (n: string) => fit(n, LIMITS.text.personName);

  const reading = (m: MeasurementRow): Reading =>
    m.overload
      ? { entered: 'OL', value: null, unit: m.unitEntered, si: null, siUnit: m.siUnit }
      : { entered: `${m.valueEntered} ${m.unitEntered}`, value: m.valueEntered, unit: m.unitEntered, si: m.valueSi, siUnit: m.siUnit };

  /** The readings a current reading replaced, oldest first, each with who replaced it. */
  const corrections = (current: MeasurementRow, byId: Map<string, MeasurementRow>): SupersededReading[] => {
    const chain: SupersededReading[] = [];
    let newer = current;
    while (newer.supersedesId) {
      const older = byId.get(newer.supersedesId);
      if (!older) break;
      chain.unshift({
        reading: reading(older),
        takenAt: time(older.takenAt),
        takenBy: name(older.takenBy.name),
        correctedAt: time(newer.takenAt),
        correctedBy: name(newer.takenBy.name),
        reason: fit(newer.note || 'corrected reading'),
      });
      newer = older;
    }
    return chain;
  };

  const expectedFor = (tree: Tree, m: MeasurementRow): ExpectedRange | null => {
    const test = tree.testByRequest.get(requestKey(requestOf(m)));
    const healthy = test && healthyOutcome(tree, test);
    return healthy ? { min: healthy.min, max: healthy.max, unit: healthy.unit } : null;
  };
  const titleFor = (tree: Tree, m: MeasurementRow) =>
    fit(tree.testByRequest.get(requestKey(requestOf(m)))?.label ?? `Reading not asked for by the fault tree (${tree.title})`);

  const steps: DiagnosticStep[] = [];
  const checks: VerificationCheck[] = [];
  const all = e.circuits.flatMap((c) => c.readings.map((m) => ({ c, m })));
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
      outcome: { code: entry?.outcomeId ?? entry?.verdict ?? 'not_classified', label: fit(entry?.outcomeLabel ?? entry?.note ?? 'not classified') },
      takenAt: time(m.takenAt),
      takenBy: name(m.takenBy.name),
      superseded: corrections(m, byId),
      ...(m.note ? { note: fit(m.note) } : {}),
    });
  }

  const stepIds = new Set(steps.map((s) => s.id));
  const causes: CircuitCause[] = e.circuits.map((c) => causeOf(c, stepIds));
  const deciding = new Set(causes.flatMap((c) => c.decidingStepIds));

  for (const { c, m } of ordered.filter(({ m }) => m.phase === 'verification')) {
    const key = requestKey(requestOf(m));
    const before = [...steps].reverse().find((s) => s.circuitId === c.id && requestKey(s.request) === key);
    const after = reading(m);
    const expected = before?.expected ?? expectedFor(c.tree, m);
    checks.push({
      id: m.id,
      seq: checks.length + 1,
      circuitId: c.id,
      repeatsStepId: before?.id ?? null,
      title: before?.title ?? titleFor(c.tree, m),
      request: requestOf(m),
      before: before?.reading ?? null,
      after,
      expected,
      pass: expected ? inRange(after.si, after.siUnit, expected) : null,
      provesFix: before !== undefined && deciding.has(before.id),
      takenAt: time(m.takenAt),
      takenBy: name(m.takenBy.name),
      superseded: corrections(m, byId),
      ...(m.note ? { note: fit(m.note) } : {}),
    });
  }

  const reached = (status: string) => order.statusLog.filter((s) => s.toStatus === status).at(-1)?.at ?? null;
  const repairedAt = reached('repaired');
  const verifiedAt = reached('verified');
  const proven = causes.filter((c) => c.proven && c.cause);
  const actions = e.repairs.map((r) => r.action).join('; ');
  const latest = e.reviews.at(-1);
  const describe = (code: string): TroubleCode => ({ code, description: genericMeaning(code)?.meaning ?? 'see the manufacturer’s service information', status: 'current' });

  const view: ProofView = {
    format: PROOF_FORMAT,
    shop: {
      name: fit(e.shop.name, LIMITS.text.shopName),
      addressLines: e.shop.address.split(/\s*[,\n]\s*/).filter(Boolean).slice(0, 4).map((l) => fit(l, LIMITS.text.shopAddressLine)),
      timeZone: tz,
    },
    repairOrder: { number: order.number, openedAt: time(order.createdAt), repairedAt: repairedAt && time(repairedAt), verifiedAt: verifiedAt && time(verifiedAt) },
    technician: technicianOf(e),
    foreman: latest ? { name: name(latest.by.name), id: latest.by.id } : null,
    vehicle: {
      vin: order.vehicle.vin,
      vinCheck: order.vehicle.outsideNorthAmerica ? 'not_checked_outside_na' : 'valid',
      year: order.vehicle.year,
      make: order.vehicle.make,
      model: order.vehicle.model,
      engine: fit(order.vehicle.engine || 'not recorded'),
      odometer: { in: order.odometerIn ?? order.vehicle.odometer, out: order.odometerOut ?? null, unit: order.vehicle.odometerUnit === 'km' ? 'km' : 'mi' },
    },
    // Cause and correction default to what the engine proved and what was recorded as repaired: nobody retypes.
    concern: {
      complaint: fit(order.complaint),
      cause: fit(order.cause || (proven.length ? proven.map((c) => c.cause!.label).join('; ') : 'Not proven: see "Root cause".'), LIMITS.text.cause),
      correction: fit(order.correction || (actions && actions.length <= LIMITS.text.correction ? actions : actions ? `${e.repairs.length} repairs: see "Repair performed".` : 'Not recorded.')),
    },
    troubleCodes: {
      found: order.codes.map(describe),
      afterRepair: {
        check:
          order.codesAfterCheckedAt && isMethod(order.codesAfterMethod)
            ? {
                method: order.codesAfterMethod,
                keyCycles: order.codesAfterKeyCycles ?? null,
                checkedAt: time(order.codesAfterCheckedAt),
                ...(order.codesAfterNote ? { note: fit(order.codesAfterNote) } : {}),
              }
            : null,
        codes: order.codesAfter.map(describe),
      },
    },
    circuits: e.circuits.map((c) => ({ id: c.id, name: fit(c.label, LIMITS.text.circuitLabel), kind: c.kind })),
    diagnosis: steps,
    causes,
    repairs: e.repairs.map((r) => ({
      circuitId: r.circuitId,
      labour: {
        clockOnAt: r.clockOnAt ? time(r.clockOnAt) : null,
        clockOffAt: r.clockOffAt ? time(r.clockOffAt) : null,
        minutes: r.labourMinutes ?? (r.clockOnAt && r.clockOffAt ? Math.round((r.clockOffAt.getTime() - r.clockOnAt.getTime()) / 60_000) : null),
      },
      action: fit(r.action),
      location: fit([r.part, r.location].filter(Boolean).join(': ')),
      parts: (r.parts as Array<{ name: string; number?: string; quantity: number }>).map((p) => ({ description: fit(p.name), quantity: p.quantity, ...(p.number ? { number: fit(p.number) } : {}) })),
      by: name(r.by.name),
      at: time(r.at),
      ...(r.note ? { note: fit(r.note) } : {}),
    })),
    verification: checks,
    signOff: {
      technicianSignedAt: verifiedAt ? time(verifiedAt) : repairedAt ? time(repairedAt) : null,
      foremanSignedAt: null,
      decisions: e.reviews.map((r) => ({
        decision: r.decision,
        by: name(r.by.name),
        at: time(r.at),
        ...(r.comment ? { comment: fit(r.comment) } : {}),
        ...(r.evidenceDigest ? { evidenceDigest: r.evidenceDigest } : {}),
      })),
    },
    cautions: [],
  };
  view.cautions = cautionsFor(view, order.vehicle.highVoltageSystem);
  // The foreman has signed only an approval of exactly this evidence; an older one is stale.
  if (latest?.decision === 'approved' && latest.evidenceDigest === evidenceDigest(view)) view.signOff.foremanSignedAt = time(latest.at);
  return view;
}

const isMethod = (m: string | null | undefined): m is CodeCheckMethod => (CODE_CHECK_METHODS as readonly string[]).includes(m ?? '');

/** What a circuit's diagnosis established: a proven cause with the readings that decided it, or "not proven". */
function causeOf(c: ProofEvidence['circuits'][number], stepIds: Set<string>): CircuitCause {
  const d = c.diagnosis;
  const candidate = (h: { id: string; label: string; probability: number }) => ({ code: h.id, label: fit(h.label), probability: h.probability });
  if (isProven(d)) {
    const conclusion = d.conclusion!;
    const confirmedBy = (conclusion as { confirmedBy?: string[] }).confirmedBy ?? [];
    const ids = [...new Set([...confirmedBy, ...conclusion.decidedBy])].filter((id) => stepIds.has(id));
    const noFault = conclusion.repair.part === 'none';
    return {
      circuitId: c.id,
      proven: true,
      cause: candidate({ id: conclusion.hypothesisId, label: conclusion.label, probability: conclusion.probability }),
      leading: [],
      decidingStepIds: ids,
      ...(noFault ? { advice: fit(conclusion.repair.action) } : {}),
    };
  }
  const undecided = (d as { undecided?: { leading: Array<{ id: string; label: string; probability: number }>; advice: string } | null }).undecided;
  const leading = (undecided?.leading ?? d.ranked.slice(0, 3)).map(candidate);
  const advice =
    undecided?.advice ??
    (d.path.length === 0
      ? 'No readings were taken on this circuit.'
      : d.nextTest
        ? `The diagnosis was not finished: the next test would have been "${d.nextTest.label}". No repair follows from it.`
        : 'No test was left that could prove a cause: look for an intermittent fault (wiggle test) or a fault outside this circuit.');
  return { circuitId: c.id, proven: false, cause: null, leading, decidingStepIds: [], advice: fit(advice) };
}

/** Who acted as the technician: the one assigned if they took readings or repaired, else whoever repaired, else whoever measured. */
function technicianOf(e: ProofEvidence): ProofView['technician'] {
  const acted = [
    ...e.repairs.map((r) => r.by),
    ...e.circuits.flatMap((c) => c.readings.map((m) => m.takenBy)),
  ];
  const assigned = e.order.technician;
  const who = (assigned && acted.find((p) => p.id === assigned.id)) ?? e.repairs.at(-1)?.by ?? acted[0];
  return who ? { name: fit(who.name, LIMITS.text.personName), id: who.id } : null;
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
