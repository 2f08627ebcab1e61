/**
 * What a repair still has to show before it counts as verified: every reading that decided the cause, taken again
 * after the repair on the same test, and now where the healthy circuit puts it (the tree's healthy outcome, from the
 * circuit model). A reading the repair did not change, or one not yet taken, is listed with why it is still needed.
 */
import { healthyOutcome, type HealthyOutcome } from './healthy-outcome';
import { requestKey, type TreeRequest } from './request-key';
import type { Tree } from './tree-model';
import type { Diagnosis, Reading } from './index';

export interface Retest {
  /** The reading that decided the cause, to be taken again. */
  readingId: string;
  testId: string;
  test: string;
  request: TreeRequest;
  /** `not_measured`: not taken since the repair; `outside_healthy`: its latest reading since still shows a fault. */
  state: 'not_measured' | 'outside_healthy';
  healthy: HealthyOutcome | null;
  /** The latest reading of the test since the repair, when there is one. */
  latestReadingId: string | null;
}

/** The deciding readings of a diagnosis: what proved (or leads) the cause, else every counted reading of the path. */
function decidingReadings(d: Diagnosis): string[] {
  const conclusion = d.conclusion as (Diagnosis['conclusion'] & { confirmedBy?: string[] }) | null;
  if (conclusion && conclusion.decidedBy.length + (conclusion.confirmedBy?.length ?? 0) > 0) {
    return [...new Set([...(conclusion.confirmedBy ?? []), ...conclusion.decidedBy])];
  }
  return d.path.filter((p) => p.verdict === 'counted' && p.testId).map((p) => p.readingId);
}

function inHealthy(value: Reading['value'], healthy: HealthyOutcome): boolean {
  if (value === 'overload') return healthy.max === null;
  return (healthy.min === null || value >= healthy.min) && (healthy.max === null || value <= healthy.max);
}

/**
 * The re-tests still needed on one circuit: `asDiagnosed` is its diagnosis before any repair, `readings` all of the
 * circuit's readings, `repairedAt` the time of the latest repair concerning it (ISO 8601). Empty: verified.
 */
export function retestsStillNeeded(tree: Tree, asDiagnosed: Diagnosis, readings: readonly Reading[], repairedAt: string): Retest[] {
  const byId = new Map(readings.map((r) => [r.id, r]));
  const since = Date.parse(repairedAt);
  const seen = new Set<string>();
  const out: Retest[] = [];
  for (const id of decidingReadings(asDiagnosed)) {
    const decided = byId.get(id);
    if (!decided) continue;
    const key = requestKey(decided.request);
    const test = tree.testByRequest.get(key);
    if (!test || seen.has(key)) continue;
    seen.add(key);
    const after = readings
      .filter((r) => !r.supersededBy && r.id !== id && Date.parse(r.takenAt) >= since && requestKey(r.request) === key)
      .sort((a, b) => Date.parse(a.takenAt) - Date.parse(b.takenAt));
    const latest = after.at(-1);
    const healthy = healthyOutcome(tree, test) ?? null;
    const need = (state: Retest['state']) => out.push({ readingId: id, testId: test.id, test: test.label, request: test.request, state, healthy, latestReadingId: latest?.id ?? null });
    if (!latest) need('not_measured');
    else if (healthy && !inHealthy(latest.value, healthy)) need('outside_healthy');
  }
  return out;
}
