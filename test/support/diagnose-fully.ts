/**
 * The engine's diagnose with no time limit on choosing the next test, so a test that checks which test comes next
 * gets the same answer on a busy machine as on an idle one (with the default budget a loaded machine falls back to
 * one-step lookahead). Tests of the budget itself call diagnose directly.
 */
import { diagnose, type DiagnosisOptions, type Reading, type Repair, type Tree } from '../../src/engine/diagnosis';
import { UNBOUNDED_PLANNING_MS } from '../../src/engine/diagnosis/drive';

export function diagnoseFully(tree: Tree, readings: readonly Reading[], repairsOrOptions: readonly Repair[] | DiagnosisOptions = [], options: DiagnosisOptions = {}) {
  const repairs = Array.isArray(repairsOrOptions) ? (repairsOrOptions as readonly Repair[]) : [];
  const opts = Array.isArray(repairsOrOptions) ? options : (repairsOrOptions as DiagnosisOptions);
  return diagnose(tree, readings, repairs, { planningBudgetMs: UNBOUNDED_PLANNING_MS, ...opts });
}
