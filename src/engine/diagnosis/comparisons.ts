/**
 * Comparison tests: two ordinary readings, one outcome on their difference. For each comparison the latest valid
 * reading of each half (same phase, not stale after a repair of the test's parts, not replaced, not a frozen scan
 * value) are paired and counted once, on the later of the two; a lone half is kept with the reason it waits.
 */
import { PID_DEFINITIONS } from '../scan';
import type { CountedReading } from './evidence';
import { verdictOf, type CheckedReading, type ReadingContext, type Verdict } from './reading-checks';
import { requestKey, type TreeRequest } from './request-key';
import type { Test, Tree } from './tree-model';
import type { PathEntry } from './index';

export interface ComparisonHalfReading {
  /** What this half is: the lead or the PID it reads. */
  label: string;
  request: TreeRequest;
  readingId: string | null;
  value: number | null;
}

export interface ComparisonEntry {
  testId: string;
  testLabel: string;
  unit: string;
  first: ComparisonHalfReading;
  second: ComparisonHalfReading;
  /** first − second, once both are taken. */
  difference: number | null;
  verdict: 'counted' | 'indeterminate' | 'unpaired';
  outcomeId?: string;
  outcomeLabel?: string;
  note: string;
}

export interface PairedComparisons {
  counted: CountedReading[];
  /** Path entries of readings that answer no test but a comparison. */
  path: PathEntry[];
  entries: ComparisonEntry[];
  /** Set-ups paid for by a half taken. */
  paid: number;
  /** Comparison tests whose pair fell between two outcomes, with the later reading. */
  indeterminate: Array<{ test: Test; reading: CheckedReading }>;
  /** Counted pairs: the later reading of each (whose own test, if any, the difference stands in for). */
  pairs: Array<{ test: Test; earlier: CheckedReading; later: CheckedReading }>;
}

/** What a half reads, in words: the test of its own, else the PID's name, else its quantity and point. */
export function halfLabel(tree: Tree, test: Test, half: 'first' | 'second'): string {
  if (half === 'second') return test.compare!.label;
  const single = tree.testByRequest.get(requestKey(test.request));
  if (single) return single.label;
  const pid = PID_DEFINITIONS.find((p) => p.pid === test.request.pid?.toUpperCase());
  return pid ? `${pid.name}${pid.j1930 ? ` (${pid.j1930})` : ''}, PID ${pid.pid}` : `${test.request.quantity} at the ${test.request.at}`;
}

const fmt = (x: number, unit: string) => `${x > 0 ? '+' : x < 0 ? '−' : ''}${Math.abs(x).toFixed(unit === '°C' ? 0 : 3)} ${unit}`;

interface HalfState {
  valid: CheckedReading[];
  early: Map<string, { verdict: Verdict; note: string }>;
}

function halfState(ctx: ReadingContext, test: Test, half: 'first' | 'second', excluded: ReadonlySet<string>): HalfState {
  const valid: CheckedReading[] = [];
  const early = new Map<string, { verdict: Verdict; note: string }>();
  for (const r of ctx.readings) {
    if (!r.halves.some((h) => h.test === test && h.half === half)) continue;
    const v = verdictOf({ ...r, test }, ctx);
    if (v) early.set(r.id, v);
    else if (excluded.has(r.id)) early.set(r.id, { verdict: 'frozen_scan', note: 'a scan value that did not refresh: not paired' });
    else valid.push(r);
  }
  return { valid, early };
}

/** The outcome of a difference: the partition for density tests, the tree's rules otherwise. */
async function outcomeOf(test: Test, value: number, request: TreeRequest): Promise<string[]> {
  const pred = test.predictive;
  if (!pred) return test.classifier.classify(value, request);
  const o = pred.partition.findIndex((b) => value >= b.lo && (value < b.hi || b.hi === Infinity));
  return [test.outcomes[o]!.id];
}

