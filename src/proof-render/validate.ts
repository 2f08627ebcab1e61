/**
 * Validation of a proof view: the zod shape first, then the rules a document must not break (ids that resolve,
 * numbers that agree with their units, a pass that agrees with the band, a sign-off that agrees with the decisions,
 * the cautions the readings themselves call for). Each rule is one entry of a table, run in order.
 */
import type { MeasurementRequest } from '../engine/vocabulary';
import { issueCode } from '../engine/request-schema';
import type { Finding } from './findings';
import { evidenceDigest } from './digest';
import { proofViewSchema } from './schema';
import { convertTo, nearlyEqual } from './units';
import { computeCheckDigit } from '../engine/vin';
import type { CautionCode, ExpectedRange, ProofView, Reading, SupersededReading } from './view';
import { CAUTION_CODES } from './view';

export type ValidationResult = { ok: true; view: ProofView } | { ok: false; findings: Finding[] };

export function validateProofView(input: unknown): ValidationResult {
  const parsed = proofViewSchema.safeParse(input);
  if (!parsed.success) {
    return {
      ok: false,
      findings: parsed.error.issues.map((issue) => ({
        code: issueCode(issue).startsWith('request.') ? issueCode(issue) : `schema.${issue.code}`,
        path: pointer(issue.path),
        message: issue.message,
      })),
    };
  }
  const view = input as ProofView; // identical to parsed.data: the schema has no defaults or transforms
  const findings = RULES.flatMap((rule) => rule(view));
  return findings.length ? { ok: false, findings } : { ok: true, view };
}

function pointer(path: ReadonlyArray<PropertyKey>): string {
  return path.length ? `/${path.map((p) => String(p).replace(/~/g, '~0').replace(/\//g, '~1')).join('/')}` : '/';
}

/** The cautions the recorded tests imply on their own (airbag and high-voltage work is the caller's to add). */
export function requiredCautions(view: Pick<ProofView, 'diagnosis' | 'verification'>): CautionCode[] {
  const requests: MeasurementRequest[] = [...view.diagnosis, ...view.verification].map((t) => t.request);
  const need = new Set<CautionCode>();
  for (const r of requests) {
    if (r.engine !== 'off') need.add('engine_in_bay');
    if (r.jumpers.length > 0) need.add('fused_jumpers_only');
    if (r.connector === 'backprobed') need.add('backprobe_gently');
  }
  return CAUTION_CODES.filter((c) => need.has(c));
}

type Rule = (view: ProofView) => Finding[];
const f = (code: string, path: string, message: string): Finding => ({ code, path, message });
const ms = (iso: string) => Date.parse(iso);

const QUANTITY_SI: Record<MeasurementRequest['quantity'], string | null> = {
  dc_volts: 'V',
  ohms: 'Ω',
  amps: 'A',
  scan_value: null,
};

function readingFindings(r: Reading, path: string): Finding[] {
  if ((r.value === null) !== (r.si === null)) {
    return [f('reading.over_range_mismatch', path, 'value and si must both be numbers, or both null for an over-range reading')];
  }
  if (r.value === null || r.si === null) return [];
  const converted = convertTo(r.value, r.unit, r.siUnit);
  if (converted === null) return [f('reading.unit_not_convertible', `${path}/siUnit`, `"${r.unit}" does not convert to "${r.siUnit}"`)];
  if (!nearlyEqual(converted, r.si)) {
    return [f('reading.si_mismatch', `${path}/si`, `${r.value} ${r.unit} is ${converted} ${r.siUnit}, not ${r.si}`)];
  }
  return [];
}

function rangeFindings(e: ExpectedRange, siUnit: string, path: string): Finding[] {
  const out: Finding[] = [];
  if (e.min === null && e.max === null) out.push(f('expected.no_bounds', path, 'an expected range needs a min, a max or both'));
  if (e.min !== null && e.max !== null && e.min > e.max) out.push(f('expected.min_above_max', path, `min ${e.min} is above max ${e.max}`));
  if (convertTo(0, e.unit, siUnit) === null) {
    out.push(f('expected.unit_not_convertible', `${path}/unit`, `range unit "${e.unit}" does not convert to the reading's "${siUnit}"`));
  }
  return out;
}

