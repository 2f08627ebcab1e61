/**
 * Diagnosis on cases it was not derived from (`npm run bench -- out-of-model`). The cases come from a second,
 * independent circuit model and instrument model (test/support/out-of-model: our own nodal solver, cross-checked
 * against ngspice; src/engine/circuit is not used): bias 47 kΩ–1 MΩ either direction, supply 4.75–5.10 V and dead
 * or weak supplies, wire and terminal resistances, sensors across their travel, thermistors −30…120 °C, a
 * 6000-count meter at ±(0.5 % + 2 counts) V and ±(1 % + 2 counts) Ω, a 10-bit 0–5 V scan value (clamped; frozen
 * key-on on modules that refresh only with engine speed), healthy circuits and hard and partial faults; and a 5 V
 * reference shared by three sensors (a sensor shorted inside, the harness shorted to ground, a failed supply).
 * Every cause of a tree gets the same number of cases (stratified, not weighted by the tree's priors).
 *
 * Each case is diagnosed to the end by the engine and by the fixed checklist (src/engine/diagnosis/drive.ts's
 * chooser). Right = proven on the true cause; confidently wrong = proven on another cause; undecided = the rest.
 * A healthy circuit is right only when proven `no_fault_now`; proven as a wire or part fault it is also counted
 * on its own line, the worst error. A wiring fault that shows on none of the tree's tests is right undecided or
 * proven `no_fault_now` too, and counted in its own column.
 */
import { builtInTrees, sharedReferenceTreeFor } from '../src/engine/diagnosis';
import { checklistChooser, type TestChooser } from '../src/engine/diagnosis/drive';
import { OOM_CAUSES, oomCases, type OomCase, type OomTreeId } from '../test/support/out-of-model/cases';
import { drawSharedCaseN, sharedCauses, SHARED_SENSOR_POOL } from '../test/support/out-of-model/shared-reference';
import { addRun, emptyTally, runOomCase, STEP_CAP, type Tally } from '../test/support/out-of-model/drive';
import type { BenchResult } from './run';

const PER_CAUSE = Number(process.env.OOM_PER_CAUSE ?? 40);
const SEED = 20261203;
/** Sensor counts of the shared-reference section. */
const SHARED_COUNTS = [3, 4, 6, 8];
export const TARGETS = { right: 0.95, confidentlyWrong: 0.01, p99Ms: 5 } as const;

const pct = (n: number, d: number) => (d === 0 ? '–' : `${((100 * n) / d).toFixed(1)} %`);
const quantile = (sorted: number[], q: number) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? NaN;
const met = (ok: boolean) => (ok ? 'met' : 'not met');

function row(tree: string, cause: string, policy: string, t: Tally): Record<string, string | number> {
  return {
    tree,
    'true cause': cause,
    policy,
    cases: t.cases,
    right: `${t.right} (${pct(t.right, t.cases)})`,
    'confidently wrong': `${t.confidentlyWrong} (${pct(t.confidentlyWrong, t.cases)})`,
    undecided: `${t.undecided} (${pct(t.undecided, t.cases)})`,
    'fault shows on no test': t.hidden,
    'mean readings': (t.readings / t.cases).toFixed(1),
    'mean minutes': (t.minutes / t.cases).toFixed(1),
  };
}

