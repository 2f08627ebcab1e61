/**
 * What each reading means for the diagnosis, decided by a table of checks (first match wins), then by the tree's
 * outcome rules: counted with an outcome, or kept in the path with the reason it does not count.
 */
import { finding, joinPath, type Finding } from './findings';
import { parseRequest } from './tree-schema';
import { requestKey, type TreeRequest } from './request-key';
import { scanToTestUnit } from './scan-units';
import type { ComparisonHalf, Test, Tree } from './tree-model';
import type { DiagnosisOptions, Reading, Repair } from './index';

export type Verdict =
  | 'counted'
  | 'indeterminate'
  | 'superseded'
  | 'verification'
  | 'not_in_tree'
  | 'invalid'
  | 'before_repair'
  | 'frozen_scan'
  /** Half of a comparison whose difference was counted on the other, later reading of the pair. */
  | 'paired'
  /** Half of a comparison still waiting for its other reading (or an earlier reading of a half since re-taken). */
  | 'unpaired';

/** A reading that passed the shape check, in time order. */
export interface CheckedReading {
  index: number;
  /** Position in the caller's readings array (for finding paths). */
  inputIndex: number;
  id: string;
  request: TreeRequest;
  value: number;
  takenAtMs: number;
  phase: 'diagnosis' | 'verification';
  supersededBy?: string;
  test?: Test;
  /** The comparisons this reading is a half of (it may also answer `test`). */
  halves: ComparisonHalf[];
  /** How a scan value in another unit was converted to the test's unit. */
  conversion?: string;
}

export interface ReadingContext {
  tree: Tree;
  readings: CheckedReading[];
  byId: Map<string, CheckedReading>;
  repairs: Array<{ id: string; part: string; atMs: number }>;
  options: Required<Pick<DiagnosisOptions, 'frozenScanTolerance'>>;
}

interface ReadingCheck {
  verdict: Verdict;
  /** A plain-words note when the check applies to this reading, else undefined. */
  check(reading: CheckedReading, ctx: ReadingContext): string | undefined;
}

export const READING_CHECKS: readonly ReadingCheck[] = [
  {
    verdict: 'superseded',
    check: (r, ctx) => (r.supersededBy && ctx.byId.has(r.supersededBy) ? `replaced by reading ${r.supersededBy}` : undefined),
  },
  {
    verdict: 'verification',
    check: (r) => (r.phase === 'verification' ? 'a verification reading: it proves the repair and does not move the diagnosis' : undefined),
  },
  {
    verdict: 'not_in_tree',
    check: (r) => (r.test || r.halves.length ? undefined : 'not in this tree: kept in the record, does not move the diagnosis'),
  },
  {
    verdict: 'before_repair',
    check: (r, ctx) => {
      const parts = r.test ? r.test.parts : r.halves[0]!.test.parts;
      const repair = ctx.repairs.find((rep) => rep.atMs > r.takenAtMs && (parts === undefined || parts.includes(rep.part)));
      return repair ? `taken before repair ${repair.id} of the ${repair.part}: no longer describes the circuit` : undefined;
    },
  },
];