function requestFindings(r: MeasurementRequest, siUnit: string, path: string): Finding[] {
  const out: Finding[] = [];
  const want = QUANTITY_SI[r.quantity];
  if (want && siUnit.replace(/\u2126/g, 'Ω') !== want) {
    out.push(f('request.unit_quantity_mismatch', path, `a ${r.quantity} reading is in ${want}, but its siUnit is "${siUnit}"`));
  }
  return out;
}

function supersededFindings(list: SupersededReading[], path: string): Finding[] {
  return list.flatMap((s, i) => [
    ...readingFindings(s.reading, `${path}/${i}/reading`),
    ...(ms(s.correctedAt) < ms(s.takenAt) ? [f('superseded.corrected_before_taken', `${path}/${i}/correctedAt`, 'a correction cannot precede the reading it corrects')] : []),
  ]);
}

/** Whether an SI value lies in a range printed in another unit; null (over-range) passes only without a max. */
export function inRange(si: number | null, siUnit: string, e: ExpectedRange): boolean {
  const lo = e.min === null ? null : convertTo(e.min, e.unit, siUnit);
  const hi = e.max === null ? null : convertTo(e.max, e.unit, siUnit);
  if (si === null) return hi === null;
  const tol = (x: number) => 1e-9 * Math.max(1, Math.abs(x));
  return (lo === null || si >= lo - tol(lo)) && (hi === null || si <= hi + tol(hi));
}

function uniqueIds(items: Array<{ id: string }>, path: string, what: string): Finding[] {
  const seen = new Set<string>();
  return items.flatMap((item, i) => {
    if (seen.has(item.id)) return [f('id.duplicate', `${path}/${i}/id`, `${what} id "${item.id}" appears twice`)];
    seen.add(item.id);
    return [];
  });
}

function increasingSeq(items: Array<{ seq: number }>, path: string): Finding[] {
  return items.flatMap((item, i) =>
    i > 0 && item.seq <= items[i - 1]!.seq
      ? [f('order.seq_not_increasing', `${path}/${i}/seq`, `seq ${item.seq} follows ${items[i - 1]!.seq}; list the tests in the order taken`)]
      : [],
  );
}

