/**
 * "Not proven": when no test is left and no cause is proven, name the leading causes and the kind of test from the
 * manufacturer's service information that would separate them. No repair is offered.
 */
import type { Tree } from './tree-model';

export interface Undecided {
  leading: Array<{ id: string; label: string; probability: number }>;
  advice: string;
  /** Why: no test left that could settle it, or the readings fit none of the modelled causes. */
  reason?: UndecidedReason;
}

export type UndecidedReason = 'no_test_left' | 'none_fits';

export const NONE_FITS = 'none of the modelled causes fits these readings';

/** What would separate a cause on each part from the others (common practice, no source). */
const SEPARATING_TEST: Record<string, string> = {
  reference: 'a voltage-drop test of the 5 V reference wire with the sensor loading it',
  signal: 'an end-to-end resistance and voltage-drop test of the signal wire',
  ground: 'a voltage-drop test of the sensor ground with the circuit loaded',
  sensor: 'a sweep of the sensor through its range on a graphing meter, or a known-good sensor',
  module: "the module's power, ground and 5 V supply checks",
  none: 'a wiggle test: flex the harness and connectors while repeating the reading, engine running where safe',
  unknown: 'the wiring diagram, for splices and other loads on these wires',
};

export function undecided(tree: Tree, ranked: Array<{ id: string; label: string; part: string; probability: number }>, reason: UndecidedReason = 'no_test_left'): Undecided {
  // The leak is no cause to name: the leading causes are the modelled ones, their shares among the modelled.
  const modelled = ranked.filter((h) => h.id !== tree.hypotheses[tree.unknownIndex]?.id);
  const mass = modelled.reduce((a, h) => a + h.probability, 0) || 1;
  const shares = reason === 'none_fits' ? modelled.map((h) => ({ ...h, probability: h.probability / mass })) : ranked;
  const leading = shares.filter((h, i) => i < 2 || (i < 4 && h.probability >= 0.05)).map(({ id, label, probability }) => ({ id, label, probability }));
  const names = leading.map((h) => `${h.label} (${Math.round(h.probability * 100)} %)`).join(', ');
  if (reason === 'none_fits') {
    return {
      leading,
      reason,
      advice: `Not proven: ${NONE_FITS}. Re-check the probe points and the connector state (plugged, unplugged, back-probed) and repeat the last readings; if they stand, follow the manufacturer's service information (wiring diagram, splices and other loads on these wires). Nearest modelled causes: ${names}. Do not repair on this result alone.`,
    };
  }
  const parts = [...new Set(leading.map((h) => tree.hypotheses.find((x) => x.id === h.id)!.part))];
  const tests = parts.map((p) => SEPARATING_TEST[p] ?? `a test of the ${p.replaceAll('_', ' ')} from the service information`);
  return {
    leading,
    reason,
    advice: `Not proven: no test in this tree can settle it. Leading causes: ${names}. To separate them, use the manufacturer's service information for ${tests.join('; ')}. Do not repair on this result alone.`,
  };
}
