import type { Diagnosis, Tree } from '../../engine/diagnosis';

/** What the API answers for a circuit's diagnosis: the tree version it follows, then the engine's result. */
export function diagnosisView(tree: Tree, diagnosis: Diagnosis) {
  return { tree: { id: tree.id, version: tree.version, title: tree.title }, ...diagnosis };
}
