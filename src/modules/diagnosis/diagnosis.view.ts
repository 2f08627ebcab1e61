import { cautionsInContext, type Diagnosis, type Tree, type WorkContext } from '../../engine/diagnosis';
import { roundProbabilities } from '../../common/round-probabilities';

/** What the API answers for a circuit's diagnosis: the tree version it follows, then the engine's result. */
export function diagnosisView(tree: Tree, diagnosis: Diagnosis) {
  return { tree: { id: tree.id, version: tree.version, title: tree.title }, ...diagnosis };
}

/** The next test's cautions with those the vehicle and sensor add (a high-voltage system first), as the pages show them. */
export function withContextCautions(diagnosis: Diagnosis, context: WorkContext): Diagnosis {
  const next = diagnosis.nextTest;
  return next ? { ...diagnosis, nextTest: { ...next, cautions: cautionsInContext(next.cautions, next.request, context) } } : diagnosis;
}

/** The same, as the API sends it: probabilities rounded (no float noise); with a work context, its cautions added. */
export function apiDiagnosisView(tree: Tree, diagnosis: Diagnosis, context?: WorkContext) {
  return roundProbabilities(diagnosisView(tree, context ? withContextCautions(diagnosis, context) : diagnosis));
}
