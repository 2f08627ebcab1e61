import type { Diagnosis, Tree } from '../../engine/diagnosis';
import { roundProbabilities } from '../../common/round-probabilities';

/** What the API answers for a circuit's diagnosis: the tree version it follows, then the engine's result. */
export function diagnosisView(tree: Tree, diagnosis: Diagnosis) {
  return { tree: { id: tree.id, version: tree.version, title: tree.title }, ...diagnosis };
}

/** The same, as the API sends it: probabilities rounded (no float noise). */
export function apiDiagnosisView(tree: Tree, diagnosis: Diagnosis) {
  return roundProbabilities(diagnosisView(tree, diagnosis));
}
