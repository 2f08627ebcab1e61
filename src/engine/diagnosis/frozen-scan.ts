/**
 * A key-on scan value that stays put although the signal set-up changed (connector, jumper) may be a module that
 * refreshes only with engine speed (common practice, no source). It is called frozen only when the change should
 * have moved it: given the readings before it, the chance that the new set-up reads within the converter's
 * tolerance of the old value is below FROZEN_ODDS. So 0 V that stays 0 V on a grounded signal is a reading.
 */
import { broadMass, instrumentBound } from './meter-error';
import { coreMass, OUTLIER_WEIGHT } from './predictive';
import type { Posterior } from './posterior';
import { signalSetupKey } from './request-key';
import type { CheckedReading } from './reading-checks';
import type { Test, Tree } from './tree-model';

/**
 * Prior odds that a module does not refresh with the engine stopped, q / (1 − q) with q = 0.2 (common practice, no
 * source): frozen is the better explanation when the circuit model gives the unchanged value less than this chance.
 */
export const FROZEN_ODDS = 0.25;

export const isKeyOnScan = (r: CheckedReading) => r.request.quantity === 'scan_value' && r.request.key === 'on' && r.request.engine === 'off';

/**
 * A meter reading of the signal with the sensor connected, key on, nothing jumpered: what a module that samples
 * only with engine speed last saw (the sensor does not move between key on and running in these tests).
 */
export const isPluggedSignalVolts = (r: CheckedReading) =>
  r.request.quantity === 'dc_volts' && r.request.at === 'signal' && r.request.key === 'on' && r.request.engine === 'off' && (r.request.connector === 'plugged' || r.request.connector === 'backprobed') && r.request.jumpers.length === 0;

/** Between a meter against battery negative and the module's converter against its own ground (common practice, no source). */
const GROUND_OFFSET_VOLTS = 0.03;

/**
 * An earlier reading this key-on scan value repeats although its signal set-up differs: a key-on scan reading of the
 * same parameter, or a meter reading of the signal with the sensor connected (the value a frozen module holds).
 */
export function unchangedFrom(reading: CheckedReading, earlier: readonly CheckedReading[], extraTolerance: number): CheckedReading | undefined {
  if (!isKeyOnScan(reading)) return undefined;
  const setup = signalSetupKey(reading.request);
  const scanTol = instrumentBound('scan_value', reading.value) + extraTolerance;
  return earlier.find((q) => {
    if (isKeyOnScan(q)) return q.request.pid === reading.request.pid && signalSetupKey(q.request) !== setup && Math.abs(q.value - reading.value) <= scanTol;
    const connected = reading.request.connector === 'plugged' || reading.request.connector === 'backprobed';
    return isPluggedSignalVolts(q) && !(connected && reading.request.jumpers.length === 0) && Math.abs(q.value - reading.value) <= scanTol + instrumentBound('dc_volts', q.value) + GROUND_OFFSET_VOLTS;
  });
}

/** P(the test reads within ± tol of `value` | the evidence so far), from the same densities that weigh readings. */
export function chanceOfReading(tree: Tree, post: Posterior, test: Test, value: number, tol: number): number {
  const nC = tree.classes.length;
  const lo = value - tol;
  const hi = value + tol;
  const pred = test.predictive;
  const q = test.weighAs;
  const broad = broadMass(q, lo, hi);
  const byCell = new Map<number, number>();
  const massOf = (cell: number) => {
    let m = byCell.get(cell);
    if (m === undefined) byCell.set(cell, (m = cell < 0 ? broad : (1 - OUTLIER_WEIGHT) * coreMass(pred!.cells[cell]!, lo, hi, q) + OUTLIER_WEIGHT * broad));
    return m;
  };
  let sum = 0;
  for (let h = 0; h < tree.hypotheses.length; h++) {
    if (post.p[h]! < 1e-9) continue;
    let ph = 0;
    if (!pred) {
      const nO = test.outcomes.length;
      const o = test.outcomes.find((x) => x.interval && value >= x.interval.lo && value < x.interval.hi);
      ph = o ? test.like[h * nO + o.index]! : 0;
    } else {
      for (let c = 0; c < nC; c++) ph += post.classGivenCause[h * nC + c]! * massOf(pred.cellOf[h * nC + c]!);
    }
    sum += post.p[h]! * ph;
  }
  return sum;
}

/** True when the unchanged value is better explained by a module that did not refresh. */
export function looksFrozen(tree: Tree, post: Posterior, reading: CheckedReading, earlier: CheckedReading, extraTolerance: number): boolean {
  const tol = instrumentBound('scan_value', reading.value) + extraTolerance + (isKeyOnScan(earlier) ? 0 : instrumentBound('dc_volts', earlier.value) + GROUND_OFFSET_VOLTS);
  return chanceOfReading(tree, post, reading.test!, earlier.value, tol) < FROZEN_ODDS;
}
