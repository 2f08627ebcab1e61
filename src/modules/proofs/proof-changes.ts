/**
 * What changed between the evidence a proof stated and the repair order's evidence now, in plain words: the
 * answer a warranty administrator needs when a document no longer matches.
 */
import { formatProbability, type ProofView } from '../../proof-render';

export interface ProofChange {
  code: string;
  message: string;
}

type Diff = (then: ProofView, now: ProofView) => ProofChange[];

const ids = (xs: Array<{ id: string }>) => new Set(xs.map((x) => x.id));
const supersededIn = (v: ProofView) => new Set([...v.diagnosis, ...v.verification].flatMap((s) => s.superseded.map((c) => `${c.takenAt}|${c.reading.entered}`)));

const readings: Diff = (then, now) => {
  const out: ProofChange[] = [];
  const thenIds = ids([...then.diagnosis, ...then.verification]);
  const nowIds = ids([...now.diagnosis, ...now.verification]);
  for (const s of [...now.diagnosis, ...now.verification]) {
    if (!thenIds.has(s.id)) out.push({ code: 'reading.added', message: `Reading added: ${s.title}, ${'reading' in s ? s.reading.entered : s.after.entered} at ${s.takenAt}.` });
  }
  const nowSuperseded = supersededIn(now);
  for (const s of [...then.diagnosis, ...then.verification]) {
    if (nowIds.has(s.id)) continue;
    const entered = 'reading' in s ? s.reading.entered : s.after.entered;
    const corrected = nowSuperseded.has(`${s.takenAt}|${entered}`);
    out.push(
      corrected
        ? { code: 'reading.superseded', message: `Reading corrected since: ${s.title}, ${entered} was replaced by a new reading.` }
        : { code: 'reading.removed', message: `Reading no longer on the document: ${s.title}, ${entered}.` },
    );
  }
  return out;
};

const decisions: Diff = (then, now) => {
  const a = then.signOff.decisions.at(-1);
  const b = now.signOff.decisions.at(-1);
  if (a?.decision === b?.decision && a?.at === b?.at) return [];
  if (b?.decision === 'approved' && a?.decision === 'approved') return [{ code: 'decision.approved', message: `Approved again since, on new evidence, by ${b.by} at ${b.at}.` }];
  if (a?.decision === 'approved' && b?.decision === 'withdrawn') return [{ code: 'approval.withdrawn', message: `Approval withdrawn by ${b.by} at ${b.at}${b.comment ? `: ${b.comment}` : ''}.` }];
  if (b) return [{ code: `decision.${b.decision}`, message: `Foreman decision since: ${b.decision} by ${b.by} at ${b.at}.` }];
  return [{ code: 'decision.changed', message: 'The foreman decisions differ.' }];
};

const repairs: Diff = (then, now) =>
  now.repairs.length > then.repairs.length
    ? now.repairs.slice(then.repairs.length).map((r) => ({ code: 'repair.added', message: `Repair recorded since: ${r.action} (${r.by}, ${r.at}).` }))
    : [];

type Causes = Array<{ circuitId: string; proven: boolean; cause: { code: string; label: string; probability: number } | null }>;
/** Documents of the first format carried one `rootCause`; read them as one cause. */
function causesOf(v: ProofView): Causes {
  const old = (v as unknown as { rootCause?: { circuitId: string; code: string; label: string; probability: number } | null }).rootCause;
  if (v.causes) return v.causes;
  return old ? [{ circuitId: old.circuitId, proven: true, cause: old }] : [];
}

const rootCause: Diff = (then, now) => {
  const key = (c: Causes[number]) => `${c.circuitId}|${c.proven}|${c.cause?.code}|${c.cause?.probability}`;
  const before = new Set(causesOf(then).map(key));
  return causesOf(now)
    .filter((c) => !before.has(key(c)))
    .map((c) => ({
      code: 'root_cause.changed',
      message: `Root cause now: ${c.proven && c.cause ? `${c.cause.label} (${formatProbability(c.cause.probability)})` : 'not proven'}.`,
    }));
};

const story: Diff = (then, now) =>
  (['complaint', 'cause', 'correction'] as const)
    .filter((k) => then.concern[k] !== now.concern[k])
    .map((k) => ({ code: `concern.${k}_changed`, message: `The ${k} text was changed.` }));

const dates: Diff = (then, now) =>
  (['repairedAt', 'verifiedAt'] as const)
    .filter((k) => then.repairOrder[k] !== now.repairOrder[k])
    .map((k) => ({ code: `status.${k}`, message: `${k === 'repairedAt' ? 'Repaired' : 'Verified'} date now ${now.repairOrder[k] ?? 'not set (reopened)'}.` }));

const DIFFS: Diff[] = [readings, repairs, rootCause, decisions, story, dates];

export function proofChanges(then: ProofView, now: ProofView): ProofChange[] {
  const changes = DIFFS.flatMap((diff) => diff(then, now));
  return changes.length ? changes : [{ code: 'other', message: 'Other details of the document changed (codes, vehicle or shop data).' }];
}