/** Pairs the halves of every comparison test of the tree. `excluded`: readings called frozen scan values. */
export async function pairComparisons(ctx: ReadingContext, excluded: ReadonlySet<string>): Promise<PairedComparisons> {
  const out: PairedComparisons = { counted: [], path: [], entries: [], paid: 0, indeterminate: [], pairs: [] };
  for (const test of ctx.tree.tests.filter((t) => t.compare)) {
    const unit = test.unit ?? 'V';
    const states = { first: halfState(ctx, test, 'first', excluded), second: halfState(ctx, test, 'second', excluded) };
    const latest = { first: states.first.valid.at(-1), second: states.second.valid.at(-1) };
    const describe = (half: 'first' | 'second'): ComparisonHalfReading => ({
      label: halfLabel(ctx.tree, test, half),
      request: half === 'first' ? test.request : test.compare!.request,
      readingId: latest[half]?.id ?? null,
      value: latest[half]?.value ?? null,
    });
    const entry: ComparisonEntry = { testId: test.id, testLabel: test.label, unit, first: describe('first'), second: describe('second'), difference: null, verdict: 'unpaired', note: '' };
    if (latest.first || latest.second) out.paid |= test.setupMask;
    const a = latest.first;
    const b = latest.second;
    let later: CheckedReading | undefined;
    if (a && b) {
      const difference = a.value - b.value;
      later = a.index > b.index ? a : b;
      entry.difference = difference;
      const hit = await outcomeOf(test, difference, test.request);
      if (hit.length === 1) {
        const outcome = test.outcomes.find((o) => o.id === hit[0])!;
        out.counted.push({ id: later.id, test, value: difference, outcome: outcome.index });
        out.pairs.push({ test, earlier: later === a ? b : a, later });
        Object.assign(entry, { verdict: 'counted', outcomeId: outcome.id, outcomeLabel: outcome.label });
        entry.note = `${entry.first.label} ${fmt(a.value, unit).replace(/^\+/, '')} less ${entry.second.label} ${fmt(b.value, unit).replace(/^\+/, '')}: ${fmt(difference, unit)}, outcome: ${outcome.label}`;
      } else {
        entry.verdict = 'indeterminate';
        entry.note = `difference ${fmt(difference, unit)} ${hit.length === 0 ? 'is in a guard band: matches no outcome' : `matches several outcomes (${hit.join(', ')})`}: take both readings again`;
        out.indeterminate.push({ test, reading: later });
      }
    } else {
      const missing = a ? 'second' : 'first';
      entry.note = a || b ? `waiting for "${entry[missing].label}": the comparison counts once both are read` : 'neither reading taken yet';
    }
    out.entries.push(entry);
    // Readings that answer only this comparison get their own line in the path.
    for (const half of ['first', 'second'] as const) {
      const other = half === 'first' ? b : a;
      for (const r of ctx.readings) {
        if (r.test || !r.halves.some((h) => h.test === test && h.half === half)) continue;
        const base = { readingId: r.id, takenAt: new Date(r.takenAtMs).toISOString(), value: r.value, testId: test.id, testLabel: `${test.label}: ${entry[half].label}` };
        const early = states[half].early.get(r.id);
        if (early) out.path.push({ ...base, verdict: early.verdict, note: early.note });
        else if (r !== latest[half]) out.path.push({ ...base, verdict: 'unpaired', note: `an earlier reading of this half: the comparison pairs the latest one, ${latest[half]!.id}` });
        else if (!other) out.path.push({ ...base, verdict: 'unpaired', note: `one half of "${test.label}": read "${entry[half === 'first' ? 'second' : 'first'].label}" too; until then it does not move the diagnosis` });
        else if (r === later && entry.verdict === 'counted') out.path.push({ ...base, verdict: 'counted', outcomeId: entry.outcomeId, outcomeLabel: entry.outcomeLabel, note: `with reading ${other.id}: ${entry.note}` });
        else if (r === later) out.path.push({ ...base, verdict: 'indeterminate', note: `with reading ${other.id}: ${entry.note}` });
        else out.path.push({ ...base, verdict: 'paired', note: `paired with reading ${later!.id}, which counts the comparison once: ${entry.note}` });
      }
    }
  }
  return out;
}
