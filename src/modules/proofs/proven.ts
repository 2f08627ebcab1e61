import type { Diagnosis } from '../../engine/diagnosis';

/**
 * Whether a diagnosis proved its cause: concluded, with a conclusion that reached the threshold. An exhausted
 * diagnosis may carry a conclusion below the threshold: that is a leading candidate, never a root cause.
 */
export function isProven(d: Diagnosis): boolean {
  return d.status === 'concluded' && d.conclusion !== null && d.conclusion.reachedThreshold !== false;
}
