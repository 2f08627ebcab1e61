/**
 * Counted readings grouped per test: readings of one test under the same conditions that agree within the
 * instrument's error are one observation (their mean, the kernel tightened by √n); readings that disagree beyond it
 * form separate clusters, and a test with more than one cluster is evidence of an intermittent (the circuit itself
 * changed between readings).
 */
import { instrumentBound } from './meter-error';
import type { Test } from './tree-model';

export interface Cluster {
  /** Mean value (V, Ω, A; Infinity for an overload), or for trees without densities the outcome index. */
  y: number;
  n: number;
  readingIds: string[];
}

export interface Evidence {
  test: number;
  readingIds: string[];
  clusters: Cluster[];
  /** Outcome of the latest reading (labels and planning). */
  outcome: number;
  /** More than one cluster: the readings disagree beyond the instrument's error. */
  intermittent: boolean;
  /** Readings in the group after the first disagreement. */
  sinceDisagreement: number;
}

export interface CountedReading {
  id: string;
  test: Test;
  value: number;
  outcome: number;
}

function sameCluster(test: Test, a: number, b: number): boolean {
  if (!test.predictive) return a === b;
  if (!Number.isFinite(a) || !Number.isFinite(b)) return a === b;
  const q = test.weighAs;
  return Math.abs(a - b) <= 2 * Math.max(instrumentBound(q, a), instrumentBound(q, b));
}

/** Groups counted readings (in time order) by test and clusters each group. */
export function groupEvidence(counted: readonly CountedReading[]): Evidence[] {
  const byTest = new Map<number, Evidence>();
  for (const r of counted) {
    const y = r.test.predictive ? r.value : r.outcome;
    let e = byTest.get(r.test.index);
    if (!e) byTest.set(r.test.index, (e = { test: r.test.index, readingIds: [], clusters: [], outcome: r.outcome, intermittent: false, sinceDisagreement: 0 }));
    e.readingIds.push(r.id);
    e.outcome = r.outcome;
    if (e.intermittent) e.sinceDisagreement++;
    const home = e.clusters.find((c) => sameCluster(r.test, c.y, y));
    if (home) {
      home.y = Number.isFinite(home.y) ? (home.y * home.n + y) / (home.n + 1) : home.y;
      home.n++;
      home.readingIds.push(r.id);
    } else {
      e.clusters.push({ y, n: 1, readingIds: [r.id] });
      if (e.clusters.length === 2) e.intermittent = true;
    }
  }
  return [...byTest.values()];
}