/** Shape check of the readings: the usable ones (time-ordered, matched to tests) and findings for the rest. */
export function checkReadingShapes(tree: Tree, readings: readonly Reading[]): { checked: CheckedReading[]; invalid: Array<{ reading: Reading; note: string }>; findings: Finding[] } {
  const findings: Finding[] = [];
  const checked: CheckedReading[] = [];
  const invalid: Array<{ reading: Reading; note: string }> = [];
  const seen = new Set<string>();
  readings.forEach((reading, i) => {
    const path = joinPath('readings', i);
    const problems: Finding[] = [];
    if (typeof reading?.id !== 'string' || reading.id === '') problems.push(finding('reading.id_missing', joinPath(path, 'id'), 'expected a non-empty reading id'));
    else if (seen.has(reading.id)) problems.push(finding('reading.duplicate_id', joinPath(path, 'id'), `reading id "${reading.id}" is used twice`));
    const { request, findings: requestFindings } = parseRequest(reading?.request, joinPath(path, 'request'));
    problems.push(...requestFindings);
    const value = reading?.value === 'overload' && request?.quantity === 'ohms' ? Infinity : reading?.value;
    if (typeof value !== 'number' || Number.isNaN(value) || value === -Infinity || (value === Infinity && reading.value !== 'overload'))
      problems.push(finding('reading.value_not_number', joinPath(path, 'value'), `expected a number in SI units (volts, ohms, amps) or the scan value as shown; got ${JSON.stringify(reading?.value)}${request?.quantity === 'ohms' ? ' (an open ohms reading is "overload")' : ''}`));
    const takenAtMs = Date.parse(reading?.takenAt);
    if (typeof reading?.takenAt !== 'string' || Number.isNaN(takenAtMs)) problems.push(finding('reading.taken_at_invalid', joinPath(path, 'takenAt'), 'expected an ISO 8601 date-time'));
    if (reading?.phase !== 'diagnosis' && reading?.phase !== 'verification') problems.push(finding('reading.phase_invalid', joinPath(path, 'phase'), 'expected "diagnosis" or "verification"'));
    if (reading?.supersededBy !== undefined && typeof reading.supersededBy !== 'string') problems.push(finding('reading.superseded_by_invalid', joinPath(path, 'supersededBy'), 'expected a reading id'));
    if (reading?.unit !== undefined && typeof reading.unit !== 'string') problems.push(finding('reading.unit_invalid', joinPath(path, 'unit'), 'expected the unit the value is in, e.g. "V"'));
    const test = request ? tree.testByRequest.get(requestKey(request)) : undefined;
    const halves = (request && tree.halvesByRequest.get(requestKey(request))) || [];
    let converted = value as number;
    let conversion: string | undefined;
    // A half that answers no test of its own is read in its comparison's unit (checked alike when the tree loads).
    const unitOf = test ?? halves[0]?.test;
    if (!problems.length && unitOf && request!.quantity === 'scan_value') {
      const c = scanToTestUnit(tree, unitOf, converted, reading.unit);
      if (c.ok) [converted, conversion] = [c.value, c.note];
      else problems.push(finding('reading.scan_unit_unexpected', joinPath(path, 'unit'), c.message));
    }
    if (typeof reading?.id === 'string') seen.add(reading.id);
    if (problems.length) {
      findings.push(...problems);
      invalid.push({ reading, note: problems.map((p) => p.message).join('; ') });
      return;
    }
    checked.push({
      index: i,
      inputIndex: i,
      id: reading.id,
      request: request!,
      value: converted,
      takenAtMs,
      phase: reading.phase,
      supersededBy: reading.supersededBy,
      test,
      halves,
      conversion,
    });
  });
  checked.sort((a, b) => a.takenAtMs - b.takenAtMs || a.index - b.index);
  checked.forEach((r, i) => (r.index = i));
  for (const r of checked)
    if (r.supersededBy !== undefined && !checked.some((q) => q.id === r.supersededBy))
      findings.push(finding('reading.superseded_by_unknown', joinPath('readings', readings.findIndex((x) => x.id === r.id), 'supersededBy'), `no reading with id "${r.supersededBy}"; the reading still counts`, 'warning'));
  return { checked, invalid, findings };
}

export function checkRepairs(repairs: readonly Repair[]): { repairs: ReadingContext['repairs']; findings: Finding[] } {
  const findings: Finding[] = [];
  const ok: ReadingContext['repairs'] = [];
  repairs.forEach((repair, i) => {
    const atMs = Date.parse(repair?.at);
    const path = joinPath('repairs', i);
    if (typeof repair?.id !== 'string' || !repair.id) findings.push(finding('repair.id_missing', joinPath(path, 'id'), 'expected a non-empty repair id'));
    else if (typeof repair.part !== 'string' || !repair.part) findings.push(finding('repair.part_missing', joinPath(path, 'part'), 'expected the repaired part (reference, signal, ground, sensor, module, …)'));
    else if (typeof repair.at !== 'string' || Number.isNaN(atMs)) findings.push(finding('repair.at_invalid', joinPath(path, 'at'), 'expected an ISO 8601 date-time'));
    else ok.push({ id: repair.id, part: repair.part, atMs });
  });
  return { repairs: ok, findings };
}

/** The first check that applies, or undefined when the reading goes on to its outcome rules. */
export function verdictOf(reading: CheckedReading, ctx: ReadingContext): { verdict: Verdict; note: string } | undefined {
  for (const c of READING_CHECKS) {
    const note = c.check(reading, ctx);
    if (note !== undefined) return { verdict: c.verdict, note };
  }
  return undefined;
}
