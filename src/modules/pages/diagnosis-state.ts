/**
 * What the pages may say about a diagnosis: a cause is proven only when the diagnosis concluded on reaching the
 * threshold; a diagnosis with no test left and nothing proven is "not proven" (its leading causes, no repair); a
 * proven cause whose repair part is "none" (the circuit tests good now) offers advice, not a repair.
 */
import type { Diagnosis } from '../../engine/diagnosis';

export interface Undecided {
  leading: Array<{ id: string; label: string; probability: number }>;
  advice: string;
}

type WithUndecided = Diagnosis & { undecided?: Undecided | null };

export function isProven(d: Diagnosis): boolean {
  return d.status === 'concluded' && d.conclusion !== null && d.conclusion.reachedThreshold !== false;
}

/** A proven cause that calls for a repair (not "no fault now"). */
export function repairable(d: Diagnosis): boolean {
  return isProven(d) && d.conclusion!.repair.part !== 'none';
}

const DEFAULT_ADVICE =
  'No test left can tell these causes apart. Check the connector and the wiring by eye and with a wiggle test while ' +
  'watching the reading, compare with the manufacturer’s service information, and ask the foreman before repairing.';

/** Not proven and nothing left to test: the diagnosis's own `undecided` when it gives one, else the top causes. */
export function undecidedOf(d: Diagnosis): Undecided | null {
  const own = (d as WithUndecided).undecided;
  if (own) return own;
  if (d.status !== 'exhausted' || isProven(d)) return null;
  return { leading: d.ranked.filter((r) => r.probability >= 0.05).slice(0, 3).map(({ id, label, probability }) => ({ id, label, probability })), advice: DEFAULT_ADVICE };
}
