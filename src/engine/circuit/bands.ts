/**
 * Outcome bands and the likelihood table the fault-tree engine consumes: for each hypothesis, the share of sampled
 * readings falling in each band of a test.
 */
import type { MeasurementRequest } from '../vocabulary';
import { checkFinite, describe, finding, joinPath, type Finding } from '../calc/findings';
import { faultsFor } from './hypotheses';
import { sampleReadings, type Percentiles, type Spreads } from './monte-carlo';
import type { CircuitSpec, FaultSpec, MeterSpec, ReadingUnit } from './types';

/** An outcome band: `min` inclusive, `max` exclusive; either may be left open. */
export interface Band {
  id: string;
  min?: number;
  max?: number;
}

/** The key under which values falling in no band are counted. */
export const OTHER_BAND = 'other';

export function validateBands(bands: Band[], path = 'bands'): Finding[] {
  if (!Array.isArray(bands) || bands.length === 0) return [finding('bands.empty', path, 'At least one band is required.')];
  const seen = new Set<string>();
  return bands.flatMap((band, i) => {
    const at = joinPath(path, i);
    const found: Finding[] = [];
    if (typeof band?.id !== 'string' || band.id === '') found.push(finding('bands.missing_id', joinPath(at, 'id'), 'Each band needs a non-empty id.'));
    else if (band.id === OTHER_BAND) found.push(finding('bands.reserved_id', joinPath(at, 'id'), `"${OTHER_BAND}" is reserved for values in no band.`));
    else if (seen.has(band.id)) found.push(finding('bands.duplicate_id', joinPath(at, 'id'), `Band id ${describe(band.id)} is used twice.`));
    seen.add(band?.id);
    if (band?.min !== undefined) found.push(...checkFinite(band.min, joinPath(at, 'min'), 'Band minimum'));
    if (band?.max !== undefined) found.push(...checkFinite(band.max, joinPath(at, 'max'), 'Band maximum'));
    if (!found.length && band.min !== undefined && band.max !== undefined && band.min >= band.max) {
      found.push(finding('bands.empty_range', joinPath(at, 'max'), 'A band maximum must exceed its minimum.'));
    }
    return found;
  });
}

/**
 * Share of `values` in each band (bands may overlap; each counts its own), plus `other` for values in no band.
 * Call `validateBands` first on untrusted bands; a band with min ≥ max simply catches nothing.
 */
export function bandProbabilities(values: ArrayLike<number>, bands: Band[]): Record<string, number> {
  const counts = new Float64Array(bands.length);
  let other = 0;
  const lo = bands.map((b) => b.min ?? Number.NEGATIVE_INFINITY);
  const hi = bands.map((b) => b.max ?? Number.POSITIVE_INFINITY);
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    let hit = false;
    for (let b = 0; b < bands.length; b++) {
      // An open-ended top band still catches an overload (+Infinity).
      if (v >= lo[b]! && (v < hi[b]! || (v === Number.POSITIVE_INFINITY && bands[b]!.max === undefined))) {
        counts[b]!++;
        hit = true;
      }
    }
    if (!hit) other++;
  }
  const n = values.length || 1;
  const out: Record<string, number> = {};
  bands.forEach((b, i) => (out[b.id] = counts[i]! / n));
  out[OTHER_BAND] = other / n;
  return out;
}

export interface BandTableInput {
  circuit: CircuitSpec;
  request: MeasurementRequest;
  bands: Band[];
  /** Hypothesis ids (see `faultsFor`) or explicit fault lists by id. `good` is always included. */
  hypotheses: string[] | Record<string, FaultSpec[]>;
  samples: number;
  seed: number;
  spreads?: Partial<Spreads>;
  meter?: MeterSpec;
}

export type BandRow =
  | { hypothesis: string; ok: true; unit: ReadingUnit; percentiles: Percentiles; probabilities: Record<string, number> }
  | { hypothesis: string; ok: false; findings: Finding[] };

/**
 * One row per hypothesis (and `good`): the reading's percentiles and the probability of each band. All rows use
 * the same seed (common random numbers), so differences between rows come from the faults, not the draws.
 * A hypothesis that means nothing on this circuit (a reference fault on a two-wire circuit) gets `ok: false`.
 */
export function bandTable(input: BandTableInput): { ok: true; rows: BandRow[] } | { ok: false; findings: Finding[] } {
  const bandFindings = validateBands(input?.bands);
  if (bandFindings.length) return { ok: false, findings: bandFindings };
  const entries: Array<[string, FaultSpec[] | undefined]> = Array.isArray(input.hypotheses)
    ? input.hypotheses.map((id) => [id, faultsFor(id)])
    : Object.entries(input.hypotheses ?? {});
  if (!entries.some(([id]) => id === 'good')) entries.unshift(['good', []]);
  const rows = entries.map(([hypothesis, faults]): BandRow => {
    if (!faults) return { hypothesis, ok: false, findings: [finding('hypothesis.unknown', `hypotheses.${hypothesis}`, `No faults are known for hypothesis "${hypothesis}".`)] };
    const sampled = sampleReadings({ ...input, faults });
    if (!sampled.ok) return { hypothesis, ok: false, findings: sampled.findings };
    return { hypothesis, ok: true, unit: sampled.unit, percentiles: sampled.percentiles, probabilities: bandProbabilities(sampled.values, input.bands) };
  });
  return { ok: true, rows };
}
