/**
 * The circuit a request describes: the engine's default circuit of its kind with the request's overrides laid over
 * it. Plain data in, plain data out; the engine validates the result.
 */
import { defaultCircuit, meterWith, type CircuitSpec, type MeterSpec } from '../../engine/circuit';
import type { CircuitOverrides, MeterOverrides } from './circuit-model.dto';
import type { z } from 'zod';

type Plain = Record<string, unknown>;
const isObject = (x: unknown): x is Plain => typeof x === 'object' && x !== null && !Array.isArray(x);

/**
 * Objects merge field by field; lists and scalars replace; a tagged object (one with `kind`) of another kind than
 * the default replaces it whole, so a beta model never inherits Steinhart–Hart coefficients.
 */
function overlay(base: unknown, patch: unknown): unknown {
  if (patch === undefined) return base;
  if (!isObject(patch) || !isObject(base)) return structuredClone(patch);
  if ('kind' in patch && patch.kind !== base.kind) return structuredClone(patch);
  const out: Plain = { ...base };
  for (const [key, value] of Object.entries(patch)) out[key] = overlay(base[key], value);
  return out;
}

export function resolveCircuit(overrides: CircuitOverrides): CircuitSpec {
  // A pressure sensor starts from the default pressure sensor, so a partial override fills in from it.
  const base = defaultCircuit(overrides.kind, overrides.sensor?.kind === 'pressure' ? { sensor: 'pressure' } : {});
  return overlay(base, overrides) as CircuitSpec;
}

export function resolveMeter(overrides: z.output<typeof MeterOverrides> | undefined): MeterSpec {
  return meterWith(overrides as Partial<MeterSpec> | undefined);
}