export default async (): Promise<BenchResult[]> => {
  const trees = builtInTrees();
  const policies: Array<[string, TestChooser | undefined]> = [
    ['engine', undefined],
    ['fixed checklist', checklistChooser],
  ];
  const perCause: BenchResult['rows'] = [];
  const totals: BenchResult['rows'] = [];
  const confusions: string[] = [];
  const latencyRows: BenchResult['rows'] = [];
  const overall = { engine: emptyTally(), checklist: emptyTally() };
  let worstP99 = 0;
  for (const treeId of Object.keys(OOM_CAUSES) as OomTreeId[]) {
    const tree = trees[treeId];
    if (!tree) throw new Error(`built-in tree ${treeId} is missing`);
    const cases = oomCases(treeId, PER_CAUSE, SEED);
    for (const c of cases.slice(0, 20)) await runOomCase(tree, c); // warm the JIT before timing
    for (const [policy, choose] of policies) {
      const byCause = new Map<string, Tally>(OOM_CAUSES[treeId].map((cause) => [cause, emptyTally()]));
      const all = emptyTally();
      const wrong = new Map<string, number>();
      const latencies: number[] = [];
      for (const c of cases) {
        const run = await runOomCase(tree, c, { choose });
        addRun(byCause.get(c.cause)!, run);
        addRun(all, run);
        addRun(choose ? overall.checklist : overall.engine, run);
        if (run.verdict === 'confidently_wrong') wrong.set(`${c.cause} (${c.variant}) → ${run.proven}`, (wrong.get(`${c.cause} (${c.variant}) → ${run.proven}`) ?? 0) + 1);
        if (!choose) latencies.push(...run.latencies);
      }
      for (const [cause, t] of byCause) perCause.push(row(treeId, cause, policy, t));
      totals.push({
        ...row(treeId, 'all', policy, all),
        'wrong: a wire or part blamed': all.wrongPartBlamed,
        'wrong: no fault now (a fault missed)': all.wrongNoFault,
        'wrong: not modelled (unknown)': all.wrongUnknown,
        'healthy proven as a wire or part fault': all.healthyBlamed,
      });
      if (!choose) {
        latencies.sort((a, b) => a - b);
        const p99 = quantile(latencies, 0.99);
        worstP99 = Math.max(worstP99, p99);
        latencyRows.push({ tree: treeId, 'diagnose calls': latencies.length, 'median (ms)': quantile(latencies, 0.5).toFixed(3), 'p99 (ms)': p99.toFixed(3), 'max (ms)': latencies.at(-1)!.toFixed(3) });
        const top = [...wrong].sort((a, b) => b[1] - a[1]).slice(0, 12);
        if (top.length) confusions.push(`${treeId}, engine, confidently wrong (true cause (form) → proven): ${top.map(([k, n]) => `${k} ×${n}`).join('; ')}.`);
      }
    }
  }
  const healthy = PER_CAUSE * Object.values(OOM_CAUSES).filter((causes) => causes.includes('no_fault_now')).length;
  const e = overall.engine;
  const k = overall.checklist;
  const targets: BenchResult['rows'] = [
    { target: `right ≥ ${TARGETS.right * 100} %`, engine: pct(e.right, e.cases), 'fixed checklist': pct(k.right, k.cases), 'engine: met?': met(e.right >= TARGETS.right * e.cases) },
    { target: `confidently wrong ≤ ${TARGETS.confidentlyWrong * 100} %`, engine: pct(e.confidentlyWrong, e.cases), 'fixed checklist': pct(k.confidentlyWrong, k.cases), 'engine: met?': met(e.confidentlyWrong <= TARGETS.confidentlyWrong * e.cases) },
    { target: 'a healthy circuit never proven as a wire or part fault', engine: `${e.healthyBlamed} of ${healthy}`, 'fixed checklist': `${k.healthyBlamed} of ${healthy}`, 'engine: met?': met(e.healthyBlamed === 0) },
    { target: `recompute p99 ≤ ${TARGETS.p99Ms} ms`, engine: `${worstP99.toFixed(3)} ms`, 'fixed checklist': '–', 'engine: met?': met(worstP99 <= TARGETS.p99Ms) },
  ];
  const setting = `${PER_CAUSE} cases per true cause and tree (seed ${SEED}), step cap ${STEP_CAP} readings.`;
  // References shared by N sensors: the tree generated for the sensors, cases with their own part values.
  const sharedRows: BenchResult['rows'] = [];
  const sharedTotals: BenchResult['rows'] = [];
  const sharedWrong: string[] = [];
  for (const n of SHARED_COUNTS) {
    const names = SHARED_SENSOR_POOL.slice(0, n);
    const tree = sharedReferenceTreeFor(names.map((id) => ({ id, label: `${id.toUpperCase()} sensor` })));
    const all = emptyTally();
    for (const cause of sharedCauses(names)) {
      const t = emptyTally();
      for (let i = 0; i < PER_CAUSE; i++) {
        const c = drawSharedCaseN(names, cause, i, SEED);
        const run = await runOomCase(tree, { tree: 'shared-reference', ...c } as OomCase);
        addRun(t, run);
        addRun(all, run);
        if (run.verdict === 'confidently_wrong') sharedWrong.push(`${n} sensors: ${cause} (${c.variant}) → ${run.proven}`);
      }
      sharedRows.push(row(`shared reference, ${n} sensors`, cause, 'engine', t));
    }
    sharedTotals.push({ ...row(`shared reference, ${n} sensors`, 'all', 'engine', all), 'healthy proven as a wire or part fault': all.healthyBlamed });
  }
  return [
    { title: 'Out-of-model diagnosis: targets (all trees together)', rows: targets, notes: [setting] },
    { title: 'Out-of-model diagnosis: per tree', rows: totals },
    { title: 'Out-of-model diagnosis: per tree and true cause', rows: perCause, notes: confusions },
    { title: 'Out-of-model diagnosis: recompute latency of one diagnose() call (engine)', rows: latencyRows },
    {
      title: 'Out-of-model diagnosis: references shared by N sensors (generated tree), per true cause',
      rows: [...sharedTotals, ...sharedRows],
      notes: [`${PER_CAUSE} cases per true cause and sensor count (seed ${SEED}).`, ...(sharedWrong.length ? [`confidently wrong: ${sharedWrong.slice(0, 12).join('; ')}.`] : [])],
    },
  ];
};
