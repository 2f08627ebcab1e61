/**
 * Fault-tree diagnosis on simulated faulted circuits. Each case draws a cause from the tree's priors, a circuit
 * variant (bias pull-up or pull-down; cold or warm engine), part spreads, and meter error, then answers whatever
 * test is asked with the circuit model's prediction (src/engine/circuit) plus the meter's stated error. Each case is
 * diagnosed to the end by (a) the engine, (b) a fixed checklist (reference, signal, ground, sensor, module tests in
 * that order), (c) the exact optimal policy (dynamic programming over test outcomes). All three use the same
 * inference, stop rule (one cause ≥ 0.95 with no reading against it, or no test left: "not proven") and re-check
 * handling; only the choice of the next test differs; all three obey the jumper safety rule, and every case is checked
 * for a jumper taken before the wires it joins read 5.5 V or less, key on (must be 0). "Confidently wrong" = concluded on a cause other than the
 * one injected. Latency is the wall time of one `diagnose` call (a full recompute).
 */
import { mulberry32 } from '../src/engine/circuit';
import { builtInTrees } from '../src/engine/diagnosis';
import { checklistChooser, driveToEnd, exactChooser, type TestChooser } from '../src/engine/diagnosis/drive';
import { drawCase } from '../src/engine/diagnosis/simulate';
import { jumperViolations } from '../src/engine/diagnosis/safety-rules';
import { newExactMemo } from '../src/engine/diagnosis/policy';
import type { BenchResult } from './run';

/** Cases per tree; DIAGNOSIS_BENCH_SCALE (e.g. 0.1) shortens a run on a busy machine. */
const SCALE = Number(process.env.DIAGNOSIS_BENCH_SCALE ?? 1);
const CASES = { 'three-wire-5v': Math.round(1000 * SCALE), 'two-wire-thermistor': Math.round(500 * SCALE) } as const;
/**
 * Exact V over every evidence state is out of reach in memory and time here for both trees (20 and 13 tests, up to
 * 5^20 and 5^13 states): the "optimum" is the DP with branches below path probability 0.01 valued by one-step
 * lookahead (near-optimal; reported as such).
 */
const PRUNE: Record<string, number> = { 'three-wire-5v': 0.01, 'two-wire-thermistor': 0.01 };
const SEED = 4242;

function quantile(sorted: number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))]!;
}

export default async (): Promise<BenchResult[]> => {
  const trees = builtInTrees();
  const rows: BenchResult['rows'] = [];
  const latencyRows: BenchResult['rows'] = [];
  const notes: string[] = [];
  for (const [treeId, n] of Object.entries(CASES)) {
    const tree = trees[treeId]!;
    const random = mulberry32(SEED);
    const cases = Array.from({ length: n }, () => drawCase(tree, random));
    const memo = newExactMemo(PRUNE[treeId]);
    const policies: Array<[string, TestChooser | undefined]> = [
      ['engine (auto: exact when small, else Q2)', undefined],
      ['fixed checklist', checklistChooser],
      [PRUNE[treeId] ? `near-optimal DP (pruned below ${PRUNE[treeId]})` : 'exact optimal policy', exactChooser({}, memo)],
    ];
    // Warm up the JIT so latency reflects steady state.
    for (const c of cases.slice(0, 20)) await driveToEnd(tree, c);
    const summary: Record<string, { acc: number; minutes: number }> = {};
    for (const [name, choose] of policies) {
      let right = 0;
      let wrong = 0;
      let minutes = 0;
      let exhausted = 0;
      let unsafe = 0;
      const latencies: number[] = [];
      const started = performance.now();
      for (const c of cases) {
        const result = await driveToEnd(tree, c, { choose });
        if (result.conclusion === c.hypothesisId) right++;
        else if (result.conclusion !== null) wrong++;
        if (result.status === 'exhausted') exhausted++;
        if (jumperViolations(result.readings).length > 0) unsafe++;
        minutes += result.minutes;
        latencies.push(...result.latencies);
      }
      const elapsed = performance.now() - started;
      summary[name] = { acc: right / n, minutes: minutes / n };
      rows.push({
        tree: treeId,
        policy: name,
        cases: n,
        'right': `${((100 * right) / n).toFixed(1)} %`,
        'confidently wrong': `${((100 * wrong) / n).toFixed(1)} %`,
        'not proven (no conclusion)': `${((100 * (n - right - wrong)) / n).toFixed(1)} %`,
        'mean minutes to root cause': (minutes / n).toFixed(2),
        'ended with no test left': exhausted,
        'jumper before its wires read ≤ 5.5 V (cases)': unsafe,
        'wall time (s)': (elapsed / 1000).toFixed(1),
      });
      if (!choose) {
        latencies.sort((a, b) => a - b);
        latencyRows.push({
          tree: treeId,
          'diagnose calls': latencies.length,
          'median (ms)': quantile(latencies, 0.5).toFixed(3),
          'p99 (ms)': quantile(latencies, 0.99).toFixed(3),
          'max (ms)': latencies.at(-1)!.toFixed(3),
        });
      }
    }
    const engine = summary[policies[0]![0]]!;
    const checklist = summary[policies[1]![0]]!;
    const optimum = summary[policies[2]![0]]!;
    notes.push(
      `${treeId}: engine minutes = ${(engine.minutes / checklist.minutes).toFixed(2)} × checklist (target ≤ 0.70), ${(engine.minutes / optimum.minutes).toFixed(2)} × optimum (target ≤ 1.10); DP memo held ${memo.values.size} evidence states${memo.minPathProbability ? `, pruned branch mass (summed over visits) ${memo.prunedMass.toFixed(1)}` : ''}.`,
    );
  }
  return [
    { title: 'Diagnosis: accuracy and minutes to root cause (simulated faulted circuits)', rows, notes },
    { title: 'Diagnosis: recompute latency of one diagnose() call (engine policy)', rows: latencyRows, notes: ['Target: p99 < 5 ms for built-in trees.'] },
  ];
};