const RULES: Rule[] = [
  (v) => {
    const matches = vinCheckDigitMatches(v.vehicle.vin);
    if (v.vehicle.vinCheck === 'valid' && !matches) return [f('vin.check_digit_claimed_valid', '/vehicle/vinCheck', `check digit of ${v.vehicle.vin} does not match (49 CFR 565.15)`)];
    if (v.vehicle.vinCheck === 'invalid' && matches) return [f('vin.check_digit_claimed_invalid', '/vehicle/vinCheck', `check digit of ${v.vehicle.vin} matches (49 CFR 565.15)`)];
    return [];
  },
  (v) => [
    ...uniqueIds(v.circuits, '/circuits', 'circuit'),
    ...uniqueIds(v.diagnosis, '/diagnosis', 'step'),
    ...uniqueIds(v.verification, '/verification', 'check'),
    ...increasingSeq(v.diagnosis, '/diagnosis'),
    ...increasingSeq(v.verification, '/verification'),
  ],
  (v) => {
    const circuits = new Set(v.circuits.map((c) => c.id));
    const steps = new Set(v.diagnosis.map((s) => s.id));
    const out: Finding[] = [];
    v.diagnosis.forEach((s, i) => {
      if (!circuits.has(s.circuitId)) out.push(f('ref.unknown_circuit', `/diagnosis/${i}/circuitId`, `no circuit "${s.circuitId}"`));
    });
    v.verification.forEach((c, i) => {
      if (!circuits.has(c.circuitId)) out.push(f('ref.unknown_circuit', `/verification/${i}/circuitId`, `no circuit "${c.circuitId}"`));
      if (c.repeatsStepId !== null && !steps.has(c.repeatsStepId)) out.push(f('ref.unknown_step', `/verification/${i}/repeatsStepId`, `no diagnostic step "${c.repeatsStepId}"`));
    });
    v.causes.forEach((c, i) => {
      if (!circuits.has(c.circuitId)) out.push(f('ref.unknown_circuit', `/causes/${i}/circuitId`, `no circuit "${c.circuitId}"`));
      if (c.proven && c.cause === null) out.push(f('cause.proven_without_cause', `/causes/${i}/cause`, 'a proven cause names the cause'));
      if (!c.proven && c.cause !== null) out.push(f('cause.unproven_named', `/causes/${i}/cause`, 'a cause that is not proven is not printed as the root cause; list it among the leading candidates'));
      c.decidingStepIds.forEach((sid, j) => {
        if (!steps.has(sid)) out.push(f('ref.unknown_step', `/causes/${i}/decidingStepIds/${j}`, `no diagnostic step "${sid}"`));
      });
    });
    v.repairs.forEach((r, i) => {
      if (r.circuitId !== null && !circuits.has(r.circuitId)) out.push(f('ref.unknown_circuit', `/repairs/${i}/circuitId`, `no circuit "${r.circuitId}"`));
    });
    return out;
  },
  (v) =>
    v.diagnosis.flatMap((s, i) => [
      ...readingFindings(s.reading, `/diagnosis/${i}/reading`),
      ...(s.expected ? rangeFindings(s.expected, s.reading.siUnit, `/diagnosis/${i}/expected`) : []),
      ...requestFindings(s.request, s.reading.siUnit, `/diagnosis/${i}/request`),
      ...supersededFindings(s.superseded, `/diagnosis/${i}/superseded`),
    ]),
  (v) =>
    v.verification.flatMap((c, i) => {
      const base = `/verification/${i}`;
      const out = [
        ...(c.before ? readingFindings(c.before, `${base}/before`) : []),
        ...readingFindings(c.after, `${base}/after`),
        ...(c.expected ? rangeFindings(c.expected, c.after.siUnit, `${base}/expected`) : []),
        ...requestFindings(c.request, c.after.siUnit, `${base}/request`),
        ...supersededFindings(c.superseded, `${base}/superseded`),
      ];
      if (c.before && c.before.siUnit !== c.after.siUnit) out.push(f('verification.unit_changed', `${base}/after/siUnit`, `before is in ${c.before.siUnit}, after in ${c.after.siUnit}`));
      if ((c.expected === null) !== (c.pass === null)) out.push(f('verification.pass_without_band', `${base}/pass`, 'a check passes or fails against a band: both set, or both null'));
      else if (out.length === 0 && c.expected && inRange(c.after.si, c.after.siUnit, c.expected) !== c.pass) {
        out.push(f('verification.pass_disagrees', `${base}/pass`, `pass is ${c.pass} but ${c.after.entered} is ${c.pass ? 'outside' : 'inside'} the expected range`));
      }
      return out;
    }),
  (v) => {
    const out: Finding[] = [];
    const d = v.signOff.decisions;
    d.forEach((dec, i) => {
      if (i > 0 && ms(dec.at) < ms(d[i - 1]!.at)) out.push(f('order.decisions_not_chronological', `/signOff/decisions/${i}/at`, 'list foreman decisions oldest first'));
      if (dec.decision !== 'approved' && !dec.comment) out.push(f('sign_off.returned_without_comment', `/signOff/decisions/${i}/comment`, `a ${dec.decision} decision says why`));
    });
    const latest = d[d.length - 1];
    if (v.signOff.foremanSignedAt !== null && latest?.decision !== 'approved') {
      out.push(f('sign_off.foreman_signed_without_approval', '/signOff/foremanSignedAt', 'the foreman signs only with an approval as the latest decision'));
    } else if (v.signOff.foremanSignedAt !== null && latest?.evidenceDigest !== evidenceDigest(v)) {
      out.push(f('sign_off.foreman_signed_stale_approval', '/signOff/foremanSignedAt', 'the approval was given on other evidence than this document states: it is stale, not a signature'));
    }
    return out;
  },
  (v) => {
    const out: Finding[] = [];
    const seen = new Set<CautionCode>();
    v.cautions.forEach((c, i) => {
      if (seen.has(c)) out.push(f('cautions.duplicate', `/cautions/${i}`, `caution "${c}" listed twice`));
      seen.add(c);
    });
    for (const need of requiredCautions(v)) {
      if (!seen.has(need)) out.push(f('cautions.missing', '/cautions', `the recorded tests call for the "${need}" caution`));
    }
    return out;
  },
];

/** Whether position 9 carries the 49 CFR 565 check digit (the engine's VIN rule). */
function vinCheckDigitMatches(vin: string): boolean {
  const computed = computeCheckDigit(vin);
  return computed.ok && vin[8] === computed.checkDigit;
}
