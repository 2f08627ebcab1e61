/**
 * Coded, path-addressed findings and the result shape shared by the calculators, the circuit model and the wire
 * identifier. The HTTP layer turns `{ ok: false, findings }` into a 400.
 */

import type { Finding } from '../findings';

export type { Finding };

export type Result<T> = { ok: true; value: T } | { ok: false; findings: Finding[] };

export function finding(code: string, path: string, message: string): Finding {
  return { code, path, message };
}

export function ok<T>(value: T): Result<T> {
  return { ok: true, value };
}

export function fail<T>(findings: Finding[]): Result<T> {
  return { ok: false, findings };
}

/** Joins JSON path segments: `joinPath('faults', 2, 'ohms')` → `faults[2].ohms`. */
export function joinPath(...segments: Array<string | number>): string {
  return segments.reduce<string>((path, segment) => {
    if (typeof segment === 'number') return `${path}[${segment}]`;
    return path === '' ? segment : `${path}.${segment}`;
  }, '');
}

/** A finite number, else a finding. */
export function checkFinite(value: unknown, path: string, what: string): Finding[] {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    return [finding('input.not_a_number', path, `${what} must be a finite number, got ${describe(value)}.`)];
  }
  return [];
}

/** A finite number ≥ 0 (or > 0 when `strict`), else a finding naming the path. */
export function checkResistance(value: unknown, path: string, what: string, strict = false): Finding[] {
  const base = checkFinite(value, path, what);
  if (base.length) return base;
  const n = value as number;
  if (n < 0) return [finding('input.negative_resistance', path, `${what} must not be negative, got ${n} Ω.`)];
  if (strict && n === 0) return [finding('input.zero_resistance', path, `${what} must be greater than 0 Ω.`)];
  return [];
}

/** A finite number within [min, max], else a finding. */
export function checkRange(value: unknown, path: string, what: string, min: number, max: number): Finding[] {
  const base = checkFinite(value, path, what);
  if (base.length) return base;
  const n = value as number;
  if (n < min || n > max) {
    return [finding('input.out_of_range', path, `${what} must lie between ${min} and ${max}, got ${n}.`)];
  }
  return [];
}

export function describe(value: unknown): string {
  if (value === undefined) return 'nothing';
  if (typeof value === 'string') return `"${value}"`;
  if (typeof value === 'number') return String(value);
  return typeof value;
}
